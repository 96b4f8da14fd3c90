/**
 * Pure helpers of an annotation save: the marks as they will read back from the database, and
 * what differs from the marks stored before, so a save writes only what changed (an autosave
 * after one drag updates one row, not every landmark of the clip).
 */
import {
  LANDMARKS,
  type AngleGauge,
  type FrameLandmarks,
  type GaitEventMark,
  type LandmarkName,
  type LandmarkOrigin,
  type LandmarkPoint,
  type NotFollowedPoint,
  type ScaleBar,
} from '../../src/contracts/annotations';
import type { Side } from '../../src/contracts/assessment';

/** Everything marked on a clip, without revision and authorship. */
export interface MarkSet {
  landmarks: FrameLandmarks[];
  events: GaitEventMark[];
  scale: ScaleBar | null;
  gauges: AngleGauge[];
}

/** One stored landmark point (a row of `clip_landmarks`). */
export interface LandmarkRow {
  frame: number;
  side: Side;
  landmark: LandmarkName;
  x: number;
  y: number;
  origin: LandmarkOrigin;
  /** 0–1 for automatic points; null for placed ones. */
  confidence: number | null;
}

/** What a save changes in the landmark rows. */
export interface LandmarkChanges {
  removed: Pick<LandmarkRow, 'frame' | 'side' | 'landmark'>[];
  changed: LandmarkRow[];
  added: LandmarkRow[];
}

/** Landmarks of a save: earlier clients also send how the whole entry was made (`tracked` = followed). */
export type LandmarksInput = FrameLandmarks & { source?: 'manual' | 'tracked' };

const sideOrder = (s: Side) => (s === 'left' ? 0 : 1);
const byFrameSide = (a: { frame: number; side: Side }, b: { frame: number; side: Side }) =>
  a.frame - b.frame || sideOrder(a.side) - sideOrder(b.side);

/**
 * A point as a read gives it back: with its origin (left out = `placed`, or `followed` when an
 * earlier client marked the whole entry `tracked`) and a confidence only when it has one.
 */
function storedPoint(p: LandmarkPoint, entrySource: LandmarksInput['source']): LandmarkPoint {
  const origin = p.origin ?? (entrySource === 'tracked' ? 'followed' : 'placed');
  return p.confidence === undefined ? { x: p.x, y: p.y, origin } : { x: p.x, y: p.y, origin, confidence: p.confidence };
}

/** The points of an entry, in landmark order, without empty ones, each as a read gives it back. */
function pointsOf(l: LandmarksInput): FrameLandmarks['points'] {
  const out: FrameLandmarks['points'] = {};
  for (const name of LANDMARKS) {
    const p = l.points[name];
    if (p) out[name] = storedPoint(p, l.source);
  }
  return out;
}

/**
 * The marks of a save in the shape and order the repository reads them back: landmarks by frame
 * then side (left first), each point with its origin and confidence (see {@link storedPoint}) and
 * without entries that hold no point; events by frame then side, each with its origin; gauges by
 * frame then id.
 */
export function normalizeMarks(input: {
  landmarks: LandmarksInput[];
  events: GaitEventMark[];
  scale: ScaleBar | null;
  gauges?: AngleGauge[];
}): MarkSet {
  const landmarks: FrameLandmarks[] = [];
  for (const l of input.landmarks) {
    const points = pointsOf(l);
    if (LANDMARKS.some((name) => points[name])) landmarks.push({ frame: l.frame, side: l.side, points });
  }
  return {
    landmarks: landmarks.sort(byFrameSide),
    events: input.events.map((e) => ({ frame: e.frame, side: e.side, kind: e.kind, origin: e.origin ?? 'placed' })).sort(byFrameSide),
    scale: input.scale,
    gauges: [...(input.gauges ?? [])].sort((a, b) => a.frame - b.frame || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0)),
  };
}

/** A number per frame and side (entries are unique by both). */
const entryKey = (l: { frame: number; side: Side }) => l.frame * 2 + sideOrder(l.side);

