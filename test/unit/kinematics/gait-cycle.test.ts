/**
 * Gait-cycle curves: angles normalised 0–100 % from one initial contact to the next, mean ± SD over
 * strides. Interpolation and statistics are worked by hand in the comments ([calc]); the toe-off
 * percentage of the synthetic runner (scripts/demo-clip — a synthetic fixture with known truth, not
 * a published dataset) is the duty factor of the REFERENCES.md timing example, 0.25 s ÷ 0.7 s = 35.71 % [calc].
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { FrameLandmarks, GaitEventMark } from '../../../src/contracts/annotations';
import type { Side } from '../../../src/contracts/assessment';
import { CYCLE_POINTS, gaitCycleCurves, normaliseCycle } from '../../../src/kinematics/gait-cycle';
import { buildGroundTruth } from '../../../scripts/demo-clip/ground-truth';
import { ev, landmarksAt, H, W } from './helpers';

describe('normaliseCycle', () => {
  // Frames 10–13 read 0, 30, 60, 30 (degrees).
  const values: Record<number, number> = { 10: 0, 11: 30, 12: 60, 13: 30 };
  const at = (f: number) => values[f];

  it('interpolates between frames (hand-worked)', () => {
    const curve = normaliseCycle(at, 10, 13)!;
    expect(curve).toHaveLength(101);
    expect(curve[0]).toBe(0); // 0 % = frame 10
    expect(curve[10]).toBeCloseTo(9, 10); // 10 % → frame 10.3 → 0 + 0.3·30 = 9
    expect(curve[50]).toBeCloseTo(45, 10); // 50 % → frame 11.5 → 30 + 0.5·30 = 45
    expect(curve[100]).toBe(30); // 100 % = frame 13
    // Five points: frames 10, 10.75, 11.5, 12.25, 13 → 0, 22.5, 45, 60 − 0.25·30 = 52.5, 30.
    expect(normaliseCycle(at, 10, 13, 5)!.map((v) => Math.round(v * 1e9) / 1e9)).toEqual([0, 22.5, 45, 52.5, 30]);
  });

  it('null when a frame of the stride has no value, or the stride has no length', () => {
    expect(normaliseCycle((f) => (f === 12 ? undefined : 1), 10, 13)).toBeNull();
    expect(normaliseCycle(at, 13, 13)).toBeNull();
  });

  it('property: a straight line over frames stays the same straight line over the cycle', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 500 }),
        fc.integer({ min: 1, max: 200 }),
        fc.double({ min: -5, max: 5, noNaN: true }),
        fc.double({ min: -90, max: 90, noNaN: true }),
        (ic, span, slope, offset) => {
          const curve = normaliseCycle((f) => offset + slope * f, ic, ic + span)!;
          curve.forEach((v, i) => expect(v).toBeCloseTo(offset + slope * (ic + (i / 100) * span), 6));
        },
      ),
    );
  });
});

/** Right-side landmarks on frames 0–20 with the thigh at 2·frame degrees (hip and knee only). */
function thighClip(skip?: number): FrameLandmarks[] {
  const out: FrameLandmarks[] = [];
  for (let f = 0; f <= 20; f++) {
    if (f === skip) continue;
    const th = (2 * f * Math.PI) / 180;
    out.push(
      landmarksAt(f, 'right', { hip: { x: 0, y: 0.9 }, knee: { x: 0.45 * Math.sin(th), y: 0.9 - 0.45 * Math.cos(th) } }, 'left_to_right'),
    );
  }
  return out;
}
// Right strides 0 → 10 (toe-off 4) and 10 → 20 (toe-off 16); left contacts at 5 and 15.
const EVENTS: GaitEventMark[] = [
  ev(0, 'right', 'initial_contact'),
  ev(4, 'right', 'toe_off'),
  ev(5, 'left', 'initial_contact'),
  ev(8, 'left', 'toe_off'),
  ev(10, 'right', 'initial_contact'),
  ev(15, 'left', 'initial_contact'),
  ev(16, 'right', 'toe_off'),
  ev(18, 'left', 'toe_off'),
  ev(20, 'right', 'initial_contact'),
];
const plane = { frameSize: { width: W, height: H }, direction: 'left_to_right' as const };

