import { HttpTestingController } from '@angular/common/http/testing';
import { ComponentFixture } from '@angular/core/testing';
import { buttonWithText, flushApiError } from '../../../shared/testing/api-errors';
import { aPlan } from '../../../shared/testing/plan-fixtures';
import { PlanPage } from './plan-page';
import { mountPage, settlePage, wait } from '../../../shared/testing/mount-page';

const PLAN = aPlan();

describe('PlanPage', () => {
  let fixture: ComponentFixture<PlanPage>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  const settle = () => settlePage(fixture);

  beforeEach(async () => {
    ({ fixture, element, backend } = mountPage(PlanPage, { id: '5' }));
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
