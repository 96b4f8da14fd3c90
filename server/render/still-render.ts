import type { Image, SKRSContext2D } from '@napi-rs/canvas';
import type { AngleGauge, FrameLandmarks, ScaleBar } from '../../src/contracts/annotations';
import type { Direction, Side } from '../../src/contracts/assessment';
import { STILL_CAUTION_LINE, type StillLabel, type StillRect } from '../../src/contracts/sharing';
import { drawOverlay, overlayLabelPositions, type Canvas2DLike, type OverlayOptions } from '../../src/kinematics';
import { CANVAS_FONT_STACK, loadCanvas } from './fonts';

/** One panel to render: a frame image and the overlay frozen with the still. */
export interface StillPanelInput {
  /** JPEG/PNG bytes (or a file path) of the working-size frame. */
  image: Buffer | string;
  /** Working frame size, px: the coordinate system of the landmarks and overlay. */
  frameSize: { width: number; height: number };
  landmarks: FrameLandmarks[];
  nearSide: Side;
  direction: Direction;
  scale: ScaleBar | null;
  /** Angle gauges of the frame (stills saved before gauges existed have none). */
  gauges?: AngleGauge[];
  /** Heading above the panel, e.g. "Re-test · 24 Nov 2026 · Right toe-off · 0.43 s". */
  heading: string;
}

export interface StillRenderInput {
  panels: StillPanelInput[];
  caption: string;
  showAngles: boolean;
  /** Called between steps with 0–1. */
  onProgress?: (fraction: number) => void | Promise<void>;
}

export interface StillRenderOutput {
  png: Buffer;
  /** Smaller JPEG for phones (long side ≤ {@link PHONE_LONG_SIDE}). */
  jpeg: Buffer;
  width: number;
  height: number;
  layout: StillRect[];
  labels: StillLabel[];
  /** Where the caution line sits: the band at the foot of the image. */
  caution: StillRect;
}

/** Long side of the phone JPEG, px. */
export const PHONE_LONG_SIDE = 960;
/** JPEG quality of the phone copy (0–100). */
export const PHONE_JPEG_QUALITY = 80;

const INK = '#1B2A26';
const PAPER = '#FFFFFF';
const BAND = '#F1F5F3';
const MUTED = '#4A5A55';
const GAP = 12;

/** User-perceived characters (a letter with its combining marks, an emoji with its modifiers stay whole). */
const graphemes = new Intl.Segmenter(undefined, { granularity: 'grapheme' });

/**
 * Splits text into lines that fit `maxWidth` with the context's current font: at spaces, and a
 * word too wide for a line of its own (text written without spaces, as Chinese or Japanese is; a
 * long web address) between its characters, so nothing runs off the edge. Every character is kept.
 */
export function wrapText(ctx: Pick<SKRSContext2D, 'measureText'>, text: string, maxWidth: number): string[] {
  const lines: string[] = [];
  const fits = (t: string) => ctx.measureText(t).width <= maxWidth;
  for (const paragraph of text.split(/\r?\n/)) {
    let line = '';
    for (const word of paragraph.split(/\s+/).filter(Boolean)) {
      const next = line ? `${line} ${word}` : word;
      if (fits(next)) {
        line = next;
        continue;
      }
      if (line) lines.push(line);
      line = '';
      if (fits(word)) {
        line = word;
        continue;
      }
      for (const { segment } of graphemes.segment(word)) {
        if (line && !fits(line + segment)) {
          lines.push(line);
          line = '';
        }
        line += segment;
      }
    }
    lines.push(line);
  }
  return lines;
}

/**
 * At most `max` of `lines`; when some are left out, the last one kept ends in "…" (shortened
 * between characters until it fits `maxWidth`), so a cut caption shows that it was cut.
 */
export function clampLines(ctx: Pick<SKRSContext2D, 'measureText'>, lines: string[], max: number, maxWidth: number): string[] {
  if (lines.length <= max) return lines;
  const kept = lines.slice(0, max);
  const chars = [...graphemes.segment(kept[max - 1]!)].map((g) => g.segment);
  while (chars.length && ctx.measureText(`${chars.join('').trimEnd()}…`).width > maxWidth) chars.pop();
  kept[max - 1] = `${chars.join('').trimEnd()}…`;
  return kept;
}

/**
 * Renders an annotated still: each panel's frame with the SAME overlay routine the review
 * workspace draws (`drawOverlay` from `src/kinematics`, through @napi-rs/canvas's Canvas 2D),
 * a heading band per panel, the caption below and one small caution line at the foot
 * (`STILL_CAUTION_LINE`), in the shipped Source Sans 3.
 *
 * Panels sit side by side at a common height (the first panel's), so a Baseline/Re-test pair lines
 * up; the overlay is drawn in each frame's own pixel coordinates under a scale transform, so
 * marker and label sizes follow the frame size exactly as in the review workspace at 100 %.
 */
