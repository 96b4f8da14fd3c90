/**
 * Vocabulary of assessments and clips, shared by client and server. Pure data and arithmetic.
 */
import { KM_PER_MILE } from './intake';

/** A dated gait visit is either the first look or a later re-test. */
export const ASSESSMENT_KINDS = ['baseline', 'retest'] as const;
export type AssessmentKind = (typeof ASSESSMENT_KINDS)[number];
export const ASSESSMENT_KIND_LABELS: Record<AssessmentKind, string> = { baseline: 'Baseline', retest: 'Re-test' };

/** Where the running was filmed. */
export const FILM_SURFACES = ['treadmill', 'track', 'road', 'trail'] as const;
export type FilmSurface = (typeof FILM_SURFACES)[number];
export const FILM_SURFACE_LABELS: Record<FilmSurface, string> = { treadmill: 'Treadmill', track: 'Track', road: 'Road', trail: 'Trail' };

/** Units a coach may type a speed in; paces are seconds per km or per mile. */
export const SPEED_UNITS = ['kmh', 'mph', 's_per_km', 's_per_mile'] as const;
export type SpeedUnit = (typeof SPEED_UNITS)[number];
export const SPEED_UNIT_LABELS: Record<SpeedUnit, string> = {
  kmh: 'km/h',
  mph: 'mph',
  s_per_km: 'min/km',
  s_per_mile: 'min/mile',
};

const METRES_PER_MILE = KM_PER_MILE * 1000;

/** Converts a speed (or pace in seconds per km/mile) to metres per second. */
export function toMetresPerSecond(value: number, unit: SpeedUnit): number {
  switch (unit) {
    case 'kmh':
      return value / 3.6;
    case 'mph':
      return (value * METRES_PER_MILE) / 3600;
    case 's_per_km':
      return 1000 / value;
    case 's_per_mile':
      return METRES_PER_MILE / value;
  }
}

/** Converts metres per second to `unit` (paces in seconds per km/mile). */
export function fromMetresPerSecond(mps: number, unit: SpeedUnit): number {
  switch (unit) {
    case 'kmh':
      return mps * 3.6;
    case 'mph':
      return (mps * 3600) / METRES_PER_MILE;
    case 's_per_km':
      return 1000 / mps;
    case 's_per_mile':
      return METRES_PER_MILE / mps;
  }
}

/** Formats seconds as `m:ss` (pace display), e.g. 330 → "5:30". */
export function formatPace(seconds: number): string {
  const whole = Math.round(seconds);
  return `${Math.floor(whole / 60)}:${String(whole % 60).padStart(2, '0')}`;
}

/** Parses `m:ss` (or plain minutes like "5.5") into seconds; null when it is not a pace. */
export function parsePace(text: string): number | null {
  const t = text.trim();
  const m = /^(\d{1,2}):([0-5]\d)$/.exec(t);
  if (m) return Number(m[1]) * 60 + Number(m[2]);
  if (/^\d+(\.\d+)?$/.test(t)) return Math.round(Number(t) * 60);
  return null;
}

/** Speeds a treadmill assessment may carry, m/s (1–10 m/s ≈ 3.6–36 km/h). */
export const BELT_SPEED_LIMITS_MPS = { min: 1, max: 10 } as const;
/** Longest texts of an assessment, characters. */
export const ASSESSMENT_TEXT_LIMITS = { shoes: 120, cameraNotes: 500, notes: 4000 } as const;
/** Earliest visit date accepted. */
export const EARLIEST_ASSESSMENT_DATE = '2000-01-01';

/** Treadmill incline, percent grade. */
export const INCLINE_LIMITS = { min: -10, max: 40 } as const;

/** Which limb is nearer the camera. */
export const SIDES = ['left', 'right'] as const;
export type Side = (typeof SIDES)[number];

/** Running direction in the image. */
export const DIRECTIONS = ['left_to_right', 'right_to_left'] as const;
export type Direction = (typeof DIRECTIONS)[number];
export const DIRECTION_LABELS: Record<Direction, string> = {
  left_to_right: 'Runs left → right',
  right_to_left: 'Runs right → left',
};

/** Processing states of a clip, in order. */
export const CLIP_STATUSES = ['queued', 'probing', 'extracting', 'ready', 'failed'] as const;
export type ClipStatus = (typeof CLIP_STATUSES)[number];

/** Capture frame rate override bounds (phone slow motion goes to 240, some cameras 960). */
export const CAPTURE_FPS_LIMITS = { min: 1, max: 1000 } as const;

/** Upload limits the client checks before sending (the server enforces them too). */
export const UPLOAD = {
  /** Accepted file extensions, for the picker; content decides in the end. */
  accept: 'video/*,.mp4,.mov,.m4v,.webm,.mkv,.avi,.3gp',
  /** One file per request; the client sends files one after another with their own progress. */
  filesPerRequest: 1,
  /**
   * Bytes per PATCH of a resumable upload: each acknowledged chunk is a point the upload never goes
   * back behind, and a chunk lost with the connection is sent again from the server's offset
   * (4 MiB is about 30 s on a slow 1 Mbit/s phone link).
   */
  chunkBytes: 4 * 1024 * 1024,
} as const;
