import type { SessionUser } from '../../src/contracts/api';
import type { PlanDetail, PlanSummary } from '../../src/contracts/plans';
import { audit } from '../audit/audit-log';
import { createOnce } from '../db/create-once';
import { AppError, ConflictError, ValidationError } from '../errors';
import { accessibleAthlete } from '../policy/athlete-resources';
import { listGrant } from '../policy/enforce';
import type { PlanContext } from './plan-context';
import { checkAssessment, checkExercises, checkStageExerciseIds, writeStages, type PlanProblem } from './plan-stages';
import { plansRepository as repo } from './plans-repository';
import type { PlanInput, PlanPutInput } from './plans-schemas';

/** A plan's content: the athlete's plans, one plan, and writing its stages and exercises. */
export interface PlanContentService {
  /** The athlete's plans, newest first (an athlete sees no drafts). */
  list(user: SessionUser, athleteId: number): Promise<PlanSummary[]>;
  get(user: SessionUser, id: number): Promise<PlanDetail>;
  /**
   * A draft with its stages, exercises, doses and criteria, in one transaction. With `key` (the client's
   * `Idempotency-Key`), the same plan sent again answers the draft it made (no second plan).
   */
  create(user: SessionUser, athleteId: number, input: PlanInput, key?: string): Promise<PlanDetail>;
  /**
   * Replaces title, link, notes and stages. Stages with logs (or the current one) must stay, and
   * stages that have started stay first in their order (409 `started_stage_moved`). 409
   * `stale_revision` (and the plan as stored, in `details.current`) when someone saved the plan
   * since `baseRevision`; nothing is written then.
   */
  replace(user: SessionUser, id: number, input: PlanPutInput): Promise<PlanDetail>;
  /** Deletes a draft (409 `plan_not_draft` otherwise). */
  remove(user: SessionUser, id: number): Promise<void>;
}

export function planContentService(ctx: PlanContext): PlanContentService {
  const { db } = ctx;
  return {
    async list(user, athleteId) {
      await accessibleAthlete(db, user, athleteId, 'plan:list');
      const includeDrafts = !listGrant(user, 'plan:list').when.includes('not-draft');
      return ctx.summaries(await repo.listForAthlete(db, athleteId, includeDrafts));
    },

    get: (user, id) => ctx.get(user, id),

    async create(user, athleteId, input, key) {
      await accessibleAthlete(db, user, athleteId, 'plan:create');
      await checkAssessment(db, user.clinicId, athleteId, input.assessmentId);
      if (input.stages.some((s) => s.id !== undefined)) {
        const i = input.stages.findIndex((s) => s.id !== undefined);
        throw new ValidationError('A new plan has no stage ids yet.', [
          { path: ['stages', i, 'id'], message: 'Leave the id out for a new stage.' },
        ]);
      }
      const idProblems = checkStageExerciseIds(input, []);
      if (idProblems.length) throw new ValidationError(`Stages: ${idProblems[0]!.message}`, idProblems);
      await checkExercises(db, user.clinicId, input, new Set());
      const at = ctx.now();
      const request = { athleteId, ...input };
      const id = await createOnce(db, {
        clinicId: user.clinicId,
        kind: 'plan',
        key,
        request,
        at,
        create: async (trx) => {
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
            revision: 0,
          });
          await writeStages(trx, user.clinicId, planId, input, [], [], at);
          await repo.putRule(trx, user.clinicId, planId, repo.ruleDefault(), user.id, at);
          await audit(trx, { clinicId: user.clinicId, actorId: user.id, athleteId, action: 'plan.created', detail: { planId } }, at);
          return planId;
        },
      });
      return ctx.get(user, id);
    },

    async replace(user, id, input) {
      const plan = await ctx.accessiblePlan(user, id, 'plan:update');
      if (plan.status === 'finished') throw new ConflictError('This plan is finished; start a new plan instead.', 'plan_finished');
      await checkAssessment(db, user.clinicId, plan.athlete_id, input.assessmentId);
      const existing = await repo.stages(db, [id]);
      const problems: PlanProblem[] = [];
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
      // A removed stage must not have started or have log entries (removing it would delete them),
      // and the stages that have started keep their order ahead of those still to come (a stage
      // moved behind the current one would be started again on advance, over its history; one
      // moved ahead of it would never run). Checked before the exercises, and again inside the
      // save's transaction against the rows as they are then: a log sent or a stage advanced in
      // between must not be deleted or reordered with it.
      const refuseStagesInUse = async (q: typeof db): Promise<void> => {
        const now = await repo.stages(q, [id]);
        const current = (await q('plans').where({ id }).first<{ current_stage_id: number | null } | undefined>('current_stage_id'))
          ?.current_stage_id;
        const counts = await repo.logCountByStage(
          q,
          removed.map((s) => s.id),
        );
        const blocked = removed.find(
          (s) => s.id === current || (counts.get(s.id) ?? 0) > 0 || now.find((n) => n.id === s.id)?.started_at != null,
        );
        if (blocked)
          throw new ConflictError(`Stage “${blocked.name}” has started or has log entries, so it cannot be removed.`, 'stage_in_use');
        const started = now.filter((s) => s.started_at != null || s.id === current);
        if (started.some((s, i) => input.stages[i]?.id !== s.id)) {
          throw new ConflictError(
            `Stages that have started (${started.map((s) => `“${s.name}”`).join(', ')}) stay first, in the order they ran; move only the stages still to come.`,
            'started_stage_moved',
          );
        }
      };
      await refuseStagesInUse(db);
      const used = new Set(existingItems.map((e) => e.exercise_id));
      await checkExercises(db, user.clinicId, input, used);
      const at = ctx.now();
      const saved = await db.transaction(async (trx) => {
        const patch = { title: input.title, assessment_id: input.assessmentId, notes: input.notes, updated_at: at };
        if (!(await repo.updateContent(trx, id, input.baseRevision, patch))) return false;
        await refuseStagesInUse(trx);
        await writeStages(trx, user.clinicId, id, input, existing, existingItems, at);
        await audit(
          trx,
          { clinicId: user.clinicId, actorId: user.id, athleteId: plan.athlete_id, action: 'plan.updated', detail: { planId: id } },
          at,
        );
        return true;
      });
      if (!saved) throw staleRevision(await ctx.get(user, id));
      return ctx.get(user, id);
    },

    async remove(user, id) {
      const plan = await ctx.accessiblePlan(user, id, 'plan:delete');
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
  };
}

/** 409 `stale_revision` with the plan as stored now: another save came after the revision the edit started from. */
function staleRevision(current: PlanDetail): AppError {
  return new AppError(
    409,
    'stale_revision',
    'Someone else saved this plan after you opened it, so your changes were not saved. Reload the plan to see theirs, then make your changes again.',
    { current },
  );
}
