/**
 * Angles through the whole frame pipeline (metres → image fractions → y-up plane → signed angles):
 * REFERENCES.md worked examples ([calc], recomputed here with independent atan/acos formulas) and
 * fast-check properties (rotation, translation, scaling, mirroring).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { FrameLandmarks, LandmarkName } from '../../../src/contracts/annotations';
import { frameAngles, heelAheadOfHip, metresPerPixel, poseAngles, sidePosePx, type PoseAngles } from '../../../src/kinematics';
import { hipExtensionDeg, wrapDeg } from '../../../src/kinematics/angles';
import { deg, H, IC_POSE, landmarksAt, SCALE_1M_400PX, TO_POSE, W } from './helpers';

const size = { width: W, height: H };

describe.each(['left_to_right', 'right_to_left'] as const)(
  '[calc] worked example, REFERENCES.md — via image fractions, %s',
  (direction) => {
    const plane = { frameSize: size, direction };
    it('initial contact: trunk 11.310°, thigh 26.565°, shank 14.036°, knee flexion 12.529°, foot 14.744°, ankle +0.707°, hip rel trunk 37.875°', () => {
      const a = frameAngles([landmarksAt(0, 'right', IC_POSE, direction)], plane).right!;
      expect(a.trunkDeg).toBeCloseTo(11.31, 3);
      expect(a.thighDeg).toBeCloseTo(26.565, 3);
      expect(a.shankDeg).toBeCloseTo(14.036, 3);
      expect(a.kneeFlexionDeg).toBeCloseTo(12.529, 3);
      expect(a.footDeg).toBeCloseTo(14.744, 3);
      expect(a.ankleDeg).toBeCloseTo(0.707, 3);
      expect(a.hipRelTrunkDeg).toBeCloseTo(37.875, 3);
    });
    it('initial contact: heel ahead of hip 0.260 m (scale 2.5 mm/px)', () => {
      const pose = sidePosePx(landmarksAt(0, 'right', IC_POSE, direction).points, plane);
      expect(heelAheadOfHip(pose)! * metresPerPixel(SCALE_1M_400PX, size)!).toBeCloseTo(0.26, 6);
    });
    it('toe-off: thigh −22.521° (22.5° extension), shank −49.399°, knee flexion 26.878°, trunk 10.204°, hip rel trunk −12.317°', () => {
      const a = frameAngles([landmarksAt(60, 'right', TO_POSE, direction)], plane).right!;
      expect(a.thighDeg).toBeCloseTo(-22.521, 3);
      expect(a.shankDeg).toBeCloseTo(-49.399, 3);
      expect(a.kneeFlexionDeg).toBeCloseTo(26.878, 3);
      expect(a.trunkDeg).toBeCloseTo(10.204, 3);
      expect(a.hipRelTrunkDeg).toBeCloseTo(-12.317, 3);
    });
  },
);

describe('[calc] worked example, REFERENCES.md — independent recomputation by hand formulas', () => {
  const included = (a: { x: number; y: number }, o: { x: number; y: number }, b: { x: number; y: number }) => {
    const u = { x: a.x - o.x, y: a.y - o.y };
    const v = { x: b.x - o.x, y: b.y - o.y };
    return deg(Math.acos((u.x * v.x + u.y * v.y) / (Math.hypot(u.x, u.y) * Math.hypot(v.x, v.y))));
  };
  it('initial contact: atan of run/rise, 180° − included angle, 90° − shank-to-foot angle', () => {
    const { shoulder, hip, knee, ankle, heel, toe } = IC_POSE;
    expect(deg(Math.atan(0.1 / 0.5))).toBeCloseTo(11.31, 3); // trunk
    expect(deg(Math.atan(0.2 / 0.4))).toBeCloseTo(26.565, 3); // thigh
    expect(deg(Math.atan(0.1 / 0.4))).toBeCloseTo(14.036, 3); // shank
    expect(180 - included(hip, knee, ankle)).toBeCloseTo(12.529, 3);
    expect(deg(Math.atan(0.05 / 0.19))).toBeCloseTo(14.744, 3); // foot
    const shankToFoot = included({ x: ankle.x + (knee.x - ankle.x), y: ankle.y + (knee.y - ankle.y) }, ankle, {
      x: ankle.x + (toe.x - heel.x),
      y: ankle.y + (toe.y - heel.y),
    });
    expect(90 - shankToFoot).toBeCloseTo(0.707, 3);
    expect(deg(Math.atan(0.2 / 0.4)) + deg(Math.atan((shoulder.x - hip.x) / (shoulder.y - hip.y)))).toBeCloseTo(37.875, 3);
  });
  it('toe-off: thigh = −atan(0.17/0.41), shank = −atan(0.28/0.24), knee = 180° − included angle', () => {
    const { hip, knee, ankle } = TO_POSE;
    expect(-deg(Math.atan(0.17 / 0.41))).toBeCloseTo(-22.521, 3);
    expect(-deg(Math.atan(0.28 / 0.24))).toBeCloseTo(-49.399, 3);
    expect(180 - included(hip, knee, ankle)).toBeCloseTo(26.878, 3);
    expect(deg(Math.atan(0.09 / 0.5))).toBeCloseTo(10.204, 3);
  });
});

describe('partial poses', () => {
  const plane = { frameSize: size, direction: 'left_to_right' as const };
  it('an angle whose landmarks are missing is absent (never NaN); trunk falls back to the other side', () => {
    const right = landmarksAt(0, 'right', { hip: IC_POSE.hip, knee: IC_POSE.knee }, 'left_to_right');
    const left = landmarksAt(0, 'left', { shoulder: IC_POSE.shoulder, hip: IC_POSE.hip }, 'left_to_right');
    const a = frameAngles([right, left], plane);
    expect(a.right).toEqual({
      thighDeg: expect.closeTo(26.565, 3),
      trunkDeg: expect.closeTo(11.31, 3),
      hipRelTrunkDeg: expect.closeTo(37.875, 3),
      trunkFromFallback: true,
    });
    expect(a.left).toEqual({ trunkDeg: expect.closeTo(11.31, 3) });
  });
  it('coincident or non-finite points give no angle', () => {
    const p = sidePosePx({ hip: { x: 0.5, y: 0.5 }, knee: { x: 0.5, y: 0.5 }, ankle: { x: Number.NaN, y: 0.7 } }, plane);
    expect(poseAngles(p)).toEqual({});
  });
});

// ─── Properties ──────────────────────────────────────────────────────────────────────────────

type Px = { x: number; y: number };
const NAMES: LandmarkName[] = ['shoulder', 'hip', 'knee', 'ankle', 'heel', 'toe'];
/** Sub-pixel coordinates inside the frame, without edge bias (which makes points coincide). */
const px = fc.record({
  x: fc.noBias(fc.integer({ min: 100_00, max: 1180_00 })).map((v) => v / 100),
  y: fc.noBias(fc.integer({ min: 50_00, max: 670_00 })).map((v) => v / 100),
});
const pose = fc.record({ shoulder: px, hip: px, knee: px, ankle: px, heel: px, toe: px });
type PxPose = Record<LandmarkName, Px>;
/** Segments used by angles are at least 5 px long (a marker placed on another gives no direction). */
const usable = (p: PxPose) =>
  [
    ['hip', 'knee'],
    ['knee', 'ankle'],
    ['hip', 'shoulder'],
    ['heel', 'toe'],
  ].every(([a, b]) => Math.hypot(p[a as LandmarkName].x - p[b as LandmarkName].x, p[a as LandmarkName].y - p[b as LandmarkName].y) > 5);
