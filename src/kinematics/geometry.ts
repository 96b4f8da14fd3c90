/**
 * Sagittal-plane coordinates. Pure: no Angular, no Node.
 *
 * Landmarks are stored as fractions of the frame (0–1, origin top-left, y down). Angles are
 * computed in a y-up plane whose +x is the running direction, so a clip of a runner going left
 * gives the same signed angles as one going right.
 */

import type { FramePoint, ScaleBar } from '../contracts/annotations';
import type { Direction } from '../contracts/assessment';

/** A point in the y-up sagittal plane, +x = running direction (any length unit). */
export interface Point {
  x: number;
  y: number;
}

/** A landmark as stored: fractions of frame width and height, origin top-left, y down. */
export interface ImagePoint {
  x: number;
  y: number;
}

/** Which way the runner moves across the image. */
export type Facing = 'left' | 'right';

/** Frame size in pixels (to undo the 0–1 normalisation without distorting angles). */
export interface FrameSize {
  width: number;
  height: number;
}

/**
 * Normalised image point → y-up plane in pixels with +x the running direction. A runner facing
 * left has x mirrored, so signed angles keep their meaning (flexion +, forward lean +).
 */
export function toSagittal(p: ImagePoint, frame: FrameSize, facing: Facing): Point {
  const x = p.x * frame.width;
  return { x: facing === 'right' ? x : -x, y: -p.y * frame.height };
}

/** Pixel point (origin top-left, y down) → y-up plane with +x the running direction. */
export function pixelToSagittal(p: Point, facing: Facing): Point {
  return { x: facing === 'right' ? p.x : -p.x, y: -p.y };
}

/** Degrees from radians. */
export const toDeg = (rad: number): number => (rad * 180) / Math.PI;
/** Radians from degrees. */
export const toRad = (deg: number): number => (deg * Math.PI) / 180;

// ─── Typed plane points, frame → plane conversion, scale ─────────────────────────────────────
//
// Two coordinate spaces must never mix:
// - image fractions (`FramePoint` from contracts, also `ImagePoint` above): 0–1 of frame width and
//   height, origin top-left, y DOWN, in the clip's own left/right orientation;
// - the sagittal plane (`PlanePoint`): y UP, +x = running direction (a right-to-left clip is
//   mirrored), in pixels ('px', aspect-correct, enough for angles) or metres ('m', needs a scale).
// `PlanePoint` carries a compile-time brand (no runtime cost) that a `FramePoint` cannot have, and
// its unit is part of the type, so metres and pixels cannot be confused either. `Point` stays the
// structural y-up type the angle functions accept (a `PlanePoint` is a `Point`).

/** Length unit of a plane point: frame pixels (unit-less scale, fine for angles) or metres. */
export type PlaneUnit = 'px' | 'm';

declare const planeBrand: unique symbol;

/**
 * A point in the y-up sagittal plane, +x = running direction, in unit `U`. Only the conversion
 * functions below make one (the brand is a type-level tag; nothing is stored at run time).
 */
export type PlanePoint<U extends PlaneUnit = PlaneUnit> = Point & { readonly [planeBrand]: U };

/** How a clip's image fractions map to the plane. */
export interface PlaneFrame {
  /** Working frame size in pixels (the size the coach marked on). */
  frameSize: FrameSize;
  /** Running direction in the image; right-to-left clips are mirrored so +x = running direction. */
  direction: Direction;
  /**
   * Pixel aspect ratio (width of a pixel ÷ its height). Extracted frames have square pixels, so
   * the default 1 is right for Trailframe frames; other values undo anamorphic storage.
   */
  pixelAspect?: number;
}

/** `'left_to_right'` → `'right'`, `'right_to_left'` → `'left'` (the older {@link Facing} words). */
export function facingOf(direction: Direction): Facing {
  return direction === 'left_to_right' ? 'right' : 'left';
}

/** +1 when the runner moves to the image's right, −1 when to its left. */
export function directionSign(direction: Direction): 1 | -1 {
  return direction === 'left_to_right' ? 1 : -1;
}

