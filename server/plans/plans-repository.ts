import type { Knex } from 'knex';
import type { LogEntry, PainRule, PlanStatus, ProgressionCriterion, SetsDone } from '../../src/contracts/plans';
import { DEFAULT_PAIN_RULE } from '../../src/contracts/plans';
import type { DoseColumns } from './exercises-repository';

export interface PlanRow {
  id: number;
  clinic_id: number;
  athlete_id: number;
  assessment_id: number | null;
  title: string;
  status: PlanStatus;
  current_stage_id: number | null;
  notes: string | null;
  started_at: string | null;
  finished_at: string | null;
  created_by: number | null;
  created_at: string;
  updated_at: string;
  /** Raised by one on every save of the plan's content. */
  revision: number;
}

export interface StageRow {
  id: number;
  clinic_id: number;
  plan_id: number;
  position: number;
  name: string;
  goal: string;
  target_weeks: number;
  progression_text: string;
  criteria: string;
  started_at: string | null;
  completed_at: string | null;
}

export interface StageExerciseRow extends DoseColumns {
  id: number;
  clinic_id: number;
  stage_id: number;
  exercise_id: number;
  position: number;
  notes: string | null;
  /** When the coach removed it from the stage; null while it is part of the plan. */
  removed_at?: string | null;
}

export interface LogRow {
  id: number;
  clinic_id: number;
  athlete_id: number;
  plan_id: number;
  stage_id: number;
  idempotency_key: string;
  session_date: string;
  pain_during: number;
  morning_pain: number | null;
  morning_at: string | null;
  sets: string;
  note: string | null;
  review_note: string | null;
  created_by: number | null;
  created_at: string;
  updated_at: string;
}

export interface AlertRuleRow {
  plan_id: number;
  clinic_id: number;
  max_during: number;
  morning_must_settle: number | boolean;
  settled_morning_max: number;
  no_weekly_rise: number | boolean;
  updated_by: number | null;
  updated_at: string;
}

