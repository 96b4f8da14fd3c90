import { LANDMARKS, type FrameLandmarks, type FramePoint, type LandmarkName } from '../contracts/annotations';
import type { Side } from '../contracts/assessment';
import type { LandmarkOrigin } from '../contracts/annotated-clips';

/** Landmarks to draw on one frame and where they came from. */
export interface FilledFrame {
  landmarks: FrameLandmarks[];
  /** The least direct origin over the sides drawn: interpolated over followed over marked; `none` when nothing is drawn. */
  origin: LandmarkOrigin;
}

const RANK: Record<LandmarkOrigin, number> = { none: 0, marked: 1, followed: 2, interpolated: 3 };

/** Looks up and fills landmarks per frame for a clip's marks. */
export interface LandmarkFill {
  at(frame: number): FilledFrame;
}

/**
 * Landmarks for every frame of a clip, for playback. Per side: a frame the coach marked by hand
 * shows those points (`marked`); otherwise followed points on that frame (every point's `origin`
 * `followed`); otherwise each landmark is interpolated linearly between the nearest earlier and
 * later frames that carry it, marked or followed (`interpolated`). Outside the first and last
 * such frame nothing is drawn: no landmark is extrapolated. Pure.
 */
export function landmarkFill(all: readonly FrameLandmarks[]): LandmarkFill {
  const bySide = new Map<Side, { frame: number; entry: FrameLandmarks; origin: LandmarkOrigin }[]>();
  for (const side of ['left', 'right'] as const) {
    const byFrame = new Map<number, { frame: number; entry: FrameLandmarks; origin: LandmarkOrigin }>();
    for (const l of all) {
      if (l.side !== side || Object.keys(l.points).length === 0) continue;
      // An entry whose every point was followed (none placed or accepted by the coach) counts as followed.
      const origin: LandmarkOrigin = Object.values(l.points).every((p) => p?.origin === 'followed') ? 'followed' : 'marked';
      const had = byFrame.get(l.frame);
      // A hand-placed entry wins over a followed one on the same frame.
      if (!had || (had.origin === 'followed' && origin === 'marked')) byFrame.set(l.frame, { frame: l.frame, entry: l, origin });
    }
    bySide.set(
      side,
      [...byFrame.values()].sort((a, b) => a.frame - b.frame),
    );
  }

  /** Index of the last entry with frame ≤ f, or −1. */
  const floor = (list: { frame: number }[], f: number) => {
    let lo = 0;
    let hi = list.length - 1;
    let found = -1;
    while (lo <= hi) {
      const mid = (lo + hi) >> 1;
      if (list[mid]!.frame <= f) {
        found = mid;
        lo = mid + 1;
      } else hi = mid - 1;
    }
    return found;
  };

  return {
    at(frame) {
      const landmarks: FrameLandmarks[] = [];
      let origin: LandmarkOrigin = 'none';
      for (const side of ['left', 'right'] as const) {
        const list = bySide.get(side)!;
        const i = floor(list, frame);
        if (i >= 0 && list[i]!.frame === frame) {
          landmarks.push(list[i]!.entry);
          if (RANK[list[i]!.origin] > RANK[origin]) origin = list[i]!.origin;
          continue;
        }
        const points: Partial<Record<LandmarkName, FramePoint>> = {};
        for (const name of LANDMARKS) {
          // The nearest earlier and later frames that carry this landmark.
          let a = i;
          while (a >= 0 && !list[a]!.entry.points[name]) a--;
          let b = i + 1;
          while (b < list.length && !list[b]!.entry.points[name]) b++;
          if (a < 0 || b >= list.length) continue;
          const pa = list[a]!.entry.points[name]!;
          const pb = list[b]!.entry.points[name]!;
          const t = (frame - list[a]!.frame) / (list[b]!.frame - list[a]!.frame);
          points[name] = { x: pa.x + (pb.x - pa.x) * t, y: pa.y + (pb.y - pa.y) * t };
        }
        if (Object.keys(points).length) {
          landmarks.push({ frame, side, points });
          origin = 'interpolated';
        }
      }
      return { landmarks, origin };
    },
  };
}
