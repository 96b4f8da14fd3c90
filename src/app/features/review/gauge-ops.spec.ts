import type { AngleGauge } from '../../../contracts/annotations';
import { AnnotationState, EMPTY_STATE, applyChanges, invertChanges, mergeOnto } from './annotation-changes';
import { gaugeHandleCandidates, gaugesOn, moveGaugePointChanges, newGaugeId, putGaugeChanges, removeGaugeChanges } from './gauge-ops';

const g1: AngleGauge = { id: 'g1', frame: 4, a: { x: 0.2, y: 0.5 }, vertex: { x: 0.4, y: 0.5 }, b: { x: 0.4, y: 0.3 } };
const g2: AngleGauge = { id: 'g2', frame: 4, a: { x: 0.6, y: 0.6 }, vertex: { x: 0.7, y: 0.7 }, b: { x: 0.8, y: 0.6 } };
const s: AnnotationState = { ...EMPTY_STATE, gauges: [g1] };

describe('angle gauge edits', () => {
  it('adds a gauge as one change that undoes to nothing', () => {
    const add = putGaugeChanges(s, g2);
    expect(add).toEqual([{ key: { kind: 'gauge', id: 'g2' }, before: null, after: g2 }]);
    const after = applyChanges(s, add);
    expect(gaugesOn(after, 4).map((g) => g.id)).toEqual(['g1', 'g2']);
    expect(applyChanges(after, invertChanges(add))).toEqual(s);
  });

  it('moves one point (tidied onto the frame) and leaves the others', () => {
    const move = moveGaugePointChanges(s, { id: 'g1', point: 'vertex' }, { x: 0.4123456, y: 1.3 });
    const moved = applyChanges(s, move).gauges[0]!;
    expect(moved.vertex).toEqual({ x: 0.41235, y: 1 });
    expect(moved.a).toEqual(g1.a);
    expect(moveGaugePointChanges(s, { id: 'gone', point: 'a' }, { x: 0.1, y: 0.1 })).toEqual([]);
    expect(moveGaugePointChanges(s, { id: 'g1', point: 'a' }, g1.a)).toEqual([]);
  });

  it('removes a gauge, and nothing when it is not there', () => {
    expect(applyChanges(s, removeGaugeChanges(s, 'g1')).gauges).toEqual([]);
    expect(removeGaugeChanges(s, 'nope')).toEqual([]);
  });

  it('keeps gauges across a save conflict: local edits go on top of the server’s newer copy', () => {
    const local = applyChanges(s, putGaugeChanges(s, g2));
    const remote: AnnotationState = { ...s, gauges: [{ ...g1, frame: 4, a: { x: 0.1, y: 0.5 } }] };
    const { merged, conflicts } = mergeOnto(s, local, remote);
    expect(merged.gauges.map((g) => g.id)).toEqual(['g1', 'g2']);
    expect(merged.gauges[0]!.a).toEqual({ x: 0.1, y: 0.5 });
    expect(conflicts).toBe(0);
  });

  it('lists handles with the vertex last, in screen pixels', () => {
    const c = gaugeHandleCandidates([g1], { width: 1000, height: 500 }, { scale: 0.5, tx: 10, ty: 0 });
    expect(c.map((h) => h.key.point)).toEqual(['a', 'b', 'vertex']);
    expect(c[2]).toMatchObject({ x: 10 + 0.4 * 1000 * 0.5, y: 0.5 * 500 * 0.5 });
  });

  it('makes ids the server accepts, different each time', () => {
    const a = newGaugeId();
    expect(a).toMatch(/^[A-Za-z0-9_-]{1,40}$/);
    expect(newGaugeId()).not.toBe(a);
  });
});
