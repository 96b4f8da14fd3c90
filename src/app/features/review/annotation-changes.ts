/**
 * Annotations as a set of keyed values, and edits as key-level changes. Every edit in the review
 * workspace is a list of changes (one landmark point, one gait event, the scale bar, one angle
 * gauge); undo applies
 * the "before" values, redo the "after" values, and after a save conflict the local edits (the
 * difference between what was loaded and what is shown) are applied on top of the server's copy.
 * Pure functions over immutable data.
 */
import type {
  AngleGauge,
  EventOrigin,
  FrameLandmarks,
  FramePoint,
  GaitEventKind,
  GaitEventMark,
  LandmarkName,
  LandmarkPoint,
  ScaleBar,
} from '../../../contracts/annotations';
import { GAIT_EVENT_KINDS, LANDMARKS } from '../../../contracts/annotations';
import type { Side } from '../../../contracts/assessment';

/** What the coach edits: the annotation body without revision bookkeeping. */
export interface AnnotationState {
  landmarks: FrameLandmarks[];
  events: GaitEventMark[];
  scale: ScaleBar | null;
  /** Angle gauges, in frame then id order. */
  gauges: AngleGauge[];
}

/** One landmark point of one side on one frame. */
export interface PointKey {
  kind: 'point';
  frame: number;
  side: Side;
  landmark: LandmarkName;
}

/** One gait event of one side on one frame. */
export interface EventKey {
  kind: 'event';
  frame: number;
  side: Side;
  event: GaitEventKind;
}

export interface ScaleKey {
  kind: 'scale';
}

/** One angle gauge, by its id. */
export interface GaugeKey {
  kind: 'gauge';
  id: string;
}

export type AnnotationKey = PointKey | EventKey | ScaleKey | GaugeKey;

/** A change of one keyed value; `null` means "absent". An event's value is where it came from. */
export type Change =
  | { key: PointKey; before: FramePoint | null; after: FramePoint | null }
  | { key: EventKey; before: EventOrigin | null; after: EventOrigin | null }
  | { key: ScaleKey; before: ScaleBar | null; after: ScaleBar | null }
  | { key: GaugeKey; before: AngleGauge | null; after: AngleGauge | null };

export const EMPTY_STATE: AnnotationState = { landmarks: [], events: [], scale: null, gauges: [] };

const SIDE_ORDER: Record<Side, number> = { left: 0, right: 1 };

/** A stable string for a key (map keys, comparisons). */
export function keyId(key: AnnotationKey): string {
  switch (key.kind) {
    case 'point':
      return `p|${key.frame}|${key.side}|${key.landmark}`;
    case 'event':
      return `e|${key.frame}|${key.side}|${key.event}`;
    case 'scale':
      return 's';
    case 'gauge':
      return `g|${key.id}`;
  }
}

function samePoint(a: FramePoint | null | undefined, b: FramePoint | null | undefined): boolean {
  if (!a || !b) return !a && !b;
  return a.x === b.x && a.y === b.y;
}

/** Same place and same origin (a point without one was placed by a person). */
function sameLandmark(a: LandmarkPoint | null | undefined, b: LandmarkPoint | null | undefined): boolean {
  return samePoint(a, b) && (a?.origin ?? 'placed') === (b?.origin ?? 'placed');
}

function sameScale(a: ScaleBar | null, b: ScaleBar | null): boolean {
  if (!a || !b) return !a && !b;
  return a.frame === b.frame && a.lengthM === b.lengthM && samePoint(a.a, b.a) && samePoint(a.b, b.b);
}

function sameGauge(a: AngleGauge | null, b: AngleGauge | null): boolean {
  if (!a || !b) return !a && !b;
  return a.id === b.id && a.frame === b.frame && samePoint(a.a, b.a) && samePoint(a.vertex, b.vertex) && samePoint(a.b, b.b);
}

function sameValue(a: unknown, b: unknown, kind: AnnotationKey['kind']): boolean {
  if (kind === 'point') return sameLandmark(a as LandmarkPoint | null, b as LandmarkPoint | null);
  if (kind === 'scale') return sameScale(a as ScaleBar | null, b as ScaleBar | null);
  if (kind === 'gauge') return sameGauge(a as AngleGauge | null, b as AngleGauge | null);
  return (a ?? null) === (b ?? null);
}

