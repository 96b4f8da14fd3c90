/**
 * Plans → Stages → Exercises, and the athlete's Log: vocabulary and API shapes shared by the
 * client and the server. Pure data and types: no Angular or Node imports.
 */

// ─── Vocabulary ───────────────────────────────────────────────────────────────────────────

/** Kinds of loading an exercise gives (the trade's words). */
export const LOADING_KINDS = ['isometric', 'eccentric', 'isotonic', 'ballistic', 'mobility', 'running_drill'] as const;
export type LoadingKind = (typeof LOADING_KINDS)[number];

export const LOADING_KIND_LABELS: Record<LoadingKind, string> = {
  isometric: 'Isometric',
  eccentric: 'Eccentric (lengthening)',
  isotonic: 'Concentric / isotonic',
  ballistic: 'Fast / ballistic',
  mobility: 'Mobility',
  running_drill: 'Running drill',
};

/** Body regions of the exercise library (coarser than the intake's pain regions). */
export const EXERCISE_REGIONS = ['foot_ankle', 'calf_achilles', 'knee', 'thigh', 'hamstring', 'hip', 'trunk', 'whole_leg'] as const;
export type ExerciseRegion = (typeof EXERCISE_REGIONS)[number];

export const EXERCISE_REGION_LABELS: Record<ExerciseRegion, string> = {
  foot_ankle: 'Foot and ankle',
  calf_achilles: 'Calf and Achilles',
  knee: 'Knee',
  thigh: 'Front of thigh',
  hamstring: 'Hamstring',
  hip: 'Hip and buttock',
  trunk: 'Trunk and pelvis',
  whole_leg: 'Whole leg',
};

/** Where a plan is in its life. Only `active` plans take log entries. */
export const PLAN_STATUSES = ['draft', 'active', 'paused', 'finished'] as const;
export type PlanStatus = (typeof PLAN_STATUSES)[number];

export const PLAN_STATUS_LABELS: Record<PlanStatus, string> = {
  draft: 'Draft',
  active: 'Active',
  paused: 'Paused',
  finished: 'Finished',
};

/** What a coach can do to a plan's status. */
export const PLAN_ACTIONS = ['start', 'advance', 'pause', 'resume', 'finish'] as const;
export type PlanAction = (typeof PLAN_ACTIONS)[number];

/** Limits of every number and text the API takes; the forms use the same ones. */
export const PLAN_LIMITS = {
  sets: { min: 1, max: 20 },
  reps: { min: 1, max: 200 },
  holdSeconds: { min: 1, max: 600 },
  restSeconds: { min: 0, max: 900 },
  daysPerWeek: { min: 1, max: 7 },
  targetWeeks: { min: 1, max: 52 },
  criterionSessions: { min: 1, max: 20 },
  criterionWeeks: { min: 1, max: 52 },
  stages: { min: 1, max: 8 },
  exercisesPerStage: { max: 15 },
  instructionSteps: { max: 12 },
  /** How many days back an athlete may date a session they forgot to log. */
  logBackdateDays: 14,
  text: {
    name: 80,
    purpose: 300,
    instructionStep: 300,
    cautions: 600,
    source: 300,
    tempo: 40,
    load: 60,
    planTitle: 100,
    planNotes: 2000,
    stageName: 80,
    stageGoal: 400,
    progressionText: 600,
    doseNotes: 200,
    logNote: 500,
  },
} as const;

export const PAIN_SCALE = { min: 0, max: 10 } as const;

/**
 * The caution every plan and exercise page carries (DESIGN.md, "Safety and privacy").
 */
export const PLAN_CAUTION =
  'Stop an exercise that causes sharp or worsening pain and contact your clinician. This plan supports, and does not replace, a licensed clinician\u2019s judgement; follow local regulations.';

/** The same caution on the exercise library and its dialog, where there is no plan yet. */
export const EXERCISE_LIBRARY_CAUTION =
  'Stop an exercise that causes sharp or worsening pain. These exercises support, and do not replace, a licensed clinician\u2019s judgement; follow local regulations.';

// ─── Exercises ────────────────────────────────────────────────────────────────────────────

/** How much of an exercise: a default on the exercise, the prescription on a stage. */
export interface Dose {
  sets: number;
  /** Repetitions per set; null for holds. At least one of reps and holdSeconds is set. */
  reps: number | null;
  /** Seconds each repetition (or the set) is held; null for moving exercises. */
  holdSeconds: number | null;
  /** Free text such as "3 s down, 1 s up"; null when it does not matter. */
  tempo: string | null;
  /** Free text such as "body weight" or "+8 kg"; null when none. */
  load: string | null;
  restSeconds: number | null;
  daysPerWeek: number;
}

export interface Exercise {
  id: number;
  name: string;
  purpose: string;
  region: ExerciseRegion;
  kind: LoadingKind;
  dose: Dose;
  /** Step-by-step instructions, in order. */
  instructions: string[];
  cautions: string;
  /**
   * The published programme the exercise is written from, cited plainly for the staff (author
   * year, journal; "from memory" where not re-read); empty for the clinic's own exercises.
   */
  source: string;
  /** Archived exercises stay on the plans that use them but leave the library. */
  archived: boolean;
  createdAt: string;
  updatedAt: string;
}

