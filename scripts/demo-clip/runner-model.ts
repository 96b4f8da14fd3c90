/**
 * A synthetic side-view runner on a treadmill — a test fixture with known truth, not a model of
 * any real runner or publication. Pure: no canvas, no ffmpeg.
 *
 * Plane: metres, y up, belt surface at y = 0, +x the running direction (mirroring for a runner
 * facing left happens only when converting to pixels). The hip stays at x = 0 (the runner keeps
 * pace with the belt) and bobs vertically like a spring-mass runner.
 *
 * - Thigh and knee angles are short Fourier series over the gait cycle (4–5 harmonics, the
 *   smoothest series through key values). In stance (gait phase 0 … dutyFactor) the belt
 *   overrides them: the foot rolls heel → flat → shoe tip, the belt point it rests on moves
 *   backwards at the belt speed, and thigh and knee follow from hip and ankle positions by
 *   two-segment inverse kinematics, so the foot never slides. Short smooth blends after toe-off
 *   and before contact join the series to the stance curves with equal value and slope.
 * - Foot inclination is one Fourier series over the whole cycle, held flat in mid-stance.
 * - Resulting figures (hip extension 4° / 11°): thigh at contact ≈ 24° / 21°, heel lands
 *   0.20 / 0.16 m ahead of the hip, peak stance knee flexion ≈ 52° / 47°, peak hip extension
 *   ≈ 2° beyond the toe-off value just after toe-off, hip vertical travel 7.2 cm.
 * The landing point and hip height are solved so that the thigh angle at toe-off is exactly
 * −hipExtensionDeg and knee flexion at initial contact is exactly `kneeAtContactDeg`.
 */
import type { Point } from '../../src/kinematics/geometry';
import { toDeg, toRad } from '../../src/kinematics/geometry';
import { evalSeries, fitSeries, slopeSeries, smootherstep, type FourierSeries } from './fourier';

/** Segment lengths and marker offsets of the synthetic runner, metres. */
export const BODY = {
  thighM: 0.45,
  shankM: 0.43,
  /** Hip (greater trochanter) → shoulder. */
  trunkM: 0.5,
  /** Heel marker → toe marker (5th metatarsal head). */
  footM: 0.18,
  /** Ankle (lateral malleolus) marker in the foot frame: along heel→toe, and above that line. */
  ankleAlongM: 0.05,
  ankleAboveM: 0.065,
  /** Heel and toe markers sit this far above the sole. */
  soleM: 0.025,
  /** Shoe tip (the last point on the belt at toe-off) along heel→toe from the heel marker. */
  tipM: 0.245,
  neckM: 0.17,
  headRadiusM: 0.09,
  upperArmM: 0.28,
  forearmM: 0.26,
} as const;

/** Phase spans over which the swing series are blended into the stance curves. */
const BLEND_AFTER_TOE_OFF = 0.08;
const BLEND_BEFORE_CONTACT = 0.06;

/** Standard gravity, m/s². */
export const G = 9.81;

/** Options of {@link createRunnerModel}. */
export interface RunnerModelOptions {
  /** Hip extension at toe-off in degrees (thigh angle at toe-off = −this). */
  hipExtensionDeg: number;
  /** Belt speed, m/s (default 3.0). */
  beltSpeedMps?: number;
  /** Stride (two steps) period, s (default 0.7 → 171.43 steps/min). */
  stridePeriodS?: number;
  /** Ground contact per foot, s (default 0.25 → duty factor 0.357, flight 0.1 s per step). */
  contactTimeS?: number;
  /** Knee flexion at initial contact, degrees (default 17). */
  kneeAtContactDeg?: number;
  /** Mean forward trunk lean, degrees (default 8). */
  trunkLeanDeg?: number;
}

/** Points of one leg (metres, y up), relative to the hip or placed in the plane. */
export interface LegPoints {
  knee: Point;
  ankle: Point;
  heel: Point;
  toe: Point;
  /** Sole under the heel marker and the sole at the shoe tip: the foot's contact points. */
  heelSole: Point;
  tipSole: Point;
}

/** The curves' own angles of one leg at one phase, degrees. */
export interface LegAngles {
  thighDeg: number;
  kneeFlexionDeg: number;
  footDeg: number;
}

export interface PlacedLeg extends LegPoints {
  /** Gait phase of this leg: 0 = initial contact, dutyFactor = toe-off. */
  phase: number;
  stance: boolean;
  angles: LegAngles;
}

/** The whole figure at one instant, metres, y up, belt at y = 0. */
export interface RunnerPose {
  timeS: number;
  hip: Point;
  shoulder: Point;
  trunkDeg: number;
  near: PlacedLeg;
  far: PlacedLeg;
}