/** The current value at `key` in `state` (null when absent). */
export function valueAt(state: AnnotationState, key: AnnotationKey): FramePoint | EventOrigin | ScaleBar | AngleGauge | null {
  switch (key.kind) {
    case 'point': {
      const row = state.landmarks.find((l) => l.frame === key.frame && l.side === key.side);
      return row?.points[key.landmark] ?? null;
    }
    case 'event': {
      const e = state.events.find((x) => x.frame === key.frame && x.side === key.side && x.kind === key.event);
      return e ? (e.origin ?? 'placed') : null;
    }
    case 'scale':
      return state.scale;
    case 'gauge':
      return state.gauges.find((g) => g.id === key.id) ?? null;
  }
}

interface Keyed {
  key: AnnotationKey;
  value: FramePoint | EventOrigin | ScaleBar | AngleGauge;
}

/** Every present value of `state`, by key id. */
export function keyedValues(state: AnnotationState): Map<string, Keyed> {
  const map = new Map<string, Keyed>();
  for (const row of state.landmarks) {
    for (const landmark of LANDMARKS) {
      const p = row.points[landmark];
      if (!p) continue;
      const key: PointKey = { kind: 'point', frame: row.frame, side: row.side, landmark };
      map.set(keyId(key), { key, value: p });
    }
  }
  for (const e of state.events) {
    const key: EventKey = { kind: 'event', frame: e.frame, side: e.side, event: e.kind };
    map.set(keyId(key), { key, value: e.origin ?? 'placed' });
  }
  if (state.scale) map.set('s', { key: { kind: 'scale' }, value: state.scale });
  for (const g of state.gauges) {
    const key: GaugeKey = { kind: 'gauge', id: g.id };
    map.set(keyId(key), { key, value: g });
  }
  return map;
}

/** The changes that turn `from` into `to` (empty when they hold the same marks). */
export function diffStates(from: AnnotationState, to: AnnotationState): Change[] {
  const a = keyedValues(from);
  const b = keyedValues(to);
  const changes: Change[] = [];
  for (const [id, { key, value }] of a) {
    const other = b.get(id);
    if (!other) changes.push({ key, before: value, after: null } as Change);
    else if (!sameValue(value, other.value, key.kind)) changes.push({ key, before: value, after: other.value } as Change);
  }
  for (const [id, { key, value }] of b) {
    if (!a.has(id)) changes.push({ key, before: null, after: value } as Change);
  }
  return changes;
}

/** Whether two states hold the same marks. */
export function sameState(a: AnnotationState, b: AnnotationState): boolean {
  return diffStates(a, b).length === 0;
}

/** The changes that undo `changes` (reversed order, before ↔ after). */
export function invertChanges(changes: readonly Change[]): Change[] {
  return [...changes].reverse().map((c) => ({ key: c.key, before: c.after, after: c.before }) as Change);
}

/**
 * The part of an undo or redo that still fits `state`: the changes whose key holds their `before`
 * value. A key changed since by a save merged in from elsewhere (a colleague, another tab) or by
 * marks taken from the server is left as it is, so an undo never removes or moves a mark it did
 * not make; `skipped` counts those.
 */
export function changesThatFit(state: AnnotationState, changes: readonly Change[]): { fit: Change[]; skipped: number } {
  const fit = changes.filter((c) => sameValue(valueAt(state, c.key), c.before, c.key.kind));
  return { fit, skipped: changes.length - fit.length };
}

/** Drops changes whose before and after are the same. */
export function effectiveChanges(changes: readonly Change[]): Change[] {
  return changes.filter((c) => !sameValue(c.before, c.after, c.key.kind));
}

function sortLandmarks(rows: FrameLandmarks[]): FrameLandmarks[] {
  return rows.sort((a, b) => a.frame - b.frame || SIDE_ORDER[a.side] - SIDE_ORDER[b.side]);
}

/** Events in frame order, then left before right, then initial contact → midstance → toe-off. */
export function sortEvents(events: readonly GaitEventMark[]): GaitEventMark[] {
  return [...events].sort(
    (a, b) =>
      a.frame - b.frame || SIDE_ORDER[a.side] - SIDE_ORDER[b.side] || GAIT_EVENT_KINDS.indexOf(a.kind) - GAIT_EVENT_KINDS.indexOf(b.kind),
  );
}