const mapPose = (p: PxPose, f: (q: Px) => Px): PxPose => Object.fromEntries(NAMES.map((n) => [n, f(p[n])])) as PxPose;
const toEntry = (p: PxPose, w = W, h = H): FrameLandmarks => ({
  frame: 0,
  side: 'right',
  points: Object.fromEntries(NAMES.map((n) => [n, { x: p[n].x / w, y: p[n].y / h }])),
});
const anglesOf = (p: PxPose, direction: 'left_to_right' | 'right_to_left' = 'left_to_right', w = W, h = H): PoseAngles =>
  frameAngles([toEntry(p, w, h)], { frameSize: { width: w, height: h }, direction }).right!;
/** Equal as angles (mod 360°). */
const sameAngle = (a: number, b: number, tol = 1e-6) => {
  const d = ((((a - b) % 360) + 540) % 360) - 180;
  return Math.abs(d) < tol;
};
const KEYS = ['thighDeg', 'shankDeg', 'kneeFlexionDeg', 'trunkDeg', 'footDeg', 'ankleDeg', 'hipRelTrunkDeg'] as const;

describe('fast-check properties of the angles', () => {
  it('translating every point leaves every angle unchanged', () => {
    fc.assert(
      fc.property(
        pose.filter(usable),
        fc.double({ min: -500, max: 500, noNaN: true }),
        fc.double({ min: -500, max: 500, noNaN: true }),
        (p, dx, dy) => {
          const a = anglesOf(p);
          const b = anglesOf(mapPose(p, (q) => ({ x: q.x + dx, y: q.y + dy })));
          for (const k of KEYS) expect(sameAngle(a[k]!, b[k]!)).toBe(true);
        },
      ),
    );
  });

  it('rotating every point leaves knee flexion, hip-relative-to-trunk and ankle unchanged; segments shift by the rotation', () => {
    fc.assert(
      fc.property(pose.filter(usable), fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }), px, (p, th, c) => {
        // Screen rotation by +θ (clockwise on screen, y down) = clockwise in the y-up plane.
        const rot = (q: Px): Px => ({
          x: c.x + (q.x - c.x) * Math.cos(th) - (q.y - c.y) * Math.sin(th),
          y: c.y + (q.x - c.x) * Math.sin(th) + (q.y - c.y) * Math.cos(th),
        });
        const a = anglesOf(p);
        const b = anglesOf(mapPose(p, rot));
        const t = deg(th);
        expect(sameAngle(a.kneeFlexionDeg!, b.kneeFlexionDeg!)).toBe(true);
        expect(sameAngle(a.hipRelTrunkDeg!, b.hipRelTrunkDeg!)).toBe(true);
        expect(sameAngle(a.ankleDeg!, b.ankleDeg!)).toBe(true);
        // Angles from the downward vertical and from +x turn with the segment; the trunk (from the upward vertical, + forward) the other way.
        expect(sameAngle(b.thighDeg! - a.thighDeg!, -t)).toBe(true);
        expect(sameAngle(b.shankDeg! - a.shankDeg!, -t)).toBe(true);
        expect(sameAngle(b.footDeg! - a.footDeg!, -t)).toBe(true);
        expect(sameAngle(b.trunkDeg! - a.trunkDeg!, t)).toBe(true);
      }),
    );
  });

  it('scaling the image (points and frame size together) leaves every angle unchanged', () => {
    fc.assert(
      fc.property(pose.filter(usable), fc.double({ min: 0.2, max: 5, noNaN: true }), (p, k) => {
        const a = anglesOf(p);
        const b = anglesOf(
          mapPose(p, (q) => ({ x: q.x * k, y: q.y * k })),
          'left_to_right',
          W * k,
          H * k,
        );
        for (const key of KEYS) expect(sameAngle(a[key]!, b[key]!)).toBe(true);
      }),
    );
  });

  it('a right-to-left clip (mirror image) gives the same signed angles as the left-to-right one', () => {
    fc.assert(
      fc.property(pose.filter(usable), (p) => {
        const a = anglesOf(p, 'left_to_right');
        const b = anglesOf(
          mapPose(p, (q) => ({ x: W - q.x, y: q.y })),
          'right_to_left',
        );
        for (const k of KEYS) expect(sameAngle(a[k]!, b[k]!)).toBe(true);
        // …and reading the mirror as if it ran left-to-right flips every sign-carrying angle.
        const wrong = anglesOf(
          mapPose(p, (q) => ({ x: W - q.x, y: q.y })),
          'left_to_right',
        );
        expect(sameAngle(wrong.thighDeg!, -a.thighDeg!)).toBe(true);
      }),
    );
  });
});

