/**
 * Overlay drawing on any Canvas-2D-like context: the browser's canvas and @napi-rs/canvas on the
 * server call the same code, so a shared still shows exactly what the coach saw. Pure: it only
 * calls the methods of {@link Canvas2DLike}; no DOM or Node types.
 *
 * Everything is drawn in FRAME PIXEL coordinates (origin top-left, y down, the clip's own
 * left/right orientation): the caller sets any zoom/pan transform first. Angle numbers come from
 * the same conversion and angle functions as the measures (image fractions → y-up plane with +x
 * the running direction → signed angles), so a label at an event frame equals that step's value
 * in the measures, rounded to one decimal.
 */
import type { AngleGauge, FrameLandmarks, LandmarkName, ScaleBar } from '../contracts/annotations';
import type { Direction, Side } from '../contracts/assessment';
import type { PoseAngles } from './angles';
import { frameToPixel, isFinitePoint, type Point } from './geometry';
import { drawGauges, gaugeLayout, type OverlayGauge } from './overlay-gauges';
import { frameAngles } from './pose';
import { formatNumber } from './format';
import { separateLabels } from './overlay-labels';
import { round1 } from './stats';

/** The subset of CanvasRenderingContext2D the overlay uses (the browser's and @napi-rs/canvas fit). */
export interface Canvas2DLike {
  save(): void;
  restore(): void;
  beginPath(): void;
  moveTo(x: number, y: number): void;
  lineTo(x: number, y: number): void;
  arc(x: number, y: number, radius: number, startAngle: number, endAngle: number, counterclockwise?: boolean): void;
  stroke(): void;
  fill(): void;
  fillText(text: string, x: number, y: number, maxWidth?: number): void;
  strokeText(text: string, x: number, y: number, maxWidth?: number): void;
  setLineDash(segments: number[]): void;
  /** Only strings are assigned; gradients/patterns of real contexts are why the type is wider. */
  strokeStyle: string | object;
  fillStyle: string | object;
  lineWidth: number;
  lineCap: 'butt' | 'round' | 'square';
  lineJoin: 'bevel' | 'miter' | 'round';
  font: string;
  textAlign: 'start' | 'end' | 'left' | 'right' | 'center';
  textBaseline: 'top' | 'hanging' | 'middle' | 'alphabetic' | 'ideographic' | 'bottom';
  globalAlpha: number;
}

/** What to draw on one frame. */
export interface OverlayOptions {
  /** Working frame size in pixels (the coordinate system drawn in). */
  frameSize: { width: number; height: number };
  /** Landmarks of the frame being drawn, one entry per side. */
  landmarks: FrameLandmarks[];
  /** The limb nearer the camera: drawn on top, full strength; the far side lighter and thinner. */
  nearSide: Side;
  /** Running direction, for signed angles (+x = running direction). */
  direction: Direction;
  /** Draw angle arcs and degree labels (hip = thigh from vertical, knee flexion, ankle). */
  showAngles: boolean;
  /** The landmark being edited, highlighted. */
  selected?: { side: Side; landmark: LandmarkName } | null;
  /** Scale bar to draw with its length label. */
  scale?: ScaleBar | null;
  /** CSS font family of labels; default `"Source Sans 3", sans-serif`. */
  fontFamily?: string;
  /** Marker radius, px; default scales with the frame (about 0.6 % of its shorter side, ≥ 3). */
  markerRadiusPx?: number;
  /** Which sides get angle arcs: the near side only (default, uncluttered) or both. */
  angleSides?: 'near' | 'both';
  /**
   * View pixels per frame pixel (the canvas's displayed width ÷ the frame's width). When set,
   * labels, markers and lines are sized in VIEW pixels — labels {@link VIEW_LABEL_PX} px, never
   * under {@link MIN_VIEW_LABEL_PX} — so a frame shown small (side by side, on a phone) keeps
   * readable labels. Without it sizes follow the frame (stills, the review at 100 %).
   */
  viewScale?: number;
  /** Angle gauges of the frame being drawn (drawn whether or not `showAngles`). */
  gauges?: readonly AngleGauge[];
  /** The gauge being edited, highlighted. */
  selectedGauge?: string | null;
}

/** Label size in view pixels when `viewScale` is given. */
export const VIEW_LABEL_PX = 13;
/** The smallest label size, in view pixels, the overlay draws when `viewScale` is given. */
export const MIN_VIEW_LABEL_PX = 12;

