/**
 * Gait-event rules on coordinate series. Every rule is checked on hand-made series that follow the
 * published rule exactly (expected frames worked by hand in the comments) and with fast-check
 * properties. Rules: coordinate method, Zeni et al. 2008, Gait Posture 27:710–714 [pub, as quoted
 * in REFERENCES.md]; heel vertical minimum and peak knee extension for running, Fellin et al. 2010,
 * J Sci Med Sport 13:646–650 [pub, as quoted in REFERENCES.md].
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  coordinateContacts,
  coordinateToeOffs,
  heelStrikeFrame,
  kneeExtensionToeOff,
  windowExtrema,
} from '../../../src/kinematics/event-rules';

describe('coordinate method (Zeni et al. 2008 [pub])', () => {
  it('initial contact at the maximum of heel.x − hip.x (hand-made series)', () => {
    // Heel ahead of the hip, metres, frames 0–10: it swings forward to 0.26 m at frame 3, then moves
    // back under the body; largest value = frame 3.
    const heelRel = [0.1, 0.18, 0.24, 0.26, 0.22, 0.12, -0.02, -0.15, -0.2, -0.12, 0.0];
    expect(coordinateContacts(heelRel, 3)).toEqual([3]);
  });

  it('toe-off at the minimum of toe.x − hip.x (hand-made series, two cycles)', () => {
    // Toe relative to the hip: rearmost −0.32 m at frame 4 and −0.31 m at frame 12 (8 frames per cycle).
    const toeRel = [0.1, -0.1, -0.25, -0.3, -0.32, -0.2, 0.05, 0.2, 0.1, -0.1, -0.25, -0.3, -0.31, -0.2, 0.0];
    expect(coordinateToeOffs(toeRel, 3)).toEqual([4, 12]);
  });

  it('a flat top counts once, at its first frame; the ends of a series or of a gap are never extrema', () => {
    // 0,1,2,2,1,0: the top (2) starts at frame 2.
    expect(windowExtrema([0, 1, 2, 2, 1, 0], 2, 'max')).toEqual([2]);
    // Still rising at the last frame / falling at the first: no maximum, no minimum inside.
    expect(windowExtrema([1, 2, 3, 4, 5], 2, 'max')).toEqual([]);
    expect(windowExtrema([5, 4, 3, 2, 1], 2, 'min')).toEqual([]);
    // Frame 3 would be the top, but frame 4 is missing: unknown whether the heel went further.
    expect(windowExtrema([0, 1, 2, 3, NaN, 2, 1], 2, 'max')).toEqual([]);
  });

  it('property: extrema of one kind are more than the half-window apart, each dominates its window, and max(x) = min(−x)', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: -50, max: 50 }), { minLength: 3, maxLength: 80 }), fc.integer({ min: 1, max: 8 }), (xs, w) => {
        const max = windowExtrema(xs, w, 'max');
        for (let k = 1; k < max.length; k++) expect(max[k]! - max[k - 1]!).toBeGreaterThan(w);
        for (const i of max)
          for (let j = Math.max(0, i - w); j <= Math.min(xs.length - 1, i + w); j++) expect(xs[i]!).toBeGreaterThanOrEqual(xs[j]!);
        expect(
          windowExtrema(
            xs.map((x) => -x),
            w,
            'min',
          ),
        ).toEqual(max);
        expect(
          windowExtrema(
            xs.map((x) => x + 7),
            w,
            'max',
          ),
        ).toEqual(max);
      }),
    );
  });
});

describe('foot strike at the heel vertical minimum (Fellin et al. 2010 [pub])', () => {
  it('the first frame where the heel stops going down after the coordinate contact (hand-made series)', () => {
    // Heel height, metres, from the coordinate-method contact at frame 0: 0.30, 0.22, 0.14, 0.08,
    // 0.05, 0.04 (frame 5), 0.04, 0.045, … — lowest first at frame 5 (frame 6 is equal, not lower).
    const heel = [0.3, 0.22, 0.14, 0.08, 0.05, 0.04, 0.04, 0.045, 0.06, 0.1];
    expect(heelStrikeFrame(heel, 0, heel.length)).toBe(5);
    // Starting at frame 2 changes nothing: same minimum.
    expect(heelStrikeFrame(heel, 2, heel.length)).toBe(5);
  });

  it('no strike while the heel still goes down at the next toe-off, or where the heel is missing', () => {
    const heel = [0.3, 0.22, 0.14, 0.08, 0.05, 0.04];
    expect(heelStrikeFrame(heel, 0, 4)).toBeNull(); // frames 0–3 all still descending
    expect(heelStrikeFrame([0.3, NaN, 0.1, 0.2], 0, 4)).toBeNull();
    expect(heelStrikeFrame(heel, 9, 12)).toBeNull();
  });

  it('property: the strike is in the window, the heel went strictly down to it and not lower the frame after', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 2, maxLength: 60 }), fc.nat(), (h, fromSeed) => {
        const from = fromSeed % h.length;
        const r = heelStrikeFrame(h, from, h.length);
        if (r === null) return;
        expect(r).toBeGreaterThanOrEqual(from);
        expect(r).toBeLessThan(h.length - 1);
        for (let i = from; i < r; i++) expect(h[i + 1]!).toBeLessThan(h[i]!);
        expect(h[r + 1]!).toBeGreaterThanOrEqual(h[r]!);
      }),
    );
  });
});

describe('toe-off at peak knee extension (Fellin et al. 2010 [pub])', () => {
  // Knee flexion, degrees: contact at frame 0 (17°), stance peak 48° at frame 2, then from frame 4 on
  // the parabola 20 + 2·(i − v)², whose lowest point (peak extension) is at frame v.
  const series = (v: number) => [17, 35, 48, 41, ...Array.from({ length: 7 }, (_, k) => 20 + 2 * (k + 4 - v) ** 2)];

  it('peak between frames 6 and 7 (v = 6.3) → toe-off on frame 6, the last frame at or before it', () => {
    // v = 6.3: frames 5, 6, 7 read 23.38, 20.18, 20.98; lowest on frame 6. Parabola vertex
    // 6 + (23.38 − 20.98) / (2·(23.38 − 2·20.18 + 20.98)) = 6 + 2.4 / 8 = 6.3 → frame 6.
    const k = series(6.3);
    expect(k[5]).toBeCloseTo(23.38, 10);
    expect(k[7]).toBeCloseTo(20.98, 10);
    expect(kneeExtensionToeOff(k, 10, 0)).toBe(6);
  });

  it('peak between frames 5 and 6 (v = 5.7) → toe-off on frame 5, although frame 6 reads the least flexion', () => {
    // v = 5.7: frames 5, 6, 7 read 20.98, 20.18, 23.38; vertex 6 + (20.98 − 23.38) / 8 = 5.7 → frame 5.
    expect(kneeExtensionToeOff(series(5.7), 10, 0)).toBe(5);
  });

  it('no toe-off when the knee is straightest at the contact, still straightening at the start frame, or missing', () => {
    // Contact at frame 1 (17°), flexing all the way to frame 5: the knee's straightest frame is the contact.
    expect(kneeExtensionToeOff([40, 17, 20, 25, 30, 35], 5, 1)).toBeNull();
    // Still straightening on frame 5: not in swing yet.
    expect(kneeExtensionToeOff([17, 40, 30, 20, 15, 12], 5, 0)).toBeNull();
    expect(kneeExtensionToeOff([17, 35, 30, NaN, 25, 30], 5, 0)).toBeNull(); // frame 3 unknown: is frame 4 the straightest?
    expect(kneeExtensionToeOff([17, 20], 1, 1)).toBeNull();
  });

  it('property: a sampled parabola with its vertex inside the window gives the frame at or before the vertex', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 3, max: 40 }),
        fc.double({ min: 0.05, max: 0.95, noNaN: true }),
        fc.double({ min: 0.2, max: 5, noNaN: true }),
        fc.double({ min: -10, max: 60, noNaN: true }),
        (whole, frac, curv, base) => {
          const v = whole + frac;
          const k = Array.from({ length: whole + 12 }, (_, i) => base + curv * (i - v) ** 2);
          expect(kneeExtensionToeOff(k, whole + 10, 0)).toBe(whole);
        },
      ),
    );
  });
});
