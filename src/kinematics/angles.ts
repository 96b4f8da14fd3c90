/**
 * Signed 2D sagittal angles in degrees, all in the y-up plane with +x the running direction
 * (convert with `toSagittal` first). Conventions (REFERENCES.md, DESIGN.md):
 * - thigh = hip→knee from vertical: + flexion (knee ahead of hip), − extension;
 * - shank = knee→ankle from vertical: + when the ankle is ahead of the knee;
 * - knee flexion = thigh − shank (0° straight) = 180° − included hip–knee–ankle angle;
 * - trunk = hip→shoulder from vertical: + forward lean;
 * - foot = heel→toe from horizontal: + toe up;
 * - ankle = 90° − angle between shank (ankle→knee) and foot (heel→toe): + dorsiflexion;
 * - hip relative to trunk = thigh + trunk.
 * Hip extension at toe-off is reported as a positive number: `hipExtensionDeg(thigh) = −thigh`.
 */
import type { LandmarkName } from '../contracts/annotations';
import { toDeg, type PlanePoint, type PlaneUnit, type Point } from './geometry';

/** Hip→knee from vertical; + flexion, − extension. */
export function thighAngleDeg(hip: Point, knee: Point): number {
  return toDeg(Math.atan2(knee.x - hip.x, hip.y - knee.y));
}

/** Knee→ankle from vertical; + when the ankle is ahead of the knee. */
export function shankAngleDeg(knee: Point, ankle: Point): number {
  return toDeg(Math.atan2(ankle.x - knee.x, knee.y - ankle.y));
}

/** Knee flexion = thigh − shank; 0° is a straight knee. Wrapped to (−180°, 180°]. */
export function kneeFlexionDeg(hip: Point, knee: Point, ankle: Point): number {
  return wrapDeg(thighAngleDeg(hip, knee) - shankAngleDeg(knee, ankle));
}

/** Hip→shoulder from vertical; + forward lean. */
export function trunkLeanDeg(hip: Point, shoulder: Point): number {
  return toDeg(Math.atan2(shoulder.x - hip.x, shoulder.y - hip.y));
}

/** Heel→toe from horizontal; + toe up. */
export function footAngleDeg(heel: Point, toe: Point): number {
  return toDeg(Math.atan2(toe.y - heel.y, toe.x - heel.x));
}

/** Ankle = 90° − angle between ankle→knee and heel→toe; + dorsiflexion, − plantarflexion. */
export function ankleAngleDeg(knee: Point, ankle: Point, heel: Point, toe: Point): number {
  const sx = knee.x - ankle.x;
  const sy = knee.y - ankle.y;
  const fx = toe.x - heel.x;
  const fy = toe.y - heel.y;
  const between = toDeg(Math.atan2(Math.abs(sx * fy - sy * fx), sx * fx + sy * fy));
  return 90 - between;
}

/** Hip angle relative to the trunk = thigh + trunk lean. */
export function hipRelativeToTrunkDeg(thighDeg: number, trunkDeg: number): number {
  return thighDeg + trunkDeg;
}

/** Hip extension as reported at toe-off: positive degrees of extension (= −thigh angle). */
export function hipExtensionDeg(thighDeg: number): number {
  return -thighDeg;
}

/** Wraps an angle to (−180°, 180°]. */
export function wrapDeg(deg: number): number {
  const w = ((((deg + 180) % 360) + 360) % 360) - 180;
  return w === -180 ? 180 : w;
}

/** The six landmarks of one side, y-up, +x running direction. */
export interface SideLandmarks {
  shoulder: Point;
  hip: Point;
  knee: Point;
  ankle: Point;
  heel: Point;
  toe: Point;
}

/** The per-frame angles a coach reads for one side. */
export interface SideAngles {
  thighDeg: number;
  kneeFlexionDeg: number;
  shankDeg: number;
  trunkDeg: number;
  footDeg: number;
}

/** All of {@link SideAngles} for one side's landmarks. */
export function sideAngles(l: SideLandmarks): SideAngles {
  return {
    thighDeg: thighAngleDeg(l.hip, l.knee),
    kneeFlexionDeg: kneeFlexionDeg(l.hip, l.knee, l.ankle),
    shankDeg: shankAngleDeg(l.knee, l.ankle),
    trunkDeg: trunkLeanDeg(l.hip, l.shoulder),
    footDeg: footAngleDeg(l.heel, l.toe),
  };
}

