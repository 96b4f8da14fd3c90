/**
 * Angles per frame: landmarks indexed by frame and side, their plane poses and angles (computed
 * once per frame), and the per-frame angle samples the chart draws. Pure.
 */
import type { FrameLandmarks } from '../contracts/annotations';
import type { Side } from '../contracts/assessment';
import type { AngleSample } from '../contracts/measures';
import { poseAngles, type PoseAngles, type SidePose } from './angles';
import type { FrameClock } from './events';
import { isFinitePoint, planeScale, toPlanePx, type PlaneFrame, type PlanePoint } from './geometry';
import { SIDE_ORDER } from './measure-definitions';
import { sidePosePx, trunkPairOf } from './pose';

/**
 * Landmarks indexed by frame and side (the last entry for a frame and side wins). Angles are
 * computed once per frame; plane poses are made on demand (only event frames and hip tracks need
 * positions), so a long fully marked clip does not keep tens of thousands of points alive.
 */
export class FrameStore {
  /** Frames that have any landmarks, ascending. */
  readonly frames: number[];
  readonly lastFrame: number;
  private readonly entries: Record<Side, (FrameLandmarks | undefined)[]> = { left: [], right: [] };
  private readonly angleBy: Record<Side, (PoseAngles | undefined)[]> = { left: [], right: [] };
  private readonly poseCache: Record<Side, Map<number, SidePose<'px'>>> = { left: new Map(), right: new Map() };

  constructor(
    landmarks: readonly FrameLandmarks[],
    private readonly plane: PlaneFrame,
  ) {
    const seen: number[] = [];
    let last = -1;
    for (const l of landmarks) {
      if (!Number.isInteger(l.frame) || l.frame < 0 || (l.side !== 'left' && l.side !== 'right')) continue;
      if (!this.entries.left[l.frame] && !this.entries.right[l.frame]) seen.push(l.frame);
      this.entries[l.side][l.frame] = l;
      if (l.frame > last) last = l.frame;
    }
    this.frames = seen.sort((a, b) => a - b);
    this.lastFrame = last;
    // Same path as frameAngles()/anglesOfPoses(), unrolled: this loop runs for every marked frame.
    const scale = planeScale(plane);
    for (const f of this.frames) {
      const left = this.entries.left[f];
      const right = this.entries.right[f];
      const pl = left ? sidePosePx(left.points ?? {}, scale) : undefined;
      const pr = right ? sidePosePx(right.points ?? {}, scale) : undefined;
      if (pl) this.angleBy.left[f] = poseAngles(pl, trunkPairOf(pr));
      if (pr) this.angleBy.right[f] = poseAngles(pr, trunkPairOf(pl));
    }
  }

  /** Angles of one side on one frame (absent when the side is not marked there). */
  angles(frame: number, side: Side): PoseAngles | undefined {
    return this.angleBy[side][frame];
  }

  /** One side's plane pose on one frame (pixels, y up, +x running direction), cached. */
  pose(frame: number, side: Side): SidePose<'px'> | undefined {
    const e = this.entries[side][frame];
    if (!e) return undefined;
    let p = this.poseCache[side].get(frame);
    if (!p) this.poseCache[side].set(frame, (p = sidePosePx(e.points ?? {}, this.plane)));
    return p;
  }

  /** The hip of one side on one frame in plane pixels (not cached: hip tracks are long). */
  hip(frame: number, side: Side): PlanePoint<'px'> | undefined {
    const h = this.entries[side][frame]?.points?.hip;
    return isFinitePoint(h) ? toPlanePx(h, this.plane) : undefined;
  }
}

/** Per-frame angle samples for the chart: every marked frame and side with at least one angle. */
export function angleSamples(store: FrameStore, clock: FrameClock): AngleSample[] {
  const angles: AngleSample[] = [];
  for (const f of store.frames) {
    const timeMs = clock.timeMs(f);
    for (const side of SIDE_ORDER) {
      const a = store.angles(f, side);
      if (!a) continue;
      const s: AngleSample = { frame: f, timeMs: Number.isFinite(timeMs) ? timeMs : 0, side };
      let n = 0;
      if (a.thighDeg !== undefined) {
        s.thighDeg = a.thighDeg;
        n++;
      }
      if (a.kneeFlexionDeg !== undefined) {
        s.kneeFlexionDeg = a.kneeFlexionDeg;
        n++;
      }
      if (a.shankDeg !== undefined) {
        s.shankDeg = a.shankDeg;
        n++;
      }
      if (a.trunkDeg !== undefined) {
        s.trunkDeg = a.trunkDeg;
        n++;
      }
      if (a.footDeg !== undefined) {
        s.footDeg = a.footDeg;
        n++;
      }
      if (a.hipRelTrunkDeg !== undefined) {
        s.hipRelTrunkDeg = a.hipRelTrunkDeg;
        n++;
      }
      if (n > 0) angles.push(s);
    }
  }
  return angles;
}
