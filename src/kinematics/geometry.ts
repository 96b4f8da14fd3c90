/**
 * Sagittal-plane coordinates. Pure: no Angular, no Node.
 *
 * Landmarks are stored as fractions of the frame (0–1, origin top-left, y down). Angles are
 * computed in a y-up plane whose +x is the running direction, so a clip of a runner going left
 * gives the same signed angles as one going right.
 */

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