/**
 * Image fraction → plane pixels: x·width (times pixel aspect), y·height, y flipped to point up,
 * x mirrored for a right-to-left clip. The same mapping as {@link toSagittal}, typed.
 */
export function toPlanePx(p: FramePoint, f: PlaneFrame): PlanePoint<'px'> {
  const s = planeScale(f);
  return { x: p.x * s.x, y: p.y * s.y } as PlanePoint<'px'>;
}

/**
 * Factors that take an image fraction to plane pixels: x · (±width · pixel aspect, − when running
 * right to left), y · (−height). Hoist it out of loops that convert many points.
 */
export function planeScale(f: PlaneFrame): { x: number; y: number } {
  return { x: directionSign(f.direction) * f.frameSize.width * (f.pixelAspect ?? 1), y: -f.frameSize.height };
}

/** Plane pixels → plane metres with a metres-per-pixel factor (see {@link metresPerPixel}). */
export function pxToMetres(p: PlanePoint<'px'>, metresPerPx: number): PlanePoint<'m'> {
  return { x: p.x * metresPerPx, y: p.y * metresPerPx } as PlanePoint<'m'>;
}

/** Image fraction → plane metres (frame → px → m). */
export function toPlaneMetres(p: FramePoint, f: PlaneFrame, metresPerPx: number): PlanePoint<'m'> {
  return pxToMetres(toPlanePx(p, f), metresPerPx);
}

/** Plane pixels → image fraction (inverse of {@link toPlanePx}); for drawing computed points. */
export function planePxToFrame(p: PlanePoint<'px'>, f: PlaneFrame): FramePoint {
  const s = planeScale(f);
  return { x: p.x / s.x, y: p.y / s.y };
}

/** Image fraction → frame pixel (origin top-left, y down, not mirrored): where to draw it. */
export function frameToPixel(p: FramePoint, frameSize: FrameSize): Point {
  return { x: p.x * frameSize.width, y: p.y * frameSize.height };
}

/** Distance between two plane points, in their unit. */
export function planeDistance<U extends PlaneUnit>(a: PlanePoint<U>, b: PlanePoint<NoInfer<U>>): number {
  return Math.hypot(b.x - a.x, b.y - a.y);
}

/** Length of a scale bar in (aspect-correct) pixels of the given frame. */
export function scaleBarPixelLength(scale: ScaleBar, frameSize: FrameSize, pixelAspect = 1): number {
  return Math.hypot((scale.b.x - scale.a.x) * frameSize.width * pixelAspect, (scale.b.y - scale.a.y) * frameSize.height);
}

/**
 * Metres per pixel from a scale bar: lengthM ÷ pixel length (REFERENCES.md: 1 m over 400 px →
 * 0.0025 m/px). Null when there is no bar, or it is degenerate (zero pixels, non-positive length).
 */
export function metresPerPixel(scale: ScaleBar | null | undefined, frameSize: FrameSize, pixelAspect = 1): number | null {
  if (!scale) return null;
  const px = scaleBarPixelLength(scale, frameSize, pixelAspect);
  if (!(px > 0) || !(scale.lengthM > 0) || !Number.isFinite(px) || !Number.isFinite(scale.lengthM)) return null;
  // A bar a hair long (e.g. 1e-320 px) would give Infinity metres per pixel: no usable scale.
  const mpp = scale.lengthM / px;
  return Number.isFinite(mpp) ? mpp : null;
}

/**
 * Out-of-plane magnification D/(D − Δ): a point Δ metres nearer the camera than the calibrated
 * plane, at camera distance D, looks this many times larger (REFERENCES.md [calc]: 0.15 m at 5 m →
 * 1.031, i.e. 3.1 %; at 2 m → 1.081). Positive Δ = nearer the camera. NaN when Δ ≥ D.
 */
export function outOfPlaneFactor(cameraDistanceM: number, offPlaneM: number): number {
  return cameraDistanceM > offPlaneM ? cameraDistanceM / (cameraDistanceM - offPlaneM) : NaN;
}

/** Whether every coordinate of a point is a finite number. */
export function isFinitePoint(p: { x: number; y: number } | null | undefined): p is { x: number; y: number } {
  return !!p && Number.isFinite(p.x) && Number.isFinite(p.y);
}
