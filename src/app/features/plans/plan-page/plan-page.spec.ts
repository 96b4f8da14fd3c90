import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { DEFAULT_PAIN_RULE, type PlanDetail } from '../../../../contracts/plans';
import { buttonWithText, flushApiError } from '../../../shared/testing/api-errors';
import { PlanPage } from './plan-page';

const wait = (ms: number) => new Promise((r) => setTimeout(r, ms));

const PLAN = {
  id: 5,
  athleteId: 4,
  title: 'Hamstring strain: staged loading',
  status: 'draft',
  assessmentId: null,
  assessmentDate: null,
  stageCount: 1,
  currentStageId: null,
  currentStageName: null,
  currentStagePosition: null,
  alerts: [],
  startedAt: null,
  finishedAt: null,
  createdAt: '2026-11-01T10:00:00Z',
  updatedAt: '2026-11-01T10:00:00Z',
  notes: null,
  revision: 1,
  painRule: DEFAULT_PAIN_RULE,
  stages: [
    {
      id: 31,
      position: 1,
      name: 'Isometric holds',
      goal: 'Calm',
      targetWeeks: 2,
      progressionText: 'When calm',
      criteria: [],
      exercises: [],
      sessionsPerWeek: 0,
      startedAt: null,
      completedAt: null,
    },
  ],
} as unknown as PlanDetail;

describe('PlanPage', () => {
  let fixture: ComponentFixture<PlanPage>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  const settle = async () => {
    await wait(20);
    fixture.detectChanges();
    await wait(10);
    fixture.detectChanges();
  };

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [PlanPage],
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([])],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PlanPage);
    fixture.componentRef.setInput('id', '5');
    element = fixture.nativeElement;
    fixture.detectChanges();
    await wait(10);
  });
  afterEach(() => backend.verify());

  it('a plan that cannot be found says so, without Try again, and the loading bar ends', async () => {
    flushApiError(backend.expectOne('/api/plans/5'), 404, 'Plan not found.');
    await settle();
    expect(element.querySelector('mat-progress-bar')).toBeNull();
    expect(element.textContent).toContain('There is no plan at this address in your clinic.');
  });

  it('a log that fails to load says why with Try again instead of "No sessions logged yet"', async () => {
    backend.expectOne('/api/plans/5').flush(PLAN);
    await settle();
    backend.expectOne('/api/athletes/4').flush({ id: 4, firstName: 'Ada', lastName: 'Kestrel', hasAccount: true });
    flushApiError(backend.expectOne('/api/plans/5/progress'), 500, 'The database is busy.');
    flushApiError(backend.expectOne('/api/plans/5/logs'), 500, 'The database is busy.');
    await settle();
    const log = element.querySelector('section.log')!;
    expect(log.textContent).toContain("Couldn't load the log");
    expect(log.textContent).toContain('The database is busy.');
    expect(log.textContent).not.toContain('No sessions logged yet');
    expect(element.querySelector('section.progress')!.textContent).toContain("Couldn't load the progress");

    buttonWithText(log as HTMLElement, 'Try again').click();
    await settle();
    backend.expectOne('/api/plans/5/logs').flush({ logs: [] });
    await settle();
    expect(log.textContent).toContain('No sessions logged yet');
  });
});
