import { rename, rm } from 'node:fs/promises';
import path from 'node:path';
import type { Image } from '@napi-rs/canvas';
import type { AngleGauge, GaitEventMark, FrameLandmarks } from '../../src/contracts/annotations';
import type { Direction, Side } from '../../src/contracts/assessment';
import {
  ANNOTATED_CLIP_MAX_SOURCE_FRAMES,
  SLOW_MOTION_LABELS,
  type LandmarkOriginCounts,
  type SlowMotionFactor,
} from '../../src/contracts/annotated-clips';
import { STILL_CAUTION_LINE, type StillRect } from '../../src/contracts/sharing';
import { GAIT_EVENT_LABELS } from '../../src/contracts/annotations';
import { drawOverlay, landmarkFill, slowMotionTiming, type Canvas2DLike, type LandmarkFill } from '../../src/kinematics';
import { startH264Encoder } from '../media/encode-h264';
import { CANVAS_FONT_STACK, loadCanvas } from './fonts';
import { PANEL_GAP, clipSizes } from './annotated-clip-layout';
import { clampLines, wrapText } from './still-render';

/** One clip to play: where its frames come from and what is marked on it. */
export interface ClipPanelInput {
  /** Working frame size, px: the coordinate system of the landmarks. */
  frameSize: { width: number; height: number };
  /** Frame rate of the clip, frames/s (time labels; the first panel's sets the video's timing). */
  fps: number;
  /** JPEG/PNG bytes (or a file path) of working frame `index`. */
  readFrame(index: number): Promise<Buffer | string>;
  landmarks: readonly FrameLandmarks[];
  events: readonly GaitEventMark[];
  gauges?: readonly AngleGauge[];
  nearSide: Side;
  direction: Direction;
  /** Heading above the panel, e.g. "Re-test · 24 Nov 2026". */
  heading: string;
}

export interface AnnotatedClipRenderInput {
  /** One clip, or Baseline and Re-test side by side (drawn at the same height). */
  panels: ClipPanelInput[];
  /**
   * The source frames to show, in order: `steps[k][p]` is panel p's frame at video step k (one
   * entry per panel; a side-by-side clip's Re-test frames come from the time-warp).
   */
  steps: readonly (readonly number[])[];
  factor: SlowMotionFactor;
  caption: string;
  /** Whether angle arcs and degree labels are drawn (near side). */
  showAngles: boolean;
  /** The .mp4 to write: encoded under a hidden name beside it and renamed when complete, so it is never seen half written. */
  outFile: string;
  /** Called now and then with 0–1. */
  onProgress?: (fraction: number) => void | Promise<void>;
  /** Aborting stops drawing and kills ffmpeg. */
  signal?: AbortSignal;
}

export interface AnnotatedClipRenderOutput {
  width: number;
  height: number;
  /** Video frames written: steps × repeat. */
  frameCount: number;
  /** Times each source frame was written (the slow-motion rule). */
  repeat: number;
  outputFps: number;
  durationS: number;
  /** Where each panel's frame sits in the video, px. */
  layout: StillRect[];
  /** Per panel: how many steps showed marked, followed, interpolated or no landmarks. */
  origins: LandmarkOriginCounts[];
  /** What the clip says about its landmarks (drawn after the speed in the foot band). */
  note: string;
  /** CPU seconds ffmpeg spent encoding (its `-benchmark` figure), or null when it did not say. */
  encoderCpuS: number | null;
}

const INK = '#1B2A26';
const PAPER = '#FFFFFF';
const BAND = '#F1F5F3';
const MUTED = '#4A5A55';
/** An event's label stays up this long in playback, seconds, so it can be read in slow motion. */
const EVENT_LABEL_HOLD_S = 0.6;
/** Frames decoded ahead of the one being drawn. */
const READ_AHEAD = 3;

const even = (n: number) => Math.max(2, 2 * Math.round(n / 2));

