import { z } from 'zod';
import {
  BODY_REGIONS,
  BODY_SIDES,
  DISTANCE_UNITS,
  INJURY_STATUSES,
  LIMITS,
  PAIN_MAX,
  PAIN_MIN,
  SURFACES,
  toKilometres,
} from '../../src/contracts/intake';
import { Email, PersonName } from '../auth/auth-schemas';

/** A calendar date `YYYY-MM-DD` that exists. */
export const IsoDate = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Use the date format YYYY-MM-DD.')
  .refine((s) => {
    const d = new Date(`${s}T00:00:00Z`);
    return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
  }, 'This date does not exist.');

const today = () => new Date().toISOString().slice(0, 10);

export const DateOfBirth = IsoDate.refine((s) => s >= '1900-01-01', 'Date of birth must be after 1900.').refine(
  (s) => s < today(),
  'Date of birth must be in the past.',
);

/** Empty strings from forms mean "not given". */
const emptyToNull = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? null : v);

const OptionalEmail = z.preprocess(emptyToNull, Email.nullable()).optional();
const OptionalText = (max: number, label: string) =>
  z.preprocess(emptyToNull, z.string().trim().max(max, `${label} must be at most ${max} characters.`).nullable()).optional();

export const AthleteCreateBody = z.strictObject({
  firstName: PersonName,
  lastName: PersonName,
  email: OptionalEmail,
  dateOfBirth: z.preprocess(emptyToNull, DateOfBirth.nullable()).optional(),
  coachId: z.number().int().positive().nullable().optional(),
  notes: OptionalText(LIMITS.notes, 'Notes'),
});
export type AthleteCreateInput = z.output<typeof AthleteCreateBody>;

export const AthleteUpdateBody = AthleteCreateBody.partial();
export type AthleteUpdateInput = z.output<typeof AthleteUpdateBody>;

const Month = z
  .string()
  .regex(/^\d{4}-(0[1-9]|1[0-2])$/, 'Use the month format YYYY-MM.')
  .refine((s) => s >= '1900-01', 'Month must be after 1900.')
  .refine((s) => s <= today().slice(0, 7), 'Month cannot be in the future.');

const Injury = z.strictObject({
  id: z.number().int().positive().optional(),
  region: z.enum(BODY_REGIONS, 'Choose a body region.'),
  side: z.enum(BODY_SIDES, 'Choose a side.'),
  when: Month,
  status: z.enum(INJURY_STATUSES, 'Choose a status.'),
  notes: z.string().trim().max(LIMITS.injuryNotes, `Notes must be at most ${LIMITS.injuryNotes} characters.`).default(''),
});

const Pain = z.strictObject({
  region: z.enum(BODY_REGIONS, 'Choose a body region.'),
  score: z
    .number('Pain score must be a number.')
    .int('Pain score must be a whole number.')
    .min(PAIN_MIN, `Pain score is ${PAIN_MIN}–${PAIN_MAX}.`)
    .max(PAIN_MAX, `Pain score is ${PAIN_MIN}–${PAIN_MAX}.`),
});

const Distance = z.number('Distance must be a number.').min(0, 'Distance cannot be negative.').nullable();

export const IntakeBody = z
  .strictObject({
    dateOfBirth: DateOfBirth.nullable(),
    heightCm: z
      .number('Height must be a number.')
      .min(LIMITS.heightCm.min, `Height must be ${LIMITS.heightCm.min}–${LIMITS.heightCm.max} cm.`)
      .max(LIMITS.heightCm.max, `Height must be ${LIMITS.heightCm.min}–${LIMITS.heightCm.max} cm.`)
      .nullable(),
    distanceUnit: z.enum(DISTANCE_UNITS, 'Distance unit is km or mi.'),
    weeklyDistance: Distance,
    longestRecentRun: Distance,
    goalEvent: z.preprocess(
      emptyToNull,
      z.string().trim().max(LIMITS.goalEvent, `Goal event must be at most ${LIMITS.goalEvent} characters.`).nullable(),
    ),
    goalDate: z.preprocess(emptyToNull, IsoDate.nullable()),
    surfaces: z.array(z.enum(SURFACES, 'Unknown surface.')).max(SURFACES.length),
    injuries: z.array(Injury).max(LIMITS.injuries, `At most ${LIMITS.injuries} injuries.`),
    pain: z.array(Pain).max(20),
    consents: z.strictObject({ videoRecording: z.boolean(), shareStills: z.boolean() }),
  })
  .superRefine((v, ctx) => {
    const limit = (value: number | null, max: number, key: 'weeklyDistance' | 'longestRecentRun', label: string) => {
      if (value !== null && toKilometres(value, v.distanceUnit) > max) {
        ctx.addIssue({ code: 'custom', path: [key], message: `${label} must be at most ${max} km.` });
      }
    };
    limit(v.weeklyDistance, LIMITS.weeklyKm.max, 'weeklyDistance', 'Weekly distance');
    limit(v.longestRecentRun, LIMITS.longestRunKm.max, 'longestRecentRun', 'Longest recent run');
    if (new Set(v.surfaces).size !== v.surfaces.length) {
      ctx.addIssue({ code: 'custom', path: ['surfaces'], message: 'Each surface can be listed once.' });
    }
    const seen = new Set<string>();
    v.pain.forEach((p, i) => {
      if (seen.has(p.region)) ctx.addIssue({ code: 'custom', path: ['pain', i, 'region'], message: 'This region is already listed.' });
      seen.add(p.region);
    });
  });
export type IntakeInput = z.output<typeof IntakeBody>;
