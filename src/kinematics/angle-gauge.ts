/**
 * Angle gauge: any angle on a frame measured with three points (arm end, vertex, arm end), e.g.
 * pelvis tilt or arm carriage. Pure geometry: the unsigned included angle at the vertex, 0–180°.
 *
 * Points are stored like landmarks, as fractions of the frame (0–1, origin top-left, y down); the
 * angle is taken in frame pixels so a non-square frame does not distort it. An unsigned angle
 * needs no running direction and is the same with y up or y down (a reflection keeps it).
 */
import type { AngleGauge, FramePoint } from '../contracts/annotations';
import { frameToPixel, isFinitePoint, toDeg, type FrameSize, type Point } from './geometry';

/**
 * The included angle at `vertex` between the rays to `a` and `b`, degrees in [0, 180]. Uses
 * atan2(|cross|, dot), which stays accurate near 0° and 180° (acos does not). NaN when either arm
 * has no length or a coordinate is not finite.
 */
export function includedAngleDeg(a: Point, vertex: Point, b: Point): number {
  const ux = a.x - vertex.x;
  const uy = a.y - vertex.y;
  const vx = b.x - vertex.x;
  const vy = b.y - vertex.y;
  if (![ux, uy, vx, vy].every(Number.isFinite)) return NaN;
  if ((ux === 0 && uy === 0) || (vx === 0 && vy === 0)) return NaN;
  return toDeg(Math.atan2(Math.abs(ux * vy - uy * vx), ux * vx + uy * vy));
}

/** The gauge's angle in degrees (0–180), taken in the frame's pixels; NaN for a degenerate gauge. */
export function gaugeAngleDeg(g: Pick<AngleGauge, 'a' | 'vertex' | 'b'>, frameSize: FrameSize): number {
  if (!isFinitePoint(g.a) || !isFinitePoint(g.vertex) || !isFinitePoint(g.b)) return NaN;
  return includedAngleDeg(frameToPixel(g.a, frameSize), frameToPixel(g.vertex, frameSize), frameToPixel(g.b, frameSize));
}

/** Whether a gauge can show an angle: both arms have length on the frame. */
export function isUsableGauge(g: Pick<AngleGauge, 'a' | 'vertex' | 'b'>, frameSize: FrameSize): boolean {
  return Number.isFinite(gaugeAngleDeg(g, frameSize));
}

/** Which of a gauge's three points: the two arm ends and the vertex between them. */
export type GaugePointName = 'a' | 'vertex' | 'b';

/** The order the three clicks place a gauge's points: arm end, vertex (middle click), arm end. */
export const GAUGE_CLICK_ORDER: readonly GaugePointName[] = ['a', 'vertex', 'b'];

/**
 * A gauge from its clicked points in click order (arm end, vertex, arm end); null until all three
 * are there.
 */
export function gaugeFromClicks(id: string, frame: number, clicks: readonly FramePoint[]): AngleGauge | null {
  if (clicks.length < 3) return null;
  const [a, vertex, b] = clicks as [FramePoint, FramePoint, FramePoint];
  return { id, frame, a: { ...a }, vertex: { ...vertex }, b: { ...b } };
}
