/**
 * Visit statistics: one visit's mean per measure and side from the measures of its clips, each
 * clip weighted by the steps behind its mean, and how many steps that is. Pure.
 */
import type { Side } from '../contracts/assessment';
import type { ClipMeasures, MeasureKey } from '../contracts/measures';

/**
 * Measures that are rates (per minute): their visit mean is steps ÷ time over all clips, so the
 * clip means are combined harmonically with step weights — Σn ÷ Σ(n ÷ rate) = 60 ÷ the pooled
 * mean step time, the same definition as one clip's cadence.
 */
export const RATE_MEASURES: ReadonlySet<MeasureKey> = new Set<MeasureKey>(['cadence']);

/** One visit's figure for one measure and side. */
export interface VisitMeasure {
  key: MeasureKey;
  side: Side | null;
  label: string;
  unit: string;
  /** Step-weighted mean of the clip means; null when no clip measured it. */
  mean: number | null;
  /** Steps behind `mean`, all clips together (0 when not measured). */
  steps: number;
  /** Clips that measured it. */
  clips: number;
}

export const visitRowId = (key: MeasureKey, side: Side | null): string => `${key}|${side ?? ''}`;

/**
 * Every measure and side found in the clips (first-seen order), with its step-weighted visit mean:
 * Σ nᵢ·meanᵢ ÷ Σ nᵢ, or for {@link RATE_MEASURES} Σ nᵢ ÷ Σ (nᵢ ÷ meanᵢ). A clip whose figure is
 * not measured (or not finite) adds nothing.
 */
export function visitStatistics(clips: readonly ClipMeasures[]): Map<string, VisitMeasure> {
  const acc = new Map<string, VisitMeasure & { sum: number }>();
  for (const clip of clips) {
    for (const m of clip.measures) {
      const id = visitRowId(m.key, m.side);
      let e = acc.get(id);
      if (!e) acc.set(id, (e = { key: m.key, side: m.side, label: m.label, unit: m.unit, mean: null, steps: 0, clips: 0, sum: 0 }));
      if (m.status !== 'ok' || m.mean === null || !Number.isFinite(m.mean)) continue;
      // A clip mean always stands on at least one step, whatever its n says.
      const n = Math.max(1, m.n);
      if (RATE_MEASURES.has(m.key)) {
        if (m.mean <= 0) continue;
        e.sum += n / m.mean;
      } else e.sum += n * m.mean;
      e.steps += n;
      e.clips += 1;
    }
  }
  const out = new Map<string, VisitMeasure>();
  for (const [id, { sum, ...e }] of acc) {
    const mean = e.steps === 0 ? null : RATE_MEASURES.has(e.key) ? e.steps / sum : sum / e.steps;
    out.set(id, { ...e, mean });
  }
  return out;
}

/** One visit's mean per measure key and side (step-weighted, see {@link visitStatistics}; null when not measured). */
export function visitMeans(clips: readonly ClipMeasures[]): { key: MeasureKey; side: Side | null; mean: number | null }[] {
  return [...visitStatistics(clips).values()].map(({ key, side, mean }) => ({ key, side, mean }));
}
