import type { Knex } from 'knex';
import type { Db } from '../db/knex';
import { ValidationError } from '../errors';
import { doseColumns, exercisesRepository } from './exercises-repository';
import { plansRepository as repo, type StageExerciseRow, type StageRow } from './plans-repository';
import type { PlanInput } from './plans-schemas';

/** A field problem of a plan write (422 `details`). */
export type PlanProblem = { path: (string | number)[]; message: string };

/** 422 unless the assessment is one of this athlete's. */
export async function checkAssessment(db: Db, clinicId: number, athleteId: number, assessmentId: number | null): Promise<void> {
  if (assessmentId === null) return;
  const row = await db('assessments').where({ id: assessmentId, clinic_id: clinicId, athlete_id: athleteId }).first();
  if (!row)
    throw new ValidationError('Assessment: choose one of this athlete’s assessments.', [
      { path: ['assessmentId'], message: 'Choose one of this athlete’s assessments.' },
    ]);
}

/** 422 unless every exercise is in this clinic's library (archived ones only if already used). */
export async function checkExercises(db: Db, clinicId: number, input: PlanInput, alreadyUsed: Set<number>): Promise<void> {
  const ids = input.stages.flatMap((s) => s.exercises.map((e) => e.exerciseId));
  const found = new Map((await exercisesRepository.byIds(db, clinicId, ids)).map((e) => [e.id, e]));
  const problems: PlanProblem[] = [];
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

/** Problems unless every stage-exercise id sent belongs to the stage it is sent in, once. Pure. */
export function checkStageExerciseIds(input: PlanInput, existingItems: StageExerciseRow[]): PlanProblem[] {
  const problems: PlanProblem[] = [];
  const seen = new Set<number>();
  input.stages.forEach((s, i) =>
    s.exercises.forEach((e, j) => {
      if (e.id === undefined) return;
      const item = existingItems.find((it) => it.id === e.id);
      if (!item || s.id === undefined || item.stage_id !== s.id)
        problems.push({ path: ['stages', i, 'exercises', j, 'id'], message: 'This exercise entry is not part of this stage.' });
      else if (seen.has(e.id)) problems.push({ path: ['stages', i, 'exercises', j, 'id'], message: 'This exercise entry appears twice.' });
      seen.add(e.id);
    }),
  );
  return problems;
}

/**
 * Writes the stages and their exercises. Ids stay stable: a kept stage or stage exercise is
 * updated in place, new ones are inserted, removed ones deleted. A stage exercise sent without
 * an id (an older client) takes the id of an unclaimed one of the same library exercise in that
 * stage, so an unchanged save renews nothing and logs queued offline still match.
 */
export async function writeStages(
  trx: Knex,
  clinicId: number,
  planId: number,
  input: PlanInput,
  existing: StageRow[],
  existingItems: StageExerciseRow[],
  at: string,
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
        clinic_id: clinicId,
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
          const found = unclaimed.findIndex((it) => it.exercise_id === e.exerciseId);
          if (found !== -1) id = unclaimed.splice(found, 1)[0]!.id;
        }
        return {
          id,
          clinic_id: clinicId,
          stage_id: stageId,
          exercise_id: e.exerciseId,
          position: j + 1,
          ...doseColumns(e.dose),
          notes: e.notes,
        };
      }),
      at,
    );
  }
  const kept = new Set(input.stages.map((s) => s.id).filter((x) => x !== undefined));
  const gone = existing.filter((s) => !kept.has(s.id)).map((s) => s.id);
  if (gone.length) await trx('plan_stages').whereIn('id', gone).delete();
}
