/**
 * Every table that holds rows about an athlete, with how to find those rows and what erasure does
 * with them. The one list both the export (`data.json` in the zip) and the erasure read, so a table
 * added here is exported and erased alike; `test/server/privacy/athlete-tables.test.ts` fails when a
 * migration adds a table reaching an athlete (an `athlete_id`, or a foreign key to such a table)
 * that is not listed here.
 */

/** What erasure does with a table's rows of the athlete. */
export type ErasureRule =
  /** The rows go. */
  | 'delete'
  /**
   * The rows stay, as the law requires for invoices and payments (drafts, never issued, go); the
   * athlete's name and contact on them become the reference.
   */
  | 'keep'
  /** The athlete's own row stays as a stub with the reference only (kept invoices point at it). */
  | 'anonymise';

/** One table about the athlete. */
export interface AthleteTable {
  /** SQL condition selecting the athlete's rows; `?` is the athlete's id (once). */
  where: string;
  erase: ErasureRule;
  /** Columns never exported (secrets: password and token hashes). */
  omit?: readonly string[];
  /** What the table holds, for the README inside the zip. */
  about: string;
}

const CLIPS = 'clip_id IN (SELECT id FROM clips WHERE athlete_id = ?)';
const PLANS = 'plan_id IN (SELECT id FROM plans WHERE athlete_id = ?)';
const INVOICES = 'invoice_id IN (SELECT id FROM invoices WHERE athlete_id = ?)';

/**
 * The athlete's tables, in the order the export writes them and erasure deletes them (children
 * before parents; foreign keys would cascade anyway).
 */
export const ATHLETE_TABLES = {
  athletes: { where: 'id = ?', erase: 'anonymise', about: 'the profile: names, contact, intake figures, goal, coach notes' },
  users: {
    where: 'id = (SELECT user_id FROM athletes WHERE id = ?)',
    erase: 'delete',
    omit: ['password_hash'],
    about: 'the sign-in account (without the password)',
  },
  injuries: { where: 'athlete_id = ?', erase: 'delete', about: 'injury history from the intake' },
  pain_entries: { where: 'athlete_id = ?', erase: 'delete', about: 'pain scores recorded at intake' },
  consents: { where: 'athlete_id = ?', erase: 'delete', about: 'every consent given or withdrawn, with who recorded it and when' },
  invitations: { where: 'athlete_id = ?', erase: 'delete', omit: ['token_hash'], about: 'invitations to the portal' },
  assessments: { where: 'athlete_id = ?', erase: 'delete', about: 'visits: date, kind, surface, speed, shoes, notes' },
  clips: { where: 'athlete_id = ?', erase: 'delete', about: 'the clips’ metadata (file name, size, frame rate, status)' },
  clip_landmarks: { where: CLIPS, erase: 'delete', about: 'joint marks per frame (frame fractions)' },
  gait_events: { where: CLIPS, erase: 'delete', about: 'initial contact and toe-off frames' },
  scale_bars: { where: CLIPS, erase: 'delete', about: 'the length scale marked on a clip' },
  angle_gauges: { where: CLIPS, erase: 'delete', about: 'angles measured by hand on a frame' },
  clip_not_followed: {
    where: CLIPS,
    erase: 'delete',
    about: 'frames marker following could not follow a marker on, and why (for the coach to check)',
  },
  measure_snapshots: { where: CLIPS, erase: 'delete', about: 'the measures computed from the marks (JSON)' },
  stills: { where: 'athlete_id = ?', erase: 'delete', about: 'annotated stills (published or not)' },
  visit_summaries: { where: 'athlete_id = ?', erase: 'delete', about: 'visit summaries (published or not)' },
  annotated_clips: { where: 'athlete_id = ?', erase: 'delete', about: 'annotated slow-motion and side-by-side clips' },
  plans: { where: 'athlete_id = ?', erase: 'delete', about: 'exercise plans' },
  plan_stages: { where: PLANS, erase: 'delete', about: 'the stages of the plans' },
  stage_exercises: {
    where: 'stage_id IN (SELECT s.id FROM plan_stages s JOIN plans p ON p.id = s.plan_id WHERE p.athlete_id = ?)',
    erase: 'delete',
    about: 'exercises and doses of each stage',
  },
  alert_rules: { where: PLANS, erase: 'delete', about: 'the pain alert rule of each plan' },
  log_entries: { where: 'athlete_id = ?', erase: 'delete', about: 'logged sessions, pain during and the next morning' },
  invoices: { where: 'athlete_id = ?', erase: 'keep', about: 'invoices (kept after erasure, as the law requires)' },
  invoice_lines: { where: INVOICES, erase: 'keep', about: 'the lines of the invoices' },
  payment_events: { where: INVOICES, erase: 'keep', about: 'payment notices received for the invoices' },
  audit_log: { where: 'athlete_id = ?', erase: 'delete', about: 'who did what about the athlete, when' },
  processed_items: { where: 'athlete_id = ?', erase: 'delete', about: 'background work about the athlete (frames, renders, exports)' },
  data_exports: { where: 'athlete_id = ?', erase: 'delete', about: 'data exports asked for' },
} as const satisfies Record<string, AthleteTable>;

export type AthleteTableName = keyof typeof ATHLETE_TABLES;

/** Every athlete table, in order. */
export const ATHLETE_TABLE_NAMES = Object.keys(ATHLETE_TABLES) as AthleteTableName[];

/**
 * Tables that reach an athlete by a foreign key but are deliberately left out, with the reason (read
 * by the coverage test).
 */
export const NOT_ATHLETE_DATA: Readonly<Record<string, string>> = {};
