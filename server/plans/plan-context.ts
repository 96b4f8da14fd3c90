import type { SessionUser } from '../../src/contracts/api';
import type { LogEntry, PainAlert, PainRule, PlanDetail, PlanStage, PlanSummary } from '../../src/contracts/plans';
import { addDays, dayOf, painAlerts, sessionsPerWeek } from '../../src/plans-rules';
import type { Db } from '../db/knex';
import { NotFoundError } from '../errors';
import type { Action } from '../policy/access-table';
import { assertAthleteResource } from '../policy/athlete-resources';
import { assertRole, may } from '../policy/enforce';
import { doseFromRow, exercisesRepository } from './exercises-repository';
import { plansRepository as repo, type LogRow, type PlanRow, type StageRow } from './plans-repository';

export interface PlansDeps {
  db: Db;
  clock: () => Date;
}

/** What the plan services share: the clock, plans as this user may reach them, and how a plan reads in the API. */
export interface PlanContext extends PlansDeps {
  now(): string;
  /** Today's calendar day (`YYYY-MM-DD`). */
  today(): string;
  /**
   * The plan this user may reach for `action` (`server/policy/access-table.ts`): staff their
   * clinic's, an athlete their own but not drafts; anything else is 404.
   */
  accessiblePlan(user: SessionUser, id: number, action: Action): Promise<PlanRow>;
  /** Pain alerts of a running plan (none for drafts and finished plans). */
  alertsFor(plan: PlanRow, logs: LogRow[], rule: PainRule): PainAlert[];
  summaries(plans: PlanRow[]): Promise<PlanSummary[]>;
  /** The plan as the API shows it to this user (coach notes only for staff). */
  detail(user: SessionUser, plan: PlanRow): Promise<PlanDetail>;
  /** `detail` of a plan this user may read. */
  get(user: SessionUser, id: number): Promise<PlanDetail>;
  logsWithStageNames(rows: LogRow[]): Promise<LogEntry[]>;
}

const painLogs = (logs: LogRow[]) => logs.map((l) => ({ date: l.session_date, painDuring: l.pain_during, morningPain: l.morning_pain }));

export function planContext(deps: PlansDeps): PlanContext {
  const { db, clock } = deps;
  const today = () => dayOf(clock());

  async function accessiblePlan(user: SessionUser, id: number, action: Action): Promise<PlanRow> {
    assertRole(user, action);
    const plan = await repo.find(db, user.clinicId, id);
    if (!plan) throw new NotFoundError('Plan');
    await assertAthleteResource(db, user, action, plan, 'Plan', { draft: plan.status === 'draft' });
    return plan;
  }

  function alertsFor(plan: PlanRow, logs: LogRow[], rule: PainRule): PainAlert[] {
    if (plan.status !== 'active' && plan.status !== 'paused') return [];
    return painAlerts(painLogs(logs), rule, today());
  }

  async function summaries(plans: PlanRow[]): Promise<PlanSummary[]> {
    const ids = plans.map((p) => p.id);
    const [stages, rules, logs, assessments] = await Promise.all([
      repo.stages(db, ids),
      repo.rules(db, ids),
      repo.logs(
        db,
        plans.filter((p) => p.status === 'active' || p.status === 'paused').map((p) => p.id),
        addDays(today(), -28),
      ),
      db('assessments')
        .whereIn(
          'id',
          plans.map((p) => p.assessment_id).filter((x): x is number => x !== null),
        )
        .select<{ id: number; date: string }[]>('id', 'date'),
    ]);
    return plans.map((p) => {
      const own = stages.filter((s) => s.plan_id === p.id);
      const current = own.find((s) => s.id === p.current_stage_id) ?? null;
      return {
        id: p.id,
        athleteId: p.athlete_id,
        title: p.title,
        status: p.status,
        assessmentId: p.assessment_id,
        assessmentDate: assessments.find((a) => a.id === p.assessment_id)?.date ?? null,
        stageCount: own.length,
        currentStageId: current?.id ?? null,
        currentStageName: current?.name ?? null,
        currentStagePosition: current ? own.indexOf(current) + 1 : null,
        alerts: alertsFor(
          p,
          logs.filter((l) => l.plan_id === p.id),
          rules.get(p.id) ?? repo.ruleDefault(),
        ),
        startedAt: p.started_at,
        finishedAt: p.finished_at,
        createdAt: p.created_at,
        updatedAt: p.updated_at,
      };
    });
  }

  async function detail(user: SessionUser, plan: PlanRow): Promise<PlanDetail> {
    const [summary] = await summaries([plan]);
    const stages = await repo.stages(db, [plan.id]);
    const items = await repo.stageExercises(
      db,
      stages.map((s) => s.id),
    );
    const exercises = await exercisesRepository.byIds(
      db,
      user.clinicId,
      items.map((i) => i.exercise_id),
    );
    const rules = await repo.rules(db, [plan.id]);
    return {
      ...summary!,
      notes: may(user, 'plan:read-notes') ? plan.notes : null,
      revision: plan.revision,
      painRule: rules.get(plan.id) ?? repo.ruleDefault(),
      stages: stages.map((s): PlanStage => {
        const own = items.filter((i) => i.stage_id === s.id);
        return {
          id: s.id,
          position: s.position,
          name: s.name,
          goal: s.goal,
          targetWeeks: s.target_weeks,
          progressionText: s.progression_text,
          criteria: repo.criteria(s),
          exercises: own.map((i) => ({
            id: i.id,
            exerciseId: i.exercise_id,
            exercise: exercisesRepository.toApi(exercises.find((e) => e.id === i.exercise_id)!),
            position: i.position,
            dose: doseFromRow(i),
            notes: i.notes,
          })),
          sessionsPerWeek: sessionsPerWeek(own.map(doseFromRow)),
          startedAt: s.started_at,
          completedAt: s.completed_at,
        };
      }),
    };
  }

  async function logsWithStageNames(rows: LogRow[]): Promise<LogEntry[]> {
    const stages = await db<StageRow>('plan_stages')
      .whereIn('id', [...new Set(rows.map((r) => r.stage_id))])
      .select('id', 'name');
    const names = new Map(stages.map((s) => [s.id, s.name]));
    return rows.map((r) => repo.logToApi(r, names.get(r.stage_id) ?? ''));
  }

  return {
    ...deps,
    now: () => clock().toISOString(),
    today,
    accessiblePlan,
    alertsFor,
    summaries,
    detail,
    get: async (user, id) => detail(user, await accessiblePlan(user, id, 'plan:read')),
    logsWithStageNames,
  };
}
