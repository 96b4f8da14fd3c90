/**
 * The pure helpers marker following uses on phone clips: the clock over the frames' real times,
 * repeated-picture detection, and where a lost marker's segment carries it. Worked by hand.
 */
import { describe, expect, it } from 'vitest';
import { carriedBySegment, frameClock, isRepeatedPicture } from '../../../server/follow/marker-follower';

describe('frameClock', () => {
  it('measures intervals in mean frame intervals from the timestamps (60 ms over 3 frames: mean 20 ms)', () => {
    const clock = frameClock([0, 12.5, 33.333, 60], 4);
    expect(clock(0, 1)).toBeCloseTo(12.5 / 20, 9);
    expect(clock(2, 1)).toBeCloseTo(20.833 / 20, 9);
    expect(clock(2, 3)).toBeCloseTo(26.667 / 20, 9);
  });

  it('counts frames when the timestamps are missing, too few or not strictly increasing', () => {
    expect(frameClock(undefined, 4)(0, 3)).toBe(3);
    expect(frameClock([0, 10], 4)(3, 1)).toBe(2);
    expect(frameClock([0, 10, 10, 30], 4)(0, 2)).toBe(2);
    expect(frameClock([0, Number.NaN, 20, 30], 4)(0, 2)).toBe(2);
  });
});

describe('isRepeatedPicture', () => {
  const frame = (fill: (i: number) => number) => ({ width: 4, height: 4, data: Uint8Array.from({ length: 16 }, (_, i) => fill(i)) });
  it('the same picture, or one within a grey level on a few pixels, repeats; a moved one does not', () => {
    const a = frame((i) => i * 10);
    expect(
      isRepeatedPicture(
        a,
        frame((i) => i * 10),
      ),
    ).toBe(true);
    // 16 pixels: mean difference 3/16 ≈ 0.19 < 0.5
    expect(
      isRepeatedPicture(
        a,
        frame((i) => i * 10 + (i < 3 ? 1 : 0)),
      ),
    ).toBe(true);
    // mean difference 8/16 = 0.5: not under the limit
    expect(
      isRepeatedPicture(
        a,
        frame((i) => i * 10 + (i < 8 ? 1 : 0)),
      ),
    ).toBe(false);
    expect(isRepeatedPicture(a, { width: 2, height: 8, data: a.data })).toBe(false);
  });
});

describe('carriedBySegment', () => {
  it('two linked markers carry it by their rotation and shift: a foot turned 90° about the ankle', () => {
    // Ankle (0,0) and toe (10,0); heel was at (−2,3). The toe swings to (0,10) about the ankle, which moves to (5,5).
    const last = {
      p: { x: -2, y: 3 },
      linked: new Map([
        ['ankle', { x: 0, y: 0 }],
        ['toe', { x: 10, y: 0 }],
      ]),
    };
    const now = new Map([
      ['ankle', { x: 5, y: 5 }],
      ['toe', { x: 5, y: 15 }],
    ]);
    // Rotating (−2,3) by +90° (x, y) → (−y, x) gives (−3,−2); plus (5,5): (2,3).
    const p = carriedBySegment(last, now)!;
    expect(p.x).toBeCloseTo(2, 9);
    expect(p.y).toBeCloseTo(3, 9);
  });

  it('one linked marker carries it by its shift; none gives null', () => {
    const last = {
      p: { x: 1, y: 1 },
      linked: new Map([
        ['knee', { x: 0, y: 0 }],
        ['toe', { x: 9, y: 9 }],
      ]),
    };
    expect(carriedBySegment(last, new Map([['knee', { x: 4, y: -2 }]]))).toEqual({ x: 5, y: -1 });
    expect(carriedBySegment(last, new Map())).toBeNull();
  });
});
