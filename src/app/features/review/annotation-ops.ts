/**
 * The edits the review workspace offers, each as a list of key-level changes (see
 * `annotation-changes.ts`) so that every one of them can be undone, redone and re-applied after a
 * save conflict. Pure functions.
 */
import type { FramePoint, GaitEventKind, GaitEventMark, LandmarkName, LandmarkPoint, ScaleBar } from '../../../contracts/annotations';
import { LANDMARKS } from '../../../contracts/annotations';
import type { Side } from '../../../contracts/assessment';
import { AnnotationState, Change, EventKey, PointKey, effectiveChanges, sortEvents, valueAt } from './annotation-changes';

/** Keeps a stored point on the frame and to a sensible precision (1e-5 of the frame). */
export function tidyPoint(p: FramePoint): FramePoint {
  const r = (v: number) => Math.round(Math.min(1, Math.max(0, v)) * 1e5) / 1e5;
  return { x: r(p.x), y: r(p.y) };
}

function pointKey(frame: number, side: Side, landmark: LandmarkName): PointKey {
  return { kind: 'point', frame, side, landmark };
}

/** The points of one side on one frame. */
export function pointsOn(state: AnnotationState, frame: number, side: Side): Partial<Record<LandmarkName, LandmarkPoint>> {
  return state.landmarks.find((l) => l.frame === frame && l.side === side)?.points ?? {};
}

/** Places (or moves) one landmark. */
export function setPointChanges(state: AnnotationState, frame: number, side: Side, landmark: LandmarkName, point: FramePoint): Change[] {
  const key = pointKey(frame, side, landmark);
  return effectiveChanges([{ key, before: valueAt(state, key) as FramePoint | null, after: tidyPoint(point) }]);
}

/** Removes one landmark (nothing when it is not there). */
export function removePointChanges(state: AnnotationState, frame: number, side: Side, landmark: LandmarkName): Change[] {
  const key = pointKey(frame, side, landmark);
  return effectiveChanges([{ key, before: valueAt(state, key) as FramePoint | null, after: null }]);
}

/** The nearest earlier frame (before `frame`) with any landmark, or null. */
export function previousMarkedFrame(state: AnnotationState, frame: number): number | null {
  let best: number | null = null;
  for (const row of state.landmarks) {
    if (row.frame < frame && Object.keys(row.points).length && (best === null || row.frame > best)) best = row.frame;
  }
  return best;
}

/**
 * Copies every landmark of the nearest earlier marked frame onto `frame` (both sides), replacing
 * what this frame had for the sides copied. A quick start when the runner moved a little.
 */
export function copyPreviousChanges(state: AnnotationState, frame: number): { from: number | null; changes: Change[] } {
  const from = previousMarkedFrame(state, frame);
  if (from === null) return { from, changes: [] };
  const changes: Change[] = [];
  for (const side of ['left', 'right'] as const) {
    const source = pointsOn(state, from, side);
    if (!Object.keys(source).length) continue;
    const target = pointsOn(state, frame, side);
    for (const landmark of LANDMARKS) {
      const key = pointKey(frame, side, landmark);
      changes.push({ key, before: target[landmark] ?? null, after: source[landmark] ?? null });
    }
  }
  return { from, changes: effectiveChanges(changes) };
}

/**
 * The landmark the placing tool moves to after `placed` was set: the next one in body order not
 * yet on this frame for this side (wrapping round), or the next in order when all are placed.
 */
export function nextLandmark(placed: LandmarkName, present: Partial<Record<LandmarkName, unknown>>): LandmarkName {
  const start = LANDMARKS.indexOf(placed);
  for (let i = 1; i <= LANDMARKS.length; i++) {
    const candidate = LANDMARKS[(start + i) % LANDMARKS.length];
    if (candidate !== placed && !present[candidate]) return candidate;
  }
  return LANDMARKS[(start + 1) % LANDMARKS.length];
}

function eventKey(frame: number, side: Side, event: GaitEventKind): EventKey {
  return { kind: 'event', frame, side, event };
}

/** Whether the event is marked on that frame for that side. */
export function hasEvent(events: readonly GaitEventMark[], frame: number, side: Side, kind: GaitEventKind): boolean {
  return events.some((e) => e.frame === frame && e.side === side && e.kind === kind);
}

/**
 * Marks the event on the frame, or unmarks it when it is already there (the key toggles). One side
 * has one event per frame, so marking replaces another kind marked there for that side.
 */
export function toggleEventChanges(state: AnnotationState, frame: number, side: Side, kind: GaitEventKind): Change[] {
  const here = state.events.find((e) => e.frame === frame && e.side === side && e.kind === kind);
  if (here) return [{ key: eventKey(frame, side, kind), before: here.origin ?? 'placed', after: null }];
  const replaced: Change[] = state.events
    .filter((e) => e.frame === frame && e.side === side && e.kind !== kind)
    .map((e) => ({ key: eventKey(frame, side, e.kind), before: e.origin ?? 'placed', after: null }));
  return [...replaced, { key: eventKey(frame, side, kind), before: null, after: 'placed' }];
}

/** Removes one event. */
export function removeEventChanges(state: AnnotationState, mark: GaitEventMark): Change[] {
  const here = state.events.find((e) => e.frame === mark.frame && e.side === mark.side && e.kind === mark.kind);
  if (!here) return [];
  return [{ key: eventKey(mark.frame, mark.side, mark.kind), before: here.origin ?? 'placed', after: null }];
}

/** Accepts proposed events: each given one (all proposals when `marks` is omitted) becomes `accepted`. */
export function acceptProposalChanges(state: AnnotationState, marks?: readonly GaitEventMark[]): Change[] {
  const wanted = (e: GaitEventMark) => !marks || marks.some((m) => m.frame === e.frame && m.side === e.side && m.kind === e.kind);
  return state.events
    .filter((e) => e.origin === 'proposed' && wanted(e))
    .map((e) => ({ key: eventKey(e.frame, e.side, e.kind), before: 'proposed', after: 'accepted' }));
}

/** Sets, replaces or (with null) removes the scale bar. */
export function setScaleChanges(state: AnnotationState, scale: ScaleBar | null): Change[] {
  const tidy = scale ? { frame: scale.frame, a: tidyPoint(scale.a), b: tidyPoint(scale.b), lengthM: scale.lengthM } : null;
  return effectiveChanges([{ key: { kind: 'scale' }, before: state.scale, after: tidy }]);
}

/** The marked event frames in order (each frame once). */
export function eventFrames(events: readonly GaitEventMark[]): number[] {
  return [...new Set(sortEvents(events).map((e) => e.frame))];
}

/**
 * The frame of the nearest marked event before (`dir` −1) or after (`dir` +1) `frame`, or null
 * when there is none that way.
 */
export function neighbourEventFrame(events: readonly GaitEventMark[], frame: number, dir: -1 | 1): number | null {
  let best: number | null = null;
  for (const e of events) {
    if (dir > 0 ? e.frame > frame && (best === null || e.frame < best) : e.frame < frame && (best === null || e.frame > best)) {
      best = e.frame;
    }
  }
  return best;
}

/** Short labels for the event kinds, as drawn on the chart and listed compactly. */
export const EVENT_SHORT: Record<GaitEventKind, string> = { initial_contact: 'IC', midstance: 'MS', toe_off: 'TO' };
