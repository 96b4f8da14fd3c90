/**
 * The scale bar (calibration): a line over an object of known length in the plane of running.
 * Pure functions.
 */
import { ANNOTATION_LIMITS, MIN_SCALE_LINE_PX, type FramePoint } from '../../../contracts/annotations';
import type { FilmSurface } from '../../../contracts/assessment';
import type { Size } from './view-transform';

/** Length of the drawn line in working-frame pixels. */
export function scaleLengthPx(a: FramePoint, b: FramePoint, frame: Size): number {
  return Math.hypot((b.x - a.x) * frame.width, (b.y - a.y) * frame.height);
}

/** Millimetres per working-frame pixel, or null when the line has no length. */
export function mmPerPx(a: FramePoint, b: FramePoint, lengthM: number, frame: Size): number | null {
  const px = scaleLengthPx(a, b, frame);
  return px > 0 && lengthM > 0 ? (lengthM * 1000) / px : null;
}

/** Reads the typed length in metres (comma or point as the decimal mark). */
export function readScaleLength(text: string): { value: number } | { error: string } {
  const t = text.trim().replace(',', '.');
  if (!t) return { error: 'Enter the length in metres' };
  if (!/^\d*\.?\d+$/.test(t)) return { error: 'Enter a number of metres, e.g. 1 or 0.5' };
  const value = Number(t);
  const { min, max } = ANNOTATION_LIMITS.scaleLengthM;
  if (value < min || value > max) return { error: `Between ${min} and ${max} m` };
  return { value };
}

/** The shortest line worth calling a scale bar, in working-frame pixels (shared with the API). */
export { MIN_SCALE_LINE_PX };

/** What lengths rest on for this surface, in a sentence for the scale panel. */
export function lengthBasisText(surface: FilmSurface, beltSpeedMps: number | null): string {
  if (surface === 'treadmill') {
    return beltSpeedMps
      ? `Treadmill: stride and step length come from the belt speed (${beltSpeedMps.toFixed(2)} m/s) × time. The scale bar is used for heel ahead of hip and vertical oscillation.`
      : 'Treadmill: stride length comes from the belt speed × time, but no belt speed is recorded on this assessment. Add it on the assessment; the scale bar is used for heel ahead of hip and vertical oscillation.';
  }
  return 'Overground: stride and step length come from the scale bar and how far the hip travels between contacts, so draw the bar in the plane the runner passes through.';
}