/** Gauges in frame order, then by id. */
export function sortGauges(gauges: readonly AngleGauge[]): AngleGauge[] {
  return [...gauges].sort((a, b) => a.frame - b.frame || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
}

/**
 * Sets each change's `after` value in `state` (whatever is there now). Landmark rows left with no
 * points are dropped; rows, events and gauges stay sorted.
 */
export function applyChanges(state: AnnotationState, changes: readonly Change[]): AnnotationState {
  if (!changes.length) return state;
  let landmarks = state.landmarks;
  let events = state.events;
  let scale = state.scale;
  let gauges = state.gauges;
  let landmarksCopied = false;
  let eventsChanged = false;
  let gaugesChanged = false;
  for (const c of changes) {
    switch (c.key.kind) {
      case 'point': {
        const { frame, side, landmark } = c.key;
        if (!landmarksCopied) {
          landmarks = [...landmarks];
          landmarksCopied = true;
        }
        const i = landmarks.findIndex((l) => l.frame === frame && l.side === side);
        // A point the coach moved or put is theirs (placed); undo brings back the point as it was, origin and all.
        const after = c.after as LandmarkPoint | null;
        const point = after && (after.origin ? { ...after } : { x: after.x, y: after.y });
        if (i < 0) {
          if (point) landmarks.push({ frame, side, points: { [landmark]: point } });
        } else {
          const points = { ...landmarks[i].points };
          if (point) points[landmark] = point;
          else delete points[landmark];
          if (Object.keys(points).length) landmarks[i] = { ...landmarks[i], points };
          else landmarks.splice(i, 1);
        }
        break;
      }
      case 'event': {
        const { frame, side, event } = c.key;
        const at = events.find((e) => e.frame === frame && e.side === side && e.kind === event);
        const present = !!at;
        const after = c.after as EventOrigin | null;
        // A placed event carries no origin field (the stored default), others say where they came from.
        const mark = (origin: EventOrigin): GaitEventMark =>
          origin === 'placed' ? { frame, side, kind: event } : { frame, side, kind: event, origin };
        if (after && !present) {
          events = [...events, mark(after)];
          eventsChanged = true;
        } else if (after && at && (at.origin ?? 'placed') !== after) {
          events = events.map((e) => (e === at ? mark(after) : e));
          eventsChanged = true;
        } else if (!after && present) {
          events = events.filter((e) => !(e.frame === frame && e.side === side && e.kind === event));
          eventsChanged = true;
        }
        break;
      }
      case 'scale':
        scale = c.after as ScaleBar | null;
        break;
      case 'gauge': {
        const id = c.key.id;
        const after = c.after as AngleGauge | null;
        gauges = gauges.filter((g) => g.id !== id);
        if (after) gauges.push(after);
        gaugesChanged = true;
        break;
      }
    }
  }
  return {
    landmarks: landmarksCopied ? sortLandmarks(landmarks) : landmarks,
    events: eventsChanged ? sortEvents(events) : events,
    scale,
    gauges: gaugesChanged ? sortGauges(gauges) : gauges,
  };
}

/** What re-applying local edits on a newer server copy gave. */
export interface MergeResult {
  merged: AnnotationState;
  /** Local edits that were re-applied. */
  applied: number;
  /** Of those, how many replaced a different edit someone else saved at the same place. */
  conflicts: number;
}

/**
 * Three-way merge after a save conflict: the edits made locally since `base` (the revision the
 * page loaded) are applied on top of `remote` (the server's newer revision). Where both changed
 * the same point, event or scale bar, the local edit wins (the coach is looking at it) and is
 * counted as a conflict. Everything else someone else saved is kept.
 */
export function mergeOnto(base: AnnotationState, local: AnnotationState, remote: AnnotationState): MergeResult {
  const mine = diffStates(base, local);
  let conflicts = 0;
  for (const c of mine) {
    const theirs = valueAt(remote, c.key);
    if (!sameValue(theirs, c.before, c.key.kind) && !sameValue(theirs, c.after, c.key.kind)) conflicts += 1;
  }
  return { merged: applyChanges(remote, mine), applied: mine.length, conflicts };
}

/** Copies only the editable part of annotations (drops revision, clip id and who saved). */
export function stateOf(a: Omit<AnnotationState, 'gauges'> & { gauges?: AngleGauge[] }): AnnotationState {
  return { landmarks: a.landmarks, events: a.events, scale: a.scale, gauges: a.gauges ?? [] };
}
