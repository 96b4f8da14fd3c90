import { AnnotationState, EMPTY_STATE, applyChanges } from './annotation-changes';
import {
  copyPreviousChanges,
  eventFrames,
  neighbourEventFrame,
  nextLandmark,
  previousMarkedFrame,
  removeEventChanges,
  removePointChanges,
  setPointChanges,
  setScaleChanges,
  tidyPoint,
  toggleEventChanges,
} from './annotation-ops';

const s: AnnotationState = {
  ...EMPTY_STATE,
  landmarks: [
    { frame: 2, side: 'left', points: { hip: { x: 0.5, y: 0.4 }, knee: { x: 0.5, y: 0.6 } } },
    { frame: 2, side: 'right', points: { hip: { x: 0.49, y: 0.41 } } },
    { frame: 6, side: 'left', points: { shoulder: { x: 0.48, y: 0.2 } } },
  ],
  events: [
    { frame: 4, side: 'left', kind: 'initial_contact' },
    { frame: 10, side: 'left', kind: 'toe_off' },
    { frame: 10, side: 'right', kind: 'midstance' },
  ],
};

describe('landmark edits', () => {
  it('rounds and clamps points onto the frame', () => {
    expect(tidyPoint({ x: 0.1234567, y: 1.2 })).toEqual({ x: 0.12346, y: 1 });
    expect(tidyPoint({ x: -0.3, y: 0.5 })).toEqual({ x: 0, y: 0.5 });
  });

  it('places, moves and removes a point, with before/after for undo', () => {
    const place = setPointChanges(s, 6, 'left', 'hip', { x: 0.5, y: 0.42 });
    expect(place).toEqual([{ key: { kind: 'point', frame: 6, side: 'left', landmark: 'hip' }, before: null, after: { x: 0.5, y: 0.42 } }]);
    const move = setPointChanges(s, 2, 'left', 'hip', { x: 0.51, y: 0.4 });
    expect(move[0].before).toEqual({ x: 0.5, y: 0.4 });
    expect(setPointChanges(s, 2, 'left', 'hip', { x: 0.5, y: 0.4 })).toEqual([]);
    expect(removePointChanges(s, 2, 'left', 'knee')).toHaveLength(1);
    expect(removePointChanges(s, 2, 'left', 'toe')).toEqual([]);
  });

  it('advances to the next landmark not yet placed, in body order', () => {
    expect(nextLandmark('shoulder', { shoulder: 1 })).toBe('hip');
    expect(nextLandmark('hip', { shoulder: 1, hip: 1, knee: 1 })).toBe('ankle');
    expect(nextLandmark('toe', { toe: 1, heel: 1 })).toBe('shoulder');
    expect(nextLandmark('knee', { shoulder: 1, hip: 1, knee: 1, ankle: 1, heel: 1, toe: 1 })).toBe('ankle');
  });

  it('copies both sides of the nearest earlier marked frame', () => {
    expect(previousMarkedFrame(s, 6)).toBe(2);
    expect(previousMarkedFrame(s, 2)).toBeNull();
    const { from, changes } = copyPreviousChanges(s, 5);
    expect(from).toBe(2);
    const after = applyChanges(s, changes);
    const row = (side: 'left' | 'right') => after.landmarks.find((l) => l.frame === 5 && l.side === side)?.points;
    expect(row('left')).toEqual({ hip: { x: 0.5, y: 0.4 }, knee: { x: 0.5, y: 0.6 } });
    expect(row('right')).toEqual({ hip: { x: 0.49, y: 0.41 } });
  });

  it('replaces the copied side on the target frame and leaves nothing to copy at the start', () => {
    const { from, changes } = copyPreviousChanges(s, 8);
    expect(from).toBe(6);
    const after = applyChanges(s, changes);
    expect(after.landmarks.find((l) => l.frame === 8)?.points).toEqual({ shoulder: { x: 0.48, y: 0.2 } });
    expect(copyPreviousChanges(s, 1)).toEqual({ from: null, changes: [] });
  });
});

describe('gait event edits', () => {
  it('toggles an event on and off', () => {
    const on = applyChanges(s, toggleEventChanges(s, 7, 'right', 'initial_contact'));
    expect(on.events.map((e) => e.frame)).toEqual([4, 7, 10, 10]);
    const off = applyChanges(on, toggleEventChanges(on, 7, 'right', 'initial_contact'));
    expect(off.events).toEqual(s.events);
  });

  it('replaces another kind marked for the same side on that frame (one event per side and frame)', () => {
    const after = applyChanges(s, toggleEventChanges(s, 4, 'left', 'toe_off'));
    expect(after.events.filter((e) => e.frame === 4)).toEqual([{ frame: 4, side: 'left', kind: 'toe_off' }]);
    const other = applyChanges(s, toggleEventChanges(s, 4, 'right', 'toe_off'));
    expect(other.events.filter((e) => e.frame === 4)).toHaveLength(2);
  });

  it('removes one event', () => {
    expect(applyChanges(s, removeEventChanges(s, s.events[0])).events).toHaveLength(2);
    expect(removeEventChanges(s, { frame: 99, side: 'left', kind: 'midstance' })).toEqual([]);
  });

  it('finds the neighbouring event frames', () => {
    expect(eventFrames(s.events)).toEqual([4, 10]);
    expect(neighbourEventFrame(s.events, 5, 1)).toBe(10);
    expect(neighbourEventFrame(s.events, 5, -1)).toBe(4);
    expect(neighbourEventFrame(s.events, 4, -1)).toBeNull();
    expect(neighbourEventFrame(s.events, 10, 1)).toBeNull();
  });
});

describe('scale bar edits', () => {
  it('sets and clears the scale bar', () => {
    const bar = { frame: 1, a: { x: 0.1, y: 0.9 }, b: { x: 0.4, y: 0.9 }, lengthM: 0.5 };
    const set = setScaleChanges(s, bar);
    expect(set).toHaveLength(1);
    const withBar = applyChanges(s, set);
    expect(withBar.scale).toEqual(bar);
    expect(setScaleChanges(withBar, bar)).toEqual([]);
    expect(applyChanges(withBar, setScaleChanges(withBar, null)).scale).toBeNull();
  });
});
