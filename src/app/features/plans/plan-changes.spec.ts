import type { PlanWrite } from '../../../contracts/plans';
import { aPlanWrite, aStageItem as item, aStageWrite as stage } from '../../shared/testing/plan-fixtures';
import { describePlanChanges } from './plan-changes';

const NAMES: Record<number, string> = { 101: 'Bridge hold', 102: 'Wall press', 201: 'Slow lowering', 202: 'Step-down' };
const name = (id: number) => NAMES[id] ?? `Exercise ${id}`;
const base = aPlanWrite([stage(1, 'Holds', [item(11, 101), item(12, 102)]), stage(2, 'Lengthening', [item(21, 201)])]);
const texts = (after: PlanWrite) => describePlanChanges(base, after, name).map((c) => `${c.kind}: ${c.text}`);

describe('describePlanChanges', () => {
  it('says nothing for the same plan', () => {
    expect(describePlanChanges(base, structuredClone(base), name)).toEqual([]);
  });

  it('names stages and exercises added and removed, with the stage they are in', () => {
    const after = structuredClone(base);
    after.stages[0]!.exercises.splice(1, 1);
    after.stages[0]!.exercises.push(item(undefined, 202));
    after.stages.splice(1, 1);
    after.stages.push(stage(undefined, 'Running drills', [item(undefined, 201), item(undefined, 102)]));
    expect(texts(after)).toEqual([
      'added: Stage “Holds”: Step-down added',
      'removed: Stage “Holds”: Wall press removed',
      'added: Stage “Running drills” added with 2 exercises',
      'removed: Stage “Lengthening” removed',
    ]);
  });

  it('gives a dose change in full, a rename, stage fields changed, and reorders', () => {
    const after = structuredClone(base);
    after.title = 'Hamstring plan, week 3';
    after.notes = 'Sore on Monday';
    after.stages[0]!.exercises[0]!.dose.sets = 4;
    after.stages[0]!.exercises.reverse();
    after.stages[1]!.name = 'Slow lengthening';
    after.stages[1]!.targetWeeks = 3;
    after.stages[1]!.criteria = [{ kind: 'sessions_logged', sessions: 4 }];
    after.stages.reverse();
    expect(texts(after)).toEqual([
      'changed: Title “Hamstring plan” → “Hamstring plan, week 3”',
      'changed: Coach notes changed',
      'moved: Stages reordered',
      'changed: Stage “Lengthening” renamed “Slow lengthening”',
      'changed: Stage “Slow lengthening”: target duration (2 → 3 weeks) and progression criteria changed',
      'changed: Stage “Holds”: Bridge hold dose 3 sets × 10 reps · rest 1 min · 3 days a week → 4 sets × 10 reps · rest 1 min · 3 days a week',
      'moved: Stage “Holds”: exercises reordered',
    ]);
  });
});
