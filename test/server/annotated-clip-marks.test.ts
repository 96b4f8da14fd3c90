/**
 * What an annotated clip freezes of a clip's marks when it is made: the frames shown, plus the
 * nearest frame carrying each side's landmarks before and after the range, so the first and last
 * frames interpolate exactly as they would inside a longer range ([calc]: the expected frames are
 * picked by hand from the marks below).
 */
import { describe, expect, it } from 'vitest';
import type { FrameLandmarks, GaitEventMark } from '../../src/contracts/annotations';
import { freezeMarks } from '../../server/annotated-clips/annotated-clips-service';
import { landmarkFill } from '../../src/kinematics';

const lm = (frame: number, side: 'left' | 'right', x = 0.5): FrameLandmarks => ({ frame, side, points: { hip: { x, y: 0.5 } } });
const ev = (frame: number): GaitEventMark => ({ frame, side: 'right', kind: 'initial_contact' });

describe('freezeMarks', () => {
  const landmarks = [lm(2, 'right', 0.1), lm(8, 'right', 0.4), lm(12, 'right', 0.6), lm(30, 'right', 0.9), lm(5, 'left'), lm(40, 'left')];
  const frozen = freezeMarks({ landmarks, events: [ev(3), ev(11), ev(25)], gauges: [] }, 10, 20);

  it('keeps the range and the nearest marked frame of each side either side of it', () => {
    // Right: 8 (before 10), 12 (inside), 30 (after 20); 2 is not needed. Left: 5 (before) and 40 (after).
    expect(frozen.landmarks.map((l) => `${l.side}:${l.frame}`).sort()).toEqual(['left:40', 'left:5', 'right:12', 'right:30', 'right:8']);
    expect(frozen.events.map((e) => e.frame)).toEqual([11]);
  });

  it('interpolates the first frame of the range as the whole clip would', () => {
    // Frame 10 between right 8 (0.4) and 12 (0.6): 0.5, with or without the frames outside the range.
    const whole = landmarkFill(landmarks)
      .at(10)
      .landmarks.find((l) => l.side === 'right')!;
    const cut = landmarkFill(frozen.landmarks)
      .at(10)
      .landmarks.find((l) => l.side === 'right')!;
    expect(cut.points.hip!.x).toBeCloseTo(0.5, 12);
    expect(cut.points).toEqual(whole.points);
  });
});
