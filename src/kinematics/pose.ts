/**
 * Frame landmarks (image fractions) → typed plane poses → angles. Pure. The one place where the
 * measures and the overlay turn what the coach marked into numbers, so both show the same figure.
 */
import type { FrameLandmarks, FramePoint, LandmarkName } from '../contracts/annotations';
import type { Side } from '../contracts/assessment';
import { poseAngles, type PoseAngles, type SidePose, type TrunkPair } from './angles';
import { isFinitePoint, planeScale, type PlaneFrame, type PlanePoint } from './geometry';

/** The other side. */
export function otherSide(side: Side): Side {
  return side === 'left' ? 'right' : 'left';
}

/**
 * One side's marked points → plane pixels (y up, +x running direction), exactly as
 * {@link toPlanePx}. `f` is the plane frame or its precomputed {@link planeScale}. Points with a
 * non-finite coordinate are dropped (treated as unmarked) so they can never turn into NaN angles.
 */
export function sidePosePx(points: Partial<Record<LandmarkName, FramePoint>>, f: PlaneFrame | { x: number; y: number }): SidePose<'px'> {
  const s = 'frameSize' in f ? planeScale(f) : f;
  const pose: SidePose<'px'> = {};
  // Explicit reads (not a keyed loop): this runs for every marked frame of a clip.
  const { shoulder, hip, knee, ankle, heel, toe } = points;
  if (isFinitePoint(shoulder)) pose.shoulder = { x: shoulder.x * s.x, y: shoulder.y * s.y } as PlanePoint<'px'>;
  if (isFinitePoint(hip)) pose.hip = { x: hip.x * s.x, y: hip.y * s.y } as PlanePoint<'px'>;
  if (isFinitePoint(knee)) pose.knee = { x: knee.x * s.x, y: knee.y * s.y } as PlanePoint<'px'>;
  if (isFinitePoint(ankle)) pose.ankle = { x: ankle.x * s.x, y: ankle.y * s.y } as PlanePoint<'px'>;
  if (isFinitePoint(heel)) pose.heel = { x: heel.x * s.x, y: heel.y * s.y } as PlanePoint<'px'>;
  if (isFinitePoint(toe)) pose.toe = { x: toe.x * s.x, y: toe.y * s.y } as PlanePoint<'px'>;
  return pose;
}

/** The trunk pair (hip, shoulder) of a pose, when both are marked (the pose itself; no copy). */
export function trunkPairOf<U extends 'px' | 'm'>(pose: SidePose<U> | undefined): TrunkPair<U> | null {
  return pose?.hip && pose.shoulder ? (pose as TrunkPair<U>) : null;
}

/** Poses of both sides on one frame (the last entry per side wins). */
export function framePosesPx(entries: readonly FrameLandmarks[], f: PlaneFrame): Partial<Record<Side, SidePose<'px'>>> {
  const out: Partial<Record<Side, SidePose<'px'>>> = {};
  for (const e of entries) if (e.side === 'left' || e.side === 'right') out[e.side] = sidePosePx(e.points ?? {}, f);
  return out;
}

/**
 * Angles of both sides on one frame. A side without its own shoulder/hip pair takes the trunk from
 * the other side's pair (one trunk, seen from the side), flagged `trunkFromFallback`.
 */
export function frameAngles(entries: readonly FrameLandmarks[], f: PlaneFrame): Partial<Record<Side, PoseAngles>> {
  return anglesOfPoses(framePosesPx(entries, f));
}

/** {@link frameAngles} for poses already in the plane. */
export function anglesOfPoses(poses: Partial<Record<Side, SidePose<'px'>>>): Partial<Record<Side, PoseAngles>> {
  const out: Partial<Record<Side, PoseAngles>> = {};
  for (const side of ['left', 'right'] as const) {
    const pose = poses[side];
    if (pose) out[side] = poseAngles(pose, trunkPairOf(poses[otherSide(side)]));
  }
  return out;
}