/** Body of POST/PATCH `/api/exercises`; `source` may be left out (stored empty). */
export type ExerciseWrite = Pick<Exercise, 'name' | 'purpose' | 'region' | 'kind' | 'dose' | 'instructions' | 'cautions'> &
  Partial<Pick<Exercise, 'source'>>;

/** Query of the library search. */
export interface ExerciseQuery {
  q?: string;
  region?: ExerciseRegion;
  kind?: LoadingKind;
}

// ─── Plans and stages ─────────────────────────────────────────────────────────────────────

/**
 * A checkable progression criterion of a stage. The pure rules in `src/plans-rules` decide
 * whether each is met from the stage's log entries.
 */
export type ProgressionCriterion =
  /** Pain during exercise at most `max`/10 on each of the last `sessions` sessions. */
  | { kind: 'pain_during_at_most'; max: number; sessions: number }
  /** Next-morning pain settled (see the plan's pain rule) after each of the last `sessions`. */
  | { kind: 'settled_by_morning'; sessions: number }
  /** Every prescribed set ticked on each of the last `sessions` sessions. */
  | { kind: 'all_sets_done'; sessions: number }
  /** At least `sessions` sessions logged in this stage. */
  | { kind: 'sessions_logged'; sessions: number }
  /** At least `weeks` weeks since the stage started. */
  | { kind: 'weeks_in_stage'; weeks: number };

export type ProgressionCriterionKind = ProgressionCriterion['kind'];

export const CRITERION_KINDS: readonly ProgressionCriterionKind[] = [
  'pain_during_at_most',
  'settled_by_morning',
  'all_sets_done',
  'sessions_logged',
  'weeks_in_stage',
];

export const CRITERION_KIND_LABELS: Record<ProgressionCriterionKind, string> = {
  pain_during_at_most: 'Pain during at most …/10 on the last … sessions',
  settled_by_morning: 'Settled by next morning after the last … sessions',
  all_sets_done: 'All sets done on the last … sessions',
  sessions_logged: 'At least … sessions logged in this stage',
  weeks_in_stage: 'At least … weeks in this stage',
};

/**
 * The plan's pain-monitoring rule. Default: pain during exercise may reach 5/10 if it settles by
 * the next morning and does not rise week to week (Silbernagel et al. 2007, Am J Sports Med
 * 35:897–906 — REFERENCES.md, [mem]: recalled, not re-read). Editable per plan.
 */
export interface PainRule {
  /** Highest acceptable pain during exercise, 0–10. */
  maxDuring: number;
  /** Whether next-morning pain must have settled. */
  morningMustSettle: boolean;
  /**
   * What "settled" means on the 0–10 scale: next-morning pain at most this. Default 2 — the
   * "minimal pain" zone of pain-monitoring scales, common practice in the trade [trade].
   */
  settledMorningMax: number;
  /** Whether a week-over-week rise of the weekly mean pain (during or next morning) alerts. */
  noWeeklyRise: boolean;
}

export const DEFAULT_PAIN_RULE: PainRule = { maxDuring: 5, morningMustSettle: true, settledMorningMax: 2, noWeeklyRise: true };

/** Where the default rule comes from, for the screen. */
export const DEFAULT_PAIN_RULE_SOURCE =
  'Pain during exercise may reach 5/10 if it settles by the next morning and does not rise week to week (Silbernagel et al. 2007, Am J Sports Med 35:897–906; quoted from memory). "Settled" = next-morning pain at most 2/10; a weekly rise = the week’s mean at least 1 point above the week before, each week with at least 2 sessions (common practice).';

export interface StageExercise {
  id: number;
  exerciseId: number;
  /** The library exercise (name, instructions, cautions) as it is now. */
  exercise: Exercise;
  position: number;
  dose: Dose;
  notes: string | null;
}

export interface PlanStage {
  id: number;
  position: number;
  name: string;
  /** What the stage is for, in plain words. */
  goal: string;
  targetWeeks: number;
  /** When to move on, in plain words. */
  progressionText: string;
  criteria: ProgressionCriterion[];
  exercises: StageExercise[];
  /** Sessions a week this stage asks for (the most days-per-week of its exercises). */
  sessionsPerWeek: number;
  startedAt: string | null;
  completedAt: string | null;
}

export interface PlanSummary {
  id: number;
  athleteId: number;
  title: string;
  status: PlanStatus;
  assessmentId: number | null;
  /** Date of the linked assessment, for display. */
  assessmentDate: string | null;
  stageCount: number;
  currentStageId: number | null;
  currentStageName: string | null;
  /** 1-based position of the current stage, or null. */
  currentStagePosition: number | null;
  /** Alerts of an active or paused plan under its pain rule (empty otherwise). */
  alerts: PainAlert[];
  startedAt: string | null;
  finishedAt: string | null;
  createdAt: string;
  updatedAt: string;
}

