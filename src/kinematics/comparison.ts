/**
 * Re-test comparison: pairs a baseline's measures with a re-test's by key and side and says
 * whether each change is larger than the published measurement error (REFERENCES.md,
 * "Measurement error"). Pure; no Angular, no Node, no DOM.
 */
import type { Side } from '../contracts/assessment';
import type { ClipMeasures, ComparisonRow, ComparisonVerdict, MeasureKey, MeasurementErrorThreshold } from '../contracts/measures';

const DINGENEN = 'Dingenen et al. 2018, Phys Ther Sport 33:40–47, smallest detectable differences (mean of ≥ 7 steps)';
const DAMSTED = 'Damsted et al. 2015, Int J Sports Phys Ther 10:147–154, between-day 95 % prediction-interval widths';

/** Thresholds of change beyond measurement error, per measure; measures not listed have none. */
export const MEASUREMENT_ERROR: Partial<Record<MeasureKey, MeasurementErrorThreshold>> = {
  foot_angle_initial_contact: {
    value: 2.3,
    unit: '°',
    source: `${DINGENEN} (foot inclination 1.3–2.3°)`,
    evidence: 'pub',
    derivation: 'Upper smallest detectable difference for foot inclination at initial contact (2.3°).',
  },
  shank_angle_initial_contact: {
    value: 4.8,
    unit: '°',
    source: `${DINGENEN} (tibia inclination 2.2–4.8°)`,
    evidence: 'pub',
    derivation: 'Upper smallest detectable difference for tibia inclination at initial contact (4.8°).',
  },
  knee_flexion_initial_contact: {
    value: 3.8,
    unit: '°',
    source: `${DINGENEN} (knee flexion at midstance 2.3–3.8°)`,
    evidence: 'pub',
    derivation: 'Upper smallest detectable difference for knee flexion at midstance (3.8°), the nearest published figure for knee flexion at initial contact.',
  },
  knee_flexion_peak_stance: {
    value: 3.8,
    unit: '°',
    source: `${DINGENEN} (knee flexion at midstance 2.3–3.8°)`,
    evidence: 'pub',
    derivation: 'Upper smallest detectable difference for knee flexion at midstance (3.8°), the nearest published figure for peak knee flexion in stance.',
  },
  hip_extension_toe_off: {
    value: 5.5,
    unit: '°',
    source: `${DAMSTED} (hip, widths 9–11°)`,
    evidence: 'calc',
    derivation: 'Half the upper 95 % prediction-interval width for the hip (11° / 2 = 5.5°): a between-day difference inside ±W/2 is expected 95 % of the time.',
  },
  hip_extension_toe_off_rel_trunk: {
    value: 5.5,
    unit: '°',
    source: `${DAMSTED} (hip, widths 9–11°)`,
    evidence: 'calc',
    derivation: 'Half the upper 95 % prediction-interval width for the hip (11° / 2 = 5.5°): a between-day difference inside ±W/2 is expected 95 % of the time.',
  },
};

/** Shown when a measure has no published threshold. */
export const NO_PUBLISHED_THRESHOLD = 'no published threshold';

export const VERDICT_LABELS: Record<ComparisonVerdict, string> = {
  beyond_measurement_error: 'Beyond measurement error',
  within_measurement_error: 'Within measurement error',
  no_threshold: 'No published threshold',
  not_measured: 'Not measured',
};

interface Side_ {
  label: string;
  unit: string;
  means: number[];
}

/** Per key and side: label, unit and the clip means that are available. */
function collect(clips: ClipMeasures[]): Map<string, Side_> {
  const out = new Map<string, Side_>();
  for (const clip of clips) {
    for (const m of clip.measures) {
      const id = rowId(m.key, m.side);
      let entry = out.get(id);
      if (!entry) {
        entry = { label: m.label, unit: m.unit, means: [] };
        out.set(id, entry);
      }
      if (m.status === 'ok' && m.mean !== null && Number.isFinite(m.mean)) entry.means.push(m.mean);
    }
  }
  return out;
}

const rowId = (key: MeasureKey, side: Side | null) => `${key}|${side ?? ''}`;

const meanOf = (xs: number[]): number | null => (xs.length ? xs.reduce((a, b) => a + b, 0) / xs.length : null);

/**
 * One row per measure key and side found in either visit: the mean of the clip means of each
 * visit (several clips of the same side are averaged), the change (re-test − baseline) and the
 * verdict against {@link MEASUREMENT_ERROR}. A change exactly at the threshold is "within".
 */
export function compareMeasures(baseline: ClipMeasures[], retest: ClipMeasures[]): ComparisonRow[] {
  const a = collect(baseline);
  const b = collect(retest);
  const order: string[] = [...a.keys()];
  for (const id of b.keys()) if (!a.has(id)) order.push(id);
  return order.map((id) => {
    const [key, sideText] = id.split('|') as [MeasureKey, string];
    const side = (sideText || null) as Side | null;
    const base = a.get(id);
    const re = b.get(id);
    const baselineMean = meanOf(base?.means ?? []);
    const retestMean = meanOf(re?.means ?? []);
    const change = baselineMean !== null && retestMean !== null ? retestMean - baselineMean : null;
    const threshold = MEASUREMENT_ERROR[key] ?? null;
    let verdict: ComparisonVerdict;
    if (change === null) verdict = 'not_measured';
    else if (!threshold) verdict = 'no_threshold';
    // A hair of tolerance so floating-point noise (12.3 − 10 = 2.3000000000000007) does not tip it.
    else verdict = Math.abs(change) > threshold.value + 1e-9 ? 'beyond_measurement_error' : 'within_measurement_error';
    return {
      key,
      side,
      label: base?.label ?? re?.label ?? key,
      unit: base?.unit ?? re?.unit ?? '',
      baseline: baselineMean,
      retest: retestMean,
      change,
      threshold,
      verdict,
    };
  });
}

/** One visit's mean per measure key and side (mean of the clip means; null when not measured). */
export function visitMeans(clips: ClipMeasures[]): { key: MeasureKey; side: Side | null; mean: number | null }[] {
  return [...collect(clips)].map(([id, entry]) => {
    const [key, sideText] = id.split('|') as [MeasureKey, string];
    return { key, side: (sideText || null) as Side | null, mean: meanOf(entry.means) };
  });
}
