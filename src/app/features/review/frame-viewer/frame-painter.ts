/**
 * Paints the review canvas: the cached bitmap of the current frame (or the nearest one, dimmed,
 * while it loads) under the view's zoom and pan, then the shared overlay (`drawOverlay`: landmarks,
 * angles, scale bar, angle gauges) in view space, then whatever is being drawn (a scale line, a
 * gauge's first arm).
 */
import type { AngleGauge, FrameLandmarks, FramePoint, ScaleBar } from '../../../../contracts/annotations';
import { FOLLOW_LOW_CONFIDENCE } from '../../../../contracts/annotations';
import type { Direction, Side } from '../../../../contracts/assessment';
import type { FrameCache } from '../frame-cache';
import type { LandmarkRef } from '../hit-test';
import { drawOverlay } from '../kinematics-adapter';
import { Size, ViewTransform, frameFractionToViewFraction } from '../view-transform';

/** Marker radius on screen, CSS px (constant at any zoom). */
export const MARKER_PX = 6;
const FONT = '"Source Sans 3", sans-serif';
/** Id of the gauge being placed, drawn like a gauge while its last point follows the pointer. */
const DRAFT_GAUGE_ID = 'draft';

/** Everything one paint needs, read from the store and the viewer. */
export interface PaintInput {
  view: ViewTransform;
  /** The canvas box, CSS px. */
  viewSize: Size;
  /** The canvas's backing store, device px: exactly `viewSize × ratio` (see canvas-pixels.ts). */
  backing: Size;
  /** Device pixels per CSS pixel. */
  ratio: number;
  frameSize: Size;
  frame: number;
  cache: FrameCache | null;
  /** Landmark rows of this frame. */
  rows: FrameLandmarks[];
  nearSide: Side;
  direction: Direction;
  showAngles: boolean;
  selected: LandmarkRef | null;
  scale: ScaleBar | null;
  /** Whether the scale tool is on (the bar shows on every frame then). */
  scaleTool: boolean;
  scaleDraft: { a: FramePoint; b: FramePoint } | null;
  /** This frame's gauges. */
  gauges: AngleGauge[];
  selectedGauge: string | null;
  /** Points of a gauge being placed (arm end, vertex). */
  gaugeDraft: FramePoint[];
  /** The pointer while a gauge is being placed. */
  hover: FramePoint | null;
}

