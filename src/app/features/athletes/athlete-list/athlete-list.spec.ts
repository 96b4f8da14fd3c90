import { BreakpointObserver } from '@angular/cdk/layout';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { of } from 'rxjs';
import type { AthleteSummary } from '../../../../contracts/api';
import type { AthletePlanAlerts } from '../../../../contracts/plans';
import { buttonWithText, flushApiError } from '../../../shared/testing/api-errors';
import { AthleteList } from './athlete-list';

function athlete(id: number, firstName: string, lastName: string, extra: Partial<AthleteSummary> = {}): AthleteSummary {
  return {
    id,
    firstName,
    lastName,
    email: null,
    dateOfBirth: null,
    goalEvent: null,
    goalDate: null,
    coachId: null,
    coachName: null,
    hasAccount: false,
    invitationPending: false,
    videoConsent: false,
    maxPain: null,
    createdAt: '2025-01-01T00:00:00Z',
    updatedAt: '2025-02-01T00:00:00Z',
    ...extra,
  };
}

describe('AthleteList', () => {
  let fixture: ComponentFixture<AthleteList>;
  let backend: HttpTestingController;
  let element: HTMLElement;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [AthleteList],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(AthleteList);
    element = fixture.nativeElement;
    // Render and start the load; whenStable() would wait for the pending request.
    fixture.detectChanges();
  });

  afterEach(() => backend.verify());

  async function answer(athletes: AthleteSummary[], alerts: AthletePlanAlerts[] = []) {
    backend.expectOne('/api/athletes').flush({ athletes });
    for (const r of backend.match('/api/plan-alerts')) r.flush({ alerts });
    await fixture.whenStable();
  }

  const rowNames = () => [...element.querySelectorAll('tr.mat-mdc-row .row-link')].map((a) => a.textContent?.trim());

  it('shows a progress bar while loading', async () => {
    expect(element.querySelector('mat-progress-bar')).not.toBeNull();
    await answer([]);
    expect(element.querySelector('mat-progress-bar')).toBeNull();
  });

  it('a failed pain-alert check says so above the roster with Try again, and the roster still shows', async () => {
    backend.expectOne('/api/athletes').flush({ athletes: [athlete(1, 'Cleo', 'Bright')] });
    flushApiError(backend.expectOne('/api/plan-alerts'), 500, 'The database is busy.');
    await fixture.whenStable();
    expect(element.querySelector('app-error-state')?.textContent).toContain("Couldn't check the plans for pain alerts");
    expect(element.querySelector('app-error-state')?.textContent).toContain('The database is busy.');
    expect(rowNames()).toEqual(['Cleo Bright']);
    buttonWithText(element, 'Try again').click();
    await new Promise((r) => setTimeout(r, 10));
    backend.expectOne('/api/plan-alerts').flush({ alerts: [] });
    await fixture.whenStable();
    expect(element.querySelector('app-error-state')).toBeNull();
  });

  it('lists athletes sorted by last name with their account state and pain', async () => {
    await answer([
      athlete(1, 'Cleo', 'Bright', { hasAccount: true, maxPain: 6 }),
      athlete(2, 'Abel', 'Able', { invitationPending: true, videoConsent: true }),
    ]);
    expect(rowNames()).toEqual(['Abel Able', 'Cleo Bright']);
    const text = element.querySelector('table')!.textContent!;
    expect(text).toContain('Invited');
    expect(text).toContain('Active');
    expect(text).toContain('6/10');
    expect(text).toContain('Given');
  });

  it('filters the roster and explains when nothing matches', async () => {
    await answer([athlete(1, 'Cleo', 'Bright'), athlete(2, 'Abel', 'Able')]);
    const input = element.querySelector<HTMLInputElement>('input[type="search"]')!;
    input.value = 'cleo';
    input.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    expect(rowNames()).toEqual(['Cleo Bright']);
    input.value = 'nobody';
    input.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    expect(rowNames()).toEqual([]);
    expect(element.textContent).toContain('No athletes match');
  });

  it('shows a friendly empty state with an Add athlete action', async () => {
    await answer([]);
    expect(element.textContent).toContain('No athletes yet');
    expect(element.querySelector('table')).toBeNull();
  });

  it('shows an error state whose retry loads again', async () => {
    backend
      .expectOne('/api/athletes')
      .flush({ error: { code: 'internal', message: 'Roster store offline' } }, { status: 500, statusText: 'Error' });
    backend.expectOne('/api/plan-alerts').flush({ alerts: [] });
    await fixture.whenStable();
    expect(element.querySelector('app-error-state')?.textContent).toContain('Roster store offline');
    element.querySelector<HTMLButtonElement>('app-error-state button')!.click();
    fixture.detectChanges();
    await answer([athlete(1, 'Cleo', 'Bright')]);
    expect(rowNames()).toEqual(['Cleo Bright']);
  });

  it('shows a plan-alert chip linking to the plan for athletes whose pain rose', async () => {
    const alert = {
      kind: 'weekly_rise_during' as const,
      message: 'Weekly pain rising: 2 → 6 (mean pain during, week of 30 Nov → week of 7 Dec).',
      date: '2026-12-07',
      value: 6,
      limit: 2,
    };
    await answer([athlete(1, 'Cleo', 'Bright'), athlete(2, 'Abel', 'Able')], [{ athleteId: 1, planId: 9, alerts: [alert] }]);
    const chips = [...element.querySelectorAll<HTMLAnchorElement>('app-plan-alert-chip a')];
    expect(chips).toHaveLength(1);
    expect(chips[0]!.textContent).toContain('Weekly pain 2 → 6/10');
    expect(chips[0]!.getAttribute('href')).toBe('/plans/9');
    expect(chips[0]!.closest('tr')?.textContent).toContain('Cleo Bright');
  });
});

describe('AthleteList on a phone', () => {
  it('keeps the name and the highest pain, and leaves the other columns to the profile', async () => {
    TestBed.configureTestingModule({
      imports: [AthleteList],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: BreakpointObserver, useValue: { observe: () => of({ matches: true, breakpoints: {} }) } },
      ],
    });
    const backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(AthleteList);
    fixture.detectChanges();
    backend.expectOne('/api/athletes').flush({ athletes: [athlete(1, 'Ada', 'Kestrel', { maxPain: 4 })] });
    for (const r of backend.match('/api/plan-alerts')) r.flush({ alerts: [] });
    await fixture.whenStable();
    const element: HTMLElement = fixture.nativeElement;
    const headers = [...element.querySelectorAll('th')].map((th) => th.textContent?.trim());
    expect(headers).toEqual(['Name', 'Highest pain']);
    expect(element.querySelector('tr.mat-mdc-row')?.textContent).toContain('4/10');
    backend.verify();
  });
});