/** Marker radius, label font and line width in frame pixels for one frame and view. */
export function overlaySizes(
  frameSize: { width: number; height: number },
  viewScale?: number,
  markerRadiusPx?: number,
): { markerRadius: number; fontPx: number; lineWidth: number; arcRadius: number } {
  const minDim = Math.max(1, Math.min(frameSize.width, frameSize.height));
  if (viewScale !== undefined && Number.isFinite(viewScale) && viewScale > 0) {
    const px = (view: number) => view / viewScale;
    return {
      markerRadius: markerRadiusPx ?? px(4.5),
      fontPx: px(Math.max(MIN_VIEW_LABEL_PX, VIEW_LABEL_PX)),
      lineWidth: px(2.5),
      arcRadius: Math.max(px(18), minDim * 0.05),
    };
  }
  return {
    markerRadius: markerRadiusPx ?? Math.max(3, Math.round(minDim * 0.006 * 10) / 10),
    fontPx: Math.max(11, Math.round(minDim * 0.026)),
    lineWidth: Math.max(1.5, Math.round(minDim * 0.0035 * 10) / 10),
    arcRadius: Math.max(16, minDim * 0.05),
  };
}

/** Colours (DESIGN.md): left limb violet, right limb amber, trunk slate. */
export const OVERLAY_COLOURS = {
  left: '#7B4FD6',
  right: '#E08A1E',
  trunk: '#3E4C59',
  /** Marker outline. */
  outline: '#FFFFFF',
  /** Dark halo behind label text. */
  halo: 'rgba(20, 24, 28, 0.85)',
  /** Under-stroke that keeps lines visible on light backgrounds. */
  shadow: 'rgba(20, 24, 28, 0.55)',
  /** Selected-landmark ring. */
  selected: '#FFFFFF',
  scale: '#FFFFFF',
  /** Label text. */
  text: '#FFFFFF',
} as const;

/** Opacity of the far side. */
export const FAR_SIDE_ALPHA = 0.5;
/** Line-width factor of the far side. */
export const FAR_SIDE_WIDTH = 0.6;
/** Default label font family. */
export const DEFAULT_OVERLAY_FONT = '"Source Sans 3", sans-serif';

/** Segments drawn per side: trunk, then the limb chain shoulder–hip–knee–ankle–heel–toe–ankle. */
export const OVERLAY_SEGMENTS: readonly { from: LandmarkName; to: LandmarkName; trunk: boolean }[] = [
  { from: 'shoulder', to: 'hip', trunk: true },
  { from: 'hip', to: 'knee', trunk: false },
  { from: 'knee', to: 'ankle', trunk: false },
  { from: 'ankle', to: 'heel', trunk: false },
  { from: 'heel', to: 'toe', trunk: false },
  { from: 'toe', to: 'ankle', trunk: false },
];

/** A joint that carries an angle arc. */
export type OverlayJoint = 'hip' | 'knee' | 'ankle';

/** One marker, px. */
export interface OverlayMarker {
  side: Side;
  landmark: LandmarkName;
  x: number;
  y: number;
  radius: number;
  near: boolean;
  selected: boolean;
}

/** One segment, px. */
export interface OverlaySegment {
  side: Side;
  from: LandmarkName;
  to: LandmarkName;
  x1: number;
  y1: number;
  x2: number;
  y2: number;
  colour: string;
  near: boolean;
}

/** One angle arc and its label, px; angles of the arc in canvas radians (clockwise, y down). */
export interface OverlayAngle {
  side: Side;
  joint: OverlayJoint;
  /** The angle the label shows, degrees: hip = thigh angle (+ flexion), knee = flexion, ankle = + dorsiflexion. */
  valueDeg: number;
  text: string;
  /** Label anchor, px (vertically centred; `align` says which end of the text is at the anchor). */
  x: number;
  y: number;
  align: 'left' | 'right' | 'center';
  arc: { cx: number; cy: number; radius: number; start: number; end: number; counterclockwise: boolean };
  /** Dashed reference ray the angle is measured from (hip: vertical; knee: thigh extended; ankle: foot direction). */
  ray: { x1: number; y1: number; x2: number; y2: number };
  near: boolean;
}

/**
 * A label sits this far (radians) outside its arc's reference ray, on the side away from the
 * measured segment, so it does not cover the limb.
 */
export const LABEL_OFFSET_RAD = 0.35;

/** Where everything goes on one frame, px — pure, for tests and hit-testing. */
export interface OverlayLayout {
  markers: OverlayMarker[];
  segments: OverlaySegment[];
  angles: OverlayAngle[];
  scaleBar: { x1: number; y1: number; x2: number; y2: number; tick: number; text: string; x: number; y: number } | null;
  gauges: OverlayGauge[];
  style: { fontPx: number; font: string; lineWidth: number; markerRadius: number };
}

