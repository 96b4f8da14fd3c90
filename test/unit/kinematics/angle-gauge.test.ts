/**
 * Angle gauge geometry: the included angle at the vertex against REFERENCES.md worked examples
 * ([calc], recomputed here independently with the law of cosines from side lengths), and
 * fast-check properties (translation, scale, rotation, reflection, symmetry, 0–180 range).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { gaugeAngleDeg, gaugeFromClicks, gaugeLayout, includedAngleDeg, isUsableGauge } from '../../../src/kinematics';
import { deg, H, IC_POSE, TO_POSE, toFraction, W } from './helpers';

type P = { x: number; y: number };
/** Law of cosines: the angle opposite side c in a triangle with sides a, b, c (independent of atan2). */
const lawOfCosines = (o: P, p: P, q: P) => {
  const a = Math.hypot(p.x - o.x, p.y - o.y);
  const b = Math.hypot(q.x - o.x, q.y - o.y);
  const c = Math.hypot(p.x - q.x, p.y - q.y);
  return deg(Math.acos((a * a + b * b - c * c) / (2 * a * b)));
};

describe('[calc] REFERENCES.md worked examples', () => {
  it('initial contact: hip–knee–ankle included angle = 180° − knee flexion 12.529° = 167.471°', () => {
    const { hip, knee, ankle } = IC_POSE;
    expect(lawOfCosines(knee, hip, ankle)).toBeCloseTo(167.471, 3);
    expect(includedAngleDeg(hip, knee, ankle)).toBeCloseTo(lawOfCosines(knee, hip, ankle), 9);
    expect(includedAngleDeg(hip, knee, ankle)).toBeCloseTo(180 - 12.529, 3);
  });

  it('toe-off: hip–knee–ankle included angle = 180° − knee flexion 26.878° = 153.122°', () => {
    const { hip, knee, ankle } = TO_POSE;
    expect(lawOfCosines(knee, hip, ankle)).toBeCloseTo(153.122, 3);
    expect(includedAngleDeg(hip, knee, ankle)).toBeCloseTo(180 - 26.878, 3);
  });

  it('initial contact: shoulder–hip–knee = 180° − hip relative to trunk 37.875° = 142.125°', () => {
    const { shoulder, hip, knee } = IC_POSE;
    expect(lawOfCosines(hip, shoulder, knee)).toBeCloseTo(142.125, 3);
    expect(includedAngleDeg(shoulder, hip, knee)).toBeCloseTo(142.125, 3);
  });

  it('placed on a 1280×720 frame as fractions (either running direction) the gauge reads the same', () => {
    for (const direction of ['left_to_right', 'right_to_left'] as const) {
      const g = {
        id: 'g1',
        frame: 0,
        a: toFraction(IC_POSE.hip, direction),
        vertex: toFraction(IC_POSE.knee, direction),
        b: toFraction(IC_POSE.ankle, direction),
      };
      expect(gaugeAngleDeg(g, { width: W, height: H })).toBeCloseTo(167.471, 3);
    }
  });

  it('takes the angle in pixels, not fractions: a square corner on a 16:9 frame is 90°', () => {
    // (0.25, 0.5)–(0.5, 0.5)–(0.5, 0.5 − 0.25·16/9) is a right angle in pixels only.
    const g = { a: { x: 0.25, y: 0.5 }, vertex: { x: 0.5, y: 0.5 }, b: { x: 0.5, y: 0.5 - (0.25 * 16) / 9 } };
    expect(gaugeAngleDeg(g, { width: 1600, height: 900 })).toBeCloseTo(90, 9);
    const arms = { a: { x: 0, y: 0 }, vertex: { x: 1, y: 0 }, b: { x: 1, y: 1 } };
    expect(gaugeAngleDeg(arms, { width: 1600, height: 900 })).toBeCloseTo(90, 9);
  });
});

