/**
 * Zoom and pan of the frame viewer. A transform maps frame pixels (origin top-left of the working
 * frame) to CSS pixels of the canvas: `screen = frame × scale + (tx, ty)`. Pure functions.
 */

/** Frame pixels → canvas CSS pixels. */
export interface ViewTransform {
  scale: number;
  tx: number;
  ty: number;
}

export interface Size {
  width: number;
  height: number;
}

export interface Vec {
  x: number;
  y: number;
}

/** How far the view may zoom, relative to "fit to view". */
export const ZOOM_RANGE = { minOfFit: 0.5, maxOfFit: 16 } as const;

/** The whole frame centred in the view, as large as it fits (with `padding` CSS px around it). */
export function fitTransform(frame: Size, view: Size, padding = 8): ViewTransform {
  if (frame.width <= 0 || frame.height <= 0 || view.width <= 0 || view.height <= 0) {
    return { scale: 1, tx: 0, ty: 0 };
  }
  const w = Math.max(1, view.width - 2 * padding);
  const h = Math.max(1, view.height - 2 * padding);
  const scale = Math.min(w / frame.width, h / frame.height);
  return {
    scale,
    tx: (view.width - frame.width * scale) / 2,
    ty: (view.height - frame.height * scale) / 2,
  };
}

/** Frame pixel → screen (canvas CSS) pixel. */
export function frameToScreen(t: ViewTransform, p: Vec): Vec {
  return { x: p.x * t.scale + t.tx, y: p.y * t.scale + t.ty };
}

/** Screen (canvas CSS) pixel → frame pixel. */
export function screenToFrame(t: ViewTransform, p: Vec): Vec {
  return { x: (p.x - t.tx) / t.scale, y: (p.y - t.ty) / t.scale };
}

/** Stored point (fractions of the frame) → screen pixel. */
export function fractionToScreen(t: ViewTransform, frame: Size, p: Vec): Vec {
  return frameToScreen(t, { x: p.x * frame.width, y: p.y * frame.height });
}

/** Screen pixel → stored point (fractions of the frame, not clamped). */
export function screenToFraction(t: ViewTransform, frame: Size, p: Vec): Vec {
  const f = screenToFrame(t, p);
  return { x: f.x / frame.width, y: f.y / frame.height };
}

/** Whether a stored point lies on the frame (0–1 both ways). */
export function isOnFrame(p: Vec): boolean {
  return p.x >= 0 && p.x <= 1 && p.y >= 0 && p.y <= 1;
}

/** Allowed absolute scales for a frame in a view. */
export function scaleLimits(frame: Size, view: Size): { min: number; max: number } {
  const fit = fitTransform(frame, view).scale;
  return { min: fit * ZOOM_RANGE.minOfFit, max: fit * ZOOM_RANGE.maxOfFit };
}

/**
 * Zooms by `factor` keeping the frame point under `anchor` (screen px) where it is. The scale is
 * kept inside `limits`.
 */
export function zoomAt(t: ViewTransform, factor: number, anchor: Vec, limits: { min: number; max: number }): ViewTransform {
  const scale = clamp(t.scale * factor, limits.min, limits.max);
  const k = scale / t.scale;
  return {
    scale,
    tx: anchor.x - (anchor.x - t.tx) * k,
    ty: anchor.y - (anchor.y - t.ty) * k,
  };
}

/** Moves the view by a screen distance. */
export function panBy(t: ViewTransform, dx: number, dy: number): ViewTransform {
  return { scale: t.scale, tx: t.tx + dx, ty: t.ty + dy };
}

/**
 * Keeps at least `keep` CSS px of the frame inside the view on each axis, so the frame can never
 * be panned out of sight.
 */
export function clampPan(t: ViewTransform, frame: Size, view: Size, keep = 48): ViewTransform {
  const w = frame.width * t.scale;
  const h = frame.height * t.scale;
  const kx = Math.min(keep, w, view.width);
  const ky = Math.min(keep, h, view.height);
  return {
    scale: t.scale,
    tx: clamp(t.tx, kx - w, view.width - kx),
    ty: clamp(t.ty, ky - h, view.height - ky),
  };
}

/**
 * Two-finger gesture: the transform that keeps both frame points under the fingers as well as a
 * similarity without rotation can (scale from the finger distance, translation from the midpoint).
 */
export function pinchTransform(
  start: ViewTransform,
  a0: Vec,
  b0: Vec,
  a1: Vec,
  b1: Vec,
  limits: { min: number; max: number },
): ViewTransform {
  const d0 = Math.hypot(b0.x - a0.x, b0.y - a0.y);
  const d1 = Math.hypot(b1.x - a1.x, b1.y - a1.y);
  const factor = d0 > 0 && d1 > 0 ? d1 / d0 : 1;
  const m0 = { x: (a0.x + b0.x) / 2, y: (a0.y + b0.y) / 2 };
  const m1 = { x: (a1.x + b1.x) / 2, y: (a1.y + b1.y) / 2 };
  const zoomed = zoomAt(start, factor, m0, limits);
  return panBy(zoomed, m1.x - m0.x, m1.y - m0.y);
}

/** Zoom factor of one wheel event (deltaY in pixels; negative = zoom in). */
export function wheelZoomFactor(deltaY: number, deltaMode = 0): number {
  const px = deltaMode === 1 ? deltaY * 16 : deltaMode === 2 ? deltaY * 400 : deltaY;
  return Math.exp(-clamp(px, -200, 200) * 0.0015);
}

/**
 * What a wheel turn over the frame does: zoom around the pointer with Ctrl or ⌘ held (a trackpad
 * pinch arrives as Ctrl + wheel too); anything else is left to the browser, so the page scrolls.
 */
export function wheelIntent(e: { ctrlKey: boolean; metaKey: boolean }): 'zoom' | 'scroll' {
  return e.ctrlKey || e.metaKey ? 'zoom' : 'scroll';
}

function clamp(v: number, lo: number, hi: number): number {
  return Math.min(hi, Math.max(lo, v));
}

/**
 * A stored point (fraction of the frame) as a fraction of the view instead. Drawing the overlay
 * with the view as its "frame" keeps markers, lines and labels the same size on screen at any
 * zoom; angles are unchanged because zoom and pan are a uniform scale plus a shift.
 */
export function frameFractionToViewFraction(t: ViewTransform, frame: Size, view: Size, p: Vec): Vec {
  const s = fractionToScreen(t, frame, p);
  return { x: s.x / view.width, y: s.y / view.height };
}
