import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatDialog } from '@angular/material/dialog';
import { provideRouter } from '@angular/router';
import { of } from 'rxjs';
import type { AthleteDataOverview } from '../../../../contracts/privacy';
import { provideFakeEventSource } from '../../../core/fake-event-source';
import { AthleteData } from './athlete-data';
import { flushApiError, buttonWithText } from '../../../shared/testing/api-errors';

const overview = (over: Partial<AthleteDataOverview> = {}): AthleteDataOverview => ({
  athleteId: 7,
  fullName: 'Test Runner',
  videoConsent: false,
  shareConsent: true,
  videoWithdrawnAt: '2026-11-02T09:00:00.000Z',
  clipCount: 3,
  clipBytes: 3 * 1024 * 1024,
  keptInvoiceCount: 0,
  ...over,
});

describe('AthleteData', () => {
  let fixture: ComponentFixture<AthleteData>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  function open(): void {
    TestBed.configureTestingModule({
      imports: [AthleteData],
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), provideFakeEventSource()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(AthleteData);
    fixture.componentRef.setInput('athleteId', 7);
    element = fixture.nativeElement;
    fixture.detectChanges();
  }
  const settle = async () => {
    await new Promise((r) => setTimeout(r, 20));
    fixture.detectChanges();
  };
  afterEach(() => {
    backend.verify();
    document.querySelector('.cdk-overlay-container')?.replaceChildren();
  });

  it('shows a loading bar while the overview is read', async () => {
    open();
    await settle();
    expect(element.querySelector('mat-progress-bar[aria-label="Loading the athlete\'s data"]')).not.toBeNull();
    backend.expectOne('/api/athletes/7/data').flush(overview());
    await settle();
    backend.expectOne('/api/athletes/7/data-exports').flush({ exports: [] });
    await settle();
    expect(element.querySelector('mat-progress-bar')).toBeNull();
    expect(element.textContent).toContain('Consent to video withdrawn');
  });

  it("gives the server's reason when the overview cannot be loaded, and Try again reads it again", async () => {
    open();
    flushApiError(backend.expectOne('/api/athletes/7/data'), 404, 'No such athlete in this clinic.');
    await settle();
    const alert = element.querySelector('[role="alert"]')!;
    expect(alert.textContent).toContain("Couldn't load the athlete's data");
    expect(alert.textContent).toContain('No such athlete in this clinic.');
    alert.querySelector('button')!.click();
    await settle();
    backend.expectOne('/api/athletes/7/data').flush(overview({ videoWithdrawnAt: null }));
    await settle();
    backend.expectOne('/api/athletes/7/data-exports').flush({ exports: [] });
    expect(element.querySelector('app-error-state')).toBeNull();
  });

  it('says by the notice why erasing the clips failed, and keeps the clips listed', async () => {
    open();
    backend.expectOne('/api/athletes/7/data').flush(overview());
    await settle();
    backend.expectOne('/api/athletes/7/data-exports').flush({ exports: [] });
    vi.spyOn(TestBed.inject(MatDialog), 'open').mockReturnValue({ afterClosed: () => of(true) } as never);
    const erase = buttonWithText(element, 'Erase clips only');
    erase.click();
    await settle();
    expect(element.querySelector('mat-progress-bar[aria-label="Erasing the clips"]')).not.toBeNull();
    flushApiError(backend.expectOne('/api/athletes/7/clips/erasure'), 409, 'A clip is being processed; try again when it is done.');
    await settle();
    const alert = element.querySelector('.notice [role="alert"]')!;
    expect(alert.textContent).toContain("Couldn't erase the clips: A clip is being processed; try again when it is done.");
    expect(element.textContent).toContain('holds 3 clips');
    expect(erase.disabled).toBe(false);
  });
});
