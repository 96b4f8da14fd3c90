/**
 * A synthetic side-view runner on a treadmill: joint-angle curves (short Fourier series over the
 * gait cycle) drive a 2D linkage; the stance foot rolls heel → flat → toe on a belt that moves
 * backwards at the belt speed, and that rolling contact sets where the hip is. Pure: no canvas,
 * no ffmpeg. A test fixture with known truth — not a model of any real runner or publication.
 *
 * Plane: metres, y up, belt surface at y = 0, +x the running direction (mirroring for a runner
 * facing left happens only when converting to pixels).
 */
import type { Point } from '../../src/kinematics/geometry';
import { toRad } from '../../src/kinematics/geometry';
import { evalSeries, fitSeries, smootherstep, type FourierSeries } from './fourier';

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
  ankleAboveM: 0.075,
  /** Heel and toe markers sit this far above the sole. */
  soleM: 0.025,
  neckM: 0.2,
  headRadiusM: 0.095,
  upperArmM: 0.28,
  forearmM: 0.26,
} as const;

/** Options of {@link createRunnerModel}. */
export interface RunnerModelOptions {
  /** Hip extension at toe-off in degrees (thigh angle at toe-off = −this). */
  hipExtensionDeg: number;
  /** Belt speed, m/s (default 3.0). */
  beltSpeedMps?: number;
  /** Stride (two steps) period, s (default 0.7 → 171.43 steps/min; whole frames at 30…240 fps). */
  stridePeriodS?: number;
  /** Ground contact per foot, s (default 0.25 → duty factor 0.357, flight 0.1 s per step). */
  contactTimeS?: number;
  /** Mean forward trunk lean, degrees (default 8). */
  trunkLeanDeg?: number;
}

/** Points of one leg, relative to the hip or absolute (metres, y up). */
export interface LegPoints {
  knee: Point;
  ankle: Point;
  heel: Point;
  toe: Point;
  /** Sole points under the heel and toe markers (what touches the belt). */
  heelSole: Point;
  toeSole: Point;
}

/** Joint and segment angles of one leg at one phase, degrees (the curves' own values). */
export interface LegAngles {
  thighDeg: number;
  kneeFlexionDeg: number;
  footDeg: number;
}

/** The whole figure at one instant, metres, y up, belt at y = 0. */
export interface RunnerPose {
  timeS: number;
  hip: Point;
  shoulder: Point;
  trunkDeg: number;
  near: LegPoints & { phase: number; stance: boolean; angles: LegAngles };
  far: LegPoints & { phase: number; stance: boolean; angles: LegAngles };
}

export interface RunnerModel {
  hipExtensionDeg: number;
  beltSpeedMps: number;
  stridePeriodS: number;
  contactTimeS: number;
  /** Contact time ÷ stride time. */
  dutyFactor: number;
  /** Steps per minute = 120 ÷ stride period. */
  cadenceStepsPerMin: number;
  /** Thigh angle at initial contact, solved so the stance foot keeps pace with the belt. */
  thighAtContactDeg: number;
  curves: { thigh: FourierSeries; knee: FourierSeries; foot: FourierSeries };
  /** Pose at time t (s); near-leg initial contacts at t = k·stridePeriodS, far leg half a stride later. */
  pose(timeS: number): RunnerPose;
  /** Leg points relative to the hip at gait phase φ (0 = initial contact, dutyFactor = toe-off). */
  legAt(phase: number): LegPoints & { angles: LegAngles };
}

const frac = (x: number) => x - Math.floor(x);
const add = (a: Point, b: Point): Point => ({ x: a.x + b.x, y: a.y + b.y });

/** Knee flexion curve (deg): stance peak ≈ 42° at 40 % of stance, swing peak ≈ 98°. */
function kneeCurve(duty: number): FourierSeries {
  return fitSeries(
    [
      { phi: 0, value: 16 },
      { phi: 0.4 * duty, value: 42, slope: 0 },
      { phi: duty, value: 24 },
      { phi: 0.66, value: 98, slope: 0 },
      { phi: 0.9, value: 30 },
      { phi: 0.965, value: 13 },
    ],
    6,
  );
}