describe('angle helpers at their edges', () => {
  it('wrapDeg keeps (−180°, 180°]: 180° and −180° both read 180°, 190° reads −170°, −190° reads 170°', () => {
    expect(wrapDeg(180)).toBe(180);
    expect(wrapDeg(-180)).toBe(180);
    expect(wrapDeg(190)).toBe(-170);
    expect(wrapDeg(-190)).toBe(170);
    expect(wrapDeg(12.5)).toBe(12.5);
  });

  it('hip extension reads −thigh: thigh −22.521° at toe-off → 22.521° of extension (REFERENCES.md worked example)', () => {
    expect(hipExtensionDeg(-22.521)).toBe(22.521);
    expect(hipExtensionDeg(5)).toBe(-5);
  });

  it('[calc] a flat foot (heel and toe at the same height) reads 0°; heel ahead of hip needs both points', () => {
    const flat = poseAngles({ heel: { x: 0.26, y: 0.05 }, toe: { x: 0.45, y: 0.05 } } as never);
    expect(flat.footDeg).toBe(deg(Math.atan2(0, 0.19)));
    expect(heelAheadOfHip({ heel: { x: 0.26, y: 0.05 } } as never)).toBeUndefined();
    expect(heelAheadOfHip({ hip: { x: 0, y: 0.9 } } as never)).toBeUndefined();
    expect(heelAheadOfHip({ heel: { x: 0.26, y: 0.05 }, hip: { x: 0, y: 0.9 } } as never)).toBeCloseTo(0.26, 12);
  });

  it('a NaN coordinate handed to poseAngles gives no angle and no flag (never a NaN value)', () => {
    const knee = { x: 0.2, y: 0.5 };
    const ankle = { x: 0.3, y: 0.1 };
    const out = poseAngles({ knee, ankle, heel: { x: Number.NaN, y: 0.05 }, toe: { x: 0.45, y: 0.1 } } as never);
    expect(Object.keys(out)).toEqual(['shankDeg']);
    const fallback = poseAngles({} as never, { hip: { x: Number.NaN, y: 0.9 }, shoulder: { x: 0.1, y: 1.4 } } as never);
    expect(fallback).toEqual({});
    expect('trunkFromFallback' in fallback).toBe(false);
  });
});
