/**
 * Ground truth of the synthetic runner clip (a test fixture, not a published source).
 */
import { describe, expect, it } from 'vitest';
import { anglesFromPixels, buildGroundTruth, frameTiming, type ClipSpec } from '../../../../scripts/demo-clip/ground-truth';

const spec: ClipSpec = { fps: 60, width: 640, height: 360, seconds: 2, hipExtensionDeg: 9, facing: 'right' };

describe('frame timing', () => {
  it('[calc] timing worked example, REFERENCES.md: at 240 fps stride 168 frames, contact 60 → stride 0.700 s, contact 0.250 s', () => {
    const t = frameTiming(240);
    expect([t.strideFrames, t.contactFrames]).toEqual([168, 60]);
    expect(t.stridePeriodS).toBeCloseTo(0.7, 12);
    expect(t.contactTimeS).toBeCloseTo(0.25, 12);
  });
  it('rounds stride (to an even count) and contact to whole frames at other rates', () => {
    expect(frameTiming(120)).toMatchObject({ strideFrames: 84, contactFrames: 30 });
    expect(frameTiming(60)).toMatchObject({ strideFrames: 42, contactFrames: 15 });
    expect(frameTiming(30)).toMatchObject({ strideFrames: 22, contactFrames: 8 });
    expect(() => frameTiming(4)).toThrow(/too low/);
  });
});

describe('buildGroundTruth', () => {
  const gt = buildGroundTruth(spec);

  it('has one frame, one angle set and exact times for every frame', () => {
    expect(gt.frameCount).toBe(120);
    expect(gt.frames).toHaveLength(120);
    expect(gt.angles).toHaveLength(120);
    expect(gt.frames[30]!.timeMs).toBe(500);
    expect(gt.pxPerMetre).toBe(200); // 400 px/m at 1280×720, halved at 640×360
    expect(gt.nearSide).toBe('right');
  });

  it('events repeat every stride; toe-off follows contact by the contact frames; the far leg is half a stride apart', () => {
    const t = frameTiming(60);
    for (const side of ['near', 'far'] as const) {
      const { initialContact, toeOff } = gt.events[side];
      expect(initialContact.length).toBeGreaterThanOrEqual(2);
      for (let i = 1; i < initialContact.length; i++) expect(initialContact[i]! - initialContact[i - 1]!).toBe(t.strideFrames);
      for (const ic of initialContact) if (ic + t.contactFrames < gt.frameCount) expect(toeOff).toContain(ic + t.contactFrames);
    }
    expect(Math.abs(gt.events.far.initialContact[0]! - gt.events.near.initialContact[0]!)).toBe(t.strideFrames / 2);
  });

  it('hip extension at every toe-off frame is within ±0.5° of the request (computed from the landmark pixels)', () => {
    for (const side of ['near', 'far'] as const) {
      expect(gt.hipExtensionAtToeOffDeg[side].length).toBeGreaterThan(0);
      for (const e of gt.hipExtensionAtToeOffDeg[side]) expect(Math.abs(e - spec.hipExtensionDeg)).toBeLessThan(0.5);
      for (const i of gt.events[side].toeOff) expect(-gt.angles[i]![side].thighDeg).toBeCloseTo(spec.hipExtensionDeg, 2);
    }
  });

  it('normalised landmarks are the pixels divided by the frame size', () => {
    const f = gt.frames[17]!;
    expect(f.landmarksNormalised.near.knee.x).toBeCloseTo(f.landmarks.near.knee.x / spec.width, 5);
    expect(f.landmarksNormalised.far.toe.y).toBeCloseTo(f.landmarks.far.toe.y / spec.height, 5);
  });

  it('the stored angles are what the kinematics functions read from the stored pixels', () => {
    for (const i of [0, 33, 77]) {
      const again = anglesFromPixels(gt.frames[i]!.landmarks.near, 'right');
      expect(again.kneeFlexionDeg).toBeCloseTo(gt.angles[i]!.near.kneeFlexionDeg, 1);
      expect(again.footDeg).toBeCloseTo(gt.angles[i]!.near.footDeg, 1);
    }
  });

  it('facing left mirrors every pixel about the centre and leaves every angle and event unchanged', () => {
    const left = buildGroundTruth({ ...spec, facing: 'left' });
    expect(left.nearSide).toBe('left');
    expect(left.events).toEqual(gt.events);
    for (const i of [0, 20, 59, 101]) {
      for (const side of ['near', 'far'] as const) {
        const a = gt.frames[i]!.landmarks[side];
        const b = left.frames[i]!.landmarks[side];
        for (const k of Object.keys(a) as Array<keyof typeof a>) {
          expect(b[k].x).toBeCloseTo(spec.width - a[k].x, 2);
          expect(b[k].y).toBeCloseTo(a[k].y, 6);
        }
        expect(left.angles[i]![side]).toEqual(gt.angles[i]![side]);
      }
    }
  });

  it('the whole figure stays inside the frame', () => {
    for (const f of gt.frames) {
      for (const side of ['near', 'far'] as const) {
        for (const p of Object.values(f.landmarks[side])) {
          expect(p.x).toBeGreaterThan(0);
          expect(p.x).toBeLessThan(spec.width);
          expect(p.y).toBeGreaterThan(0);
          expect(p.y).toBeLessThan(spec.height);
        }
      }
    }
  });
});
