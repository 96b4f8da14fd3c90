import { HttpTestingController } from '@angular/common/http/testing';
import { ComponentFixture } from '@angular/core/testing';
import { MatDialog } from '@angular/material/dialog';
import { Subject } from 'rxjs';
import type { AthleteDetail } from '../../../../contracts/api';
import type { Exercise } from '../../../../contracts/plans';
import type { ExercisePickerData } from '../exercise-picker/exercise-picker';
import { buttonWithText, flushApiError } from '../../../shared/testing/api-errors';
import { PlanBuilder } from './plan-builder';
import { mountPage, settlePage, wait } from '../../../shared/testing/mount-page';

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