export interface PlanDetail extends PlanSummary {
  /** Coach-only free text; null for athletes. */
  notes: string | null;
  /** Raised by one on every save of the content (PUT); an edit names the one it started from as `baseRevision`. */
  revision: number;
  painRule: PainRule;
  stages: PlanStage[];
}

/** Body of POST /api/athletes/:id/plans (and of PUT /api/plans/:id with `baseRevision`, {@link PlanReplace}). */
export interface PlanWrite {
  title: string;
  assessmentId: number | null;
  notes: string | null;
  stages: StageWrite[];
}

/** Body of PUT /api/plans/:id: the plan as {@link PlanWrite}, and the revision the edit started from. */
export interface PlanReplace extends PlanWrite {
  /**
   * Required: the `revision` of the plan the edit started from; when someone saved the plan since,
   * the PUT answers 409 `stale_revision` with the stored plan in `details.current` and writes nothing.
   */
  baseRevision: number;
}

export interface StageWrite {
  /** Id of an existing stage to keep (PUT); absent for a new stage. */
  id?: number;
  name: string;
  goal: string;
  targetWeeks: number;
  progressionText: string;
  criteria: ProgressionCriterion[];
  /** `id`: an existing stage exercise of this stage to keep (PUT), so logs queued offline still match it. */
  exercises: { id?: number; exerciseId: number; dose: Dose; notes: string | null }[];
}

export interface PlanTransition {
  action: PlanAction;
}

// ─── Log ──────────────────────────────────────────────────────────────────────────────────

/** Sets done of one exercise in a session (with a copy of what was prescribed then). */
export interface SetsDone {
  stageExerciseId: number;
  /** Exercise name when the session was logged. */
  name: string;
  setsPrescribed: number;
  setsDone: number;
}

export interface LogEntry {
  id: number;
  planId: number;
  stageId: number;
  stageName: string;
  /** Client-generated idempotency key. */
  key: string;
  /** Day the session was done, `YYYY-MM-DD` (the athlete's calendar). */
  date: string;
  /** Pain during the session, 0–10. */
  painDuring: number;
  /** Pain the next morning, 0–10; null until the morning check. */
  morningPain: number | null;
  morningAt: string | null;
  sets: SetsDone[];
  note: string | null;
  /**
   * Why the coach should look at this entry (it was sent for exercises changed meanwhile, e.g. a
   * session queued offline before a plan edit), or null.
   */
  reviewNote: string | null;
  createdAt: string;
}

/** Body of POST /api/plans/:id/logs. */
export interface LogWrite {
  key: string;
  stageId: number;
  date: string;
  painDuring: number;
  /** `exerciseId` (the library exercise) lets the server match the set if the plan was edited since. */
  sets: { stageExerciseId: number; exerciseId?: number; setsDone: number }[];
  note: string | null;
}

/** Body of PUT /api/plans/:id/logs/:key/morning. */
export interface MorningCheckWrite {
  pain: number;
}

// ─── Progress, progression and alerts ─────────────────────────────────────────────────────

export type PainAlertKind = 'during_above_max' | 'not_settled' | 'weekly_rise_during' | 'weekly_rise_morning';

export interface PainAlert {
  kind: PainAlertKind;
  /** Plain words naming the rule that fired, e.g. "Pain 6/10 during on 9 Dec — above this plan's limit of 5/10." */
  message: string;
  /** The session date or the Monday of the week it is about. */
  date: string;
  /** The score that fired (a session's, or the newer week's mean). */
  value: number;
  /** The plan's limit it went past, or the earlier week's mean for a weekly rise. */
  limit: number;
}

/** Which rule of the plan fired, as a heading. */
export const PAIN_ALERT_LABELS: Record<PainAlertKind, string> = {
  during_above_max: 'Limit for pain during',
  not_settled: 'Settled by next morning',
  weekly_rise_during: 'No weekly rise (pain during)',
  weekly_rise_morning: 'No weekly rise (next-morning pain)',
};

export interface CriterionCheck {
  criterion: ProgressionCriterion;
  met: boolean;
  /** Plain words: what was checked and what the log shows. */
  detail: string;
}

export interface ProgressionResult {
  stageId: number;
  /** All checkable criteria met (and there is at least one): the app suggests moving on. */
  ready: boolean;
  checks: CriterionCheck[];
  /** Id of the next stage, null for the last one. */
  nextStageId: number | null;
}

export interface AdherenceWeek {
  /** Monday of the week, `YYYY-MM-DD`. */
  weekStart: string;
  done: number;
  prescribed: number;
}

export interface PainPoint {
  date: string;
  painDuring: number;
  morningPain: number | null;
  stageId: number;
}

export interface PlanProgress {
  planId: number;
  /** The server's calendar day the figures were computed for. */
  today: string;
  adherence: AdherenceWeek[];
  pain: PainPoint[];
  alerts: PainAlert[];
  /** Evaluation of the current stage's criteria; null when no stage is current. */
  progression: ProgressionResult | null;
}

/** One athlete's alerts, for the roster. */
export interface AthletePlanAlerts {
  athleteId: number;
  planId: number;
  alerts: PainAlert[];
}
