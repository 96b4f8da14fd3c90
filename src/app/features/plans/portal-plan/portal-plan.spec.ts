import { HttpTestingController } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { ComponentFixture } from '@angular/core/testing';
import { Subject } from 'rxjs';
import { AuthStore } from '../../../core/auth-store';
import { LogOutbox } from '../../../core/data/log-outbox';
import { logItem, type OutboxItem } from '../../../core/data/log-outbox-queue';
import type { LogWrite } from '../../../../contracts/plans';
import { provideIsoDateAdapter } from '../../../shared/iso-date-adapter';
import { buttonWithText, flushApiError } from '../../../shared/testing/api-errors';
import { aPlan } from '../../../shared/testing/plan-fixtures';
import { PortalPlan } from './portal-plan';
import { mountPage, settlePage, wait } from '../../../shared/testing/mount-page';

const PLAN = aPlan({
  status: 'active',
  currentStageId: 31,
  currentStageName: 'Isometric holds',
  currentStagePosition: 1,
  startedAt: '2026-11-01T10:00:00Z',
});
PLAN.stages[0]!.startedAt = '2026-11-01T10:00:00Z';
const { notes: _notes, revision: _revision, painRule: _painRule, stages: _stages, ...SUMMARY } = PLAN;

describe('PortalPlan', () => {
  let fixture: ComponentFixture<PortalPlan>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  const settle = () => settlePage(fixture);

  beforeEach(async () => {
    const items = signal<OutboxItem[]>([]);
    const outbox = {
      items,
      pending: signal([]),
      refused: signal([]),
      delivered: new Subject(),
      refusals: new Subject(),
      submitLog: (planId: number, body: LogWrite) => items.update((list) => [...list, logItem(planId, body, Date.now())]),
    };
    ({ fixture, element, backend } = mountPage(PortalPlan, {}, [
      provideIsoDateAdapter(),
      { provide: AuthStore, useValue: { user: signal({ id: 9, role: 'athlete', athleteId: 4, name: 'Ada Kestrel' }) } },
      { provide: LogOutbox, useValue: outbox },
    ]));
    await wait(10);
  });
  afterEach(() => backend.verify());

  it('a plan list that fails to load says why with Try again, and the loading bar ends', async () => {
    flushApiError(backend.expectOne('/api/athletes/4/plans'), 503, 'The server is starting up.');
    await settle();
    expect(element.querySelector('mat-progress-bar')).toBeNull();
    expect(element.textContent).toContain("Couldn't load your plan");
    expect(element.textContent).toContain('The server is starting up.');
  });

  it('a log that fails to load says why with Try again, not "Your sessions appear here once you save them"', async () => {
    backend.expectOne('/api/athletes/4/plans').flush({ plans: [SUMMARY] });
    await settle();
    backend.expectOne('/api/plans/5').flush(PLAN);
    flushApiError(backend.expectOne('/api/plans/5/logs'), 500, 'The database is busy.');
    await settle();
    const history = element.querySelector<HTMLElement>('section.history')!;
    expect(history.textContent).toContain("Couldn't load your log");
    expect(history.textContent).toContain('The database is busy.');
    expect(history.textContent).not.toContain('Your sessions appear here');

    buttonWithText(history, 'Try again').click();
    await settle();
    backend.expectOne('/api/plans/5/logs').flush({ logs: [] });
    await settle();
    expect(history.textContent).toContain('Your sessions appear here once you save them.');
  });

  it('focus moves to "Done for today" after saving, and to the session heading on "Log another session", never to the page body', async () => {
    backend.expectOne('/api/athletes/4/plans').flush({ plans: [SUMMARY] });
    await settle();
    backend.expectOne('/api/plans/5').flush(PLAN);
    backend.expectOne('/api/plans/5/logs').flush({ logs: [] });
    await settle();
    element.querySelector<HTMLElement>('[aria-label="Pain during 2 out of 10"]')!.click();
    buttonWithText(element, 'Save session').click();
    await settle();
    // The heading itself, not the page body (whose text holds every heading).
    expect(document.activeElement?.tagName).toBe('H2');
    expect(document.activeElement?.textContent).toContain('Done for today');

    buttonWithText(element, 'Log another session').click();
    await settle();
    expect(document.activeElement?.tagName).toBe('H2');
    expect(document.activeElement?.textContent).toContain("Today's session: Isometric holds");
  });
});
