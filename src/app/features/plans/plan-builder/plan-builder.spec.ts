import { HttpTestingController } from '@angular/common/http/testing';
import { ComponentFixture } from '@angular/core/testing';
import { MatDialog } from '@angular/material/dialog';
import { Subject } from 'rxjs';
import type { AthleteDetail } from '../../../../contracts/api';
import type { ExercisePickerData } from '../exercise-picker/exercise-picker';
import { buttonWithText, flushApiError } from '../../../shared/testing/api-errors';
import { PlanBuilder } from './plan-builder';
import { mountPage, settlePage, wait } from '../../../shared/testing/mount-page';
import { aPlan } from '../../../shared/testing/plan-fixtures';
import type { Exercise, PlanDetail, PlanReplace } from '../../../../contracts/plans';

const athlete = { id: 4, firstName: 'Ada', lastName: 'Example', email: 'ada@runner.test', hasAccount: true } as AthleteDetail;

function exercise(id: number, name: string): Exercise {
  return {
    id,
    name,
    purpose: 'Invented for the spec.',
    region: 'hamstring',
    kind: 'isometric',
    dose: { sets: 3, reps: null, holdSeconds: 30, tempo: null, load: null, restSeconds: 60, daysPerWeek: 5 },
    instructions: ['Hold.'],
    cautions: '',
    source: '',
    archived: false,
    createdAt: '',
    updatedAt: '',
  };
}

