import type { PlanWrite } from '../../../contracts/plans';
import { aPlanWrite, aStageItem as item, aStageWrite as stage } from '../../shared/testing/plan-fixtures';
import { rebasePlan, sameValue } from './plan-merge';

const clone = <T>(x: T): T => structuredClone(x);

/** Stage ids and the stage-exercise ids (or "new:<exercise id>") of each, to read a merge at a glance. */
const shape = (p: PlanWrite) =>
  p.stages.map((s) => `${s.id ?? 'new'}:${s.name}[${s.exercises.map((e) => e.id ?? `new${e.exerciseId}`).join(',')}]`);

const base = aPlanWrite([stage(1, 'Holds', [item(11, 101), item(12, 102)]), stage(2, 'Lengthening', [item(21, 201)])]);

describe('sameValue', () => {
  it('compares by content, whatever the key order, and treats an absent key as undefined', () => {
    expect(sameValue({ a: 1, b: [1, { c: null }] }, { b: [1, { c: null }], a: 1 })).toBe(true);
    expect(sameValue({ a: 1, b: undefined }, { a: 1 })).toBe(true);
    expect(sameValue({ a: null }, { a: undefined })).toBe(false);
    expect(sameValue([1, 2], [2, 1])).toBe(false);
    expect(sameValue([], {})).toBe(false);
  });
});

describe('rebasePlan', () => {
  it('keeps what only they changed, and applies what only I changed, field by field', () => {
    const theirs = clone(base);
    theirs.title = 'Their title';
    theirs.stages[1]!.targetWeeks = 4;
    theirs.stages[0]!.exercises[0]!.dose.reps = 12;
    const mine = clone(base);
    mine.stages[0]!.name = 'Isometric holds';
    mine.stages[0]!.exercises[0]!.dose.sets = 5;
    const merged = rebasePlan(base, mine, theirs);
    expect(merged.title).toBe('Their title');
    expect(merged.stages[0]!.name).toBe('Isometric holds');
    expect(merged.stages[1]!.targetWeeks).toBe(4);
    expect(merged.stages[0]!.exercises[0]!.dose).toMatchObject({ sets: 5, reps: 12 });
  });

  it('where we both changed the same field, mine wins', () => {
    const theirs = clone(base);
    theirs.title = 'Their title';
    const mine = clone(base);
    mine.title = 'My title';
    expect(rebasePlan(base, mine, theirs).title).toBe('My title');
  });

  it('keeps the stages and exercises they added, after what they followed, and adds mine', () => {
    const theirs = clone(base);
    theirs.stages.splice(1, 0, stage(3, 'Their middle stage', [item(31, 301)]));
    theirs.stages[0]!.exercises.push(item(13, 103));
    const mine = clone(base);
    mine.stages.push(stage(undefined, 'My last stage', [item(undefined, 401)]));
    mine.stages[1]!.exercises.push(item(undefined, 202));
    expect(shape(rebasePlan(base, mine, theirs))).toEqual([
      '1:Holds[11,12,13]',
      '3:Their middle stage[31]',
      '2:Lengthening[21,new202]',
      'new:My last stage[new401]',
    ]);
  });

  it('honours their removals unless I changed what they removed: then my copy comes back as new', () => {
    const theirs = clone(base);
    theirs.stages[0]!.exercises.splice(1, 1); // they removed exercise 12
    theirs.stages.splice(1, 1); // and stage 2
    const untouched = rebasePlan(base, clone(base), theirs);
    expect(shape(untouched)).toEqual(['1:Holds[11]']);

    const mine = clone(base);
    mine.stages[0]!.exercises[1]!.dose.sets = 6;
    mine.stages[1]!.name = 'Slow lengthening';
    expect(shape(rebasePlan(base, mine, theirs))).toEqual(['1:Holds[11,new102]', 'new:Slow lengthening[new201]']);
  });

  it('applies my removals, and my order when I reordered; their order when I did not', () => {
    const theirs = clone(base);
    theirs.stages[0]!.exercises.reverse();
    const mineRemoved = clone(base);
    mineRemoved.stages.splice(1, 1);
    expect(shape(rebasePlan(base, mineRemoved, theirs))).toEqual(['1:Holds[12,11]']);

    const mineMoved = clone(base);
    mineMoved.stages.reverse();
    expect(shape(rebasePlan(base, mineMoved, theirs))).toEqual(['2:Lengthening[21]', '1:Holds[12,11]']);
  });

  it('with no edit of mine, answers their plan', () => {
    const theirs = clone(base);
    theirs.notes = 'Their notes';
    theirs.stages.reverse();
    expect(rebasePlan(base, clone(base), theirs)).toEqual(theirs);
  });
});
