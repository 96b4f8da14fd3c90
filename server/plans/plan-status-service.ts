import type { SessionUser } from '../../src/contracts/api';
import type { PainRule, PlanAction, PlanDetail } from '../../src/contracts/plans';
import { audit } from '../audit/audit-log';
import { ConflictError } from '../errors';
import type { PlanContext } from './plan-context';
import { plansRepository as repo } from './plans-repository';

/** Where a plan stands (draft, active, paused, finished; its current stage) and its pain rule. The coach decides. */
export interface PlanStatusService {
  /** Start, advance to the next stage, pause, resume or finish. Nothing moves by itself. */
  transition(user: SessionUser, id: number, action: PlanAction): Promise<PlanDetail>;
  /** The plan's alert rule. */
  putRule(user: SessionUser, id: number, rule: PainRule): Promise<PlanDetail>;
}

export function planStatusService(ctx: PlanContext): PlanStatusService {
  const { db } = ctx;
  return {
    async transition(user, id, action) {
      const plan = await ctx.accessiblePlan(user, id, 'plan:transition');
      const stages = await repo.stages(db, [id]);
      const at = ctx.now();
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
      return ctx.get(user, id);
    },

    async putRule(user, id, rule) {
      const plan = await ctx.accessiblePlan(user, id, 'plan:set-pain-rule');
      const at = ctx.now();
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
      return ctx.get(user, id);
    },
  };
}