describe('PlanBuilder', () => {
  let fixture: ComponentFixture<PlanBuilder>;
  let element: HTMLElement;
  let backend: HttpTestingController;
  /** What the picker dialog answers, when the test says so (outside any template event). */
  let picked: Subject<Exercise | undefined>;
  let pickerData: ExercisePickerData[];

  beforeEach(async () => {
    pickerData = [];
    const dialog = {
      open: (_c: unknown, config: { data: ExercisePickerData }) => {
        pickerData.push(config.data);
        picked = new Subject<Exercise | undefined>();
        return { afterClosed: () => picked };
      },
    };
    ({ fixture, element, backend } = mountPage(PlanBuilder, { athlete: '4' }, [{ provide: MatDialog, useValue: dialog }]));
    await wait(0);
    backend.expectOne('/api/athletes/4').flush(athlete);
    backend.expectOne('/api/athletes/4/assessments').flush({ assessments: [] });
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  const button = (text: string) => [...element.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent?.includes(text))!;
  const stageExercises = (stage: number) =>
    [...element.querySelectorAll(`[aria-label="Stage ${stage}"] .stage-exercise .exercise-name`)].map((e) => e.textContent?.trim());

  it("shows a stage's whole goal and move-on words: both grow with their text instead of cutting it off on a phone", async () => {
    button('Start from three stages').click();
    await fixture.whenStable();
    for (const name of ['goal', 'progressionText']) {
      const field = element.querySelector(`[aria-label="Stage 1"] [formcontrolname="${name}"]`)!;
      expect(field.tagName, name).toBe('TEXTAREA');
      expect(field.classList.contains('cdk-textarea-autosize'), name).toBe(true);
    }
  });

  it('shows an exercise as soon as the picker answers Add, without another click, and the picker then knows it is in the stage', async () => {
    button('Start from three stages').click();
    await fixture.whenStable();
    const addButtons = () =>
      [...element.querySelectorAll<HTMLButtonElement>('[aria-label="Stage 1"] button')].filter((b) =>
        b.textContent?.includes('Add exercise from library'),
      );
    addButtons()[0]!.click();
    await fixture.whenStable();
    expect(pickerData[0]).toMatchObject({ stageName: 'Isometric holds', chosenIds: [] });

    // The dialog closes with the chosen exercise some time later, not inside a click.
    await wait(5);
    picked.next(exercise(11, 'Bridge hold'));
    picked.complete();
    await fixture.whenStable();
    expect(stageExercises(1)).toEqual(['Bridge hold']);
    expect(element.querySelector('[role="status"]')?.textContent).toContain('Added Bridge hold to Isometric holds.');

    // Opening the picker again: the exercise is already in the stage, so it is marked as such.
    addButtons()[0]!.click();
    await fixture.whenStable();
    expect(pickerData[1]!.chosenIds).toEqual([11]);
    picked.next(undefined);
    picked.complete();
    await fixture.whenStable();
    expect(stageExercises(1)).toEqual(['Bridge hold']);
  });
});

describe('PlanBuilder when a load fails', () => {
  let fixture: ComponentFixture<PlanBuilder>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  const settle = () => settlePage(fixture);

  function open(inputs: { athlete?: string; id?: string }): void {
    ({ fixture, element, backend } = mountPage(PlanBuilder, inputs));
  }
  afterEach(() => backend.verify());

  it("the athlete's visits failing: the form opens and says by the assessment field why it has no visits", async () => {
    open({ athlete: '4' });
    await wait(0);
    backend.expectOne('/api/athletes/4').flush(athlete);
    flushApiError(backend.expectOne('/api/athletes/4/assessments'), 500, 'The database is busy.');
    await settle();
    expect(element.querySelector('form')).not.toBeNull();
    expect(element.textContent).toContain("Couldn't load the athlete's visits: The database is busy.");
    expect(element.querySelector('mat-progress-bar')).toBeNull();
  });

  it('a plan that cannot be found (mistyped or deleted) says so and the loading bar ends', async () => {
    open({ id: '999' });
    await wait(0);
    flushApiError(backend.expectOne('/api/plans/999'), 404, 'Plan not found.');
    await settle();
    expect(element.querySelector('mat-progress-bar')).toBeNull();
    expect(element.textContent).toContain('There is no such plan or athlete in your clinic.');
    expect(element.querySelector('form')).toBeNull();
  });

  it("a plan that fails to load for another reason gives the server's reason with Try again", async () => {
    open({ id: '7' });
    await wait(0);
    flushApiError(backend.expectOne('/api/plans/7'), 503, 'The server is starting up.');
    await settle();
    expect(element.textContent).toContain("Couldn't open the plan");
    expect(element.textContent).toContain('The server is starting up.');
    buttonWithText(element, 'Try again').click();
    await settle();
    backend.expectOne('/api/plans/7');
  });
});

describe('PlanBuilder when a colleague saved the plan after it was opened', () => {
  let fixture: ComponentFixture<PlanBuilder>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  const settle = () => settlePage(fixture);
  const bridge = exercise(11, 'Bridge hold');
  const press = exercise(12, 'Wall press');
  const item = (id: number, e: Exercise, position: number) => ({ id, exerciseId: e.id, exercise: e, position, dose: e.dose, notes: null });
  /** As the coach opened it: one stage with Bridge hold. */
  const opened = aPlan({ revision: 1, stages: [{ ...aPlan().stages[0]!, exercises: [item(41, bridge, 1)] }] });
  /** The colleague's save: Wall press added to the stage, and a second stage. */
  const theirs: PlanDetail = {
    ...opened,
    revision: 2,
    updatedAt: '2026-11-02T09:30:00Z',
    stages: [
      { ...opened.stages[0]!, exercises: [item(41, bridge, 1), item(42, press, 2)] },
      { ...opened.stages[0]!, id: 32, position: 2, name: 'Running drills', exercises: [] },
    ],
  };
  const titleInput = () => element.querySelector<HTMLInputElement>('input[formcontrolname="title"]')!;

  async function openAndSaveStale(): Promise<void> {
    ({ fixture, element, backend } = mountPage(PlanBuilder, { id: '5' }));
    await wait(0);
    backend.expectOne('/api/plans/5').flush(opened);
    await settle();
    backend.expectOne('/api/athletes/4').flush(athlete);
    backend.expectOne('/api/athletes/4/assessments').flush({ assessments: [] });
    await settle();
    titleInput().value = 'My new title';
    titleInput().dispatchEvent(new Event('input'));
    buttonWithText(element, 'Save plan').click();
    await settle();
    const put = backend.expectOne({ method: 'PUT', url: '/api/plans/5' });
    expect((put.request.body as PlanReplace).baseRevision).toBe(1);
    put.flush(
      { error: { code: 'stale_revision', message: 'Someone else saved this plan.', details: { current: theirs } } },
      { status: 409, statusText: 'Conflict' },
    );
    await settle();
  }
  afterEach(() => backend.verify());

  it('keeps the edit in the form and shows what their save and the edit changed', async () => {
    await openAndSaveStale();
    const panel = element.querySelector('app-plan-conflict')!;
    expect(panel.textContent).toContain('A colleague saved this plan after you opened it');
    expect(panel.textContent).toContain('Stage “Isometric holds”: Wall press added');
    expect(panel.textContent).toContain('Stage “Running drills” added');
    expect(panel.textContent).toContain('Title “Hamstring strain: staged loading” → “My new title”');
    expect(titleInput().value).toBe('My new title');
    expect(element.querySelector('.form-problem')).toBeNull();
  });

  it('“Keep my changes” saves the edit on top of their version, against their revision', async () => {
    await openAndSaveStale();
    buttonWithText(element, 'Keep my changes').click();
    await settle();
    const put = backend.expectOne({ method: 'PUT', url: '/api/plans/5' });
    const body = put.request.body as PlanReplace;
    expect(body.baseRevision).toBe(2);
    expect(body.title).toBe('My new title');
    expect(body.stages.map((s) => s.id)).toEqual([31, 32]);
    expect(body.stages[0]!.exercises.map((e) => e.id)).toEqual([41, 42]);
    put.flush({ ...theirs, title: 'My new title', revision: 3 });
    await settle();
    expect(element.querySelector('app-plan-conflict')).toBeNull();
  });

  it('“Load their version” shows their plan and drops the edit, sending nothing', async () => {
    await openAndSaveStale();
    buttonWithText(element, 'Load their version').click();
    await settle();
    expect(element.querySelector('app-plan-conflict')).toBeNull();
    expect(titleInput().value).toBe('Hamstring strain: staged loading');
    expect(element.textContent).toContain('Wall press');
    const stageNames = [...element.querySelectorAll<HTMLInputElement>('input[formcontrolname="name"]')].map((i) => i.value);
    expect(stageNames).toEqual(['Isometric holds', 'Running drills']);
    backend.expectNone({ method: 'PUT', url: '/api/plans/5' });
  });
});

describe('PlanBuilder on a running plan', () => {
  it('holds the stages that have started in place: they and the stage after them cannot move past each other', async () => {
    const stage = aPlan().stages[0]!;
    const running = aPlan({
      status: 'active',
      currentStageId: 32,
      stages: [
        { ...stage, id: 31, position: 1, name: 'Holds', startedAt: '2026-11-01T08:00:00Z', completedAt: '2026-11-08T08:00:00Z' },
        { ...stage, id: 32, position: 2, name: 'Lengthening', startedAt: '2026-11-08T08:00:00Z' },
        { ...stage, id: 33, position: 3, name: 'Springs' },
        { ...stage, id: 34, position: 4, name: 'Running' },
      ],
    });
    const { fixture, element, backend } = mountPage(PlanBuilder, { id: '5' });
    await wait(0);
    backend.expectOne('/api/plans/5').flush(running);
    await settlePage(fixture);
    backend.expectOne('/api/athletes/4').flush(athlete);
    backend.expectOne('/api/athletes/4/assessments').flush({ assessments: [] });
    await settlePage(fixture);
    const enabled = (n: number) =>
      [...element.querySelectorAll<HTMLButtonElement>(`[aria-label="Stage ${n}"] app-reorder-buttons button`)].map((b) => !b.disabled);
    // Up, down, remove: the started two do not move; the third cannot pass the current stage; the rest moves freely.
    expect([1, 2, 3, 4].map(enabled)).toEqual([
      [false, false, true],
      [false, false, true],
      [false, true, true],
      [true, false, true],
    ]);
    expect(element.querySelectorAll('.held-note')).toHaveLength(2);
    backend.verify();
  });
});