/** Foot angle from horizontal before the flat-foot window is applied (deg, + toe up). */
function footCurve(duty: number): FourierSeries {
  return fitSeries(
    [
      { phi: 0, value: 10 },
      { phi: duty, value: -32 },
      { phi: duty + 0.13, value: -58 },
      { phi: 0.7, value: -12 },
      { phi: 0.88, value: 16 },
      { phi: 0.96, value: 13 },
    ],
    5,
  );
}

/**
 * Thigh curve (deg): `contactDeg` at initial contact, its minimum −hipExtension exactly at
 * toe-off (zero slope there, so peak extension is at toe-off), peak flexion in late swing,
 * a little retraction before the next contact.
 */
function thighCurve(duty: number, contactDeg: number, hipExtensionDeg: number): FourierSeries {
  return fitSeries(
    [
      { phi: 0, value: contactDeg },
      { phi: duty, value: -hipExtensionDeg, slope: 0 },
      { phi: 0.62, value: 14 },
      { phi: 0.82, value: contactDeg + 12, slope: 0 },
      { phi: 0.95, value: contactDeg + 3 },
    ],
    5,
  );
}

/** Bisection for an increasing or decreasing function's root in [lo, hi]. */
function bisect(f: (x: number) => number, lo: number, hi: number): number {
  let flo = f(lo);
  if (flo * f(hi) > 0) throw new Error('bisect: no sign change');
  for (let i = 0; i < 80; i++) {
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

/** Cubic Hermite between (p0, m0) and (p1, m1) over a span of length `span`, at s ∈ [0, 1]. */
function hermite(p0: number, m0: number, p1: number, m1: number, span: number, s: number): number {
  const s2 = s * s;
  const s3 = s2 * s;
  return (2 * s3 - 3 * s2 + 1) * p0 + (s3 - 2 * s2 + s) * span * m0 + (-2 * s3 + 3 * s2) * p1 + (s3 - s2) * span * m1;
}

/**
 * Builds the synthetic runner. The thigh angle at initial contact is solved so that, over one
 * contact, the hip passes over the rolling foot by exactly beltSpeed × contactTime — so the
 * hip needs no horizontal surge to stay over the treadmill (less hip extension ⇒ the foot
 * lands further ahead, i.e. a longer reach at contact).
 */
export function createRunnerModel(options: RunnerModelOptions): RunnerModel {
  const v = options.beltSpeedMps ?? 3.0;
  const T = options.stridePeriodS ?? 0.7;
  const Tc = options.contactTimeS ?? 0.25;
  const lean = options.trunkLeanDeg ?? 8;
  const E = options.hipExtensionDeg;
  const duty = Tc / T;
  if (!(duty > 0 && duty < 0.5)) throw new RangeError('contact time must be under half the stride (runners have flight)');

  const knee = kneeCurve(duty);
  const footRaw = footCurve(duty);
  // Flat-foot window in stance: the foot lies on the belt from 12 % to 45 % of stance.
  const flatWeight = (phi: number) => smootherstep(0.02 * duty, 0.12 * duty, phi) - smootherstep(0.45 * duty, 0.62 * duty, phi);
  const footDeg = (phi: number) => evalSeries(footRaw, phi) * (1 - flatWeight(phi));

  let thigh = thighCurve(duty, 25, E);

  const legAtWith = (thighSeries: FourierSeries, phase: number): LegPoints & { angles: LegAngles } => {
    const phi = frac(phase);
    const thighDeg = evalSeries(thighSeries, phi);
    const kneeFlexionDeg = evalSeries(knee, phi);
    const fDeg = footDeg(phi);
    const t = toRad(thighDeg);
    const s = toRad(thighDeg - kneeFlexionDeg);
    const a = toRad(fDeg);
    const kneeP = { x: BODY.thighM * Math.sin(t), y: -BODY.thighM * Math.cos(t) };
    const ankle = add(kneeP, { x: BODY.shankM * Math.sin(s), y: -BODY.shankM * Math.cos(s) });
    const u = { x: Math.cos(a), y: Math.sin(a) };
    const n = { x: -Math.sin(a), y: Math.cos(a) };
    const heel = { x: ankle.x - BODY.ankleAlongM * u.x - BODY.ankleAboveM * n.x, y: ankle.y - BODY.ankleAlongM * u.y - BODY.ankleAboveM * n.y };
    const toe = { x: heel.x + BODY.footM * u.x, y: heel.y + BODY.footM * u.y };
    const heelSole = { x: heel.x - BODY.soleM * n.x, y: heel.y - BODY.soleM * n.y };
    const toeSole = { x: toe.x - BODY.soleM * n.x, y: toe.y - BODY.soleM * n.y };
    return { knee: kneeP, ankle, heel, toe, heelSole, toeSole, angles: { thighDeg, kneeFlexionDeg, footDeg: fDeg } };
  };

  // Solve the contact thigh angle: hip travel over the rolling foot = belt travel in contact.
  const travel = (thighSeries: FourierSeries) => {
    const ic = legAtWith(thighSeries, 0);
    const to = legAtWith(thighSeries, duty);
    return ic.heelSole.x + BODY.footM - to.toeSole.x;
  };
  const contactDeg = bisect((c) => travel(thighCurve(duty, c, E)) - v * Tc, 0, 50);
  thigh = thighCurve(duty, contactDeg, E);
  const legAt = (phase: number) => legAtWith(thigh, phase);

  // Hip in stance (step phase ψ ∈ [0, 2·duty)), relative to its x at initial contact.
  const heelAtContactX = legAt(0).heelSole.x;
  const stanceHip = (phi: number): Point => {
    const leg = legAt(phi);
    const belt = heelAtContactX - v * phi * T; // where the heel sole would be if the foot lay flat
    const onHeel = leg.angles.footDeg >= 0;
    const contact = onHeel ? leg.heelSole : leg.toeSole;
    const contactX = onHeel ? belt : belt + BODY.footM;
    return { x: contactX - contact.x, y: -contact.y };
  };
  const h = 1e-5;
  const stanceVel = (phi: number): Point => {
    const a = stanceHip(phi - h);
    const b = stanceHip(phi + h);
    return { x: (b.x - a.x) / (2 * h * T), y: (b.y - a.y) / (2 * h * T) };
  };
  const start = stanceHip(0);
  const startVel = stanceVel(h);
  const end = stanceHip(duty);
  const endVel = stanceVel(duty - h);
  const flight = T / 2 - Tc;
  const hipRaw = (timeS: number): Point => {
    const stepT = frac(timeS / (T / 2)) * (T / 2);
    if (stepT <= Tc) return stanceHip(stepT / T);
    const s = (stepT - Tc) / flight;
    return { x: hermite(end.x, endVel.x, start.x, startVel.x, flight, s), y: hermite(end.y, endVel.y, start.y, startVel.y, flight, s) };
  };
  // Centre the hip's mean x on 0.
  let meanX = 0;
  const samples = 400;
  for (let i = 0; i < samples; i++) meanX += hipRaw((i / samples) * (T / 2)).x / samples;

  const pose = (timeS: number): RunnerPose => {
    const raw = hipRaw(timeS);
    const hip = { x: raw.x - meanX, y: raw.y };
    const nearPhase = frac(timeS / T);
    const farPhase = frac(timeS / T - 0.5);
    const trunkDeg = lean + 1.5 * Math.sin(2 * Math.PI * (2 * nearPhase - 0.1));
    const tr = toRad(trunkDeg);
    const shoulder = add(hip, { x: BODY.trunkM * Math.sin(tr), y: BODY.trunkM * Math.cos(tr) });
    const place = (phase: number) => {
      const rel = legAt(phase);
      return {
        knee: add(hip, rel.knee),
        ankle: add(hip, rel.ankle),
        heel: add(hip, rel.heel),
        toe: add(hip, rel.toe),
        heelSole: add(hip, rel.heelSole),
        toeSole: add(hip, rel.toeSole),
        phase,
        stance: phase <= duty + 1e-9,
        angles: rel.angles,
      };
    };
    return { timeS, hip, shoulder, trunkDeg, near: place(nearPhase), far: place(farPhase) };
  };

  return {
    hipExtensionDeg: E,
    beltSpeedMps: v,
    stridePeriodS: T,
    contactTimeS: Tc,
    dutyFactor: duty,
    cadenceStepsPerMin: 120 / T,
    thighAtContactDeg: contactDeg,
    curves: { thigh, knee, foot: footRaw },
    pose,
    legAt,
  };
}