/** The row of one point (origin `placed` and no confidence when not given). */
function rowOf(l: { frame: number; side: Side }, landmark: LandmarkName, p: LandmarkPoint): LandmarkRow {
  return { frame: l.frame, side: l.side, landmark, x: p.x, y: p.y, origin: p.origin ?? 'placed', confidence: p.confidence ?? null };
}

/** Whether a point's stored row would differ: position, origin or confidence. */
const pointChanged = (p: LandmarkPoint, q: LandmarkPoint) =>
  p.x !== q.x || p.y !== q.y || (p.origin ?? 'placed') !== (q.origin ?? 'placed') || (p.confidence ?? null) !== (q.confidence ?? null);

/**
 * The landmark rows to delete, update and insert to turn `before` into `after` (both normalised):
 * a point whose position, origin or confidence differs is one changed row.
 */
export function landmarkChanges(before: FrameLandmarks[], after: FrameLandmarks[]): LandmarkChanges {
  const old = new Map<number, FrameLandmarks>();
  for (const l of before) old.set(entryKey(l), l);
  const changes: LandmarkChanges = { removed: [], changed: [], added: [] };
  for (const l of after) {
    const key = entryKey(l);
    const was = old.get(key);
    old.delete(key);
    for (const landmark of LANDMARKS) {
      const p = l.points[landmark];
      const q = was?.points[landmark];
      if (p && !q) changes.added.push(rowOf(l, landmark, p));
      else if (!p && q) changes.removed.push({ frame: l.frame, side: l.side, landmark });
      else if (p && q && pointChanged(p, q)) changes.changed.push(rowOf(l, landmark, p));
    }
  }
  for (const l of old.values()) {
    for (const landmark of LANDMARKS) if (l.points[landmark]) changes.removed.push({ frame: l.frame, side: l.side, landmark });
  }
  return changes;
}

const samePoint = (a: { x: number; y: number }, b: { x: number; y: number }) => a.x === b.x && a.y === b.y;

/** Whether two event lists (normalised) are the same. */
export function sameEvents(a: GaitEventMark[], b: GaitEventMark[]): boolean {
  return (
    a.length === b.length &&
    a.every(
      (e, i) =>
        e.frame === b[i]!.frame && e.side === b[i]!.side && e.kind === b[i]!.kind && (e.origin ?? 'placed') === (b[i]!.origin ?? 'placed'),
    )
  );
}

/** Whether two scale bars are the same. */
export function sameScale(a: ScaleBar | null, b: ScaleBar | null): boolean {
  if (!a || !b) return a === b;
  return a.frame === b.frame && a.lengthM === b.lengthM && samePoint(a.a, b.a) && samePoint(a.b, b.b);
}

/** Whether two gauge lists (normalised) are the same. */
export function sameGauges(a: AngleGauge[], b: AngleGauge[]): boolean {
  return (
    a.length === b.length &&
    a.every((g, i) => {
      const h = b[i]!;
      return g.id === h.id && g.frame === h.frame && samePoint(g.a, h.a) && samePoint(g.vertex, h.vertex) && samePoint(g.b, h.b);
    })
  );
}

/** Origins a person decided: a point placed by hand, or a proposal accepted. */
export const isHandPoint = (p: LandmarkPoint | undefined): boolean =>
  !!p && (p.origin ?? 'placed') !== 'followed' && p.origin !== 'proposed';

/**
 * The frames not followed that stay after a save of `landmarks`: a frame where a person has now
 * placed (or accepted) that marker is checked, so it leaves the list; the rest stay in order.
 */
export function notFollowedAfter(stored: readonly NotFollowedPoint[], landmarks: readonly FrameLandmarks[]): NotFollowedPoint[] {
  if (!stored.length) return [];
  const rows = new Map<string, FrameLandmarks>();
  for (const row of landmarks) rows.set(`${row.frame}:${row.side}`, row);
  return stored.filter((p) => !isHandPoint(rows.get(`${p.frame}:${p.side}`)?.points[p.landmark]));
}
