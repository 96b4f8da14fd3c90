/**
 * How measure numbers are written, on screen, on stills and in the visit summary PDF: decimals
 * per unit, one rounding rule (half away from zero on the decimal text), the true minus sign,
 * units joined the same way everywhere. Pure.
 */
import type { Measure, ReferenceBand } from '../contracts/measures';

/** Decimals shown for a unit: whole steps/min and mm, ms-precision seconds, cm-precision metres. */
export function decimalsFor(unit: string): number {
  switch (unit) {
    case 'steps/min':
    case 'strides/min':
    case 'mm':
      return 0;
    case 's':
      return 3;
    case 'm':
      return 2;
    default:
      return 1;
  }
}

/**
 * The number's absolute value rounded to `decimals`, as fixed-decimals text. The ONE rounding rule
 * of every figure Trailframe shows (overlay labels, measures, comparison, stills, PDFs): round half
 * away from zero on the number's shortest decimal text — the digits JavaScript prints for it — so
 * 22.45 → "22.5" even though the double nearest 22.45 is 22.4499999999999992…, which `toFixed`
 * rounds down, and 2.675 → "2.68" at two decimals.
 */
function roundedAbsText(value: number, decimals: number): string {
  const d = Math.max(0, Math.min(20, Math.trunc(decimals)));
  const abs = Math.abs(value);
  if (abs >= 1e21) return abs.toFixed(d);
  // Shortest round-trip text; tiny numbers come as "1.23e-7": write those out in full.
  let text = String(abs);
  if (text.includes('e')) text = abs.toFixed(Math.min(100, d + 2));
  const [intPart = '0', fracPart = ''] = text.split('.');
  if (fracPart.length <= d) return d ? `${intPart}.${fracPart.padEnd(d, '0')}` : intPart;
  const kept = `${intPart}${fracPart.slice(0, d)}`;
  const up = fracPart.charCodeAt(d) >= 53; // '5'…'9': half or more away from zero
  const digits = up ? (BigInt(kept) + 1n).toString().padStart(kept.length, '0') : kept;
  return d ? `${digits.slice(0, digits.length - d)}.${digits.slice(digits.length - d)}` : digits;
}

/** `value` rounded to `decimals` by the one rule of {@link formatNumber} (half away from zero on the decimal text); never −0. */
export function roundHalfAway(value: number, decimals: number): number {
  if (!Number.isFinite(value)) return value;
  const r = Number(roundedAbsText(value, decimals));
  return r === 0 ? 0 : value < 0 ? -r : r;
}

/**
 * A number with fixed decimals, rounded half away from zero on its decimal text (22.45 → "22.5"),
 * with the true minus sign ("−3.0"), never "−0.0"; `signed` adds "+" to positive numbers (changes).
 */
export function formatNumber(value: number, decimals: number, opts: { signed?: boolean } = {}): string {
  if (!Number.isFinite(value)) return '—';
  const text = roundedAbsText(value, decimals);
  const zero = !/[1-9]/.test(text);
  const sign = zero ? '' : value < 0 ? '\u2212' : opts.signed ? '+' : '';
  return `${sign}${text}`;
}

/** A value rounded to the precision its unit is shown at ({@link decimalsFor}). */
export function roundForUnit(value: number, unit: string): number {
  return roundHalfAway(value, decimalsFor(unit));
}

const fixed = (value: number, decimals: number, signed = false) => formatNumber(value, decimals, { signed });

function joinUnit(text: string, unit: string): string {
  if (!unit) return text;
  return unit === '°' || unit === '%' ? `${text}${unit}` : `${text} ${unit}`;
}

/**
 * A number in a measure's unit, e.g. "12.3°", "171 steps/min", "0.350 s", "—" when missing;
 * `signed` writes changes with their sign ("+3.8°", "−2 steps/min", "0.0°").
 */
export function formatValue(value: number | null, unit: string, opts: { signed?: boolean } = {}): string {
  if (value === null || !Number.isFinite(value)) return '—';
  return joinUnit(fixed(value, decimalsFor(unit), opts.signed), unit);
}

/** "mean ± SD unit" (SD left out for a single step). */
export function formatMeasure(m: Pick<Measure, 'mean' | 'sd' | 'unit' | 'n' | 'status'>): string {
  if (m.status !== 'ok' || m.mean === null) return 'Not enough data';
  const d = decimalsFor(m.unit);
  const sd = m.sd !== null && Number.isFinite(m.sd) && m.n > 1 ? ` ± ${fixed(m.sd, d)}` : '';
  return joinUnit(`${fixed(m.mean, d)}${sd}`, m.unit);
}

/**
 * "10–25°", "≥ 10°", "≤ 8 cm"; a range with a negative end reads "−0.8 to 7.4°", since a dash
 * beside a minus sign ("−0.8–7.4°", "−5–−2°") reads as subtraction or a double minus.
 */
export function bandRange(band: Pick<ReferenceBand, 'low' | 'high' | 'unit'>): string {
  const { low, high, unit } = band;
  const d = decimalsFor(unit);
  const n = (v: number) => String(roundHalfAway(v, Math.max(d, 2))).replace('-', '\u2212');
  if (low !== null && high !== null) {
    const [from, to] = [n(low), n(high)];
    const signed = from.startsWith('\u2212') || to.startsWith('\u2212');
    return joinUnit(signed ? `${from} to ${to}` : `${from}–${to}`, unit);
  }
  if (low !== null) return `≥ ${joinUnit(n(low), unit)}`;
  if (high !== null) return `≤ ${joinUnit(n(high), unit)}`;
  return 'No limits';
}

/**
 * A measure's name with its side: "Knee flexion at initial contact (left)". A name that already ends in a
 * bracket takes the side inside it — "Hip extension at toe-off (thigh from vertical, left)" — not a second pair.
 */
export function sidedLabel(label: string, side: 'left' | 'right' | null): string {
  if (side === null) return label;
  return label.endsWith(')') ? `${label.slice(0, -1)}, ${side})` : `${label} (${side})`;
}
