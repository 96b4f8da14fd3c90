/**
 * Re-applying a coach's unsaved edit of a plan on top of a colleague's newer save (after a 409
 * `stale_revision`): a three-way merge of the plan as opened (base), the edit (mine) and the
 * stored plan (theirs), matched by stage and stage-exercise ids. Pure.
 */
import type { Dose, PlanDetail, PlanWrite, StageWrite } from '../../../contracts/plans';

/** One exercise of a stage as sent. */
export type StageExerciseWrite = StageWrite['exercises'][number];

/** Whether two JSON-like values are equal, whatever the order of their keys. */
export function sameValue(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null) return false;
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  if (Array.isArray(a)) return a.length === (b as unknown[]).length && a.every((x, i) => sameValue(x, (b as unknown[])[i]));
  const ka = Object.keys(a).filter((k) => (a as Record<string, unknown>)[k] !== undefined);
  const kb = Object.keys(b).filter((k) => (b as Record<string, unknown>)[k] !== undefined);
  return ka.length === kb.length && ka.every((k) => sameValue((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]));
}

/** A stored plan as the body the editor would send for it unchanged (every id kept). */
export function planWriteOf(p: PlanDetail): PlanWrite {
  return {
    title: p.title,
    assessmentId: p.assessmentId,
    notes: p.notes,
    stages: p.stages.map((s) => ({
      id: s.id,
      name: s.name,
      goal: s.goal,
      targetWeeks: s.targetWeeks,
      progressionText: s.progressionText,
      criteria: s.criteria,
      exercises: s.exercises.map((e) => ({ id: e.id, exerciseId: e.exerciseId, dose: e.dose, notes: e.notes })),
    })),
  };
}

/** Mine where I changed it from the base, else theirs. */
const pick = <T>(base: T, mine: T, theirs: T): T => (sameValue(base, mine) ? theirs : mine);

type WithId = { id?: number };

/**
 * Merges a list of id-matched items:
 * - an item I added (no id) stays where I put it;
 * - an item both still have is merged field by field (`mergeItem`);
 * - an item they removed goes, unless I changed it: then it stays as a new item (`asNew`);
 * - an item I removed goes;
 * - an item they added comes in after the item it followed in their list.
 * When I did not reorder the items we both have, their order is kept.
 */
function mergeList<T extends WithId>(base: T[], mine: T[], theirs: T[], mergeItem: (b: T, m: T, t: T) => T, asNew: (m: T) => T): T[] {
  const baseById = new Map(base.filter((x) => x.id !== undefined).map((x) => [x.id!, x]));
  const theirsById = new Map(theirs.filter((x) => x.id !== undefined).map((x) => [x.id!, x]));
  const mineIds = new Set(mine.map((x) => x.id).filter((id) => id !== undefined));
  const result: T[] = [];
  for (const m of mine) {
    if (m.id === undefined) result.push(m);
    else if (theirsById.has(m.id)) result.push(mergeItem(baseById.get(m.id) ?? m, m, theirsById.get(m.id)!));
    else {
      const b = baseById.get(m.id);
      if (!b || !sameValue(b, m)) result.push(asNew(m));
    }
  }
  // Their order for the items we both have, when I did not reorder them.
  const mineOrder = mine.map((x) => x.id).filter((id): id is number => id !== undefined && baseById.has(id));
  const baseOrder = base.map((x) => x.id).filter((id): id is number => id !== undefined && mineIds.has(id));
  if (sameValue(mineOrder, baseOrder)) {
    const slots = result.flatMap((x, i) => (x.id !== undefined && theirsById.has(x.id) ? [i] : []));
    const theirIndex = new Map(theirs.map((x, i) => [x.id, i]));
    const shared = slots.map((i) => result[i]!).sort((a, b) => theirIndex.get(a.id)! - theirIndex.get(b.id)!);
    slots.forEach((slot, k) => (result[slot] = shared[k]!));
  }
  theirs.forEach((t, i) => {
    if (t.id === undefined || baseById.has(t.id) || mineIds.has(t.id)) return;
    const before = theirs
      .slice(0, i)
      .reverse()
      .find((p) => result.some((r) => r.id === p.id));
    result.splice(before ? result.findIndex((r) => r.id === before.id) + 1 : 0, 0, t);
  });
  return result;
}

function mergeExercise(b: StageExerciseWrite, m: StageExerciseWrite, t: StageExerciseWrite): StageExerciseWrite {
  const dose = { ...t.dose };
  for (const key of Object.keys(dose) as (keyof Dose)[])
    (dose as Record<keyof Dose, unknown>)[key] = pick(b.dose[key], m.dose[key], t.dose[key]);
  return { id: t.id, exerciseId: t.exerciseId, dose, notes: pick(b.notes, m.notes, t.notes) };
}

const exerciseAsNew = ({ id: _id, ...rest }: StageExerciseWrite): StageExerciseWrite => rest;

function mergeStage(b: StageWrite, m: StageWrite, t: StageWrite): StageWrite {
  return {
    id: t.id,
    name: pick(b.name, m.name, t.name),
    goal: pick(b.goal, m.goal, t.goal),
    targetWeeks: pick(b.targetWeeks, m.targetWeeks, t.targetWeeks),
    progressionText: pick(b.progressionText, m.progressionText, t.progressionText),
    criteria: pick(b.criteria, m.criteria, t.criteria),
    exercises: mergeList(b.exercises, m.exercises, t.exercises, mergeExercise, exerciseAsNew),
  };
}

const stageAsNew = ({ id: _id, ...rest }: StageWrite): StageWrite => ({ ...rest, exercises: rest.exercises.map(exerciseAsNew) });

/**
 * My edit (`mine`, made from `base`) applied on top of `theirs`: what I changed wins, what only
 * they changed stays theirs. Ids of what they removed are dropped (my changed copy comes back as
 * new), so the result can be saved against their revision.
 */
export function rebasePlan(base: PlanWrite, mine: PlanWrite, theirs: PlanWrite): PlanWrite {
  return {
    title: pick(base.title, mine.title, theirs.title),
    assessmentId: pick(base.assessmentId, mine.assessmentId, theirs.assessmentId),
    notes: pick(base.notes, mine.notes, theirs.notes),
    stages: mergeList(base.stages, mine.stages, theirs.stages, mergeStage, stageAsNew),
  };
}