/**
 * Label text of an angle: hip "26.6° flex" / "22.5° ext" (thigh from vertical), knee "12.5°"
 * (flexion; "−2.0°" for hyperextension), ankle "0.7° DF" / "3.2° PF". The number is the angle
 * rounded to one decimal by the one rule of `formatNumber` (half away from zero on the decimal
 * text), so it equals the rounded measure in the panel, the comparison and the PDF.
 */
export function formatAngleLabel(joint: OverlayJoint, deg: number): string {
  const r = round1(deg);
  const abs = formatNumber(Math.abs(r), 1);
  if (joint === 'knee') return `${r < 0 ? '−' : ''}${abs}°`;
  if (r === 0) return `${abs}°`;
  if (joint === 'hip') return `${abs}° ${r > 0 ? 'flex' : 'ext'}`;
  return `${abs}° ${r > 0 ? 'DF' : 'PF'}`;
}

const sub = (a: Point, b: Point): Point => ({ x: a.x - b.x, y: a.y - b.y });
const wrapPi = (a: number) => {
  let w = a;
  while (w <= -Math.PI) w += 2 * Math.PI;
  while (w > Math.PI) w -= 2 * Math.PI;
  return w;
};

/**
 * Arc from direction u to direction v (screen vectors) the short way. The label goes just outside
 * ray u on the side away from v, aligned to extend away from the limb; the dashed reference ray
 * runs along u or v (`rayFrom`).
 */
function arcBetween(c: Point, u: Point, v: Point, radius: number, labelGap: number, rayLength: number, rayFrom: 'u' | 'v') {
  const start = Math.atan2(u.y, u.x);
  const delta = wrapPi(Math.atan2(v.y, v.x) - start);
  const end = start + delta;
  const away = delta >= 0 ? -1 : 1;
  const dir = start + away * LABEL_OFFSET_RAD;
  const cos = Math.cos(dir);
  const rayDir = rayFrom === 'u' ? start : end;
  return {
    arc: { cx: c.x, cy: c.y, radius, start, end, counterclockwise: delta < 0 },
    x: c.x + cos * (radius + labelGap),
    y: c.y + Math.sin(dir) * (radius + labelGap),
    align: (cos > 0.2 ? 'left' : cos < -0.2 ? 'right' : 'center') as OverlayAngle['align'],
    ray: { x1: c.x, y1: c.y, x2: c.x + Math.cos(rayDir) * rayLength, y2: c.y + Math.sin(rayDir) * rayLength },
  };
}

/**
 * Positions of every marker, segment, angle label and the scale bar on one frame, px. Pure: the
 * same layout {@link drawOverlay} draws, so tests can check positions without pixels.
 */
