import type { ScaleBar } from '../../../contracts/annotations';
import {
  AnnotationState,
  EMPTY_STATE,
  applyChanges,
  changesThatFit,
  diffStates,
  invertChanges,
  mergeOnto,
  sameState,
  sortEvents,
} from './annotation-changes';
import { setPointChanges, setScaleChanges, toggleEventChanges } from './annotation-ops';

const scale: ScaleBar = { frame: 0, a: { x: 0.1, y: 0.9 }, b: { x: 0.6, y: 0.9 }, lengthM: 1 };

function state(partial: Partial<AnnotationState> = {}): AnnotationState {
  return { ...EMPTY_STATE, ...partial };
}

const base = state({
  landmarks: [
    { frame: 3, side: 'left', points: { hip: { x: 0.5, y: 0.4 }, knee: { x: 0.52, y: 0.6 } } },
    { frame: 9, side: 'left', points: { hip: { x: 0.55, y: 0.41 } } },
  ],
  events: [{ frame: 3, side: 'left', kind: 'initial_contact' }],
  scale: null,
});

describe('diffStates / applyChanges', () => {
  it('finds no changes between equal states', () => {
    expect(diffStates(base, structuredClone(base))).toEqual([]);
    expect(sameState(base, structuredClone(base))).toBe(true);
  });

  it('turns one state into another and back', () => {
    const target = state({
      landmarks: [
        { frame: 3, side: 'left', points: { hip: { x: 0.5, y: 0.45 } } },
        { frame: 5, side: 'right', points: { toe: { x: 0.7, y: 0.95 } } },
      ],
      events: [{ frame: 12, side: 'right', kind: 'toe_off' }],
      scale,
    });
    const changes = diffStates(base, target);
    const forward = applyChanges(base, changes);
    expect(sameState(forward, target)).toBe(true);
    const back = applyChanges(forward, invertChanges(changes));
    expect(sameState(back, base)).toBe(true);
  });

  it('drops landmark rows that lose their last point and keeps rows sorted', () => {
    const removeHip = setPointChanges(base, 9, 'left', 'hip', { x: 0, y: 0 }).map((c) => ({ ...c, after: null }));
    const after = applyChanges(base, removeHip as never);
    expect(after.landmarks.map((l) => l.frame)).toEqual([3]);
    const added = applyChanges(base, setPointChanges(base, 1, 'right', 'toe', { x: 0.2, y: 0.9 }));
    expect(added.landmarks.map((l) => `${l.frame}${l.side}`)).toEqual(['1right', '3left', '9left']);
  });

  it('does not mutate the state it is given', () => {
    const copy = structuredClone(base);
    applyChanges(base, toggleEventChanges(base, 7, 'right', 'toe_off'));
    applyChanges(base, setPointChanges(base, 3, 'left', 'hip', { x: 0.1, y: 0.1 }));
    expect(base).toEqual(copy);
  });
});

describe('sortEvents', () => {
  it('orders by frame, then side, then initial contact → midstance → toe-off', () => {
    const sorted = sortEvents([
      { frame: 5, side: 'right', kind: 'toe_off' },
      { frame: 5, side: 'left', kind: 'toe_off' },
      { frame: 5, side: 'left', kind: 'initial_contact' },
      { frame: 2, side: 'right', kind: 'midstance' },
    ]);
    expect(sorted.map((e) => `${e.frame}${e.side[0]}${e.kind}`)).toEqual(['2rmidstance', '5linitial_contact', '5ltoe_off', '5rtoe_off']);
  });
});

