/**
 * The other visit's skeleton ("ghost") drawn on a frame under that frame's own overlay, for the
 * Re-test comparison: dashed lines in lighter tints of the limb colours over a dark under-stroke,
 * hollow markers — clearly apart from the solid, full-colour skeleton drawn on top, on dark and
 * light video alike. Same sizes as the overlay (`overlaySizes`), in frame pixels. Pure.
 */
import type { FrameLandmarks, LandmarkName } from '../contracts/annotations';
import type { Side } from '../contracts/assessment';
import { frameToPixel, isFinitePoint, type Point } from './geometry';
import { OVERLAY_COLOURS, OVERLAY_SEGMENTS, overlaySizes, type Canvas2DLike } from './overlay';

/** How much white goes into the ghost's colours (0 = the limb colour, 1 = white). */
export const GHOST_TINT = 0.45;

/** Mixes a #RRGGBB colour with white. */
export function tint(hex: string, amount: number): string {
  const n = Number.parseInt(hex.slice(1), 16);
  const mix = (c: number) => Math.round(c + (255 - c) * amount);
  const [r, g, b] = [(n >> 16) & 255, (n >> 8) & 255, n & 255].map(mix) as [number, number, number];
  return `#${((1 << 24) | (r << 16) | (g << 8) | b).toString(16).slice(1).toUpperCase()}`;
}

/** The ghost's colours: the project's left violet, right amber and trunk slate, lightened. */
export const GHOST_COLOURS: Readonly<Record<Side | 'trunk', string>> = {
  left: tint(OVERLAY_COLOURS.left, GHOST_TINT),
  right: tint(OVERLAY_COLOURS.right, GHOST_TINT),
  trunk: tint(OVERLAY_COLOURS.trunk, GHOST_TINT),
};

/** Dash of the ghost's lines, in line widths: long dashes, clear gaps. */
export const GHOST_DASH = [3, 2] as const;

/** What to draw: the ghost's landmarks (already moved where they belong, frame fractions). */
export interface GhostOptions {
  frameSize: { width: number; height: number };
  landmarks: FrameLandmarks[];
  /** As in `OverlayOptions.viewScale`: sizes in view pixels when set. */
  viewScale?: number;
}

/**
 * Draws the ghost skeleton: per side, every segment as a dark solid under-stroke and a dashed
 * tinted line, then hollow markers. Leaves the context's state as it found it.
 */
export function drawGhostSkeleton(ctx: Canvas2DLike, opts: GhostOptions): void {
  const { lineWidth, markerRadius } = overlaySizes(opts.frameSize, opts.viewScale);
  ctx.save();
  ctx.globalAlpha = 1;
  ctx.lineCap = 'butt';
  ctx.lineJoin = 'round';
  for (const row of opts.landmarks) {
    if (row.side !== 'left' && row.side !== 'right') continue;
    const px: Partial<Record<LandmarkName, Point>> = {};
    for (const [name, p] of Object.entries(row.points ?? {}) as [LandmarkName, Point | undefined][])
      if (isFinitePoint(p)) px[name] = frameToPixel(p, opts.frameSize);
    for (const s of OVERLAY_SEGMENTS) {
      const a = px[s.from];
      const b = px[s.to];
      if (!a || !b) continue;
      const colour = s.trunk ? GHOST_COLOURS.trunk : GHOST_COLOURS[row.side];
      for (const [style, width, dash] of [
        [OVERLAY_COLOURS.shadow, lineWidth + 2, [] as number[]],
        [colour, lineWidth, GHOST_DASH.map((d) => d * lineWidth)],
      ] as const) {
        ctx.setLineDash([...dash]);
        ctx.strokeStyle = style;
        ctx.lineWidth = width;
        ctx.beginPath();
        ctx.moveTo(a.x, a.y);
        ctx.lineTo(b.x, b.y);
        ctx.stroke();
      }
    }
    ctx.setLineDash([]);
    for (const p of Object.values(px)) {
      for (const [style, width] of [
        [OVERLAY_COLOURS.shadow, Math.max(1, markerRadius * 0.45) + 2],
        [GHOST_COLOURS[row.side], Math.max(1, markerRadius * 0.45)],
      ] as const) {
        ctx.strokeStyle = style;
        ctx.lineWidth = width;
        ctx.beginPath();
        ctx.arc(p.x, p.y, markerRadius, 0, Math.PI * 2);
        ctx.stroke();
      }
    }
  }
  ctx.restore();
}
