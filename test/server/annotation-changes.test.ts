/**
 * The pure diff of an annotation save (server/annotations/annotation-changes.ts). Worked examples
 * [calc]: the expected rows are counted by hand from the small inputs below.
 */
import { describe, expect, it } from 'vitest';
import { landmarkChanges, normalizeMarks, sameEvents, sameGauges, sameScale } from '../../server/annotations/annotation-changes';
import type { FrameLandmarks } from '../../src/contracts/annotations';

const hipKnee = (frame: number, side: 'left' | 'right', x = 0.5): FrameLandmarks => ({
  frame,
  side,
  points: { hip: { x, y: 0.4 }, knee: { x, y: 0.6 } },
});

describe('normalizeMarks', () => {
  it('orders as a read does (frame, then left before right), fills the origin of each point, drops entries without points', () => {
    const m = normalizeMarks({
      landmarks: [hipKnee(9, 'right'), { frame: 4, side: 'left', points: {} }, hipKnee(3, 'right'), hipKnee(3, 'left', 0.2)],
      events: [
        { frame: 12, side: 'right', kind: 'toe_off' },
        { frame: 3, side: 'right', kind: 'initial_contact' },
        { frame: 3, side: 'left', kind: 'midstance' },
      ],
      scale: null,
      gauges: [
        { id: 'b', frame: 2, a: { x: 0, y: 0 }, vertex: { x: 0.5, y: 0.5 }, b: { x: 1, y: 0 } },
        { id: 'a', frame: 2, a: { x: 0, y: 0 }, vertex: { x: 0.5, y: 0.5 }, b: { x: 1, y: 0 } },
        { id: 'c', frame: 1, a: { x: 0, y: 0 }, vertex: { x: 0.5, y: 0.5 }, b: { x: 1, y: 0 } },
      ],
    });
    expect(m.landmarks.map((l) => `${l.frame}${l.side[0]}${l.points.hip?.origin}`)).toEqual(['3lplaced', '3rplaced', '9rplaced']);
    expect(m.events.map((e) => `${e.frame}${e.side[0]}`)).toEqual(['3l', '3r', '12r']);
    expect(m.gauges.map((g) => g.id)).toEqual(['c', 'a', 'b']);
  });

  it("keeps a point's origin and confidence, reads an earlier client's tracked entry as followed, and leaves confidence out when not given", () => {
    const m = normalizeMarks({
      landmarks: [
        { frame: 1, side: 'left', points: { hip: { x: 0.5, y: 0.4, origin: 'followed', confidence: 0.8 }, knee: { x: 0.5, y: 0.6 } } },
        { frame: 2, side: 'left', source: 'tracked', points: { hip: { x: 0.5, y: 0.4 }, knee: { x: 0.5, y: 0.6, origin: 'placed' } } },
        { frame: 3, side: 'left', source: 'manual', points: { hip: { x: 0.5, y: 0.4 } } },
      ],
      events: [{ frame: 1, side: 'left', kind: 'toe_off', origin: 'proposed' }],
      scale: null,
    });
    expect(m.landmarks.map((l) => l.points)).toEqual([
      { hip: { x: 0.5, y: 0.4, origin: 'followed', confidence: 0.8 }, knee: { x: 0.5, y: 0.6, origin: 'placed' } },
      { hip: { x: 0.5, y: 0.4, origin: 'followed' }, knee: { x: 0.5, y: 0.6, origin: 'placed' } },
      { hip: { x: 0.5, y: 0.4, origin: 'placed' } },
    ]);
    expect(m.landmarks.some((l) => 'source' in l)).toBe(false);
    expect(m.events[0]!.origin).toBe('proposed');
  });
});

