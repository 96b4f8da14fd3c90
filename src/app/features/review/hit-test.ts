/**
 * Which marker a pointer is on, measured in screen pixels so the tolerance is the same at any
 * zoom, and wider for fingers than for a mouse. Pure functions.
 */
import type { FrameLandmarks, LandmarkName } from '../../../contracts/annotations';
import { LANDMARKS } from '../../../contracts/annotations';
import type { Side } from '../../../contracts/assessment';
import { Size, Vec, ViewTransform, fractionToScreen } from './view-transform';

export interface HitCandidate<K> {
  key: K;
  /** Screen position, CSS px. */
  x: number;
  y: number;
}

/** How close (CSS px) a pointer must be to grab a marker. */
export function hitTolerancePx(pointerType: string): number {
  switch (pointerType) {
    case 'touch':
      return 24;
    case 'pen':
      return 14;
    default:
      return 10;
  }
}

/**
 * The candidate nearest to `pointer` within `tolerance` px, or null. Among candidates at the same
 * distance (stacked markers) the preferred one wins, then the one listed last (drawn on top).
 */
export function hitTest<K>(
  candidates: readonly HitCandidate<K>[],
  pointer: Vec,
  tolerance: number,
  prefer: (key: K) => boolean = () => false,
): K | null {
  let best: { key: K; d: number; preferred: boolean } | null = null;
  for (const c of candidates) {
    const d = Math.hypot(c.x - pointer.x, c.y - pointer.y);
    if (d > tolerance) continue;
    const preferred = prefer(c.key);
    const closer = best === null || d < best.d - 0.5;
    const tie = best !== null && Math.abs(d - best.d) <= 0.5;
    if (closer || (tie && (preferred || !best!.preferred))) best = { key: c.key, d, preferred };
  }
  return best?.key ?? null;
}

export interface LandmarkRef {
  side: Side;
  landmark: LandmarkName;
}

/** Screen positions of the landmarks of one frame (rows of that frame, either side). */
export function landmarkCandidates(rows: readonly FrameLandmarks[], frame: Size, t: ViewTransform): HitCandidate<LandmarkRef>[] {
  const out: HitCandidate<LandmarkRef>[] = [];
  for (const row of rows) {
    for (const landmark of LANDMARKS) {
      const p = row.points[landmark];
      if (!p) continue;
      const s = fractionToScreen(t, frame, p);
      out.push({ key: { side: row.side, landmark }, x: s.x, y: s.y });
    }
  }
  return out;
}
