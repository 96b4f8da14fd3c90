import { planContentService, type PlanContentService } from './plan-content-service';
import { planContext, type PlansDeps } from './plan-context';
import { planLogService, type PlanLogService } from './plan-log-service';
import { planProgressService, type PlanProgressService } from './plan-progress-service';
import { planStatusService, type PlanStatusService } from './plan-status-service';

export type { PlansDeps };

/**
 * Plans → Stages → Exercises for an athlete, their status (start, advance, pause, resume, finish),
 * the pain rule, progress and alerts, and the athlete's log with idempotent submissions. Staff of
 * the athlete's clinic write plans; the athlete reads their own non-draft plans and logs (who may
 * do what: `server/policy/access-table.ts`). Each concern lives in its own file.
 */
export interface PlansService extends PlanContentService, PlanStatusService, PlanProgressService, PlanLogService {}

export function plansService(deps: PlansDeps): PlansService {
  const ctx = planContext(deps);
  return {
    ...planContentService(ctx),
    ...planStatusService(ctx),
    ...planProgressService(ctx),
    ...planLogService(ctx),
  };
}
