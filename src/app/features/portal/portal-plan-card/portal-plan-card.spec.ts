import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { LogOutbox } from '../../../core/data/log-outbox';
import { PortalPlanCard } from './portal-plan-card';

const wait = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe('PortalPlanCard', () => {
  let fixture: ComponentFixture<PortalPlanCard>;
  let element: HTMLElement;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [PortalPlanCard],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([]),
        { provide: LogOutbox, useValue: { items: signal([]), pending: signal([]) } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PortalPlanCard);
    fixture.componentRef.setInput('athleteId', 4);
    element = fixture.nativeElement;
    fixture.detectChanges();
    await wait(10);
  });
  afterEach(() => backend.verify());

  it('the plan failing to load says so on the card and still links to the plan page (which offers Try again)', async () => {
    backend.expectOne('/api/athletes/4/plans').error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
    await wait(20);
    fixture.detectChanges();
    expect(element.querySelector('[role="alert"]')?.textContent).toContain("Couldn't load your plan just now: Can't reach the server");
    expect(element.querySelector('a[href="/portal/plan"]')?.textContent).toContain('Open my plan');
  });
});
