import type { SessionUser } from '../../src/contracts/api';
import type { LogEntry } from '../../src/contracts/plans';
import { PLAN_LIMITS } from '../../src/contracts/plans';
import { addDays, dayOf } from '../../src/plans-rules';
import { audit } from '../audit/audit-log';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { exercisesRepository } from './exercises-repository';
import type { PlanContext } from './plan-context';
import { plansRepository as repo, type LogRow, type StageExerciseRow } from './plans-repository';
import type { LogInput } from './plans-schemas';

/** The athlete's log of a plan: sessions (idempotent submissions) and the next-morning check. */
export interface PlanLogService {
  /** The plan's log, newest first. */
  logs(user: SessionUser, id: number): Promise<LogEntry[]>;
  /**
   * Adds a session to the athlete's log. Idempotent on `input.key`: a retry with a key already
   * stored for this plan answers that entry (`created: false`) and writes nothing.
   */
  addLog(user: SessionUser, id: number, input: LogInput): Promise<{ entry: LogEntry; created: boolean }>;
  /** The one-tap next-morning check of a logged session (PUT: repeating it changes nothing more). */
  morningCheck(user: SessionUser, id: number, key: string, pain: number): Promise<LogEntry>;
}

/** Is this SQLite's (or PostgreSQL's) unique-constraint failure? */
function isUniqueViolation(err: unknown): boolean {
  const e = err as { code?: string; message?: string };
  return e?.code === 'SQLITE_CONSTRAINT_UNIQUE' || e?.code === '23505' || /UNIQUE constraint failed/i.test(e?.message ?? '');
}

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

export function planLogService(ctx: PlanContext): PlanLogService {
  const { db } = ctx;
  return {
    async logs(user, id) {
      await ctx.accessiblePlan(user, id, 'plan-log:list');
      return ctx.logsWithStageNames(await repo.logs(db, [id]));
    },

    async addLog(user, id, input) {
      const plan = await ctx.accessiblePlan(user, id, 'plan-log:create');
      const replay = async (): Promise<{ entry: LogEntry; created: boolean } | null> => {
        const existing = await repo.findLogByKey(db, input.key);
        if (!existing) return null;
        if (existing.plan_id !== id || existing.athlete_id !== plan.athlete_id) {
          throw new ConflictError(
            'This submission key was already used for another log entry. Send the session again with a new key.',
            'idempotency_key_reused',
          );
        }
        return { entry: (await ctx.logsWithStageNames([existing]))[0]!, created: false };
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
      const day = ctx.today();
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
      const at = ctx.now();
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

    async morningCheck(user, id, key, pain) {
      const plan = await ctx.accessiblePlan(user, id, 'plan-log:morning-check');
      const row = await repo.findLogByKey(db, key);
      if (!row || row.plan_id !== id || row.athlete_id !== plan.athlete_id) throw new NotFoundError('Log entry');
      const at = ctx.now();
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
      return (await ctx.logsWithStageNames([(await db<LogRow>('log_entries').where({ id: row.id }).first())!]))[0]!;
    },
  };
}
