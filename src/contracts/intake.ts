/**
 * Vocabulary of the athlete intake, shared by the Angular client and the server so the form's
 * choices and the API's validation can never drift apart. Pure data: no Angular or Node imports.
 */

/** Running surfaces an athlete trains or races on. */
export const SURFACES = ['road', 'trail', 'track', 'treadmill', 'grass', 'mixed'] as const;
export type Surface = (typeof SURFACES)[number];

export const SURFACE_LABELS: Record<Surface, string> = {
  road: 'Road',
  trail: 'Trail',
  track: 'Track',
  treadmill: 'Treadmill',
  grass: 'Grass',
  mixed: 'Mixed terrain',
};

/** Body regions used for injury history and current pain. */
export const BODY_REGIONS = [
  'foot',
  'heel',
  'achilles',
  'ankle',
  'calf',
  'shin',
  'knee',
  'thigh_front',
  'hamstring',
  'hip',
  'groin',
  'buttock',
  'lower_back',
  'other',
] as const;
export type BodyRegion = (typeof BODY_REGIONS)[number];

export const BODY_REGION_LABELS: Record<BodyRegion, string> = {
  foot: 'Foot',
  heel: 'Heel / plantar fascia',
  achilles: 'Achilles tendon',
  ankle: 'Ankle',
  calf: 'Calf',
  shin: 'Shin',
  knee: 'Knee',
  thigh_front: 'Front of thigh',
  hamstring: 'Hamstring',
  hip: 'Hip',
  groin: 'Groin',
  buttock: 'Buttock / high hamstring',
  lower_back: 'Lower back',
  other: 'Other',
};

/** Which side an injury affects. */
export const BODY_SIDES = ['left', 'right', 'both', 'central'] as const;
export type BodySide = (typeof BODY_SIDES)[number];

export const BODY_SIDE_LABELS: Record<BodySide, string> = {
  left: 'Left',
  right: 'Right',
  both: 'Both sides',
  central: 'Central / not sided',
};

/** Where an injury stands now. */
export const INJURY_STATUSES = ['active', 'recovering', 'resolved'] as const;
export type InjuryStatus = (typeof INJURY_STATUSES)[number];

export const INJURY_STATUS_LABELS: Record<InjuryStatus, string> = {
  active: 'Active',
  recovering: 'Recovering',
  resolved: 'Resolved',
};

/** Units a clinic or athlete may choose for running distance. */
export const DISTANCE_UNITS = ['km', 'mi'] as const;
export type DistanceUnit = (typeof DISTANCE_UNITS)[number];

/** Kilometres in one international mile (exact by definition: 1 mi = 1609.344 m). */
export const KM_PER_MILE = 1.609344;

/** Converts a distance in `unit` to kilometres. */
export function toKilometres(value: number, unit: DistanceUnit): number {
  return unit === 'mi' ? value * KM_PER_MILE : value;
}

/** Converts kilometres to `unit`, rounded to one decimal place for display and forms. */
export function fromKilometres(km: number, unit: DistanceUnit): number {
  const value = unit === 'mi' ? km / KM_PER_MILE : km;
  return Math.round(value * 10) / 10;
}

/** Consent kinds that gate later work (uploads need video consent; publishing stills needs sharing consent). */
export const CONSENT_KINDS = ['video_recording', 'share_stills'] as const;
export type ConsentKind = (typeof CONSENT_KINDS)[number];

/** Pain is scored 0 (none) to 10 (worst imaginable) — the usual numeric rating scale. */
export const PAIN_MIN = 0;
export const PAIN_MAX = 10;

/** Limits shared by form validators and API schemas. */
export const LIMITS = {
  name: 80,
  email: 254,
  goalEvent: 120,
  notes: 2000,
  injuryNotes: 500,
  injuries: 30,
  passwordMin: 10,
  passwordMax: 128,
  heightCm: { min: 100, max: 230 },
  weeklyKm: { min: 0, max: 400 },
  longestRunKm: { min: 0, max: 400 },
} as const;