describe('gaitCycleCurves', () => {
  it('mean ± SD over strides and event percentages (hand-worked)', () => {
    const right = gaitCycleCurves(thighClip(), EVENTS, plane).right!;
    expect(right.strides).toBe(2);
    expect(right.curves.map((c) => c.key)).toEqual(['thighDeg']); // only hip and knee marked
    const thigh = right.curves[0]!;
    // Stride 1 at p %: frame p/10 → 2·p/10 = p/5°; stride 2: frame 10 + p/10 → 20 + p/5°.
    // Mean 10 + p/5 (at 50 %: 20°); SD of two values 20° apart = 20/√2 = 14.142°.
    expect(thigh.mean[0]).toBeCloseTo(10, 6);
    expect(thigh.mean[50]).toBeCloseTo(20, 6);
    expect(thigh.mean[100]).toBeCloseTo(30, 6);
    expect(thigh.sd[50]).toBeCloseTo(14.142, 3);
    // Toe-off at 4/10 = 40 % and 6/10 = 60 % → 50 ± 14.142 %; left contact at 5/10 = 50 % both times.
    expect(right.toeOff!.meanPct).toBeCloseTo(50, 9);
    expect(right.toeOff!.sdPct).toBeCloseTo(14.142, 3);
    expect(right.otherContact).toEqual({ meanPct: 50, sdPct: 0, strides: 2 });
  });

  it('leaves out a stride with a frame without landmarks and says so; a side with no stride is null', () => {
    const curves = gaitCycleCurves(thighClip(13), EVENTS, plane);
    expect(curves.right!.strides).toBe(1);
    expect(curves.right!.excluded).toEqual(['Stride at frames 10–20: some frames have no right landmarks.']);
    expect(curves.right!.curves[0]!.sd[50]).toBe(0);
    // The left stride 5 → 15 has no left landmarks at all: no curve, and the reason.
    expect(curves.left).toMatchObject({ strides: 0, curves: [], excluded: ['Stride at frames 5–15: some frames have no left landmarks.'] });
    expect(gaitCycleCurves(thighClip(), EVENTS.slice(0, 2), plane)).toEqual({ left: null, right: null });
  });

  it('proposed events are not used until accepted', () => {
    const proposed = EVENTS.map((e) => ({ ...e, origin: 'proposed' as const }));
    expect(gaitCycleCurves(thighClip(), proposed, plane).right).toBeNull();
    const accepted = EVENTS.map((e) => ({ ...e, origin: 'accepted' as const }));
    expect(gaitCycleCurves(thighClip(), accepted, plane).right!.strides).toBe(2);
  });

  it('synthetic runner (synthetic fixture): toe-off at 35.71 % of the cycle and curves that start at the true contact angles', () => {
    const gt = buildGroundTruth({ fps: 120, width: 1280, height: 720, seconds: 3, hipExtensionDeg: 8, facing: 'right' });
    const sides: Record<'near' | 'far', Side> = { near: 'right', far: 'left' };
    const landmarks: FrameLandmarks[] = gt.frames.flatMap((f) => [
      { frame: f.index, side: 'right' as const, points: f.landmarksNormalised.near },
      { frame: f.index, side: 'left' as const, points: f.landmarksNormalised.far },
    ]);
    const events: GaitEventMark[] = (['near', 'far'] as const).flatMap((k) => [
      ...gt.events[k].initialContact.map((frame) => ev(frame, sides[k], 'initial_contact')),
      ...gt.events[k].toeOff.map((frame) => ev(frame, sides[k], 'toe_off')),
    ]);
    const curves = gaitCycleCurves(landmarks, events, { frameSize: { width: 1280, height: 720 }, direction: 'left_to_right' });
    for (const k of ['near', 'far'] as const) {
      const c = curves[sides[k]]!;
      expect(c.strides).toBeGreaterThanOrEqual(3);
      expect(c.toeOff!.meanPct).toBeCloseTo((0.25 / 0.7) * 100, 6); // duty factor 0.3571 [calc]
      expect(c.otherContact!.meanPct).toBeCloseTo(50, 6); // the far leg runs half a stride later
      const thigh = c.curves.find((x) => x.key === 'thighDeg')!;
      const atIc = gt.events[k].initialContact
        .filter((f) => gt.events[k].initialContact.includes(f) && f + 84 < gt.frameCount)
        .map((f) => gt.angles[f]![k].thighDeg);
      expect(thigh.mean[0]).toBeCloseTo(atIc.reduce((a, b) => a + b, 0) / atIc.length, 3);
      expect(thigh.mean).toHaveLength(CYCLE_POINTS);
    }
  });
});