describe('degenerate gauges', () => {
  it('an arm without length has no angle', () => {
    expect(includedAngleDeg({ x: 1, y: 1 }, { x: 1, y: 1 }, { x: 2, y: 3 })).toBeNaN();
    expect(includedAngleDeg({ x: 0, y: 0 }, { x: 1, y: 1 }, { x: NaN, y: 3 })).toBeNaN();
    expect(isUsableGauge({ a: { x: 0.2, y: 0.2 }, vertex: { x: 0.2, y: 0.2 }, b: { x: 0.5, y: 0.5 } }, { width: 100, height: 100 })).toBe(
      false,
    );
    expect(
      gaugeLayout(
        [{ id: 'x', frame: 0, a: { x: 0.2, y: 0.2 }, vertex: { x: 0.2, y: 0.2 }, b: { x: 0.5, y: 0.5 } }],
        { width: 100, height: 100 },
        12,
      ),
    ).toEqual([]);
  });

  it('three clicks make a gauge in click order: arm end, vertex (middle click), arm end', () => {
    expect(
      gaugeFromClicks('g', 4, [
        { x: 0.1, y: 0.1 },
        { x: 0.2, y: 0.2 },
      ]),
    ).toBeNull();
    expect(
      gaugeFromClicks('g', 4, [
        { x: 0.1, y: 0.1 },
        { x: 0.2, y: 0.2 },
        { x: 0.3, y: 0.1 },
      ]),
    ).toEqual({
      id: 'g',
      frame: 4,
      a: { x: 0.1, y: 0.1 },
      vertex: { x: 0.2, y: 0.2 },
      b: { x: 0.3, y: 0.1 },
    });
  });
});

describe('properties (fast-check)', () => {
  const coord = fc.double({ min: -1000, max: 1000, noNaN: true });
  const point = fc.record({ x: coord, y: coord });
  // Triangles whose arms are not tiny (the angle is well conditioned).
  const gauge = fc
    .tuple(point, point, point)
    .filter(([a, o, b]) => Math.hypot(a.x - o.x, a.y - o.y) > 1e-3 && Math.hypot(b.x - o.x, b.y - o.y) > 1e-3);

  it('lies in 0–180° and agrees with the law of cosines', () => {
    fc.assert(
      fc.property(gauge, ([a, o, b]) => {
        const v = includedAngleDeg(a, o, b);
        expect(v).toBeGreaterThanOrEqual(0);
        expect(v).toBeLessThanOrEqual(180);
        const ref = lawOfCosines(o, a, b);
        if (Number.isFinite(ref) && ref > 1 && ref < 179) expect(Math.abs(v - ref)).toBeLessThan(1e-6);
      }),
    );
  });

  it('is symmetric in its two arms', () => {
    fc.assert(
      fc.property(gauge, ([a, o, b]) => {
        expect(Math.abs(includedAngleDeg(a, o, b) - includedAngleDeg(b, o, a))).toBeLessThan(1e-9);
      }),
    );
  });

  it('does not change under translation, uniform scaling, rotation or mirroring', () => {
    fc.assert(
      fc.property(
        gauge,
        coord,
        coord,
        fc.double({ min: 0.01, max: 100, noNaN: true }),
        fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
        ([a, o, b], dx, dy, k, t) => {
          const v = includedAngleDeg(a, o, b);
          const move = (p: P) => ({ x: p.x + dx, y: p.y + dy });
          const scale = (p: P) => ({ x: p.x * k, y: p.y * k });
          const turn = (p: P) => ({ x: p.x * Math.cos(t) - p.y * Math.sin(t), y: p.x * Math.sin(t) + p.y * Math.cos(t) });
          const mirror = (p: P) => ({ x: -p.x, y: p.y });
          for (const f of [move, scale, turn, mirror]) expect(Math.abs(includedAngleDeg(f(a), f(o), f(b)) - v)).toBeLessThan(1e-6);
        },
      ),
    );
  });

  it('an arm turned through the vertex gives the supplementary angle', () => {
    fc.assert(
      fc.property(gauge, ([a, o, b]) => {
        const through = { x: 2 * o.x - a.x, y: 2 * o.y - a.y };
        expect(Math.abs(includedAngleDeg(a, o, b) + includedAngleDeg(through, o, b) - 180)).toBeLessThan(1e-6);
      }),
    );
  });
});

describe('overlay layout of gauges', () => {
  it('labels the value with the measures formatter and puts the label outside the arc on the bisector', () => {
    const size = { width: 1000, height: 1000 };
    const [g] = gaugeLayout(
      [{ id: 'g', frame: 0, a: { x: 0.7, y: 0.5 }, vertex: { x: 0.5, y: 0.5 }, b: { x: 0.5, y: 0.3 } }],
      size,
      20,
      'g',
    );
    expect(g!.text).toBe('90.0°');
    expect(g!.selected).toBe(true);
    // Arms point right (0 rad) and up (−π/2 on screen): the bisector points up and to the right.
    const dx = g!.x - g!.vertex.x;
    const dy = g!.y - g!.vertex.y;
    expect(dx).toBeCloseTo(-dy, 6);
    expect(Math.hypot(dx, dy)).toBeGreaterThan(g!.arc.radius);
  });
});