/** The hidden name a video is encoded under beside `outFile` until it is complete. */
export function partialFileOf(outFile: string): string {
  return path.join(path.dirname(outFile), `.${path.basename(outFile)}.rendering`);
}

/** "Landmarks marked on 12 frames, followed on 30 and interpolated between marked frames on 18." */
export function landmarkNote(counts: LandmarkOriginCounts): string {
  const parts: string[] = [];
  if (counts.marked) parts.push(`marked on ${counts.marked} frame${counts.marked === 1 ? '' : 's'}`);
  if (counts.followed) parts.push(`followed on ${counts.followed}`);
  if (counts.interpolated) parts.push(`interpolated between marked frames on ${counts.interpolated}`);
  if (!parts.length) return 'No landmarks in this range.';
  const last = parts.pop()!;
  return `Landmarks ${parts.length ? `${parts.join(', ')} and ${last}` : last}.`;
}

/** The events of one side shown while the clip is at `frame`: those up to `hold` frames back. */
function eventsShown(events: readonly GaitEventMark[], frame: number, hold: number): string {
  return events
    .filter((e) => e.frame <= frame && frame - e.frame < hold)
    .sort((a, b) => b.frame - a.frame)
    .slice(0, 2)
    .map((e) => `${e.side === 'left' ? 'Left' : 'Right'} ${GAIT_EVENT_LABELS[e.kind].toLowerCase()}`)
    .join(' · ');
}

/**
 * Renders an annotated clip: every step's source frame(s) drawn with the SAME overlay the review
 * and the stills draw (`drawOverlay` on @napi-rs/canvas), a heading band per panel (visit, time,
 * event labels held {@link EVENT_LABEL_HOLD_S} s of playback), and a band below with the caption,
 * the speed and where the landmarks came from, and the caution line. Frames go to ffmpeg raw
 * (RGBA through a pipe; no file per frame), each source frame once; ffmpeg repeats it `repeat` times
 * after converting it, by the slow-motion rule (`slowMotionTiming`). Landmarks between marked frames: followed ones, else interpolated
 * (`landmarkFill`); a frame showing interpolated landmarks says so in its heading.
 */
