/**
 * src/kinematics angle functions: worked examples recomputed by hand from the formulas in
 * REFERENCES.md ([calc]), and properties that must hold for any pose (fast-check).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  ankleAngleDeg,
  footAngleDeg,
  hipExtensionDeg,
  hipRelativeToTrunkDeg,
  kneeFlexionDeg,
  shankAngleDeg,
  sideAngles,
  thighAngleDeg,
  trunkLeanDeg,
  type SideLandmarks,
} from '../../../../src/kinematics/angles';
import { pixelToSagittal, toSagittal, type Point } from '../../../../src/kinematics/geometry';

const P = (x: number, y: number): Point => ({ x, y });

describe('[calc] worked example, REFERENCES.md — initial-contact frame (metres, y up)', () => {
  const shoulder = P(0.1, 1.4);
  const hip = P(0, 0.9);
  const knee = P(0.2, 0.5);
  const ankle = P(0.3, 0.1);
  const heel = P(0.26, 0.05);
  const toe = P(0.45, 0.1);
  it('trunk 11.310°, thigh 26.565°, shank 14.036°, knee flexion 12.529°, foot 14.744°', () => {
    expect(trunkLeanDeg(hip, shoulder)).toBeCloseTo(11.31, 3);
    expect(thighAngleDeg(hip, knee)).toBeCloseTo(26.565, 3);
    expect(shankAngleDeg(knee, ankle)).toBeCloseTo(14.036, 3);
    expect(kneeFlexionDeg(hip, knee, ankle)).toBeCloseTo(12.529, 3);
    expect(footAngleDeg(heel, toe)).toBeCloseTo(14.744, 3);
  });
  it('ankle (90° − shank-to-foot angle) +0.707°, hip relative to trunk 37.875°, heel ahead of hip 0.260 m', () => {
    expect(ankleAngleDeg(knee, ankle, heel, toe)).toBeCloseTo(0.707, 3);
    expect(hipRelativeToTrunkDeg(thighAngleDeg(hip, knee), trunkLeanDeg(hip, shoulder))).toBeCloseTo(37.875, 3);
    expect(heel.x - hip.x).toBeCloseTo(0.26, 6);
  });
  it('independent recomputation with atan/acos agrees (hand formula: knee flexion = 180° − included angle)', () => {
    const deg = (r: number) => (r * 180) / Math.PI;
    expect(deg(Math.atan(0.2 / 0.4))).toBeCloseTo(26.565, 3);
    const a = { x: hip.x - knee.x, y: hip.y - knee.y };
    const b = { x: ankle.x - knee.x, y: ankle.y - knee.y };
    const included = deg(Math.acos((a.x * b.x + a.y * b.y) / (Math.hypot(a.x, a.y) * Math.hypot(b.x, b.y))));
    expect(180 - included).toBeCloseTo(12.529, 3);
  });
});

describe('[calc] worked example, REFERENCES.md — toe-off frame', () => {
  const shoulder = P(0.09, 1.42);
  const hip = P(0, 0.92);
  const knee = P(-0.17, 0.51);
  const ankle = P(-0.45, 0.27);
  it('thigh −22.521° (22.5° extension), shank −49.399°, knee flexion 26.878°, trunk 10.204°, hip relative to trunk −12.317°', () => {
    const thigh = thighAngleDeg(hip, knee);
    expect(thigh).toBeCloseTo(-22.521, 3);
    expect(hipExtensionDeg(thigh)).toBeCloseTo(22.521, 3);
    expect(shankAngleDeg(knee, ankle)).toBeCloseTo(-49.399, 3);
    expect(kneeFlexionDeg(hip, knee, ankle)).toBeCloseTo(26.878, 3);
    expect(trunkLeanDeg(hip, shoulder)).toBeCloseTo(10.204, 3);
    expect(hipRelativeToTrunkDeg(thigh, trunkLeanDeg(hip, shoulder))).toBeCloseTo(-12.317, 3);
  });
});

/** Sub-pixel coordinates without fast-check's bias to edge values (which would make points coincide). */
const coord = fc.noBias(fc.integer({ min: 0, max: 192_000 })).map((v) => v / 100);
const pixel = fc.record({ x: coord, y: coord });
const pose = fc.record({ shoulder: pixel, hip: pixel, knee: pixel, ankle: pixel, heel: pixel, toe: pixel });
type PixelPose = Record<keyof SideLandmarks, Point>;
const map = (p: PixelPose, f: (q: Point) => Point): PixelPose =>
  Object.fromEntries(Object.entries(p).map(([k, q]) => [k, f(q)])) as PixelPose;