export function overlayLabelPositions(opts: OverlayOptions): OverlayLayout {
  const { frameSize } = opts;
  const { markerRadius, fontPx, lineWidth, arcRadius } = overlaySizes(frameSize, opts.viewScale, opts.markerRadiusPx);
  const font = `600 ${fontPx}px ${opts.fontFamily ?? DEFAULT_OVERLAY_FONT}`;

  const bySide: Partial<Record<Side, Partial<Record<LandmarkName, Point>>>> = {};
  for (const e of opts.landmarks) {
    if (e.side !== 'left' && e.side !== 'right') continue;
    const px: Partial<Record<LandmarkName, Point>> = {};
    for (const [name, p] of Object.entries(e.points ?? {}) as [LandmarkName, Point | undefined][])
      if (isFinitePoint(p)) px[name] = frameToPixel(p, frameSize);
    bySide[e.side] = px;
  }
  const angles: Partial<Record<Side, PoseAngles>> = opts.showAngles
    ? frameAngles(opts.landmarks, { frameSize, direction: opts.direction })
    : {};

  const far: Side = opts.nearSide === 'left' ? 'right' : 'left';
  const markers: OverlayMarker[] = [];
  const segments: OverlaySegment[] = [];
  const arcs: OverlayAngle[] = [];
  for (const side of [far, opts.nearSide]) {
    const pts = bySide[side];
    if (!pts) continue;
    const near = side === opts.nearSide;
    for (const s of OVERLAY_SEGMENTS) {
      const a = pts[s.from];
      const b = pts[s.to];
      if (a && b)
        segments.push({
          side,
          from: s.from,
          to: s.to,
          x1: a.x,
          y1: a.y,
          x2: b.x,
          y2: b.y,
          colour: s.trunk ? OVERLAY_COLOURS.trunk : OVERLAY_COLOURS[side],
          near,
        });
    }
    for (const [landmark, p] of Object.entries(pts) as [LandmarkName, Point][]) {
      const selected = !!opts.selected && opts.selected.side === side && opts.selected.landmark === landmark;
      markers.push({ side, landmark, x: p.x, y: p.y, radius: near ? markerRadius : markerRadius * 0.8, near, selected });
    }
    const ang = angles[side];
    if (!ang || (!near && (opts.angleSides ?? 'near') === 'near')) continue;
    const r = arcRadius;
    const gap = fontPx * 0.4;
    const { hip, knee, ankle, heel, toe } = pts;
    if (ang.thighDeg !== undefined && hip && knee) {
      const g = arcBetween(hip, { x: 0, y: 1 }, sub(knee, hip), r, gap, r * 1.5, 'u');
      arcs.push({ side, joint: 'hip', valueDeg: ang.thighDeg, text: formatAngleLabel('hip', ang.thighDeg), ...g, near });
    }
    if (ang.kneeFlexionDeg !== undefined && hip && knee && ankle) {
      const g = arcBetween(knee, sub(knee, hip), sub(ankle, knee), r * 0.85, gap, r * 1.3, 'u');
      arcs.push({ side, joint: 'knee', valueDeg: ang.kneeFlexionDeg, text: formatAngleLabel('knee', ang.kneeFlexionDeg), ...g, near });
    }
    if (ang.ankleDeg !== undefined && knee && ankle && heel && toe) {
      const g = arcBetween(ankle, sub(knee, ankle), sub(toe, heel), r * 0.7, gap, r * 1.1, 'v');
      arcs.push({ side, joint: 'ankle', valueDeg: ang.ankleDeg, text: formatAngleLabel('ankle', ang.ankleDeg), ...g, near });
    }
  }

  let scaleBar: OverlayLayout['scaleBar'] = null;
  const sc = opts.scale;
  if (sc && isFinitePoint(sc.a) && isFinitePoint(sc.b) && Number.isFinite(sc.lengthM)) {
    const a = frameToPixel(sc.a, frameSize);
    const b = frameToPixel(sc.b, frameSize);
    const len = Math.hypot(b.x - a.x, b.y - a.y) || 1;
    // Unit normal pointing up the screen (or left for a vertical bar): the label sits there.
    let nx = -(b.y - a.y) / len;
    let ny = (b.x - a.x) / len;
    if (ny > 0 || (ny === 0 && nx > 0)) {
      nx = -nx;
      ny = -ny;
    }
    const off = fontPx * 0.9;
    scaleBar = {
      x1: a.x,
      y1: a.y,
      x2: b.x,
      y2: b.y,
      tick: fontPx * 0.4,
      text: `${sc.lengthM.toFixed(2)} m`,
      x: (a.x + b.x) / 2 + nx * off,
      y: (a.y + b.y) / 2 + ny * off,
    };
  }
  const gauges = gaugeLayout(opts.gauges ?? [], frameSize, fontPx, opts.selectedGauge ?? null);
  return { markers, segments, angles: separateLabels(arcs, fontPx), scaleBar, gauges, style: { fontPx, font, lineWidth, markerRadius } };
}

function line(ctx: Canvas2DLike, x1: number, y1: number, x2: number, y2: number): void {
  ctx.beginPath();
  ctx.moveTo(x1, y1);
  ctx.lineTo(x2, y2);
  ctx.stroke();
}

/** Light text on a dark halo: legible on any video frame. */
function label(ctx: Canvas2DLike, text: string, x: number, y: number, align: OverlayAngle['align'], halo: number): void {
  ctx.textAlign = align;
  ctx.lineWidth = halo;
  ctx.strokeStyle = OVERLAY_COLOURS.halo;
  ctx.strokeText(text, x, y);
  ctx.fillStyle = OVERLAY_COLOURS.text;
  ctx.fillText(text, x, y);
}

/**
 * Draws markers (circles with a contrasting outline), segments (trunk slate; limbs violet left,
 * amber right; far side lighter and thinner), the selected-landmark highlight, angle arcs with
 * degree labels, the scale bar with its length and the angle gauges with their values — in frame
 * pixels on any {@link Canvas2DLike}. Leaves the context's state as it found it (save/restore).
 */
