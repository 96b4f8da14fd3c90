import type { SessionUser } from '../../src/contracts/api';
import type {
  AthletePlanAlerts,
  LogEntry,
  PainAlert,
  PainRule,
  PlanAction,
  PlanDetail,
  PlanProgress,
  PlanStage,
  PlanSummary,
} from '../../src/contracts/plans';
import { PLAN_LIMITS } from '../../src/contracts/plans';
import { addDays, dayOf, evaluateProgression, painAlerts, sessionsPerWeek, weeklyAdherence, type StagePeriod } from '../../src/plans-rules';
import type { Db } from '../db/knex';
import type { Knex } from 'knex';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { isStaff } from '../http/access';
import { audit } from '../audit/audit-log';
import { accessibleAthlete } from '../athletes/athlete-access';
import { doseColumns, doseFromRow, exercisesRepository } from './exercises-repository';
import { plansRepository as repo, type LogRow, type PlanRow, type StageExerciseRow, type StageRow } from './plans-repository';
import type { LogInput, PlanInput } from './plans-schemas';

/** Is this SQLite's (or PostgreSQL's) unique-constraint failure? */
function isUniqueViolation(err: unknown): boolean {
  const e = err as { code?: string; message?: string };
  return e?.code === 'SQLITE_CONSTRAINT_UNIQUE' || e?.code === '23505' || /UNIQUE constraint failed/i.test(e?.message ?? '');
}

const painLogs = (logs: LogRow[]) => logs.map((l) => ({ date: l.session_date, painDuring: l.pain_during, morningPain: l.morning_pain }));

type LoggedSet = LogInput['sets'][number];

/**
 * Matches a session's sets to the stage's exercises as they are now: by stage-exercise id, else
 * (the coach replaced the entry since) by library exercise id. Sets that match neither are
 * returned as `unmatched` (the caller checks they are exercises removed from the stage: those are
 * kept and flagged, not refused). A set named twice is an error. Pure.
 */
export function matchLoggedSets(sent: readonly LoggedSet[], items: readonly Pick<StageExerciseRow, 'id' | 'exercise_id'>[]) {
  const done = new Map<number, number>();
  const unmatched: LoggedSet[] = [];
  const problems: { path: (string | number)[]; message: string }[] = [];
  const seen = new Set<number>();
  sent.forEach((s, i) => {
    if (seen.has(s.stageExerciseId)) problems.push({ path: ['sets', i, 'stageExerciseId'], message: 'This exercise appears twice.' });
    seen.add(s.stageExerciseId);
  });
  const direct = sent.filter((s) => items.some((it) => it.id === s.stageExerciseId));
  for (const s of direct) done.set(s.stageExerciseId, s.setsDone);
  for (const s of sent) {
    if (direct.includes(s)) continue;
    const item = s.exerciseId === undefined ? undefined : items.find((it) => it.exercise_id === s.exerciseId && !done.has(it.id));
    if (item) done.set(item.id, s.setsDone);
    else unmatched.push(s);
  }
  return { done, unmatched, problems };
}

/**
 * Plans → Stages → Exercises for an athlete, their status (start, advance, pause, resume, finish),
 * the pain rule, progress and alerts, and the athlete's log with idempotent submissions.
 * Staff of the athlete's clinic write plans; the athlete reads their own non-draft plans and logs.
 */
