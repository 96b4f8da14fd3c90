import { z } from 'zod';
import type { MeasureKey } from '../../src/contracts/measures';
import { MEASURE_KEYS } from '../../src/kinematics';

const OptionalId = (label: string) =>
  z.preprocess(
    (v) => (v === '' ? undefined : v),
    z.coerce
      .number(`${label} must be an assessment id.`)
      .int(`${label} must be an assessment id.`)
      .positive(`${label} must be an assessment id.`)
      .max(Number.MAX_SAFE_INTEGER)
      .optional(),
  );

/** `?baseline=&retest=`: both optional (latest Baseline and latest Re-test by default). */
export const ComparisonQuery = z.object({
  baseline: OptionalId('Baseline'),
  retest: OptionalId('Re-test'),
});

/** `?keys=a,b`: measure keys, comma-separated; omitted → every measure. */
export const TrendsQuery = z.object({
  keys: z
    .string()
    .optional()
    .transform((s) =>
      s
        ? s
            .split(',')
            .map((k) => k.trim())
            .filter(Boolean)
        : [...MEASURE_KEYS],
    )
    .pipe(
      z
        .array(z.string().refine((k) => (MEASURE_KEYS as string[]).includes(k), { message: 'Unknown measure key.' }))
        .min(1, 'Name at least one measure.')
        .max(MEASURE_KEYS.length, 'Too many measures.'),
    )
    .transform((ks) => [...new Set(ks)] as MeasureKey[]),
});