export interface RunnerModel {
  hipExtensionDeg: number;
  beltSpeedMps: number;
  stridePeriodS: number;
  contactTimeS: number;
  flightTimeS: number;
  /** Contact time ÷ stride time. */
  dutyFactor: number;
  /** Steps per minute = 120 ÷ stride period. */
  cadenceStepsPerMin: number;
  /** Heel sole x at initial contact (ahead of the hip), metres. */
  landingAheadM: number;
  /** Hip height at initial contact and toe-off, metres. */
  hipAtContactM: number;
  /** Hip drop from contact to mid-stance and rise in flight, metres (spring-mass figures). */
  stanceDropM: number;
  flightRiseM: number;
  curves: { thigh: FourierSeries; knee: FourierSeries; foot: FourierSeries };
  /** Pose at time t (s); near-leg initial contacts at t = k·stridePeriodS, far leg half a stride later. */
  pose(timeS: number): RunnerPose;
  /** The near leg at gait phase φ (0 = initial contact, dutyFactor = toe-off), i.e. at time φ·stridePeriodS. */
  legAt(phase: number): PlacedLeg;
  /** Hip height above the belt at time t, metres. */
  hipHeight(timeS: number): number;
}

const frac = (x: number) => x - Math.floor(x);
const add = (a: Point, b: Point): Point => ({ x: a.x + b.x, y: a.y + b.y });

/**
 * Spring-mass vertical motion (Morin et al. 2005, J Appl Biomech 21:167–180 — method as quoted
 * in REFERENCES.md, formula from memory): Fmax = (π/2)(tf/tc + 1) body weights; stance drop
 * Δy = Fmax·g·tc²/π² − g·tc²/8; flight rise g·tf²/8.
 */
export function springMassExcursion(contactS: number, flightS: number): { peakForceBw: number; stanceDropM: number; flightRiseM: number } {
  const peakForceBw = (Math.PI / 2) * (flightS / contactS + 1);
  return {
    peakForceBw,
    stanceDropM: (peakForceBw * G * contactS ** 2) / Math.PI ** 2 - (G * contactS ** 2) / 8,
    flightRiseM: (G * flightS ** 2) / 8,
  };
}

/**
 * Foot inclination before the mid-stance flat window (deg, + toe up): +10° at contact (rearfoot
 * strike), −52° at toe-off while still turning toe-down (push-off), which keeps the thigh's
 * overshoot past its toe-off angle to about 2° (peak hip extension just after toe-off).
 */
function footCurve(duty: number): FourierSeries {
  return fitSeries(
    [
      { phi: 0, value: 10 },
      { phi: duty, value: -52, slope: -400 },
      { phi: duty + 0.1, value: -62 },
      { phi: 0.7, value: -12 },
      { phi: 0.88, value: 16 },
      { phi: 0.96, value: 13 },
    ],
    5,
  );
}

/** Root of a monotonic function in [lo, hi] by bisection. */
export function bisect(f: (x: number) => number, lo: number, hi: number): number {
  let flo = f(lo);
  if (flo * f(hi) > 0) throw new Error('bisect: no sign change in the bracket');
  for (let i = 0; i < 100; i++) {
    const mid = (lo + hi) / 2;
    const fm = f(mid);
    if (flo * fm <= 0) hi = mid;
    else {
      lo = mid;
      flo = fm;
    }
  }
  return (lo + hi) / 2;
}

/** Two-segment inverse kinematics, knee in front: thigh and shank angles from vertical (deg). */
export function legIk(hip: Point, ankle: Point, thighM: number, shankM: number): { thighDeg: number; shankDeg: number } {
  const dx = ankle.x - hip.x;
  const dy = ankle.y - hip.y;
  const d = Math.min(Math.hypot(dx, dy), thighM + shankM - 1e-9);
  const line = Math.atan2(dx, -dy);
  const atHip = Math.acos(Math.min(1, (thighM ** 2 + d ** 2 - shankM ** 2) / (2 * thighM * d)));
  const atAnkle = Math.acos(Math.min(1, (shankM ** 2 + d ** 2 - thighM ** 2) / (2 * shankM * d)));
  return { thighDeg: toDeg(line + atHip), shankDeg: toDeg(line - atAnkle) };
}

