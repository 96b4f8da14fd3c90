import { z } from 'zod';
import {
  ASSESSMENT_KINDS,
  ASSESSMENT_TEXT_LIMITS,
  EARLIEST_ASSESSMENT_DATE,
  BELT_SPEED_LIMITS_MPS,
  FILM_SURFACES,
  INCLINE_LIMITS,
  SPEED_UNITS,
  SPEED_UNIT_LABELS,
  fromMetresPerSecond,
  toMetresPerSecond,
} from '../../src/contracts/assessment';
import { IsoDate } from '../athletes/athletes-schemas';

const emptyToNull = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? null : v);
const Text = (max: number, label: string) =>
  z.preprocess(emptyToNull, z.string().trim().max(max, `${label} must be at most ${max} characters.`).nullable());

const Speed = z
  .strictObject({
    value: z.number('Speed must be a number.').positive('Speed must be above zero.'),
    unit: z.enum(SPEED_UNITS, 'Choose km/h, mph, min/km or min/mile.'),
  })
  .nullable()
  .superRefine((s, ctx) => {
    if (!s) return;
    const mps = toMetresPerSecond(s.value, s.unit);
    const { min, max } = BELT_SPEED_LIMITS_MPS;
    if (!(mps >= min && mps <= max)) {
      const lo = fromMetresPerSecond(min, s.unit);
      const hi = fromMetresPerSecond(max, s.unit);
      const [a, b] = lo < hi ? [lo, hi] : [hi, lo];
      ctx.addIssue({
        code: 'custom',
        path: ['value'],
        message: `Speed must be between ${a.toFixed(1)} and ${b.toFixed(1)} ${SPEED_UNIT_LABELS[s.unit]}${s.unit.startsWith('s_') ? ' (in seconds)' : ''}.`,
      });
    }
  });

export const AssessmentBody = z.strictObject({
  date: IsoDate.refine((d) => d >= EARLIEST_ASSESSMENT_DATE, `Date must be on or after ${EARLIEST_ASSESSMENT_DATE}.`),
  kind: z.enum(ASSESSMENT_KINDS, 'Choose Baseline or Re-test.'),
  surface: z.enum(FILM_SURFACES, 'Choose treadmill, track, road or trail.'),
  speed: Speed,
  inclinePercent: z
    .number('Incline must be a number.')
    .min(INCLINE_LIMITS.min, `Incline must be ${INCLINE_LIMITS.min} to ${INCLINE_LIMITS.max} %.`)
    .max(INCLINE_LIMITS.max, `Incline must be ${INCLINE_LIMITS.min} to ${INCLINE_LIMITS.max} %.`)
    .nullable(),
  shoes: Text(ASSESSMENT_TEXT_LIMITS.shoes, 'Shoes'),
  cameraNotes: Text(ASSESSMENT_TEXT_LIMITS.cameraNotes, 'Camera notes'),
  notes: Text(ASSESSMENT_TEXT_LIMITS.notes, 'Notes'),
});
export type AssessmentInput = z.output<typeof AssessmentBody>;
export const AssessmentPatchBody = AssessmentBody.partial();
export type AssessmentPatch = z.output<typeof AssessmentPatchBody>;
