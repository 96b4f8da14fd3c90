/**
 * Between a clip's saved landmarks and the marker follower: which markers to follow from the start
 * frame, which points a person placed (never replaced), and how followed points merge back into
 * the landmarks. Pure: frame fractions in, frame fractions out.
 */
import type { FrameLandmarks, LandmarkName, LandmarkPoint, NotFollowedPoint } from '../../src/contracts/annotations';
import { LANDMARKS } from '../../src/contracts/annotations';
import type { Side } from '../../src/contracts/assessment';
import type { Point } from '../../src/kinematics/geometry';
import type { FollowMarker, FollowResult, LostPoint } from './marker-follower';
import { RIGID_LINKS } from './rigid-links';

/** Origins a person decided (placed, or a proposal they accepted): following never replaces them. */
const KEPT = new Set(['placed', 'accepted']);
const isKept = (p: LandmarkPoint) => KEPT.has(p.origin ?? 'placed');

/** The follower's key of one landmark of one side. */
export const markerKey = (side: Side, landmark: LandmarkName): string => `${side} ${landmark}`;

/** What to hand the follower, in pixels of a `width × height` frame. */
export interface FollowPlan {
  markers: FollowMarker[];
  placed: Map<string, Map<number, Point>>;
  links: Array<readonly [string, string]>;
}

/**
 * Markers from every landmark on `startFrame`; placed (or accepted) points on other frames of the
 * range become anchors; links join the landmarks of one side on one rigid segment.
 */
export function planFollow(
  landmarks: readonly FrameLandmarks[],
  range: { startFrame: number; from: number; to: number },
  size: { width: number; height: number },
): FollowPlan {
  const px = (p: LandmarkPoint): Point => ({ x: p.x * size.width, y: p.y * size.height });
  const markers: FollowMarker[] = [];
  const placed = new Map<string, Map<number, Point>>();
  const sides = new Set<Side>();
  for (const row of landmarks) {
    for (const name of LANDMARKS) {
      const p = row.points[name];
      if (!p) continue;
      const key = markerKey(row.side, name);
      if (row.frame === range.startFrame) {
        markers.push({ key, start: px(p) });
        sides.add(row.side);
      } else if (row.frame >= range.from && row.frame <= range.to && isKept(p)) {
        if (!placed.has(key)) placed.set(key, new Map());
        placed.get(key)!.set(row.frame, px(p));
      }
    }
  }
  const keys = new Set(markers.map((m) => m.key));
  const links = [...sides].flatMap((side) =>
    RIGID_LINKS.map(([a, b]) => [markerKey(side, a), markerKey(side, b)] as const).filter(([a, b]) => keys.has(a) && keys.has(b)),
  );
  return { markers, placed, links };
}

/**
 * The landmarks after a follow over `range`: followed points (origin `followed`, with their
 * confidence) go on every frame of the range except the start frame; points a person placed or
 * accepted stay exactly as they were; earlier followed or proposed points of the followed markers
 * inside the range that this run did not find are removed (no stale point stays confident).
 */
export function mergeFollowed(
  landmarks: readonly FrameLandmarks[],
  result: Pick<FollowResult, 'points'>,
  range: { startFrame: number; from: number; to: number },
  size: { width: number; height: number },
): FrameLandmarks[] {
  const rows = new Map<string, FrameLandmarks>();
  const rowKey = (frame: number, side: Side) => `${frame}:${side}`;
  for (const row of landmarks) rows.set(rowKey(row.frame, row.side), { ...row, points: { ...row.points } });
  const clamp = (v: number) => Math.min(1, Math.max(0, v));
  for (const key of result.points.keys()) {
    const [side, name] = key.split(' ') as [Side, LandmarkName];
    for (const row of rows.values()) {
      const p = row.points[name];
      if (row.side !== side || row.frame === range.startFrame || row.frame < range.from || row.frame > range.to || !p || isKept(p))
        continue;
      delete row.points[name];
    }
  }
  for (const [key, points] of result.points) {
    const [side, name] = key.split(' ') as [Side, LandmarkName];
    for (const f of points) {
      const id = rowKey(f.frame, side);
      const row = rows.get(id) ?? { frame: f.frame, side, points: {} };
      const existing = row.points[name];
      if (existing && isKept(existing)) continue;
      row.points[name] = { x: clamp(f.x / size.width), y: clamp(f.y / size.height), origin: 'followed', confidence: f.confidence };
      rows.set(id, row);
    }
  }
  return [...rows.values()].filter((r) => Object.keys(r.points).length > 0).sort((a, b) => a.frame - b.frame || (a.side < b.side ? -1 : 1));
}

/**
 * The clip's frames not followed after a follow run over `range`: the run answers for the markers
 * it followed on every frame of the range, so their earlier entries there are replaced by the
 * run's `lost`; entries of other markers, and of frames outside the range, stay. Sorted by frame,
 * side and landmark name.
 */
export function notFollowedAfterFollow(
  stored: readonly NotFollowedPoint[],
  result: { points: ReadonlyMap<string, unknown>; lost: ReadonlyMap<string, readonly LostPoint[]> },
  range: { from: number; to: number },
): NotFollowedPoint[] {
  const followed = new Set([...result.points.keys(), ...result.lost.keys()]);
  const out = stored.filter((p) => p.frame < range.from || p.frame > range.to || !followed.has(markerKey(p.side, p.landmark)));
  for (const [key, list] of result.lost) {
    const [side, landmark] = key.split(' ') as [Side, LandmarkName];
    for (const l of list) if (l.frame >= range.from && l.frame <= range.to) out.push({ frame: l.frame, side, landmark, reason: l.reason });
  }
  // The order the database reads them back in (side and landmark names compared as text).
  const text = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);
  return out.sort((a, b) => a.frame - b.frame || text(a.side, b.side) || text(a.landmark, b.landmark));
}
