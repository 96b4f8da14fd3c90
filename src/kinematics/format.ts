/**
 * How measure numbers are written, on screen and in the visit summary PDF: decimals per unit,
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

/** A fixed-decimals number with a true minus sign ("−3.0"); one that rounds to zero has none. */
function fixed(value: number, decimals: number): string {
  const text = value.toFixed(decimals);
  if (Number(text) === 0) return Math.abs(value).toFixed(decimals);
  return text.replace('-', '\u2212');
}

function joinUnit(text: string, unit: string): string {
  if (!unit) return text;
  return unit === '°' || unit === '%' ? `${text}${unit}` : `${text} ${unit}`;
}

/** A number in a measure's unit, e.g. "12.3°", "171 steps/min", "0.350 s". */
export function formatValue(value: number | null, unit: string): string {
  if (value === null || !Number.isFinite(value)) return '—';
  return joinUnit(fixed(value, decimalsFor(unit)), unit);
}

/** "mean ± SD unit" (SD left out for a single step). */
export function formatMeasure(m: Pick<Measure, 'mean' | 'sd' | 'unit' | 'n' | 'status'>): string {
  if (m.status !== 'ok' || m.mean === null) return 'Not enough data';
  const d = decimalsFor(m.unit);
  const sd = m.sd !== null && Number.isFinite(m.sd) && m.n > 1 ? ` ± ${m.sd.toFixed(d)}` : '';
  return joinUnit(`${fixed(m.mean, d)}${sd}`, m.unit);
}

/** "10–25°", "≥ 10°", "≤ 8 cm". */
export function bandRange(band: Pick<ReferenceBand, 'low' | 'high' | 'unit'>): string {
  const { low, high, unit } = band;
  const d = decimalsFor(unit);
  const n = (v: number) => String(Number(v.toFixed(Math.max(d, 2)))).replace('-', '\u2212');
  if (low !== null && high !== null) return joinUnit(`${n(low)}–${n(high)}`, unit);
  if (low !== null) return `≥ ${joinUnit(n(low), unit)}`;
  if (high !== null) return `≤ ${joinUnit(n(high), unit)}`;
  return 'No limits';
}

