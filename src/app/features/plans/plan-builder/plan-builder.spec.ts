import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatDialog } from '@angular/material/dialog';
import { provideRouter } from '@angular/router';
import { Subject } from 'rxjs';
import type { AthleteDetail } from '../../../../contracts/api';
import type { Exercise } from '../../../../contracts/plans';
import type { ExercisePickerData } from '../exercise-picker/exercise-picker';
import { PlanBuilder } from './plan-builder';

const wait = (ms: number) => new Promise((r) => setTimeout(r, ms));

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
    TestBed.configureTestingModule({
      imports: [PlanBuilder],
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), { provide: MatDialog, useValue: dialog }],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PlanBuilder);
    fixture.componentRef.setInput('athlete', '4');
    element = fixture.nativeElement;
    fixture.detectChanges();
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
