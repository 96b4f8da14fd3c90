import type { SessionUser } from '../../src/contracts/api';
import type { AthletePlanAlerts, PlanProgress } from '../../src/contracts/plans';
import { addDays, dayOf, evaluateProgression, sessionsPerWeek, weeklyAdherence, type StagePeriod } from '../../src/plans-rules';
import { doseFromRow } from './exercises-repository';
import type { PlanContext } from './plan-context';
import { plansRepository as repo } from './plans-repository';

/** How a plan goes: adherence, pain over time, alerts and the current stage's progression checks. */
export interface PlanProgressService {
  /** Adherence per week, pain over time, alerts and the current stage's progression checks (a suggestion only). */
  progress(user: SessionUser, id: number): Promise<PlanProgress>;
  /** Every running plan of the clinic that has alerts (roster). */
  clinicAlerts(user: SessionUser): Promise<AthletePlanAlerts[]>;
}

export function planProgressService(ctx: PlanContext): PlanProgressService {
  const { db } = ctx;
  return {
    async progress(user, id) {
      const plan = await ctx.accessiblePlan(user, id, 'plan:read-progress');
      const day = ctx.today();
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
        alerts: ctx.alertsFor(plan, logs, rule),
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

    async clinicAlerts(user) {
      const plans = await repo.runningInClinic(db, user.clinicId);
      const ids = plans.map((p) => p.id);
      const [logs, rules] = await Promise.all([repo.logs(db, ids, addDays(ctx.today(), -28)), repo.rules(db, ids)]);
      return plans
        .map((p) => ({
          athleteId: p.athlete_id,
          planId: p.id,
          alerts: ctx.alertsFor(
            p,
            logs.filter((l) => l.plan_id === p.id),
            rules.get(p.id) ?? repo.ruleDefault(),
          ),
        }))
        .filter((a) => a.alerts.length > 0);
    },
  };
}