export function plansService({ db, clock }: { db: Db; clock: () => Date }) {
  const now = () => clock().toISOString();
  const today = () => dayOf(clock());

  /** The plan this user may see (athletes: their own, not drafts); anything else is 404. */
  async function accessiblePlan(user: SessionUser, id: number): Promise<PlanRow> {
    const plan = await repo.find(db, user.clinicId, id);
    if (!plan) throw new NotFoundError('Plan');
    if (!isStaff(user)) {
      const athlete = await db('athletes')
        .where({ id: plan.athlete_id, clinic_id: user.clinicId })
        .first<{ user_id: number | null } | undefined>();
      if (!athlete || athlete.user_id !== user.id || plan.status === 'draft') throw new NotFoundError('Plan');
    }
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
      notes: isStaff(user) ? plan.notes : null,
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

  /** 422 unless the assessment is one of this athlete's. */
  async function checkAssessment(user: SessionUser, athleteId: number, assessmentId: number | null): Promise<void> {
    if (assessmentId === null) return;
    const row = await db('assessments').where({ id: assessmentId, clinic_id: user.clinicId, athlete_id: athleteId }).first();
    if (!row)
      throw new ValidationError('Assessment: choose one of this athlete’s assessments.', [
        { path: ['assessmentId'], message: 'Choose one of this athlete’s assessments.' },
      ]);
  }

  /** 422 unless every exercise is in this clinic's library (archived ones only if already used). */
  async function checkExercises(user: SessionUser, input: PlanInput, alreadyUsed: Set<number>): Promise<void> {
    const ids = input.stages.flatMap((s) => s.exercises.map((e) => e.exerciseId));
    const found = new Map((await exercisesRepository.byIds(db, user.clinicId, ids)).map((e) => [e.id, e]));
    const problems: { path: (string | number)[]; message: string }[] = [];
    input.stages.forEach((s, i) =>
      s.exercises.forEach((e, j) => {
        const ex = found.get(e.exerciseId);
        if (!ex) problems.push({ path: ['stages', i, 'exercises', j, 'exerciseId'], message: 'Choose an exercise from the library.' });
        else if (ex.archived && !alreadyUsed.has(ex.id))
          problems.push({
            path: ['stages', i, 'exercises', j, 'exerciseId'],
            message: `“${ex.name}” is archived; choose another exercise.`,
          });
      }),
    );
    if (problems.length) throw new ValidationError(`Exercises: ${problems[0]!.message}`, problems);
  }

  /**
   * Writes the stages and their exercises. Ids stay stable: a kept stage or stage exercise is
   * updated in place, new ones are inserted, removed ones deleted. A stage exercise sent without
   * an id (an older client) takes the id of an unclaimed one of the same library exercise in that
   * stage, so an unchanged save renews nothing and logs queued offline still match.
   */
  async function writeStages(
    trx: Knex,
    user: SessionUser,
    planId: number,
    input: PlanInput,
    existing: StageRow[],
    existingItems: StageExerciseRow[],
  ): Promise<void> {
    for (const [i, s] of input.stages.entries()) {
      const fields = {
        position: i + 1,
        name: s.name,
        goal: s.goal,
        target_weeks: s.targetWeeks,
        progression_text: s.progressionText,
        criteria: JSON.stringify(s.criteria),
      };
      let stageId: number;
      if (s.id !== undefined) {
        stageId = s.id;
        await repo.updateStage(trx, stageId, fields);
      } else {
        stageId = await repo.insertStage(trx, {
          clinic_id: user.clinicId,
          plan_id: planId,
          ...fields,
          started_at: null,
          completed_at: null,
        });
      }
      const claimed = new Set(s.exercises.map((e) => e.id).filter((id) => id !== undefined));
      const unclaimed = existingItems.filter((it) => it.stage_id === stageId && !claimed.has(it.id));
      await repo.syncStageExercises(
        trx,
        stageId,
        s.exercises.map((e, j) => {
          let id = e.id;
          if (id === undefined) {
            const at = unclaimed.findIndex((it) => it.exercise_id === e.exerciseId);
            if (at !== -1) id = unclaimed.splice(at, 1)[0]!.id;
          }
          return {
            id,
            clinic_id: user.clinicId,
            stage_id: stageId,
            exercise_id: e.exerciseId,
            position: j + 1,
            ...doseColumns(e.dose),
            notes: e.notes,
          };
        }),
        now(),
      );
    }
    const kept = new Set(input.stages.map((s) => s.id).filter((x) => x !== undefined));
    const gone = existing.filter((s) => !kept.has(s.id)).map((s) => s.id);
    if (gone.length) await trx('plan_stages').whereIn('id', gone).delete();
  }

  /** 422 unless every stage-exercise id sent belongs to the stage it is sent in, once. */
  function checkStageExerciseIds(input: PlanInput, existingItems: StageExerciseRow[]): { path: (string | number)[]; message: string }[] {
    const problems: { path: (string | number)[]; message: string }[] = [];
    const seen = new Set<number>();
    input.stages.forEach((s, i) =>
      s.exercises.forEach((e, j) => {
        if (e.id === undefined) return;
        const item = existingItems.find((it) => it.id === e.id);
        if (!item || s.id === undefined || item.stage_id !== s.id)
          problems.push({ path: ['stages', i, 'exercises', j, 'id'], message: 'This exercise entry is not part of this stage.' });
        else if (seen.has(e.id))
          problems.push({ path: ['stages', i, 'exercises', j, 'id'], message: 'This exercise entry appears twice.' });
        seen.add(e.id);
      }),
    );
    return problems;
  }

  async function logsWithStageNames(rows: LogRow[]): Promise<LogEntry[]> {
    const stages = await db<StageRow>('plan_stages')
      .whereIn('id', [...new Set(rows.map((r) => r.stage_id))])
      .select('id', 'name');
    const names = new Map(stages.map((s) => [s.id, s.name]));
    return rows.map((r) => repo.logToApi(r, names.get(r.stage_id) ?? ''));
  }

  return {
    accessiblePlan,

    async list(user: SessionUser, athleteId: number): Promise<PlanSummary[]> {
      await accessibleAthlete(db, user, athleteId);
      return summaries(await repo.listForAthlete(db, athleteId, isStaff(user)));
    },

    async get(user: SessionUser, id: number): Promise<PlanDetail> {
      return detail(user, await accessiblePlan(user, id));
    },

    async create(user: SessionUser, athleteId: number, input: PlanInput): Promise<PlanDetail> {
      await accessibleAthlete(db, user, athleteId);
      await checkAssessment(user, athleteId, input.assessmentId);
      if (input.stages.some((s) => s.id !== undefined)) {
        const i = input.stages.findIndex((s) => s.id !== undefined);
        throw new ValidationError('A new plan has no stage ids yet.', [
          { path: ['stages', i, 'id'], message: 'Leave the id out for a new stage.' },
        ]);
      }
      const idProblems = checkStageExerciseIds(input, []);
      if (idProblems.length) throw new ValidationError(`Stages: ${idProblems[0]!.message}`, idProblems);
      await checkExercises(user, input, new Set());
      const at = now();
      const id = await db.transaction(async (trx) => {
        const planId = await repo.insert(trx, {
          clinic_id: user.clinicId,
          athlete_id: athleteId,
          assessment_id: input.assessmentId,
          title: input.title,
          status: 'draft',
          current_stage_id: null,
          notes: input.notes,
          started_at: null,
          finished_at: null,
          created_by: user.id,
          created_at: at,
          updated_at: at,
        });
        await writeStages(trx, user, planId, input, [], []);
        await repo.putRule(trx, user.clinicId, planId, repo.ruleDefault(), user.id, at);
        await audit(trx, { clinicId: user.clinicId, actorId: user.id, athleteId, action: 'plan.created', detail: { planId } }, at);
        return planId;
      });
      return this.get(user, id);
    },

    /** Replaces title, link, notes and stages. Stages with logs (or the current one) must stay. */
    async replace(user: SessionUser, id: number, input: PlanInput): Promise<PlanDetail> {
      const plan = await accessiblePlan(user, id);
      if (plan.status === 'finished') throw new ConflictError('This plan is finished; start a new plan instead.', 'plan_finished');
      await checkAssessment(user, plan.athlete_id, input.assessmentId);
      const existing = await repo.stages(db, [id]);
      const problems: { path: (string | number)[]; message: string }[] = [];
      input.stages.forEach((s, i) => {
        if (s.id !== undefined && !existing.some((e) => e.id === s.id))
          problems.push({ path: ['stages', i, 'id'], message: 'This stage is not part of the plan.' });
      });
      if (
        new Set(input.stages.map((s) => s.id).filter((x) => x !== undefined)).size !== input.stages.filter((s) => s.id !== undefined).length
      ) {
        problems.push({ path: ['stages'], message: 'A stage appears twice.' });
      }
      const existingItems = await repo.stageExercises(
        db,
        existing.map((s) => s.id),
      );
      problems.push(...checkStageExerciseIds(input, existingItems));
      if (problems.length) throw new ValidationError(`Stages: ${problems[0]!.message}`, problems);
      const kept = new Set(input.stages.map((s) => s.id));
      const removed = existing.filter((s) => !kept.has(s.id));
      const counts = await repo.logCountByStage(
        db,
        removed.map((s) => s.id),
      );
      const blocked = removed.find((s) => s.id === plan.current_stage_id || (counts.get(s.id) ?? 0) > 0 || s.started_at !== null);
      if (blocked)
        throw new ConflictError(`Stage “${blocked.name}” has started or has log entries, so it cannot be removed.`, 'stage_in_use');
      const used = new Set(existingItems.map((e) => e.exercise_id));
      await checkExercises(user, input, used);
      const at = now();
      await db.transaction(async (trx) => {
        await repo.update(trx, id, { title: input.title, assessment_id: input.assessmentId, notes: input.notes, updated_at: at });
        await writeStages(trx, user, id, input, existing, existingItems);
        await audit(
          trx,
          { clinicId: user.clinicId, actorId: user.id, athleteId: plan.athlete_id, action: 'plan.updated', detail: { planId: id } },
          at,
        );
      });
      return this.get(user, id);
    },

    async remove(user: SessionUser, id: number): Promise<void> {
      const plan = await accessiblePlan(user, id);
      if (plan.status !== 'draft') throw new ConflictError('Only a draft plan can be deleted; finish this one instead.', 'plan_not_draft');
      await db.transaction(async (trx) => {
        await trx('plans').where({ id }).delete();
        await audit(trx, {
          clinicId: user.clinicId,
          actorId: user.id,
          athleteId: plan.athlete_id,
          action: 'plan.deleted',
          detail: { planId: id },
        });
      });
    },

    /** Start, advance to the next stage, pause, resume or finish. The coach decides; nothing moves by itself. */
    async transition(user: SessionUser, id: number, action: PlanAction): Promise<PlanDetail> {
      const plan = await accessiblePlan(user, id);
      const stages = await repo.stages(db, [id]);
      const at = now();
      const refuse = (message: string, code = 'invalid_transition') => {
        throw new ConflictError(message, code);
      };
      const current = stages.find((s) => s.id === plan.current_stage_id);
      await db.transaction(async (trx) => {
        switch (action) {
          case 'start': {
            if (plan.status !== 'draft') refuse(`The plan is ${plan.status}; only a draft can be started.`);
            const first = stages[0];
            const items = await repo.stageExercises(trx, first ? [first.id] : []);
            if (!first || items.length === 0) refuse('Add at least one exercise to the first stage before starting.', 'plan_incomplete');
            const other = await repo.otherRunningPlan(trx, plan.athlete_id, id);
            if (other)
              refuse(`This athlete already follows “${other.title}”. Finish it before starting another plan.`, 'athlete_has_active_plan');
            await repo.updateStage(trx, first!.id, { started_at: at, completed_at: null });
            await repo.update(trx, id, { status: 'active', current_stage_id: first!.id, started_at: at, updated_at: at });
            break;
          }
          case 'advance': {
            if (plan.status !== 'active')
              refuse(
                plan.status === 'paused'
                  ? 'Resume the plan before moving to the next stage.'
                  : `The plan is ${plan.status}; it cannot move to another stage.`,
              );
            const next = stages.find((s) => current && s.position > current.position);
            if (!current || !next) refuse('This is the last stage; finish the plan instead.', 'last_stage');
            const items = await repo.stageExercises(trx, [next!.id]);
            if (items.length === 0) refuse(`Add an exercise to “${next!.name}” before moving to it.`, 'plan_incomplete');
            await repo.updateStage(trx, current!.id, { completed_at: at });
            await repo.updateStage(trx, next!.id, { started_at: at, completed_at: null });
            await repo.update(trx, id, { current_stage_id: next!.id, updated_at: at });
            break;
          }
          case 'pause':
            if (plan.status !== 'active') refuse(`The plan is ${plan.status}; only an active plan can be paused.`);
            await repo.update(trx, id, { status: 'paused', updated_at: at });
            break;
          case 'resume':
            if (plan.status !== 'paused') refuse(`The plan is ${plan.status}; only a paused plan can be resumed.`);
            await repo.update(trx, id, { status: 'active', updated_at: at });
            break;
          case 'finish':
            if (plan.status !== 'active' && plan.status !== 'paused')
              refuse(`The plan is ${plan.status}; only an active or paused plan can be finished.`);
            if (current) await repo.updateStage(trx, current.id, { completed_at: at });
            await repo.update(trx, id, { status: 'finished', finished_at: at, updated_at: at });
            break;
        }
        await audit(
          trx,
          { clinicId: user.clinicId, actorId: user.id, athleteId: plan.athlete_id, action: `plan.${action}`, detail: { planId: id } },
          at,
        );
      });
      return this.get(user, id);
    },

    async putRule(user: SessionUser, id: number, rule: PainRule): Promise<PlanDetail> {
      const plan = await accessiblePlan(user, id);
      const at = now();
      await db.transaction(async (trx) => {
        await repo.putRule(trx, user.clinicId, id, rule, user.id, at);
        await audit(
          trx,
          {
            clinicId: user.clinicId,
            actorId: user.id,
            athleteId: plan.athlete_id,
            action: 'plan.pain_rule_updated',
            detail: { planId: id, ...rule },
          },
          at,
        );
      });
      return this.get(user, id);
    },

    /** Adherence per week, pain over time, alerts and the current stage's progression checks. */
    async progress(user: SessionUser, id: number): Promise<PlanProgress> {
      const plan = await accessiblePlan(user, id);
      const day = today();
      const [stages, logs, rules] = await Promise.all([repo.stages(db, [id]), repo.logs(db, [id]), repo.rules(db, [id])]);
      const rule = rules.get(id) ?? repo.ruleDefault();
      const items = await repo.stageExercises(
        db,
        stages.map((s) => s.id),
      );
      const periods: StagePeriod[] = stages
        .filter((s) => s.started_at !== null)
        .map((s) => ({
          start: dayOf(s.started_at!),
          end: s.completed_at ? addDays(dayOf(s.completed_at), -1) : null,
          sessionsPerWeek: sessionsPerWeek(items.filter((i) => i.stage_id === s.id).map(doseFromRow)),
        }));
      const until = plan.finished_at ? dayOf(plan.finished_at) : day;
      const current = stages.find((s) => s.id === plan.current_stage_id);
      const running = plan.status === 'active' || plan.status === 'paused';
      const next = current ? (stages.find((s) => s.position > current.position) ?? null) : null;
      return {
        planId: id,
        today: day,
        adherence:
          plan.status === 'draft'
            ? []
            : weeklyAdherence(
                periods,
                logs.map((l) => l.session_date),
                until,
              ),
        pain: [...logs]
          .reverse()
          .map((l) => ({ date: l.session_date, painDuring: l.pain_during, morningPain: l.morning_pain, stageId: l.stage_id })),
        alerts: alertsFor(plan, logs, rule),
        progression:
          running && current
            ? evaluateProgression(
                { id: current.id, criteria: repo.criteria(current), startedAt: current.started_at },
                logs
                  .filter((l) => l.stage_id === current.id)
                  .map((l) => ({
                    id: l.id,
                    date: l.session_date,
                    painDuring: l.pain_during,
                    morningPain: l.morning_pain,
                    sets: JSON.parse(l.sets),
                  })),
                rule,
                day,
                next?.id ?? null,
              )
            : null,
      };
    },

    /** Every running plan of the clinic that has alerts (roster). */
    async clinicAlerts(user: SessionUser): Promise<AthletePlanAlerts[]> {
      const plans = await repo.runningInClinic(db, user.clinicId);
      const ids = plans.map((p) => p.id);
      const [logs, rules] = await Promise.all([repo.logs(db, ids, addDays(today(), -28)), repo.rules(db, ids)]);
      return plans
        .map((p) => ({
          athleteId: p.athlete_id,
          planId: p.id,
          alerts: alertsFor(
            p,
            logs.filter((l) => l.plan_id === p.id),
            rules.get(p.id) ?? repo.ruleDefault(),
          ),
        }))
        .filter((a) => a.alerts.length > 0);
    },

    async logs(user: SessionUser, id: number): Promise<LogEntry[]> {
      await accessiblePlan(user, id);
      return logsWithStageNames(await repo.logs(db, [id]));
    },

    /**
     * Adds a session to the athlete's log. Idempotent on `input.key`: a retry with a key already
     * stored for this plan answers that entry (`created: false`) and writes nothing.
     */
    async addLog(user: SessionUser, id: number, input: LogInput): Promise<{ entry: LogEntry; created: boolean }> {
      const plan = await accessiblePlan(user, id);
      const replay = async (): Promise<{ entry: LogEntry; created: boolean } | null> => {
        const existing = await repo.findLogByKey(db, input.key);
        if (!existing) return null;
        if (existing.plan_id !== id || existing.athlete_id !== plan.athlete_id) {
          throw new ConflictError(
            'This submission key was already used for another log entry. Send the session again with a new key.',
            'idempotency_key_reused',
          );
        }
        return { entry: (await logsWithStageNames([existing]))[0]!, created: false };
      };
      const earlier = await replay();
      if (earlier) return earlier;

      if (plan.status !== 'active')
        throw new ConflictError(`This plan is ${plan.status}; sessions can be logged only while it is active.`, 'plan_not_active');
      const stage = (await repo.stages(db, [id])).find((s) => s.id === input.stageId);
      if (!stage)
        throw new ValidationError('Stage: this stage is not part of the plan.', [
          { path: ['stageId'], message: 'This stage is not part of the plan.' },
        ]);
      if (stage.id !== plan.current_stage_id) {
        throw new ConflictError(
          `“${stage.name}” is not the current stage of this plan any more. Reload to see today’s session.`,
          'stage_not_current',
        );
      }
      const day = today();
      const earliest = [addDays(day, -PLAN_LIMITS.logBackdateDays), stage.started_at ? addDays(dayOf(stage.started_at), -1) : day]
        .sort()
        .at(-1)!;
      if (input.date > addDays(day, 1) || input.date < earliest) {
        const message =
          input.date > day
            ? 'The session date cannot be in the future.'
            : `The session date must be on or after ${earliest} (the stage start, at most ${PLAN_LIMITS.logBackdateDays} days back).`;
        throw new ValidationError(`Date: ${message}`, [{ path: ['date'], message }]);
      }
      const items = await repo.stageExercises(db, [stage.id]);
      const matched = matchLoggedSets(input.sets, items);
      // A set for an exercise the coach removed from this stage since is kept and flagged; any other unknown id is an error.
      const removed = new Map(
        (
          await repo.removedStageExercises(
            db,
            stage.id,
            matched.unmatched.map((u) => u.stageExerciseId),
          )
        ).map((r) => [r.id, r]),
      );
      input.sets.forEach((s, i) => {
        if (matched.unmatched.includes(s) && !removed.has(s.stageExerciseId))
          matched.problems.push({ path: ['sets', i, 'stageExerciseId'], message: 'This exercise is not in the current stage.' });
      });
      if (matched.problems.length) throw new ValidationError(`Sets: ${matched.problems[0]!.message}`, matched.problems);
      const names = new Map(
        (
          await exercisesRepository.byIds(
            db,
            user.clinicId,
            [...items, ...removed.values()].map((i) => i.exercise_id),
          )
        ).map((e) => [e.id, e.name]),
      );
      const goneName = (u: LoggedSet) => names.get(removed.get(u.stageExerciseId)!.exercise_id) ?? 'An exercise no longer in this stage';
      const sets = [
        ...items.map((it) => ({
          stageExerciseId: it.id,
          name: names.get(it.exercise_id) ?? '',
          setsPrescribed: it.sets,
          setsDone: matched.done.get(it.id) ?? 0,
        })),
        // Exercises that left the stage since the session was saved on the phone: kept as sent, flagged.
        ...matched.unmatched.map((u) => ({
          stageExerciseId: u.stageExerciseId,
          name: goneName(u),
          setsPrescribed: removed.get(u.stageExerciseId)!.sets,
          setsDone: u.setsDone,
        })),
      ];
      const reviewNote = matched.unmatched.length
        ? `Sent for exercises the plan no longer has in this stage (saved on the athlete’s phone before the plan was edited): ${matched.unmatched.map(goneName).join(', ')}.`
        : null;
      const at = now();
      try {
        const logId = await db.transaction(async (trx) => {
          const newId = await repo.insertLog(trx, {
            clinic_id: user.clinicId,
            athlete_id: plan.athlete_id,
            plan_id: id,
            stage_id: stage.id,
            idempotency_key: input.key,
            session_date: input.date,
            pain_during: input.painDuring,
            morning_pain: null,
            morning_at: null,
            sets: JSON.stringify(sets),
            note: input.note,
            review_note: reviewNote,
            created_by: user.id,
            created_at: at,
            updated_at: at,
          });
          await audit(
            trx,
            {
              clinicId: user.clinicId,
              actorId: user.id,
              athleteId: plan.athlete_id,
              action: 'plan.log_added',
              detail: { planId: id, logId: newId, ...(reviewNote ? { unmatchedSets: matched.unmatched.length } : {}) },
            },
            at,
          );
          return newId;
        });
        const row = (await db<LogRow>('log_entries').where({ id: logId }).first())!;
        return { entry: repo.logToApi(row, stage.name), created: true };
      } catch (err) {
        // Two copies of one submission raced: the first one won; answer it.
        if (isUniqueViolation(err)) {
          const again = await replay();
          if (again) return again;
        }
        throw err;
      }
    },

    /** The one-tap next-morning check of a logged session (PUT: repeating it changes nothing more). */
    async morningCheck(user: SessionUser, id: number, key: string, pain: number): Promise<LogEntry> {
      const plan = await accessiblePlan(user, id);
      const row = await repo.findLogByKey(db, key);
      if (!row || row.plan_id !== id || row.athlete_id !== plan.athlete_id) throw new NotFoundError('Log entry');
      const at = now();
      if (row.morning_pain !== pain) {
        await db.transaction(async (trx) => {
          await repo.updateLog(trx, row.id, { morning_pain: pain, morning_at: at, updated_at: at });
          await audit(
            trx,
            {
              clinicId: user.clinicId,
              actorId: user.id,
              athleteId: plan.athlete_id,
              action: 'plan.morning_check',
              detail: { planId: id, logId: row.id },
            },
            at,
          );
        });
      }
      return (await logsWithStageNames([(await db<LogRow>('log_entries').where({ id: row.id }).first())!]))[0]!;
    },
  };
}

export type PlansService = ReturnType<typeof plansService>;