export function drawOverlay(ctx: Canvas2DLike, opts: OverlayOptions): void {
  const L = overlayLabelPositions(opts);
  const { lineWidth, font, fontPx } = L.style;
  ctx.save();
  ctx.setLineDash([]);
  ctx.lineCap = 'round';
  ctx.lineJoin = 'round';
  ctx.font = font;
  ctx.textAlign = 'center';
  ctx.textBaseline = 'middle';

  // 1. Segments, far side first (lighter, thinner).
  for (const near of [false, true]) {
    ctx.globalAlpha = near ? 1 : FAR_SIDE_ALPHA;
    const w = near ? lineWidth : lineWidth * FAR_SIDE_WIDTH;
    for (const s of L.segments.filter((x) => x.near === near)) {
      ctx.strokeStyle = OVERLAY_COLOURS.shadow;
      ctx.lineWidth = w + 2;
      line(ctx, s.x1, s.y1, s.x2, s.y2);
      ctx.strokeStyle = s.colour;
      ctx.lineWidth = w;
      line(ctx, s.x1, s.y1, s.x2, s.y2);
    }
  }

  // 2. Angle reference rays and arcs (under the markers, which the coach drags).
  for (const a of L.angles) {
    ctx.globalAlpha = a.near ? 1 : FAR_SIDE_ALPHA;
    ctx.setLineDash([lineWidth * 2, lineWidth * 2]);
    ctx.strokeStyle = OVERLAY_COLOURS.outline;
    ctx.lineWidth = Math.max(1, lineWidth * 0.5);
    line(ctx, a.ray.x1, a.ray.y1, a.ray.x2, a.ray.y2);
    ctx.setLineDash([]);
    for (const [style, width] of [
      [OVERLAY_COLOURS.shadow, lineWidth + 2],
      [OVERLAY_COLOURS[a.side], lineWidth],
    ] as const) {
      ctx.strokeStyle = style;
      ctx.lineWidth = width;
      ctx.beginPath();
      ctx.arc(a.arc.cx, a.arc.cy, a.arc.radius, a.arc.start, a.arc.end, a.arc.counterclockwise);
      ctx.stroke();
    }
  }

  // 3. Markers, far side first, then the selection ring.
  for (const near of [false, true]) {
    ctx.globalAlpha = near ? 1 : FAR_SIDE_ALPHA;
    for (const m of L.markers.filter((x) => x.near === near)) {
      ctx.beginPath();
      ctx.arc(m.x, m.y, m.radius, 0, Math.PI * 2);
      ctx.fillStyle = OVERLAY_COLOURS[m.side];
      ctx.fill();
      ctx.strokeStyle = OVERLAY_COLOURS.outline;
      ctx.lineWidth = Math.max(1, m.radius * 0.35);
      ctx.stroke();
    }
  }
  ctx.globalAlpha = 1;
  const sel = L.markers.find((m) => m.selected);
  if (sel) {
    for (const [style, width] of [
      [OVERLAY_COLOURS.shadow, 4],
      [OVERLAY_COLOURS.selected, 2],
    ] as const) {
      ctx.beginPath();
      ctx.arc(sel.x, sel.y, sel.radius + 4, 0, Math.PI * 2);
      ctx.strokeStyle = style;
      ctx.lineWidth = width;
      ctx.stroke();
    }
  }

  // 4. Angle labels on top.
  for (const a of L.angles) {
    ctx.globalAlpha = a.near ? 1 : FAR_SIDE_ALPHA;
    label(ctx, a.text, a.x, a.y, a.align, Math.max(2, fontPx * 0.25));
  }

  // 5. Scale bar with its length.
  ctx.globalAlpha = 1;
  const sb = L.scaleBar;
  if (sb) {
    const len = Math.hypot(sb.x2 - sb.x1, sb.y2 - sb.y1) || 1;
    const nx = (-(sb.y2 - sb.y1) / len) * sb.tick;
    const ny = ((sb.x2 - sb.x1) / len) * sb.tick;
    for (const [colour, width] of [
      [OVERLAY_COLOURS.shadow, lineWidth + 2],
      [OVERLAY_COLOURS.scale, lineWidth],
    ] as const) {
      ctx.strokeStyle = colour;
      ctx.lineWidth = width;
      line(ctx, sb.x1, sb.y1, sb.x2, sb.y2);
      line(ctx, sb.x1 - nx, sb.y1 - ny, sb.x1 + nx, sb.y1 + ny);
      line(ctx, sb.x2 - nx, sb.y2 - ny, sb.x2 + nx, sb.y2 + ny);
    }
    label(ctx, sb.text, sb.x, sb.y, 'center', Math.max(2, fontPx * 0.25));
  }

  // 6. Angle gauges.
  drawGauges(ctx, L.gauges, L.style);
  ctx.restore();
}
