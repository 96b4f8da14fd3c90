/**
 * The synthetic runner (scripts/demo-clip/runner-model.ts). It is a test fixture with known
 * truth, not a published source: these tests check that it does what it promises. Outside
 * figures are labelled where used ([calc] = worked example in REFERENCES.md).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createRunnerModel, springMassExcursion } from '../../../../scripts/demo-clip/runner-model';
import { thighAngleDeg } from '../../../../src/kinematics/angles';

const hipExt = fc.noBias(fc.integer({ min: 0, max: 150 })).map((v) => v / 10);

describe('synthetic runner model (test fixture, not a published source)', () => {
  it('thigh angle at toe-off equals −requested hip extension (model curve and landmark geometry), any request 0–15°', () => {
    fc.assert(
      fc.property(hipExt, (E) => {
        const m = createRunnerModel({ hipExtensionDeg: E });
        const leg = m.legAt(m.dutyFactor);
        const hip = { x: 0, y: m.hipHeight(m.contactTimeS) };
        return Math.abs(leg.angles.thighDeg + E) < 1e-6 && Math.abs(thighAngleDeg(hip, leg.knee) + E) < 1e-6;
      }),
      { numRuns: 25 },
    );
  });

  it('[calc] timing worked example, REFERENCES.md: stride 0.700 s, contact 0.250 s → cadence 171.43 steps/min, duty factor 0.3571, flight 0.100 s, stride length 2.100 m', () => {
    const m = createRunnerModel({ hipExtensionDeg: 10 });
    expect(m.cadenceStepsPerMin).toBeCloseTo(171.43, 2);
    expect(m.dutyFactor).toBeCloseTo(0.3571, 4);
    expect(m.flightTimeS).toBeCloseTo(0.1, 9);
    expect(m.beltSpeedMps * m.stridePeriodS).toBeCloseTo(2.1, 9);
    // stance 35–40 % of the stride per leg, so both feet are off the belt for part of each step
    expect(m.dutyFactor).toBeGreaterThan(0.35);
    expect(m.dutyFactor).toBeLessThan(0.4);
  });

  it('[calc] spring-mass worked example, REFERENCES.md (Morin et al. 2005 method, formula from memory): Fmax 2.199 BW, drop 5.997 cm, rise 1.226 cm; the hip travels 7.224 cm', () => {
    const sm = springMassExcursion(0.25, 0.1);
    expect(sm.peakForceBw).toBeCloseTo(2.199, 3);
    expect(sm.stanceDropM * 100).toBeCloseTo(5.997, 3);
    expect(sm.flightRiseM * 100).toBeCloseTo(1.226, 3);
    const m = createRunnerModel({ hipExtensionDeg: 11 });
    const ys = Array.from({ length: 2001 }, (_, i) => m.hipHeight((i / 2000) * m.stridePeriodS));
    expect((Math.max(...ys) - Math.min(...ys)) * 100).toBeCloseTo(7.224, 2);
  });

  it.each([4, 11])('hip extension %i°: the stance foot stays on the belt and its contact point moves back at belt speed', (E) => {
    const m = createRunnerModel({ hipExtensionDeg: E });
    const h = 1e-5;
    for (let i = 1; i < 60; i++) {
      const t = (i / 60) * m.contactTimeS;
      const p = m.pose(t).near;
      const low = Math.min(p.heelSole.y, p.tipSole.y);
      expect(Math.abs(low)).toBeLessThan(1e-9);
      const onHeel = p.heelSole.y <= p.tipSole.y;
      const key = onHeel ? 'heelSole' : 'tipSole';
      const a = m.pose(t - h).near[key];
      const b = m.pose(t + h).near[key];
      // where the foot pivots on heel or tip, the pivot point is stationary on the belt
      expect((b.x - a.x) / (2 * h)).toBeCloseTo(-m.beltSpeedMps, 3);
      expect(Math.abs(b.y - a.y) / (2 * h)).toBeLessThan(1e-3);
    }
  });

  it.each([4, 11])('hip extension %i°: swing feet stay above the belt (within 0.5 mm) and the knee never hyperextends', (E) => {
    const m = createRunnerModel({ hipExtensionDeg: E });
    for (let i = 0; i < 1400; i++) {
      const p = m.pose((i / 1400) * m.stridePeriodS);
      for (const leg of [p.near, p.far]) {
        if (!leg.stance) expect(Math.min(leg.heelSole.y, leg.tipSole.y)).toBeGreaterThan(-0.0005);
        expect(leg.angles.kneeFlexionDeg).toBeGreaterThan(0);
      }
    }
  });

  it('peak hip extension comes at or just after toe-off (≤ 3° beyond, within 10 % of the cycle)', () => {
    for (const E of [4, 11]) {
      const m = createRunnerModel({ hipExtensionDeg: E });
      let peak = { deg: -Infinity, phase: 0 };
      for (let i = 0; i < 1000; i++) {
        const phase = i / 1000;
        const ext = -m.legAt(phase).angles.thighDeg;
        if (ext > peak.deg) peak = { deg: ext, phase };
      }
      expect(peak.deg - E).toBeGreaterThanOrEqual(0);
      expect(peak.deg - E).toBeLessThan(3);
      expect(peak.phase - m.dutyFactor).toBeLessThan(0.1);
    }
  });

  it('the far leg runs half a stride behind the near leg', () => {
    const m = createRunnerModel({ hipExtensionDeg: 8 });
    for (const t of [0.01, 0.2, 0.33, 0.5, 0.69]) {
      const now = m.pose(t);
      const halfLater = m.pose(t + m.stridePeriodS / 2);
      expect(halfLater.far.angles.thighDeg).toBeCloseTo(now.near.angles.thighDeg, 9);
      expect(halfLater.far.knee.y - halfLater.hip.y).toBeCloseTo(now.near.knee.y - now.hip.y, 9);
    }
  });

  it('less hip extension at toe-off means the foot lands further ahead of the hip (longer reach)', () => {
    const a = createRunnerModel({ hipExtensionDeg: 4 });
    const b = createRunnerModel({ hipExtensionDeg: 11 });
    expect(a.landingAheadM).toBeGreaterThan(b.landingAheadM);
    expect(a.legAt(0).angles.thighDeg).toBeGreaterThan(b.legAt(0).angles.thighDeg);
  });
});
