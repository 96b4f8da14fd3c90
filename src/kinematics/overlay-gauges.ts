/**
 * Angle gauges on the overlay: two arms from the vertex, an arc between them and the degree value,
 * in frame pixels on any Canvas-2D-like context (the review's canvas and the server's still
 * renderer both call it through `drawOverlay`). Pure layout plus drawing; no DOM or Node types.
 */
import type { AngleGauge } from '../contracts/annotations';
import { gaugeAngleDeg } from './angle-gauge';
import { formatValue } from './format';
import { frameToPixel, type FrameSize, type Point } from './geometry';
import type { Canvas2DLike } from './overlay';

/** Gauge colours: a light spruce green of our palette, apart from the limb and trunk colours. */
export const GAUGE_COLOURS = {
  line: '#5CD6B0',
  shadow: 'rgba(20, 24, 28, 0.6)',
  handle: '#FFFFFF',
  halo: 'rgba(20, 24, 28, 0.85)',
  text: '#FFFFFF',
} as const;

/** One gauge where it is drawn, px. */
export interface OverlayGauge {
  id: string;
  a: Point;
  vertex: Point;
  b: Point;
  /** The included angle, degrees (0–180). */
  valueDeg: number;
  /** "34.2°" — the measures' formatter. */
  text: string;
  /** Label centre, px (on the bisector, outside the arc). */
  x: number;
  y: number;
  arc: { radius: number; start: number; end: number; counterclockwise: boolean };
  selected: boolean;
}

/**
 * Where each usable gauge of `gauges` goes, px (degenerate ones — an arm without length — are left
 * out). `unit` is the label font size, px: the arc and label offsets scale with it.
 */
export function gaugeLayout(
  gauges: readonly AngleGauge[],
  frameSize: FrameSize,
  unit: number,
  selectedId: string | null = null,
): OverlayGauge[] {
  const out: OverlayGauge[] = [];
  for (const g of gauges) {
    const valueDeg = gaugeAngleDeg(g, frameSize);
    if (!Number.isFinite(valueDeg)) continue;
    const a = frameToPixel(g.a, frameSize);
    const vertex = frameToPixel(g.vertex, frameSize);
    const b = frameToPixel(g.b, frameSize);
    const la = Math.hypot(a.x - vertex.x, a.y - vertex.y);
    const lb = Math.hypot(b.x - vertex.x, b.y - vertex.y);
    const radius = Math.max(6, Math.min(unit * 2, 0.45 * Math.min(la, lb)));
    const start = Math.atan2(a.y - vertex.y, a.x - vertex.x);
    let delta = Math.atan2(b.y - vertex.y, b.x - vertex.x) - start;
    while (delta <= -Math.PI) delta += 2 * Math.PI;
    while (delta > Math.PI) delta -= 2 * Math.PI;
    // The label sits on the bisector, just outside the arc.
    const mid = start + delta / 2;
    const off = radius + unit * 1.3;
    out.push({
      id: g.id,
      a,
      vertex,
      b,
      valueDeg,
      text: formatValue(valueDeg, '°'),
      x: vertex.x + Math.cos(mid) * off,
      y: vertex.y + Math.sin(mid) * off,
      arc: { radius, start, end: start + delta, counterclockwise: delta < 0 },
      selected: g.id === selectedId,
    });
  }
  return out;
}

function segment(ctx: Canvas2DLike, p: Point, q: Point): void {
  ctx.beginPath();
  ctx.moveTo(p.x, p.y);
  ctx.lineTo(q.x, q.y);
  ctx.stroke();
}

/**
 * Draws gauges laid out by {@link gaugeLayout}: dark under-stroke then the gauge colour for arms and
 * arc, white handles at the three points (larger with a ring when selected), and the value on a
 * dark halo. Leaves the context's state as it found it.
 */
export function drawGauges(
  ctx: Canvas2DLike,
  gauges: readonly OverlayGauge[],
  style: { lineWidth: number; markerRadius: number; font: string; fontPx: number },
): void {
  if (!gauges.length) return;
  const { lineWidth, markerRadius, font, fontPx } = style;
  ctx.save();
  ctx.globalAlpha = 1;
  ctx.setLineDash([]);
  ctx.lineCap = 'round';
  ctx.lineJoin = 'round';
  for (const g of gauges) {
    for (const [colour, width] of [
      [GAUGE_COLOURS.shadow, lineWidth + 2],
      [GAUGE_COLOURS.line, lineWidth],
    ] as const) {
      ctx.strokeStyle = colour;
      ctx.lineWidth = width;
      segment(ctx, g.vertex, g.a);
      segment(ctx, g.vertex, g.b);
      ctx.beginPath();
      ctx.arc(g.vertex.x, g.vertex.y, g.arc.radius, g.arc.start, g.arc.end, g.arc.counterclockwise);
      ctx.stroke();
    }
    const r = g.selected ? markerRadius * 1.1 : markerRadius * 0.8;
    for (const p of [g.a, g.vertex, g.b]) {
      ctx.beginPath();
      ctx.arc(p.x, p.y, r, 0, Math.PI * 2);
      ctx.fillStyle = GAUGE_COLOURS.handle;
      ctx.fill();
      ctx.strokeStyle = GAUGE_COLOURS.line;
      ctx.lineWidth = Math.max(1, r * 0.45);
      ctx.stroke();
      if (g.selected) {
        ctx.beginPath();
        ctx.arc(p.x, p.y, r + 4, 0, Math.PI * 2);
        ctx.strokeStyle = GAUGE_COLOURS.handle;
        ctx.lineWidth = 2;
        ctx.stroke();
      }
    }
  }
  ctx.font = font;
  ctx.textAlign = 'center';
  ctx.textBaseline = 'middle';
  for (const g of gauges) {
    ctx.lineWidth = Math.max(2, fontPx * 0.25);
    ctx.strokeStyle = GAUGE_COLOURS.halo;
    ctx.strokeText(g.text, g.x, g.y);
    ctx.fillStyle = GAUGE_COLOURS.text;
    ctx.fillText(g.text, g.x, g.y);
  }
  ctx.restore();
}