export async function renderStill(input: StillRenderInput): Promise<StillRenderOutput> {
  const { createCanvas, loadImage } = await loadCanvas([input.caption, ...input.panels.map((p) => p.heading)]);
  if (input.panels.length === 0) throw new Error('A still needs at least one panel.');
  const images: Image[] = [];
  for (const p of input.panels) images.push(await loadImage(p.image));
  await input.onProgress?.(0.25);

  const first = input.panels[0]!.frameSize;
  const panelHeight = first.height;
  const widths = input.panels.map((p) => Math.round((p.frameSize.width * panelHeight) / p.frameSize.height));
  const contentWidth = widths.reduce((a, b) => a + b, 0) + GAP * (input.panels.length - 1);
  const unit = Math.max(12, Math.round(Math.min(contentWidth, panelHeight) * 0.028));
  const headingHeight = Math.round(unit * 2.2);
  const captionFont = `400 ${Math.round(unit * 1.15)}px ${CANVAS_FONT_STACK}`;

  // Caption lines are measured on a scratch context with the same font.
  const scratch = createCanvas(10, 10).getContext('2d');
  scratch.font = captionFont;
  const caption = input.caption.trim();
  const captionLines = caption ? wrapText(scratch, caption, contentWidth - 2 * unit) : [];
  const lineHeight = Math.round(unit * 1.5);
  // Whole pixels: the canvas has whole pixels, and the stored height is an integer column.
  const captionHeight = captionLines.length ? captionLines.length * lineHeight + Math.round(unit * 1.4) : 0;
  const cautionSize = Math.max(10, Math.round(unit * 0.8));
  const cautionHeight = Math.round(cautionSize * 2);

  const width = contentWidth;
  const height = headingHeight + panelHeight + captionHeight + cautionHeight;
  const canvas = createCanvas(width, height);
  const ctx = canvas.getContext('2d');
  ctx.fillStyle = PAPER;
  ctx.fillRect(0, 0, width, height);

  const layout: StillRect[] = [];
  const labels: StillLabel[] = [];
  let x = 0;
  input.panels.forEach((panel, index) => {
    const w = widths[index]!;
    const rect = { x, y: headingHeight, width: w, height: panelHeight };
    layout.push(rect);
    ctx.fillStyle = BAND;
    ctx.fillRect(x, 0, w, headingHeight);
    ctx.fillStyle = INK;
    ctx.font = `600 ${unit}px ${CANVAS_FONT_STACK}`;
    ctx.textBaseline = 'middle';
    ctx.textAlign = 'left';
    ctx.fillText(panel.heading, x + unit * 0.6, headingHeight / 2, w - unit * 1.2);

    ctx.drawImage(images[index]!, rect.x, rect.y, rect.width, rect.height);
    const opts: OverlayOptions = {
      frameSize: panel.frameSize,
      landmarks: panel.landmarks,
      nearSide: panel.nearSide,
      direction: panel.direction,
      showAngles: input.showAngles,
      scale: panel.scale,
      gauges: panel.gauges ?? [],
      fontFamily: `${CANVAS_FONT_STACK}, sans-serif`,
    };
    ctx.save();
    ctx.translate(rect.x, rect.y);
    ctx.scale(rect.width / panel.frameSize.width, rect.height / panel.frameSize.height);
    drawOverlay(ctx as unknown as Canvas2DLike, opts);
    ctx.restore();
    if (input.showAngles) {
      for (const a of overlayLabelPositions(opts).angles) labels.push({ panel: index, side: a.side, joint: a.joint, text: a.text });
    }
    x += w + GAP;
  });
  await input.onProgress?.(0.55);

  if (captionLines.length) {
    ctx.fillStyle = INK;
    ctx.font = captionFont;
    ctx.textBaseline = 'top';
    ctx.textAlign = 'left';
    captionLines.forEach((line, i) => ctx.fillText(line, unit, headingHeight + panelHeight + unit * 0.7 + i * lineHeight));
  }
  // One small caution line at the foot, in the muted ink (about 7:1 on white), never over the frame.
  const caution = { x: 0, y: height - cautionHeight, width, height: cautionHeight };
  ctx.fillStyle = MUTED;
  ctx.font = `400 ${cautionSize}px ${CANVAS_FONT_STACK}`;
  ctx.textBaseline = 'middle';
  ctx.textAlign = 'left';
  ctx.fillText(STILL_CAUTION_LINE, unit, caution.y + cautionHeight / 2, width - 2 * unit);
  // A hairline under the caption keeps white-on-white phone viewers from losing the edge.
  ctx.fillStyle = MUTED;
  ctx.fillRect(0, height - 1, width, 1);

  const png = await canvas.encode('png');
  await input.onProgress?.(0.85);

  const factor = Math.min(1, PHONE_LONG_SIDE / Math.max(width, height));
  const small = createCanvas(Math.max(1, Math.round(width * factor)), Math.max(1, Math.round(height * factor)));
  const sctx = small.getContext('2d');
  sctx.imageSmoothingQuality = 'high';
  sctx.drawImage(canvas, 0, 0, small.width, small.height);
  const jpeg = await small.encode('jpeg', PHONE_JPEG_QUALITY);
  await input.onProgress?.(1);

  return { png, jpeg, width, height, layout, labels, caution };
}
