/**
 * Timing of annotated clips: the slow-motion rule, the per-step time-warp of a side-by-side clip,
 * and landmarks between marked frames. Every expected value is worked by hand in the comment
 * beside it ([calc]: recomputed here from the rule's arithmetic, not from the functions' output).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { FrameLandmarks, GaitEventMark } from '../../../src/contracts/annotations';
import {
  defaultClipRange,
  frameRangeProblem,
  landmarkFill,
  pairInitialContacts,
  sideBySideSteps,
  slowMotionLength,
  slowMotionTiming,
  warpToRetest,
} from '../../../src/kinematics';

const ic = (frame: number, side: 'left' | 'right'): GaitEventMark => ({ frame, side, kind: 'initial_contact' });
const to = (frame: number, side: 'left' | 'right'): GaitEventMark => ({ frame, side, kind: 'toe_off' });

describe('slowMotionTiming: repeat each source frame until the video runs at ≥ 24 frames/s', () => {
  it.each([
    // fps, factor, shown/s = fps × factor, repeat = ⌈24 ÷ shown⌉ (≥ 1), video fps = shown × repeat
    [120, 0.25, 1, 30], // 30 shown/s ≥ 24 → no repeat
    [30, 0.25, 4, 30], // 7.5/s: 24 ÷ 7.5 = 3.2 → 4 → 30 fps
    [60, 0.125, 4, 30], // 7.5/s → 4 → 30 fps
    [120, 0.125, 2, 30], // 15/s: 24 ÷ 15 = 1.6 → 2 → 30 fps
    [240, 0.125, 1, 30], // 30/s
    [30, 1, 1, 30],
    [25, 0.5, 2, 25], // 12.5/s: 1.92 → 2 → 25 fps
    [48, 0.5, 1, 24], // exactly 24/s: no repeat
    [240, 1, 1, 240], // real time keeps the source rate
  ])('%d fps at %d× real time: %d copies of each frame, %d frames/s', (fps, factor, repeat, out) => {
    const t = slowMotionTiming(fps, factor);
    expect(t.repeat).toBe(repeat);
    expect(t.outputFps).toBeCloseTo(out, 9);
  });

  it('gives frames and seconds of a range: 240 frames of 120 fps at ¼ → 240 frames, 8 s; of 30 fps at ¼ → 960 frames, 32 s', () => {
    expect(slowMotionLength(240, 120, 0.25)).toEqual({ frames: 240, seconds: 8 }); // 240 ÷ (120 × ¼) = 8
    expect(slowMotionLength(240, 30, 0.25)).toEqual({ frames: 960, seconds: 32 }); // 240 × 4; 240 ÷ 7.5 = 32
    expect(slowMotionLength(100, 29.97, 0.5).frames).toBe(200); // 14.985/s → 24 ÷ 14.985 = 1.6 → 2
  });

  it('refuses a frame rate or factor that is not a rate', () => {
    expect(() => slowMotionTiming(0, 0.5)).toThrow(RangeError);
    expect(() => slowMotionTiming(30, 2)).toThrow(RangeError);
  });

  it('never runs below 24 frames/s and never repeats more than needed (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 10, max: 300, noNaN: true }), fc.constantFrom(1, 0.5, 0.25, 0.125), (fps, factor) => {
        const { repeat, outputFps } = slowMotionTiming(fps, factor);
        expect(outputFps).toBeGreaterThanOrEqual(24 - 1e-6);
        if (repeat > 1) expect(fps * factor * (repeat - 1)).toBeLessThan(24);
      }),
    );
  });
});

describe('pairInitialContacts: each Baseline contact with the next Re-test contact of the same side', () => {
  it('pairs alternating contacts in order, ignoring toe-offs', () => {
    const baseline = [ic(10, 'right'), to(25, 'right'), ic(31, 'left'), ic(52, 'right')];
    const retest = [ic(4, 'right'), ic(28, 'left'), to(40, 'left'), ic(50, 'right'), ic(75, 'left')];
    expect(pairInitialContacts(baseline, retest)).toEqual([
      [10, 4],
      [31, 28],
      [52, 50],
    ]);
  });

  it('skips Re-test contacts of the other side until the sides agree', () => {
    // The Re-test starts with a left contact: the Baseline's first (right) contact pairs with the Re-test's right at 30.
    expect(pairInitialContacts([ic(10, 'right'), ic(32, 'left')], [ic(8, 'left'), ic(30, 'right'), ic(52, 'left')])).toEqual([
      [10, 30],
      [32, 52],
    ]);
  });

  it('a step missing in the Re-test skips that step instead of shifting the rest', () => {
    // Re-test left contact at 28 was not marked: Baseline left 31 pairs with the next left (72).
    const pairs = pairInitialContacts(
      [ic(10, 'right'), ic(31, 'left'), ic(52, 'right')],
      [ic(4, 'right'), ic(50, 'right'), ic(72, 'left')],
    );
    expect(pairs).toEqual([
      [10, 4],
      [31, 72],
    ]);
  });
});

describe('warpToRetest: initial contacts line up, linear in between', () => {
  // Baseline contacts at 10, 31, 52; the Re-test's at 4, 28, 50 (steps of 24 and 22 frames against 21 and 21).
  const pairs = [
    [10, 4],
    [31, 28],
    [52, 50],
  ] as const;

  it('maps each Baseline contact exactly onto its Re-test contact', () => {
    expect(pairs.map(([b]) => warpToRetest(pairs, 1, 100, b))).toEqual([4, 28, 50]);
  });

  it('runs linearly within a step', () => {
    // b = 20 in step 10–31: r = 4 + (20 − 10) × 24 / 21 = 4 + 11.43 = 15.43 → 15
    expect(warpToRetest(pairs, 1, 100, 20)).toBe(15);
    // b = 41 in step 31–52: r = 28 + 10 × 22 / 21 = 38.48 → 38
    expect(warpToRetest(pairs, 1, 100, 41)).toBe(38);
    // b = 11: 4 + 24/21 = 5.14 → 5
    expect(warpToRetest(pairs, 1, 100, 11)).toBe(5);
  });

  it('runs at real-time speed outside the paired steps, scaled by the frame-rate ratio, within the clip', () => {
    // Re-test at 100 fps beside a 60 fps Baseline: ratio 100/60. b = 55: 50 + 3 × 1.667 = 55 → 55
    expect(warpToRetest(pairs, 100 / 60, 100, 55)).toBe(55);
    // b = 7: 4 − 3 × 1.667 = −1 → clamped to 0
    expect(warpToRetest(pairs, 100 / 60, 100, 7)).toBe(0);
    // b = 90: 50 + 38 × 1.667 = 113.3 → last frame 99
    expect(warpToRetest(pairs, 100 / 60, 100, 90)).toBe(99);
  });

  it('never runs backwards (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: 1, max: 40 }), fc.integer({ min: 1, max: 40 })), { minLength: 1, maxLength: 8 }),
        fc.double({ min: 0.25, max: 4, noNaN: true }),
        (steps, ratio) => {
          const ps: [number, number][] = [];
          let b = 5;
          let r = 5;
          for (const [db, dr] of steps) ps.push([(b += db), (r += dr)]);
          let prev = -1;
          for (let f = 0; f < b + 20; f++) {
            const now = warpToRetest(ps, ratio, 10_000, f);
            expect(now).toBeGreaterThanOrEqual(prev);
            prev = now;
          }
        },
      ),
    );
  });
});

describe('landmarkFill: marked, followed, then interpolated between them', () => {
  const lm = (frame: number, side: 'left' | 'right', x: number, source?: 'manual' | 'tracked'): FrameLandmarks => {
    const origin = source === 'tracked' ? { origin: 'followed' as const } : source === 'manual' ? { origin: 'placed' as const } : {};
    return { frame, side, points: { hip: { x, y: 0.5, ...origin }, knee: { x: x + 0.1, y: 0.7, ...origin } } };
  };
  const fill = landmarkFill([lm(10, 'right', 0.2), lm(20, 'right', 0.4), lm(14, 'right', 0.9, 'tracked'), lm(10, 'left', 0.3)]);

  it('shows hand-marked points on a marked frame', () => {
    expect(fill.at(10)).toEqual({ landmarks: [lm(10, 'left', 0.3), lm(10, 'right', 0.2)], origin: 'marked' });
  });

  it('shows followed points where they exist', () => {
    expect(fill.at(14)).toEqual({ landmarks: [lm(14, 'right', 0.9, 'tracked')], origin: 'followed' });
  });

  it('interpolates between the nearest frames carrying each landmark', () => {
    // Frame 12 between marked 10 (x 0.2) and followed 14 (x 0.9): 0.2 + 0.7 × 2/4 = 0.55; knee 0.3 + 0.7 × ½ = 0.65.
    const at12 = fill.at(12);
    expect(at12.origin).toBe('interpolated');
    expect(at12.landmarks).toHaveLength(1); // the left side has one marked frame only: nothing to interpolate
    expect(at12.landmarks[0]!.points.hip!.x).toBeCloseTo(0.55, 12);
    expect(at12.landmarks[0]!.points.knee!.x).toBeCloseTo(0.65, 12);
    // Frame 17 between followed 14 (0.9) and marked 20 (0.4): 0.9 − 0.5 × 3/6 = 0.65.
    expect(fill.at(17).landmarks[0]!.points.hip!.x).toBeCloseTo(0.65, 12);
  });

  it('draws nothing before the first or after the last frame that carries a landmark', () => {
    expect(fill.at(9)).toEqual({ landmarks: [], origin: 'none' });
    expect(fill.at(21)).toEqual({ landmarks: [], origin: 'none' });
  });

  it('a hand-placed entry wins over a followed one on the same frame', () => {
    expect(landmarkFill([lm(5, 'left', 0.5, 'tracked'), lm(5, 'left', 0.1, 'manual')]).at(5).landmarks[0]!.points.hip!.x).toBe(0.1);
  });
});

describe('frameRangeProblem: at most 1,000 source frames, inside the clip', () => {
  it('accepts 1,000 frames and refuses 1,001 with the count and the limit', () => {
    expect(frameRangeProblem(0, 999, 2000, 1000)).toBeNull();
    expect(frameRangeProblem(0, 1000, 2000, 1000)).toBe(
      'That range has 1001 frames; an annotated clip can cover at most 1000. Choose a shorter range.',
    );
  });

  it('refuses frames outside the clip and a reversed range', () => {
    expect(frameRangeProblem(-1, 10, 100, 1000)).toBe('Choose frames from 0 to 99.');
    expect(frameRangeProblem(0, 100, 100, 1000)).toBe('Choose frames from 0 to 99.');
    expect(frameRangeProblem(50, 40, 100, 1000)).toBe('The last frame comes before the first.');
    expect(frameRangeProblem(1.5, 40, 100, 1000)).toBe('The first and last frame must be whole frame numbers.');
  });
});

describe('defaultClipRange: two strides centred on the current frame', () => {
  it('uses the median gap between one side’s initial contacts', () => {
    // Right contacts 10, 52, 94 and left 31, 73: gaps 42, 42, 42 → stride 42, range 85 frames centred on 60: 18–102.
    expect(defaultClipRange(60, { left: [31, 73], right: [10, 52, 94] }, 500, 60, 1000)).toEqual({ from: 18, to: 102 });
  });

  it('falls back to 0.7 s of the clip and keeps the range inside it', () => {
    // No contacts at 100 fps: stride 70 → 141 frames; centred on 5 it would start at −65, so it starts at 0.
    expect(defaultClipRange(5, { left: [], right: [] }, 500, 100, 1000)).toEqual({ from: 0, to: 140 });
    // Near the end of a 120-frame clip: the whole clip.
    expect(defaultClipRange(110, { left: [], right: [] }, 120, 100, 1000)).toEqual({ from: 0, to: 119 });
  });

  it('never exceeds the frame limit', () => {
    // 500-frame strides would want 1,001 frames: 1,000 instead, from round(1500 − 999/2) = round(1000.5) = 1001.
    expect(defaultClipRange(1500, { left: [], right: [100, 600, 1100] }, 5000, 240, 1000)).toEqual({ from: 1001, to: 2000 });
  });
});

describe('sideBySideSteps', () => {
  it('lists each Baseline frame with its warped Re-test frame', () => {
    // Pairs (10, 4), (31, 28): b = 10 → 4; b = 11 → 4 + 24/21 = 5.14 → 5; b = 12 → 4 + 48/21 = 6.29 → 6.
    expect(
      sideBySideSteps(
        10,
        12,
        [
          [10, 4],
          [31, 28],
        ],
        1,
        100,
      ),
    ).toEqual([
      [10, 4],
      [11, 5],
      [12, 6],
    ]);
  });
});