// ─── Partial poses (what a coach has marked so far) ──────────────────────────────────────────

/** One side's landmarks on one frame in the plane (any subset marked), unit `U`. */
export type SidePose<U extends PlaneUnit = PlaneUnit> = Partial<Record<LandmarkName, PlanePoint<U>>>;

/** A trunk segment: hip → shoulder. */
export interface TrunkPair<U extends PlaneUnit = PlaneUnit> {
  hip: PlanePoint<U>;
  shoulder: PlanePoint<U>;
}

/**
 * Angles available from a partial pose (degrees; same conventions as above). An angle is absent
 * when a landmark it needs is absent — never NaN.
 */
export interface PoseAngles {
  /** Hip→knee from vertical, + flexion. Needs hip, knee. */
  thighDeg?: number;
  /** Knee→ankle from vertical, + ankle ahead of knee. Needs knee, ankle. */
  shankDeg?: number;
  /** Thigh − shank, 0° straight. Needs hip, knee, ankle. */
  kneeFlexionDeg?: number;
  /** Hip→shoulder from vertical, + forward. Needs shoulder, hip (own side, else `trunkFallback`). */
  trunkDeg?: number;
  /** Heel→toe from horizontal, + toe up. Needs heel, toe. */
  footDeg?: number;
  /** 90° − angle(shank, foot), + dorsiflexion. Needs knee, ankle, heel, toe. */
  ankleDeg?: number;
  /** Thigh + trunk. Needs thigh and trunk. */
  hipRelTrunkDeg?: number;
  /** True when the trunk came from `trunkFallback` (the other side's shoulder and hip). */
  trunkFromFallback?: boolean;
}

const distinct = (a: Point, b: Point): boolean => a.x !== b.x || a.y !== b.y;

/**
 * The angles of a partial pose. `trunkFallback` (normally the other side's shoulder and hip on the
 * same frame) is used for the trunk when this side's shoulder or hip is missing: the trunk is one
 * segment, seen from the side both marker pairs lie along it. Coincident points give no angle.
 */
export function poseAngles<U extends PlaneUnit>(pose: SidePose<U>, trunkFallback?: TrunkPair<U> | null): PoseAngles {
  const { shoulder, hip, knee, ankle, heel, toe } = pose;
  const out: PoseAngles = {};
  // Only finite values are ever written (no delete afterwards: it would slow every later access).
  let thigh = NaN;
  let shank = NaN;
  let trunk = NaN;
  if (hip && knee && distinct(hip, knee)) thigh = thighAngleDeg(hip, knee);
  if (Number.isFinite(thigh)) out.thighDeg = thigh;
  if (knee && ankle && distinct(knee, ankle)) shank = shankAngleDeg(knee, ankle);
  if (Number.isFinite(shank)) out.shankDeg = shank;
  if (Number.isFinite(thigh) && Number.isFinite(shank)) out.kneeFlexionDeg = wrapDeg(thigh - shank);
  if (shoulder && hip && distinct(hip, shoulder)) trunk = trunkLeanDeg(hip, shoulder);
  else if (trunkFallback && distinct(trunkFallback.hip, trunkFallback.shoulder)) {
    trunk = trunkLeanDeg(trunkFallback.hip, trunkFallback.shoulder);
    if (Number.isFinite(trunk)) out.trunkFromFallback = true;
  }
  if (Number.isFinite(trunk)) out.trunkDeg = trunk;
  if (heel && toe && distinct(heel, toe)) {
    const foot = footAngleDeg(heel, toe);
    if (Number.isFinite(foot)) out.footDeg = foot;
    if (Number.isFinite(shank)) {
      const a = ankleAngleDeg(knee!, ankle!, heel, toe);
      if (Number.isFinite(a)) out.ankleDeg = a;
    }
  }
  if (Number.isFinite(thigh) && Number.isFinite(trunk)) out.hipRelTrunkDeg = hipRelativeToTrunkDeg(thigh, trunk);
  return out;
}

/** Horizontal distance heel − hip (+ = heel ahead of the hip, overstride), in the pose's unit. */
export function heelAheadOfHip<U extends PlaneUnit>(pose: SidePose<U>): number | undefined {
  return pose.heel && pose.hip ? pose.heel.x - pose.hip.x : undefined;
}
