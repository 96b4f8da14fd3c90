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
import { toDeg, type Point } from './geometry';

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
