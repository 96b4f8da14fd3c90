/**
 * Small descriptive statistics used by the measures. Pure.
 */
import { roundHalfAway } from './format';

/** Arithmetic mean; null for an empty list. */
export function mean(values: readonly number[]): number | null {
  if (values.length === 0) return null;
  let s = 0;
  for (const v of values) s += v;
  return s / values.length;
}

/** Sample standard deviation (n − 1 in the denominator); null when fewer than two values. */
export function sampleSd(values: readonly number[]): number | null {
  if (values.length < 2) return null;
  const m = mean(values)!;
  let ss = 0;
  for (const v of values) ss += (v - m) * (v - m);
  return Math.sqrt(ss / (values.length - 1));
}

/** Median; null for an empty list. */
export function median(values: readonly number[]): number | null {
  if (values.length === 0) return null;
  const s = [...values].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 ? s[h]! : (s[h - 1]! + s[h]!) / 2;
}

/**
 * Symmetry index, percent: |L − R| ÷ mean(L, R) × 100 (0 % = perfect symmetry). Only defined when
 * both values are positive (a mean near or below zero makes the ratio meaningless); null otherwise.
 */
export function symmetryIndexPct(left: number, right: number): number | null {
  if (!(left > 0) || !(right > 0)) return null;
  return (Math.abs(left - right) / ((left + right) / 2)) * 100;
}

/** Rounds to one decimal the way every label shows numbers ({@link roundHalfAway}: half away from zero on the decimal text; −0 → 0). */
export function round1(v: number): number {
  return roundHalfAway(v, 1);
}