describe('landmarkChanges', () => {
  it('one point moved: one changed row, nothing added or removed', () => {
    const before = [hipKnee(3, 'left'), hipKnee(3, 'right')];
    const after = [hipKnee(3, 'left'), { ...hipKnee(3, 'right'), points: { hip: { x: 0.51, y: 0.4 }, knee: { x: 0.5, y: 0.6 } } }];
    expect(landmarkChanges(before, after)).toEqual({
      removed: [],
      changed: [{ frame: 3, side: 'right', landmark: 'hip', x: 0.51, y: 0.4, origin: 'placed', confidence: null }],
      added: [],
    });
  });

  it('a frame cleared and another marked: its two rows removed, two added', () => {
    const c = landmarkChanges([hipKnee(3, 'left'), hipKnee(5, 'left')], [hipKnee(3, 'left'), hipKnee(7, 'right')]);
    expect(c.changed).toEqual([]);
    expect(c.removed).toEqual([
      { frame: 5, side: 'left', landmark: 'hip' },
      { frame: 5, side: 'left', landmark: 'knee' },
    ]);
    expect(c.added.map((p) => `${p.frame}${p.side[0]}${p.landmark}`)).toEqual(['7rhip', '7rknee']);
  });

  it('a point taken away from a frame that keeps others: that row only', () => {
    const c = landmarkChanges([hipKnee(3, 'left')], [{ frame: 3, side: 'left', points: { hip: { x: 0.5, y: 0.4 } } }]);
    expect(c).toEqual({ removed: [{ frame: 3, side: 'left', landmark: 'knee' }], changed: [], added: [] });
  });

  it('a followed point the coach moves onto the same spot becomes placed: one changed row for the new origin', () => {
    const followed = { frame: 3, side: 'left' as const, points: { hip: { x: 0.5, y: 0.4, origin: 'followed' as const, confidence: 0.7 } } };
    const placed = { frame: 3, side: 'left' as const, points: { hip: { x: 0.5, y: 0.4, origin: 'placed' as const } } };
    expect(landmarkChanges([followed], [placed])).toEqual({
      removed: [],
      changed: [{ frame: 3, side: 'left', landmark: 'hip', x: 0.5, y: 0.4, origin: 'placed', confidence: null }],
      added: [],
    });
  });

  it('only the confidence differs: that row changes; origin and confidence the same: nothing', () => {
    const at = (confidence: number) => ({
      frame: 3,
      side: 'left' as const,
      points: {
        hip: { x: 0.5, y: 0.4, origin: 'followed' as const, confidence },
        knee: { x: 0.5, y: 0.6, origin: 'followed' as const, confidence: 0.9 },
      },
    });
    expect(landmarkChanges([at(0.9)], [at(0.4)]).changed).toEqual([
      { frame: 3, side: 'left', landmark: 'hip', x: 0.5, y: 0.4, origin: 'followed', confidence: 0.4 },
    ]);
    expect(landmarkChanges([at(0.9)], [at(0.9)])).toEqual({ removed: [], changed: [], added: [] });
  });

  it('an added followed point keeps its origin and confidence in its row', () => {
    const c = landmarkChanges([], [{ frame: 0, side: 'right', points: { toe: { x: 0.2, y: 0.9, origin: 'followed', confidence: 0.35 } } }]);
    expect(c.added).toEqual([{ frame: 0, side: 'right', landmark: 'toe', x: 0.2, y: 0.9, origin: 'followed', confidence: 0.35 }]);
  });

  it('from nothing: every point added', () => {
    expect(landmarkChanges([], [hipKnee(1, 'left'), hipKnee(2, 'right')]).added).toHaveLength(4);
  });
});

describe('same events, scale, gauges', () => {
  it('compares by value', () => {
    expect(sameEvents([{ frame: 1, side: 'left', kind: 'toe_off' }], [{ frame: 1, side: 'left', kind: 'toe_off' }])).toBe(true);
    expect(sameEvents([{ frame: 1, side: 'left', kind: 'toe_off' }], [{ frame: 1, side: 'left', kind: 'midstance' }])).toBe(false);
    const bar = { frame: 0, a: { x: 0.1, y: 0.9 }, b: { x: 0.6, y: 0.9 }, lengthM: 1 };
    expect(sameScale(bar, { ...bar, a: { ...bar.a } })).toBe(true);
    expect(sameScale(bar, { ...bar, lengthM: 1.5 })).toBe(false);
    expect(sameScale(null, null)).toBe(true);
    expect(sameScale(bar, null)).toBe(false);
    const g = { id: 'g1', frame: 2, a: { x: 0, y: 0 }, vertex: { x: 0.5, y: 0.5 }, b: { x: 1, y: 0 } };
    expect(sameGauges([g], [{ ...g }])).toBe(true);
    expect(sameGauges([g], [{ ...g, vertex: { x: 0.5, y: 0.4 } }])).toBe(false);
  });
});