describe('mergeOnto (local edits on top of a newer server copy)', () => {
  it('keeps what someone else saved and re-applies the local edits', () => {
    const local = applyChanges(base, [
      ...setPointChanges(base, 3, 'left', 'ankle', { x: 0.53, y: 0.8 }),
      ...toggleEventChanges(base, 20, 'left', 'toe_off'),
    ]);
    const remote = applyChanges(base, [...setScaleChanges(base, scale), ...toggleEventChanges(base, 30, 'right', 'midstance')]);
    const { merged, applied, conflicts } = mergeOnto(base, local, remote);
    expect(applied).toBe(2);
    expect(conflicts).toBe(0);
    expect(merged.scale).toEqual(scale);
    expect(merged.events.map((e) => e.frame)).toEqual([3, 20, 30]);
    expect(merged.landmarks[0].points.ankle).toEqual({ x: 0.53, y: 0.8 });
  });

  it('lets the local edit win where both changed the same point, and counts it', () => {
    const local = applyChanges(base, setPointChanges(base, 3, 'left', 'hip', { x: 0.6, y: 0.4 }));
    const remote = applyChanges(base, setPointChanges(base, 3, 'left', 'hip', { x: 0.4, y: 0.4 }));
    const { merged, conflicts } = mergeOnto(base, local, remote);
    expect(conflicts).toBe(1);
    expect(merged.landmarks[0].points.hip).toEqual({ x: 0.6, y: 0.4 });
  });

  it('re-applies a local deletion and keeps a remote deletion', () => {
    const local = applyChanges(base, toggleEventChanges(base, 3, 'left', 'initial_contact'));
    const remote = applyChanges(base, setPointChanges(base, 9, 'left', 'hip', { x: 0, y: 0 }).map((c) => ({ ...c, after: null })) as never);
    const { merged, conflicts } = mergeOnto(base, local, remote);
    expect(conflicts).toBe(0);
    expect(merged.events).toEqual([]);
    expect(merged.landmarks.map((l) => l.frame)).toEqual([3]);
  });

  it('is the server copy when nothing was edited locally', () => {
    const remote = applyChanges(base, setScaleChanges(base, scale));
    const { merged, applied } = mergeOnto(base, base, remote);
    expect(applied).toBe(0);
    expect(sameState(merged, remote)).toBe(true);
  });

  it('does not count a conflict when both made the same edit', () => {
    const edit = setPointChanges(base, 3, 'left', 'toe', { x: 0.6, y: 0.95 });
    const { conflicts } = mergeOnto(base, applyChanges(base, edit), applyChanges(base, edit));
    expect(conflicts).toBe(0);
  });
});

describe('landmark origin through edits', () => {
  const followed = state({
    landmarks: [{ frame: 7, side: 'right', points: { knee: { x: 0.5, y: 0.6, origin: 'followed', confidence: 0.42 } } }],
  });

  it('a followed point the coach moves becomes placed; undo brings back the followed point with its confidence', () => {
    const edit = setPointChanges(followed, 7, 'right', 'knee', { x: 0.51, y: 0.6 });
    const moved = applyChanges(followed, edit);
    expect(moved.landmarks[0]!.points.knee).toEqual({ x: 0.51, y: 0.6 });
    const undone = applyChanges(moved, invertChanges(edit));
    expect(undone.landmarks[0]!.points.knee).toEqual({ x: 0.5, y: 0.6, origin: 'followed', confidence: 0.42 });
  });

  it('a point that only changes origin (followed → placed) counts as a change', () => {
    const placed = state({ landmarks: [{ frame: 7, side: 'right', points: { knee: { x: 0.5, y: 0.6, origin: 'placed' } } }] });
    expect(diffStates(followed, placed)).toHaveLength(1);
    expect(sameState(placed, state({ landmarks: [{ frame: 7, side: 'right', points: { knee: { x: 0.5, y: 0.6 } } }] }))).toBe(true);
  });
});

describe('changesThatFit', () => {
  it('keeps the changes whose key still holds their before value and counts the rest', () => {
    const placed = setPointChanges(EMPTY_STATE, 3, 'left', 'knee', { x: 0.4, y: 0.5 });
    const marked = toggleEventChanges(EMPTY_STATE, 3, 'left', 'toe_off');
    const now = applyChanges(EMPTY_STATE, [...placed, ...marked]);
    // Someone else's save moved the knee since.
    const moved = applyChanges(now, setPointChanges(now, 3, 'left', 'knee', { x: 0.7, y: 0.5 }));
    const { fit, skipped } = changesThatFit(moved, invertChanges([...placed, ...marked]));
    expect(skipped).toBe(1);
    expect(fit.map((c) => c.key.kind)).toEqual(['event']);
    expect(changesThatFit(now, invertChanges([...placed, ...marked])).skipped).toBe(0);
  });
});
