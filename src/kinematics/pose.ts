/**
 * Frame landmarks (image fractions) → typed plane poses → angles. Pure. The one place where the
 * measures and the overlay turn what the coach marked into numbers, so both show the same figure.
 */
import { LANDMARKS, type FrameLandmarks, type FramePoint, type LandmarkName } from '../contracts/annotations';
import type { Side } from '../contracts/assessment';
import { poseAngles, type PoseAngles, type SidePose, type TrunkPair } from './angles';
import { isFinitePoint, toPlanePx, type PlaneFrame } from './geometry';

/** The other side. */
export function otherSide(side: Side): Side {
  return side === 'left' ? 'right' : 'left';
}

/**
 * One side's marked points → plane pixels (y up, +x running direction). Points with a non-finite
 * coordinate are dropped (treated as unmarked) so they can never turn into NaN angles.
 */
export function sidePosePx(points: Partial<Record<LandmarkName, FramePoint>>, f: PlaneFrame): SidePose<'px'> {
  const pose: SidePose<'px'> = {};
  for (const name of LANDMARKS) {
    const p = points[name];
    if (isFinitePoint(p)) pose[name] = toPlanePx(p, f);
  }
  return pose;
}

/** The trunk pair (hip, shoulder) of a pose, when both are marked. */
export function trunkPairOf<U extends 'px' | 'm'>(pose: SidePose<U> | undefined): TrunkPair<U> | null {
  return pose?.hip && pose.shoulder ? { hip: pose.hip, shoulder: pose.shoulder } : null;
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