const distinct = (p: PixelPose) => {
  const pts = Object.values(p);
  return pts.every((a, i) => pts.every((b, j) => i === j || Math.hypot(a.x - b.x, a.y - b.y) > 1));
};
const close = (a: number, b: number) => Math.abs(a - b) < 1e-6 || Math.abs(Math.abs(a - b) - 360) < 1e-6;

describe('properties (fast-check)', () => {
  it('mirroring a pose (runner facing the other way) leaves every signed angle unchanged after direction normalisation', () => {
    fc.assert(
      fc.property(pose, fc.integer({ min: 2, max: 4000 }), (p, width) => {
        fc.pre(distinct(p));
        const right = sideAngles(map(p, (q) => pixelToSagittal(q, 'right')) as SideLandmarks);
        const left = sideAngles(
          map(
            map(p, (q) => ({ x: width - q.x, y: q.y })),
            (q) => pixelToSagittal(q, 'left'),
          ) as SideLandmarks,
        );
        return (Object.keys(right) as Array<keyof typeof right>).every((k) => close(right[k], left[k]));
      }),
    );
  });

  it('angles do not change when the pose is moved or uniformly scaled', () => {
    fc.assert(
      fc.property(
        pose,
        fc.double({ min: -500, max: 500, noNaN: true }),
        fc.double({ min: 0.1, max: 10, noNaN: true }),
        (p, shift, scale) => {
          fc.pre(distinct(p));
          const a = sideAngles(map(p, (q) => pixelToSagittal(q, 'right')) as SideLandmarks);
          const b = sideAngles(
            map(p, (q) => pixelToSagittal({ x: q.x * scale + shift, y: q.y * scale - shift }, 'right')) as SideLandmarks,
          );
          return (Object.keys(a) as Array<keyof typeof a>).every((k) => close(a[k], b[k]));
        },
      ),
    );
  });

  it('|knee flexion| = 180° − the unsigned hip–knee–ankle angle; its sign tells flexion from hyperextension', () => {
    fc.assert(
      fc.property(pixel, pixel, pixel, (hipPx, kneePx, anklePx) => {
        const [hip, knee, ankle] = [hipPx, kneePx, anklePx].map((q) => pixelToSagittal(q, 'right')) as [Point, Point, Point];
        fc.pre(Math.hypot(hip.x - knee.x, hip.y - knee.y) > 1 && Math.hypot(ankle.x - knee.x, ankle.y - knee.y) > 1);
        const a = { x: hip.x - knee.x, y: hip.y - knee.y };
        const b = { x: ankle.x - knee.x, y: ankle.y - knee.y };
        const cos = (a.x * b.x + a.y * b.y) / (Math.hypot(a.x, a.y) * Math.hypot(b.x, b.y));
        const included = (Math.acos(Math.max(-1, Math.min(1, cos))) * 180) / Math.PI;
        return Math.abs(Math.abs(kneeFlexionDeg(hip, knee, ankle)) - (180 - included)) < 1e-6;
      }),
    );
  });

  it('normalised landmarks give the same angles as pixels when width and height are applied', () => {
    fc.assert(
      fc.property(
        pose,
        fc.integer({ min: 16, max: 4000 }),
        fc.integer({ min: 16, max: 4000 }),
        fc.constantFrom('left' as const, 'right' as const),
        (p, w, h, facing) => {
          fc.pre(distinct(p));
          const fromPx = sideAngles(map(p, (q) => pixelToSagittal(q, facing)) as SideLandmarks);
          const fromNorm = sideAngles(
            map(p, (q) => toSagittal({ x: q.x / w, y: q.y / h }, { width: w, height: h }, facing)) as SideLandmarks,
          );
          return (Object.keys(fromPx) as Array<keyof typeof fromPx>).every((k) => close(fromPx[k], fromNorm[k]));
        },
      ),
    );
  });
});