export async function renderAnnotatedClip(input: AnnotatedClipRenderInput): Promise<AnnotatedClipRenderOutput> {
  const { createCanvas, loadImage } = await loadCanvas([input.caption, ...input.panels.map((p) => p.heading)]);
  const { panels, steps } = input;
  if (panels.length === 0) throw new RangeError('An annotated clip needs at least one clip.');
  if (steps.length === 0) throw new RangeError('An annotated clip needs at least one frame.');
  if (steps.length > ANNOTATED_CLIP_MAX_SOURCE_FRAMES)
    throw new RangeError(`An annotated clip can cover at most ${ANNOTATED_CLIP_MAX_SOURCE_FRAMES} frames; this one has ${steps.length}.`);
  const timing = slowMotionTiming(panels[0]!.fps, input.factor);

  const { widths, panelHeight, contentWidth, unit, phoneScale } = clipSizes(panels.map((p) => p.frameSize));
  const scratch = createCanvas(10, 10).getContext('2d');
  const captionFont = `400 ${Math.round(unit * 1.05)}px ${CANVAS_FONT_STACK}`;
  scratch.font = captionFont;
  const caption = input.caption.trim();
  // At most three lines under the video; a longer caption ends in "…" rather than stopping without a sign.
  const captionLines = caption ? clampLines(scratch, wrapText(scratch, caption, contentWidth - 2 * unit), 3, contentWidth - 2 * unit) : [];
  const lineHeight = Math.round(unit * 1.4);
  const smallSize = Math.max(10, Math.round(unit * 0.8));
  const footHeight = Math.round(unit * 0.6) + captionLines.length * lineHeight + Math.round(smallSize * 1.6) * 2 + Math.round(unit * 0.4);

  const fills: LandmarkFill[] = panels.map((p) => landmarkFill(p.landmarks));
  const holdFrames = panels.map((p) => Math.max(1, Math.round(EVENT_LABEL_HOLD_S * p.fps * input.factor)));
  const headingFont = `600 ${unit}px ${CANVAS_FONT_STACK}`;
  const statusFont = `400 ${Math.round(unit * 0.9)}px ${CANVAS_FONT_STACK}`;
  /** Panel `i`'s status at source frame `frame`: the time, the events just passed and the landmark origin. */
  const statusAt = (i: number, frame: number) => {
    const panel = panels[i]!;
    return [
      `${(frame / panel.fps).toFixed(2)} s`,
      eventsShown(panel.events, frame, holdFrames[i]!),
      fills[i]!.at(frame).origin === 'interpolated' ? 'landmarks interpolated' : '',
    ]
      .filter(Boolean)
      .join(' · ');
  };
  // The heading band: visit and status on one line when the longest of them fits, else status below.
  const widest = (font: string, texts: Iterable<string>) => {
    scratch.font = font;
    let w = 0;
    for (const t of texts) w = Math.max(w, scratch.measureText(t).width);
    return w;
  };
  const oneLine = panels.every((p, i) => {
    const statuses = new Set(steps.map((step) => statusAt(i, step[i]!)));
    return widest(headingFont, [p.heading]) + widest(statusFont, statuses) + 2.2 * unit <= widths[i]!;
  });
  const headingHeight = Math.round(unit * (oneLine ? 2.2 : 3.7));

  const width = even(contentWidth);
  const height = even(headingHeight + panelHeight + footHeight);
  const canvas = createCanvas(width, height);
  const ctx = canvas.getContext('2d');
  ctx.fillStyle = PAPER;
  ctx.fillRect(0, 0, width, height);

  const layout: StillRect[] = [];
  let x = 0;
  for (const w of widths) {
    layout.push({ x, y: headingHeight, width: w, height: panelHeight });
    x += w + PANEL_GAP;
  }
  const origins: LandmarkOriginCounts[] = panels.map(() => ({ marked: 0, followed: 0, interpolated: 0, none: 0 }));
  for (const step of steps) panels.forEach((_, i) => origins[i]![fills[i]!.at(step[i]!).origin]++);
  const notes = panels.map((p, i) => {
    const text = landmarkNote(origins[i]!);
    // Side by side: "Baseline: landmarks marked on …".
    return panels.length > 1 ? `${p.heading.split(' · ')[0]}: ${text.charAt(0).toLowerCase()}${text.slice(1)}` : text;
  });
  const note = notes.join(' ');

  // The foot band does not change: drawn once.
  const footTop = headingHeight + panelHeight;
  ctx.fillStyle = PAPER;
  ctx.fillRect(0, footTop, width, height - footTop);
  ctx.textAlign = 'left';
  ctx.textBaseline = 'top';
  let y = footTop + Math.round(unit * 0.6);
  ctx.fillStyle = INK;
  ctx.font = captionFont;
  for (const line of captionLines) {
    ctx.fillText(line, unit, y, width - 2 * unit);
    y += lineHeight;
  }
  ctx.font = `400 ${smallSize}px ${CANVAS_FONT_STACK}`;
  ctx.fillStyle = MUTED;
  ctx.fillText(`${SLOW_MOTION_LABELS[input.factor]}. ${note}`, unit, y, width - 2 * unit);
  y += Math.round(smallSize * 1.6);
  ctx.fillText(STILL_CAUTION_LINE, unit, y, width - 2 * unit);
  ctx.fillRect(0, height - 1, width, 1);

  function drawStep(k: number, images: Image[]): void {
    panels.forEach((panel, i) => {
      const rect = layout[i]!;
      const frame = steps[k]![i]!;
      const filled = fills[i]!.at(frame);
      // Heading band: visit, and the status on the right (or below it when the panel is narrow).
      ctx.fillStyle = BAND;
      ctx.fillRect(rect.x, 0, rect.width, headingHeight);
      ctx.textBaseline = 'middle';
      ctx.fillStyle = INK;
      ctx.font = headingFont;
      ctx.textAlign = 'left';
      const left = rect.x + unit * 0.6;
      const textWidth = rect.width - unit * 1.2;
      ctx.fillText(panel.heading, left, unit * 1.1, oneLine ? textWidth * 0.45 : textWidth);
      ctx.font = statusFont;
      if (oneLine) {
        ctx.textAlign = 'right';
        ctx.fillText(statusAt(i, frame), rect.x + rect.width - unit * 0.6, unit * 1.1, textWidth * 0.55);
      } else ctx.fillText(statusAt(i, frame), left, unit * 2.6, textWidth);

      const image = images[i]!;
      // At its own size a frame is copied as it is (no resampling).
      if (image.width === rect.width && image.height === rect.height) ctx.drawImage(image, rect.x, rect.y);
      else ctx.drawImage(image, rect.x, rect.y, rect.width, rect.height);
      const scale = rect.width / panel.frameSize.width;
      ctx.save();
      ctx.translate(rect.x, rect.y);
      ctx.scale(scale, rect.height / panel.frameSize.height);
      drawOverlay(ctx as unknown as Canvas2DLike, {
        frameSize: panel.frameSize,
        landmarks: filled.landmarks,
        nearSide: panel.nearSide,
        direction: panel.direction,
        showAngles: input.showAngles,
        scale: null,
        gauges: (panel.gauges ?? []).filter((g) => g.frame === frame),
        fontFamily: `${CANVAS_FONT_STACK}, sans-serif`,
        // A panel shown smaller than its frame keeps labels and markers readable on a phone.
        ...(scale < 0.999 ? { viewScale: scale * phoneScale } : {}),
      });
      ctx.restore();
    });
    if (panels.length > 1) {
      ctx.fillStyle = PAPER;
      for (let i = 1; i < layout.length; i++) ctx.fillRect(layout[i]!.x - PANEL_GAP, 0, PANEL_GAP, footTop);
    }
  }

  const read = (k: number) => Promise.all(panels.map(async (p, i) => loadImage(await p.readFrame(steps[k]![i]!))));
  const partial = partialFileOf(input.outFile);
  // Each source frame is drawn and piped once; ffmpeg makes the slow-motion copies (`repeat`).
  const encoder = startH264Encoder({ width, height, fps: timing.outputFps, repeat: timing.repeat, outFile: partial, signal: input.signal });
  const ahead: Promise<Image[]>[] = [];
  for (let k = 0; k < Math.min(READ_AHEAD, steps.length); k++) ahead.push(read(k));
  ahead.forEach((p) => p.catch(() => undefined));
  let reported = 0;
  try {
    for (let k = 0; k < steps.length; k++) {
      if (input.signal?.aborted) throw new Error('Rendering was cancelled.');
      const images = await ahead.shift()!;
      if (k + READ_AHEAD < steps.length) {
        const next = read(k + READ_AHEAD);
        next.catch(() => undefined);
        ahead.push(next);
      }
      drawStep(k, images);
      // canvas.data() is a copy: the next draw does not touch what ffmpeg still reads.
      await encoder.write(canvas.data());
      const fraction = (k + 1) / steps.length;
      if (input.onProgress && fraction - reported >= 0.02) {
        reported = fraction;
        await input.onProgress(Math.min(0.99, fraction));
      }
    }
    await encoder.finish();
    await rename(partial, input.outFile);
  } catch (err) {
    encoder.abort();
    await encoder.done.catch(() => undefined);
    await rm(partial, { force: true });
    throw err;
  }
  await input.onProgress?.(1);
  return {
    width,
    height,
    frameCount: steps.length * timing.repeat,
    repeat: timing.repeat,
    outputFps: timing.outputFps,
    durationS: steps.length / (panels[0]!.fps * input.factor),
    layout,
    origins,
    note,
    encoderCpuS: encoder.cpuSeconds(),
  };
}
