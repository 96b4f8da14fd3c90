/**
 * What differs between two versions of a plan, in a coach's words: stages and exercises added,
 * removed, changed or reordered (matched by their ids), and the plan's own fields. Pure.
 */
import type { PlanWrite, StageWrite } from '../../../contracts/plans';
import { formatDose } from '../../shared/plan-words';
import { sameValue, type StageExerciseWrite } from './plan-merge';

/** One difference, for a list line with an icon by kind. */
export interface PlanChange {
  kind: 'added' | 'removed' | 'changed' | 'moved';
  text: string;
}

const STAGE_FIELDS: { key: keyof StageWrite; label: string }[] = [
  { key: 'goal', label: 'goal' },
  { key: 'targetWeeks', label: 'target duration' },
  { key: 'progressionText', label: 'when to move on' },
  { key: 'criteria', label: 'progression criteria' },
];

/** "a", "a and b", "a, b and c". */
function listed(words: string[]): string {
  return words.length < 2 ? (words[0] ?? '') : `${words.slice(0, -1).join(', ')} and ${words.at(-1)}`;
}

/** Whether the items both lists keep (by id) come in a different order. */
function reordered(before: { id?: number }[], after: { id?: number }[]): boolean {
  const afterIds = new Set(after.map((x) => x.id).filter((id) => id !== undefined));
  const beforeIds = new Set(before.map((x) => x.id).filter((id) => id !== undefined));
  const a = before.map((x) => x.id).filter((id) => id !== undefined && afterIds.has(id));
  const b = after.map((x) => x.id).filter((id) => id !== undefined && beforeIds.has(id));
  return !sameValue(a, b);
}

function exerciseChanges(
  stage: string,
  before: StageExerciseWrite[],
  after: StageExerciseWrite[],
  name: (id: number) => string,
): PlanChange[] {
  const changes: PlanChange[] = [];
  const beforeById = new Map(before.filter((e) => e.id !== undefined).map((e) => [e.id!, e]));
  const afterIds = new Set(after.map((e) => e.id));
  for (const e of after) {
    const old = e.id === undefined ? undefined : beforeById.get(e.id);
    if (!old) {
      changes.push({ kind: 'added', text: `${stage}: ${name(e.exerciseId)} added` });
      continue;
    }
    if (!sameValue(old.dose, e.dose)) {
      changes.push({ kind: 'changed', text: `${stage}: ${name(e.exerciseId)} dose ${formatDose(old.dose)} → ${formatDose(e.dose)}` });
    }
    if (!sameValue(old.notes, e.notes)) changes.push({ kind: 'changed', text: `${stage}: ${name(e.exerciseId)} notes changed` });
  }
  for (const e of before) {
    if (e.id === undefined || !afterIds.has(e.id)) changes.push({ kind: 'removed', text: `${stage}: ${name(e.exerciseId)} removed` });
  }
  if (reordered(before, after)) changes.push({ kind: 'moved', text: `${stage}: exercises reordered` });
  return changes;
}

/**
 * The differences from `before` to `after`, plan fields first, then stage by stage in the order
 * of `after` (removed stages last). `name` gives a library exercise's name by its id.
 */
export function describePlanChanges(before: PlanWrite, after: PlanWrite, name: (exerciseId: number) => string): PlanChange[] {
  const changes: PlanChange[] = [];
  if (before.title !== after.title) changes.push({ kind: 'changed', text: `Title “${before.title}” → “${after.title}”` });
  if (before.assessmentId !== after.assessmentId) changes.push({ kind: 'changed', text: 'Linked assessment changed' });
  if (!sameValue(before.notes, after.notes)) changes.push({ kind: 'changed', text: 'Coach notes changed' });
  const beforeById = new Map(before.stages.filter((s) => s.id !== undefined).map((s) => [s.id!, s]));
  const afterIds = new Set(after.stages.map((s) => s.id));
  if (reordered(before.stages, after.stages)) changes.push({ kind: 'moved', text: 'Stages reordered' });
  for (const s of after.stages) {
    const old = s.id === undefined ? undefined : beforeById.get(s.id);
    const label = `Stage “${s.name}”`;
    if (!old) {
      const n = s.exercises.length;
      changes.push({ kind: 'added', text: `${label} added${n ? ` with ${n} exercise${n === 1 ? '' : 's'}` : ''}` });
      continue;
    }
    if (old.name !== s.name) changes.push({ kind: 'changed', text: `Stage “${old.name}” renamed “${s.name}”` });
    const fields = STAGE_FIELDS.filter((f) => !sameValue(old[f.key], s[f.key])).map((f) =>
      f.key === 'targetWeeks' ? `${f.label} (${old.targetWeeks} → ${s.targetWeeks} weeks)` : f.label,
    );
    if (fields.length) changes.push({ kind: 'changed', text: `${label}: ${listed(fields)} changed` });
    changes.push(...exerciseChanges(label, old.exercises, s.exercises, name));
  }
  for (const s of before.stages) {
    if (s.id === undefined || !afterIds.has(s.id)) changes.push({ kind: 'removed', text: `Stage “${s.name}” removed` });
  }
  return changes;
}
