/**
 * Angle gauge edits as key-level changes (see `annotation-changes.ts`), so placing, dragging and
 * removing a gauge undo, redo and merge like landmarks. Plus where the gauge handles are on screen,
 * for hit-testing. Pure functions.
 */
import type { AngleGauge, FramePoint } from '../../../contracts/annotations';
import type { GaugePointName } from '../../../kinematics/angle-gauge';
import { AnnotationState, Change, GaugeKey, effectiveChanges, valueAt } from './annotation-changes';
import { tidyPoint } from './annotation-ops';
import type { HitCandidate } from './hit-test';
import { Size, ViewTransform, fractionToScreen } from './view-transform';

/** One handle of one gauge. */
export interface GaugeHandleRef {
  id: string;
  point: GaugePointName;
}

const gaugeKey = (id: string): GaugeKey => ({ kind: 'gauge', id });

/** The gauges on one frame, in id order. */
export function gaugesOn(state: AnnotationState, frame: number): AngleGauge[] {
  return state.gauges.filter((g) => g.frame === frame);
}

/** The gauge with this id, or null. */
export function gaugeById(state: AnnotationState, id: string): AngleGauge | null {
  return (valueAt(state, gaugeKey(id)) as AngleGauge | null) ?? null;
}

function tidyGauge(g: AngleGauge): AngleGauge {
  return { id: g.id, frame: g.frame, a: tidyPoint(g.a), vertex: tidyPoint(g.vertex), b: tidyPoint(g.b) };
}

/** Adds a gauge (or replaces the one with its id). */
export function putGaugeChanges(state: AnnotationState, gauge: AngleGauge): Change[] {
  return effectiveChanges([{ key: gaugeKey(gauge.id), before: gaugeById(state, gauge.id), after: tidyGauge(gauge) }]);
}

/** Moves one of a gauge's three points (nothing when the gauge is gone). */
export function moveGaugePointChanges(state: AnnotationState, ref: GaugeHandleRef, to: FramePoint): Change[] {
  const g = gaugeById(state, ref.id);
  if (!g) return [];
  return putGaugeChanges(state, { ...g, [ref.point]: to });
}

/** Removes a gauge (nothing when it is not there). */
export function removeGaugeChanges(state: AnnotationState, id: string): Change[] {
  return effectiveChanges([{ key: gaugeKey(id), before: gaugeById(state, id), after: null }]);
}

/** Screen positions of the handles of `gauges`, vertex listed last (it wins ties: drawn on top). */
export function gaugeHandleCandidates(gauges: readonly AngleGauge[], frame: Size, t: ViewTransform): HitCandidate<GaugeHandleRef>[] {
  const out: HitCandidate<GaugeHandleRef>[] = [];
  for (const g of gauges) {
    for (const point of ['a', 'b', 'vertex'] as const) {
      const s = fractionToScreen(t, frame, g[point]);
      out.push({ key: { id: g.id, point }, x: s.x, y: s.y });
    }
  }
  return out;
}

/** A new gauge id: letters and digits the server accepts (`[A-Za-z0-9_-]{1,40}`). */
export function newGaugeId(random: () => number = Math.random, now: number = Date.now()): string {
  const part = () =>
    Math.floor(random() * 36 ** 6)
      .toString(36)
      .padStart(6, '0');
  return `g${now.toString(36)}${part()}${part()}`;
}