/** Paints the frame, overlay and drafts onto `canvas`, one backing pixel a device pixel. */
export function paintFrame(canvas: HTMLCanvasElement, s: PaintInput): void {
  const ctx = canvas.getContext('2d');
  const size = s.viewSize;
  if (!ctx || size.width <= 0 || size.height <= 0 || s.backing.width <= 0 || s.backing.height <= 0) return;
  const dpr = s.ratio;
  const w = s.backing.width;
  const h = s.backing.height;
  if (canvas.width !== w || canvas.height !== h) {
    canvas.width = w;
    canvas.height = h;
  }
  ctx.setTransform(1, 0, 0, 1, 0, 0);
  ctx.fillStyle = '#1e2422';
  ctx.fillRect(0, 0, w, h);

  const frame = s.frameSize;
  if (frame.width <= 0) return;
  const t = s.view;
  const exact = s.cache?.get(s.frame) ?? null;
  const shown = exact ?? s.cache?.nearest(s.frame)?.bitmap ?? null;
  const frameSpace = () => ctx.setTransform(dpr * t.scale, 0, 0, dpr * t.scale, dpr * t.tx, dpr * t.ty);

  frameSpace();
  ctx.imageSmoothingEnabled = t.scale < 3;
  if (shown) {
    ctx.drawImage(shown, 0, 0, frame.width, frame.height);
    if (!exact) {
      ctx.fillStyle = 'rgba(20, 24, 23, 0.45)';
      ctx.fillRect(0, 0, frame.width, frame.height);
    }
  } else {
    ctx.fillStyle = '#2b3230';
    ctx.fillRect(0, 0, frame.width, frame.height);
  }

  // The overlay is drawn in view space (the view standing in for the frame), so markers, lines
  // and labels keep their size on screen at any zoom; see frameFractionToViewFraction.
  ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
  const toView = (p: FramePoint) => frameFractionToViewFraction(t, frame, size, p);
  const showScale = s.scale && (s.scaleTool || s.scale.frame === s.frame) ? s.scale : null;
  const [first, vertex] = s.gaugeDraft;
  const gauges =
    first && vertex && s.hover ? [...s.gauges, { id: DRAFT_GAUGE_ID, frame: s.frame, a: first, vertex, b: s.hover }] : s.gauges;
  drawOverlay(ctx, {
    frameSize: size,
    landmarks: s.rows.map((row) => ({
      ...row,
      points: Object.fromEntries(Object.entries(row.points).map(([name, p]) => [name, toView(p)])),
    })),
    nearSide: s.nearSide,
    direction: s.direction,
    showAngles: s.showAngles,
    selected: s.selected,
    scale: showScale ? { ...showScale, a: toView(showScale.a), b: toView(showScale.b) } : null,
    gauges: gauges.map((g) => ({ ...g, a: toView(g.a), vertex: toView(g.vertex), b: toView(g.b) })),
    selectedGauge: s.selectedGauge ?? DRAFT_GAUGE_ID,
    fontFamily: FONT,
    markerRadiusPx: MARKER_PX,
  });
  drawFollowedRings(ctx, s.rows, (p) => {
    const v = toView(p);
    return { x: v.x * size.width, y: v.y * size.height };
  });

  if (first && !(vertex && s.hover)) {
    // A gauge being placed: its first arm so far (it becomes a gauge once the vertex is down).
    frameSpace();
    drawDraftLine(ctx, first, vertex ?? s.hover ?? first, frame, t.scale);
  }
  if (s.scaleDraft) {
    frameSpace();
    drawDraftLine(ctx, s.scaleDraft.a, s.scaleDraft.b, frame, t.scale);
  }
}

/**
 * Followed points apart from placed ones, in view pixels: a dashed white ring around each, amber
 * and thicker when its confidence is low (the coach should check it).
 */
function drawFollowedRings(ctx: CanvasRenderingContext2D, rows: FrameLandmarks[], toViewPx: (p: FramePoint) => FramePoint): void {
  ctx.save();
  ctx.setLineDash([3, 3]);
  for (const row of rows) {
    for (const p of Object.values(row.points)) {
      if (p?.origin !== 'followed') continue;
      const low = (p.confidence ?? 0) < FOLLOW_LOW_CONFIDENCE;
      const v = toViewPx(p);
      ctx.beginPath();
      ctx.arc(v.x, v.y, MARKER_PX + 4, 0, Math.PI * 2);
      ctx.lineWidth = low ? 3 : 1.5;
      ctx.strokeStyle = low ? '#ffb000' : '#ffffff';
      ctx.stroke();
    }
  }
  ctx.restore();
}

/** A dashed white line with end handles, in frame pixels (sizes divided by the zoom). */
function drawDraftLine(ctx: CanvasRenderingContext2D, a: FramePoint, b: FramePoint, frame: Size, scale: number): void {
  const ax = a.x * frame.width;
  const ay = a.y * frame.height;
  const bx = b.x * frame.width;
  const by = b.y * frame.height;
  ctx.save();
  ctx.lineWidth = 4 / scale;
  ctx.strokeStyle = 'rgba(0, 0, 0, 0.6)';
  ctx.beginPath();
  ctx.moveTo(ax, ay);
  ctx.lineTo(bx, by);
  ctx.stroke();
  ctx.lineWidth = 2 / scale;
  ctx.strokeStyle = '#ffffff';
  ctx.setLineDash([8 / scale, 5 / scale]);
  ctx.stroke();
  ctx.setLineDash([]);
  for (const [x, y] of [
    [ax, ay],
    [bx, by],
  ]) {
    ctx.beginPath();
    ctx.arc(x, y, MARKER_PX / scale, 0, Math.PI * 2);
    ctx.fillStyle = '#ffffff';
    ctx.fill();
    ctx.lineWidth = 2 / scale;
    ctx.strokeStyle = '#1f5f4a';
    ctx.stroke();
  }
  ctx.restore();
}
