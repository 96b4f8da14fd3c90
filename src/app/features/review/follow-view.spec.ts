import type { FrameLandmarks } from '../../../contracts/annotations';
import { followBlockedReason, followRangeProblem, followStatusText, isFollowed, lowConfidenceFrames } from './follow-view';

// Hand-made rows [calc]: the expected frames are read off the rows below.
const rows: FrameLandmarks[] = [
  {
    frame: 7,
    side: 'right',
    points: { hip: { x: 0.5, y: 0.4, origin: 'followed', confidence: 0.3 }, knee: { x: 0.5, y: 0.6, origin: 'followed', confidence: 0.2 } },
  },
  { frame: 3, side: 'left', points: { hip: { x: 0.5, y: 0.4, origin: 'followed', confidence: 0.49 } } },
  { frame: 3, side: 'right', points: { hip: { x: 0.5, y: 0.4, origin: 'followed', confidence: 0.9 } } },
  {
    frame: 5,
    side: 'right',
    points: { hip: { x: 0.5, y: 0.4, origin: 'followed', confidence: 0.5 }, toe: { x: 0.2, y: 0.9, origin: 'placed' } },
  },
  { frame: 9, side: 'right', points: { hip: { x: 0.5, y: 0.4 } } },
];

describe('follow view', () => {
  it('flags each frame once where a followed point is below 0.5 (0.5 itself is not flagged; placed points never)', () => {
    expect(lowConfidenceFrames(rows)).toEqual([3, 7]);
  });

  it('tells followed points from placed ones (no origin = placed)', () => {
    expect(isFollowed(rows[0]!.points.hip)).toBe(true);
    expect(isFollowed(rows[3]!.points.toe)).toBe(false);
    expect(isFollowed(rows[4]!.points.hip)).toBe(false);
  });

  it('puts progress in words', () => {
    expect(followStatusText({ state: 'running', progress: { done: 40, total: 120 }, error: null })).toBe(
      'Following markers… 40 of 120 frames',
    );
    expect(followStatusText({ state: 'failed', progress: null, error: 'Frame 3 has no landmarks any more.' })).toBe(
      'Following stopped: Frame 3 has no landmarks any more.',
    );
    expect(followStatusText({ state: 'cancelled', progress: null, error: null })).toContain('nothing it followed was kept');
  });

  it('takes a range inside the clip, two frames or more, holding the frame with the points (a 120-frame clip: frames 0–119)', () => {
    expect(followRangeProblem({ from: 0, to: 119 }, 60, 120)).toBeNull();
    expect(followRangeProblem({ from: 60, to: 61 }, 60, 120)).toBeNull();
    expect(followRangeProblem({ from: 0, to: 120 }, 60, 120)).toBe("The clip's frames are 0–119.");
    expect(followRangeProblem({ from: -1, to: 50 }, 20, 120)).toBe("The clip's frames are 0–119.");
    expect(followRangeProblem({ from: 40, to: 40 }, 40, 120)).toMatch(/at least two frames/);
    expect(followRangeProblem({ from: 70, to: 30 }, 40, 120)).toMatch(/at least two frames/);
    expect(followRangeProblem({ from: 10, to: 50 }, 60, 120)).toBe(
      'This frame (60) is outside 10–50: follow from a frame inside the range.',
    );
    expect(followRangeProblem({ from: 1.5, to: 50 }, 20, 120)).toBe('Frame numbers are whole numbers.');
  });

  it('says why following cannot start yet: no markers on this frame first, then edits still saving; nothing while running or when ready', () => {
    expect(followBlockedReason({ running: false, pointsHere: 0, unsaved: false })).toBe(
      'Place markers on this frame first: following starts from the points you placed here.',
    );
    expect(followBlockedReason({ running: false, pointsHere: 0, unsaved: true })).toMatch(/^Place markers/);
    expect(followBlockedReason({ running: false, pointsHere: 6, unsaved: true })).toBe(
      'Saving your marks… following can start once they are saved.',
    );
    expect(followBlockedReason({ running: false, pointsHere: 6, unsaved: false })).toBeNull();
    expect(followBlockedReason({ running: true, pointsHere: 0, unsaved: true })).toBeNull();
  });
});