/** Plans, their stages and stage exercises, the athlete's log and the plan's alert rule. */
export const plansRepository = {
  find(db: Knex, clinicId: number, id: number): Promise<PlanRow | undefined> {
    return db<PlanRow>('plans').where({ id, clinic_id: clinicId }).first();
  },

  listForAthlete(db: Knex, athleteId: number, includeDrafts: boolean): Promise<PlanRow[]> {
    const q = db<PlanRow>('plans').where({ athlete_id: athleteId });
    if (!includeDrafts) q.whereNot({ status: 'draft' });
    return q.orderBy('created_at', 'desc').orderBy('id', 'desc');
  },

  /** Active or paused plans of a clinic (roster alerts). */
  runningInClinic(db: Knex, clinicId: number): Promise<PlanRow[]> {
    return db<PlanRow>('plans').where({ clinic_id: clinicId }).whereIn('status', ['active', 'paused']);
  },

  async otherRunningPlan(db: Knex, athleteId: number, exceptId: number): Promise<PlanRow | undefined> {
    return db<PlanRow>('plans').where({ athlete_id: athleteId }).whereIn('status', ['active', 'paused']).whereNot({ id: exceptId }).first();
  },

  async insert(db: Knex, row: Omit<PlanRow, 'id'>): Promise<number> {
    const [r] = await db('plans').insert(row).returning('id');
    return (r as { id: number }).id;
  },

  async update(db: Knex, id: number, patch: Partial<PlanRow>): Promise<void> {
    await db('plans').where({ id }).update(patch);
  },
  /**
   * Writes a plan's content fields and raises its revision, only while the stored revision is
   * `baseRevision`; answers whether the row was written.
   */
  async updateContent(db: Knex, id: number, baseRevision: number, patch: Partial<PlanRow>): Promise<boolean> {
    return (
      (await db('plans')
        .where({ id, revision: baseRevision })
        .update({ ...patch, revision: db.raw('revision + 1') })) > 0
    );
  },

  stages(db: Knex, planIds: number[]): Promise<StageRow[]> {
    if (planIds.length === 0) return Promise.resolve([]);
    return db<StageRow>('plan_stages').whereIn('plan_id', planIds).orderBy('plan_id').orderBy('position');
  },

  async insertStage(db: Knex, row: Omit<StageRow, 'id'>): Promise<number> {
    const [r] = await db('plan_stages').insert(row).returning('id');
    return (r as { id: number }).id;
  },

  async updateStage(db: Knex, id: number, patch: Partial<StageRow>): Promise<void> {
    await db('plan_stages').where({ id }).update(patch);
  },

  /** The stages' exercises as the plan has them now (not the removed ones). */
  stageExercises(db: Knex, stageIds: number[]): Promise<StageExerciseRow[]> {
    if (stageIds.length === 0) return Promise.resolve([]);
    return db<StageExerciseRow>('stage_exercises')
      .whereIn('stage_id', stageIds)
      .whereNull('removed_at')
      .orderBy('stage_id')
      .orderBy('position');
  },

  /** Exercises the coach removed from a stage, by id (a session logged offline may still name them). */
  removedStageExercises(db: Knex, stageId: number, ids: number[]): Promise<StageExerciseRow[]> {
    if (ids.length === 0) return Promise.resolve([]);
    return db<StageExerciseRow>('stage_exercises').where({ stage_id: stageId }).whereIn('id', ids).whereNotNull('removed_at');
  },

  /**
   * Makes a stage's exercises `rows`, keeping ids: a row with `id` is updated in place, one
   * without is inserted, and the stage's exercises not named are marked removed (kept, so a
   * session logged offline for one of them can still be recorded).
   */
  async syncStageExercises(db: Knex, stageId: number, rows: (Omit<StageExerciseRow, 'id'> & { id?: number })[], at: string): Promise<void> {
    const keep = rows.map((r) => r.id).filter((id): id is number => id !== undefined);
    const gone = db('stage_exercises').where({ stage_id: stageId }).whereNull('removed_at');
    if (keep.length) gone.whereNotIn('id', keep);
    await gone.update({ removed_at: at });
    for (const { id, ...row } of rows) {
      if (id !== undefined) await db('stage_exercises').where({ id, stage_id: stageId }).update(row);
      else await db('stage_exercises').insert(row);
    }
  },

  async logCountByStage(db: Knex, stageIds: number[]): Promise<Map<number, number>> {
    if (stageIds.length === 0) return new Map();
    const rows = await db('log_entries')
      .whereIn('stage_id', stageIds)
      .groupBy('stage_id')
      .select<{ stage_id: number; n: number }[]>('stage_id', db.raw('COUNT(*) AS n'));
    return new Map(rows.map((r) => [r.stage_id, Number(r.n)]));
  },

  logs(db: Knex, planIds: number[], sinceDate?: string): Promise<LogRow[]> {
    if (planIds.length === 0) return Promise.resolve([]);
    const q = db<LogRow>('log_entries').whereIn('plan_id', planIds);
    if (sinceDate) q.andWhere('session_date', '>=', sinceDate);
    return q.orderBy('session_date', 'desc').orderBy('id', 'desc');
  },

  findLogByKey(db: Knex, key: string): Promise<LogRow | undefined> {
    return db<LogRow>('log_entries').where({ idempotency_key: key }).first();
  },

  async insertLog(db: Knex, row: Omit<LogRow, 'id'>): Promise<number> {
    const [r] = await db('log_entries').insert(row).returning('id');
    return (r as { id: number }).id;
  },

  async updateLog(db: Knex, id: number, patch: Partial<LogRow>): Promise<void> {
    await db('log_entries').where({ id }).update(patch);
  },

  async rules(db: Knex, planIds: number[]): Promise<Map<number, PainRule>> {
    if (planIds.length === 0) return new Map();
    const rows = await db<AlertRuleRow>('alert_rules').whereIn('plan_id', planIds);
    return new Map(rows.map((r) => [r.plan_id, ruleFromRow(r)]));
  },

  async putRule(db: Knex, clinicId: number, planId: number, rule: PainRule, by: number | null, at: string): Promise<void> {
    const row: AlertRuleRow = {
      plan_id: planId,
      clinic_id: clinicId,
      max_during: rule.maxDuring,
      morning_must_settle: rule.morningMustSettle,
      settled_morning_max: rule.settledMorningMax,
      no_weekly_rise: rule.noWeeklyRise,
      updated_by: by,
      updated_at: at,
    };
    await db('alert_rules').insert(row).onConflict('plan_id').merge();
  },

  logToApi(r: LogRow, stageName: string): LogEntry {
    return {
      id: r.id,
      planId: r.plan_id,
      stageId: r.stage_id,
      stageName,
      key: r.idempotency_key,
      date: r.session_date,
      painDuring: r.pain_during,
      morningPain: r.morning_pain,
      morningAt: r.morning_at,
      sets: JSON.parse(r.sets) as SetsDone[],
      note: r.note,
      reviewNote: r.review_note ?? null,
      createdAt: r.created_at,
    };
  },

  ruleDefault(): PainRule {
    return { ...DEFAULT_PAIN_RULE };
  },

  criteria(r: StageRow): ProgressionCriterion[] {
    return JSON.parse(r.criteria) as ProgressionCriterion[];
  },
};

export function ruleFromRow(r: AlertRuleRow | undefined): PainRule {
  if (!r) return { ...DEFAULT_PAIN_RULE };
  return {
    maxDuring: r.max_during,
    morningMustSettle: Boolean(r.morning_must_settle),
    settledMorningMax: r.settled_morning_max,
    noWeeklyRise: Boolean(r.no_weekly_rise),
  };
}