/** Builds the synthetic runner; see the module comment for how each part moves. */
export function createRunnerModel(options: RunnerModelOptions): RunnerModel {
  const v = options.beltSpeedMps ?? 3.0;
  const T = options.stridePeriodS ?? 0.7;
  const Tc = options.contactTimeS ?? 0.25;
  const kneeIc = options.kneeAtContactDeg ?? 17;
  const lean = options.trunkLeanDeg ?? 8;
  const E = options.hipExtensionDeg;
  const duty = Tc / T;
  const Tf = T / 2 - Tc;
  if (!(Tf > 0)) throw new RangeError('contact time must be under half the stride: runners have a flight phase');
  const { stanceDropM, flightRiseM } = springMassExcursion(Tc, Tf);
  // Stance height profile y = yTD − Δ·(a·sin πs + (1 − a)·sin² πs), s = t/Tc: a matches the
  // ballistic flight's vertical speed g·Tf/2 at both ends.
  const a = (G * Tf * Tc) / (2 * Math.PI * stanceDropM);
  if (a > 1) throw new RangeError('flight too long for this contact time');
  const dropShape = (s: number) => a * Math.sin(Math.PI * s) + (1 - a) * Math.sin(Math.PI * s) ** 2;

  const footRaw = footCurve(duty);
  // The foot lies flat on the belt from 12 % to 40 % of stance.
  const flatWeight = (phi: number) => smootherstep(0.02 * duty, 0.12 * duty, phi) - smootherstep(0.4 * duty, 0.55 * duty, phi);
  const footDeg = (phi: number) => evalSeries(footRaw, phi) * (1 - flatWeight(phi));

  /** Hip height over a step: stance arc, then a ballistic flight. */
  const stepHeight = (yTd: number, stepTime: number): number => {
    if (stepTime <= Tc) return yTd - stanceDropM * dropShape(stepTime / Tc);
    const t = stepTime - Tc;
    return yTd + ((G * Tf) / 2) * t - (G * t * t) / 2;
  };

  /** Stance leg by IK for landing point `landing` (heel-sole x at contact) and contact hip height. */
  const stanceLeg = (landing: number, yTd: number, phi: number) => {
    const t = phi * T;
    const hip = { x: 0, y: stepHeight(yTd, t) };
    const alpha = toRad(footDeg(phi));
    const u = { x: Math.cos(alpha), y: Math.sin(alpha) };
    const n = { x: -Math.sin(alpha), y: Math.cos(alpha) };
    const belt = landing - v * t; // heel-sole x if the foot lay flat; it rolls heel → flat → tip
    const heelSole = alpha >= 0 ? { x: belt, y: 0 } : { x: belt + BODY.tipM - BODY.tipM * u.x, y: -BODY.tipM * u.y };
    const heel = { x: heelSole.x + BODY.soleM * n.x, y: heelSole.y + BODY.soleM * n.y };
    const ankle = {
      x: heel.x + BODY.ankleAlongM * u.x + BODY.ankleAboveM * n.x,
      y: heel.y + BODY.ankleAlongM * u.y + BODY.ankleAboveM * n.y,
    };
    const ik = legIk(hip, ankle, BODY.thighM, BODY.shankM);
    return { hip, ik, kneeDeg: ik.thighDeg - ik.shankDeg };
  };

  // Solve hip height at contact (knee flexion at contact) and landing point (thigh at toe-off).
  const hipForLanding = (landing: number) => bisect((y) => stanceLeg(landing, y, 0).kneeDeg - kneeIc, 0.3, BODY.thighM + BODY.shankM + 0.2);
  const landing = bisect((x) => stanceLeg(x, hipForLanding(x), duty).ik.thighDeg + E, -0.1, 0.5);
  const yTd = hipForLanding(landing);

  const stanceAngles = (phi: number) => {
    const s = stanceLeg(landing, yTd, phi);
    return { thigh: s.ik.thighDeg, knee: s.kneeDeg };
  };
  const h = 1e-6;
  const ic = stanceAngles(0);
  const to = stanceAngles(duty);
  const icSlope = { thigh: (stanceAngles(h).thigh - ic.thigh) / h, knee: (stanceAngles(h).knee - ic.knee) / h };
  const toSlope = { thigh: (to.thigh - stanceAngles(duty - h).thigh) / h, knee: (to.knee - stanceAngles(duty - h).knee) / h };
  const mid = stanceAngles(duty / 2);

  // Whole-cycle series: stance values (where IK will override them) plus swing key values.
  const thigh = fitSeries(
    [
      { phi: 0, value: ic.thigh },
      { phi: duty / 2, value: mid.thigh },
      { phi: duty, value: to.thigh },
      { phi: 0.62, value: 12 },
      { phi: 0.85, value: ic.thigh + 10, slope: 0 },
    ],
    4,
  );
  const knee = fitSeries(
    [
      { phi: 0, value: ic.knee },
      { phi: duty / 2, value: mid.knee },
      { phi: duty, value: to.knee },
      { phi: 0.66, value: 100, slope: 0 },
      { phi: 0.9, value: 30 },
      { phi: 0.97, value: Math.max(4, kneeIc - 6) },
    ],
    5,
  );

  /** Swing value of a series, blended near toe-off and contact to meet the stance value and slope. */
  const swing = (series: FourierSeries, phi: number, atTo: { v: number; s: number }, atIc: { v: number; s: number }) => {
    const f = evalSeries(series, phi);
    const fromTo = 1 - smootherstep(duty, duty + BLEND_AFTER_TOE_OFF, phi);
    const toIc = smootherstep(1 - BLEND_BEFORE_CONTACT, 1, phi);
    const dTo = atTo.v - evalSeries(series, duty) + (atTo.s - slopeSeries(series, duty)) * (phi - duty);
    const dIc = atIc.v - evalSeries(series, 1) + (atIc.s - slopeSeries(series, 1)) * (phi - 1);
    return f + fromTo * dTo + toIc * dIc;
  };

  const anglesAt = (phi: number): LegAngles => {
    if (phi <= duty) {
      const s = stanceAngles(phi);
      return { thighDeg: s.thigh, kneeFlexionDeg: s.knee, footDeg: footDeg(phi) };
    }
    return {
      thighDeg: swing(thigh, phi, { v: to.thigh, s: toSlope.thigh }, { v: ic.thigh, s: icSlope.thigh }),
      kneeFlexionDeg: swing(knee, phi, { v: to.knee, s: toSlope.knee }, { v: ic.knee, s: icSlope.knee }),
      footDeg: footDeg(phi),
    };
  };

  /** Forward kinematics from the hip for given angles. */
  const legFromAngles = (hip: Point, angles: LegAngles): LegPoints => {
    const t = toRad(angles.thighDeg);
    const s = toRad(angles.thighDeg - angles.kneeFlexionDeg);
    const al = toRad(angles.footDeg);
    const kneeP = add(hip, { x: BODY.thighM * Math.sin(t), y: -BODY.thighM * Math.cos(t) });
    const ankle = add(kneeP, { x: BODY.shankM * Math.sin(s), y: -BODY.shankM * Math.cos(s) });
    const u = { x: Math.cos(al), y: Math.sin(al) };
    const n = { x: -Math.sin(al), y: Math.cos(al) };
    const heel = {
      x: ankle.x - BODY.ankleAlongM * u.x - BODY.ankleAboveM * n.x,
      y: ankle.y - BODY.ankleAlongM * u.y - BODY.ankleAboveM * n.y,
    };
    const toe = { x: heel.x + BODY.footM * u.x, y: heel.y + BODY.footM * u.y };
    return {
      knee: kneeP,
      ankle,
      heel,
      toe,
      heelSole: { x: heel.x - BODY.soleM * n.x, y: heel.y - BODY.soleM * n.y },
      tipSole: { x: heel.x + BODY.tipM * u.x - BODY.soleM * n.x, y: heel.y + BODY.tipM * u.y - BODY.soleM * n.y },
    };
  };

  const hipHeight = (timeS: number) => stepHeight(yTd, frac(timeS / (T / 2)) * (T / 2));
  const place = (hip: Point, phase: number): PlacedLeg => {
    const angles = anglesAt(phase);
    return { ...legFromAngles(hip, angles), phase, stance: phase <= duty + 1e-9, angles };
  };

  const pose = (timeS: number): RunnerPose => {
    const hip = { x: 0, y: hipHeight(timeS) };
    const nearPhase = frac(timeS / T + 1e-12);
    const farPhase = frac(timeS / T - 0.5 + 1e-12);
    const trunkDeg = lean + 1.5 * Math.sin(2 * Math.PI * (2 * nearPhase - 0.1));
    const tr = toRad(trunkDeg);
    const shoulder = add(hip, { x: BODY.trunkM * Math.sin(tr), y: BODY.trunkM * Math.cos(tr) });
    return { timeS, hip, shoulder, trunkDeg, near: place(hip, nearPhase), far: place(hip, farPhase) };
  };

  return {
    hipExtensionDeg: E,
    beltSpeedMps: v,
    stridePeriodS: T,
    contactTimeS: Tc,
    flightTimeS: Tf,
    dutyFactor: duty,
    cadenceStepsPerMin: 120 / T,
    landingAheadM: landing,
    hipAtContactM: yTd,
    stanceDropM,
    flightRiseM,
    curves: { thigh, knee, foot: footRaw },
    pose,
    legAt: (phase: number) => place({ x: 0, y: hipHeight(frac(phase) * T) }, frac(phase)),
    hipHeight,
  };
}
