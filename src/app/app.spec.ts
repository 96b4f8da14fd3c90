import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter, withComponentInputBinding } from '@angular/router';
import { of, throwError } from 'rxjs';
import { HttpErrorResponse } from '@angular/common/http';
import type { SessionUser } from '../contracts/api';
import { App } from './app';
import { routes } from './app.routes';
import { AuthApi } from './core/auth-api';
import { AuthStore } from './core/auth-store';
import { ConfigStore } from './core/config-store';
import { AssessmentsApi } from './core/data/assessments-api';
import { PlansApi } from './core/data/plans-api';
import { StillsApi } from './core/data/stills-api';
import { BillingApi } from './core/data/billing-api';
import { ClinicBrandStore } from './core/data/clinic-brand-store';
import { AnnotatedClipsApi } from './core/data/annotated-clips-api';
import { provideIsoDateAdapter } from './shared/iso-date-adapter';

const athlete: SessionUser = {
  id: 11,
  email: 'runner@clinic.test',
  name: 'Sam Runner',
  role: 'athlete',
  clinicId: 1,
  clinicName: 'Test Clinic',
  athleteId: 5,
};

async function boot(user: SessionUser | null, url: string, demoMode = false) {
  TestBed.configureTestingModule({
    providers: [
      provideRouter(routes, withComponentInputBinding()),
      provideHttpClient(),
      provideHttpClientTesting(),
      provideIsoDateAdapter(),
      {
        provide: AuthApi,
        useValue: {
          me: () => (user ? of(user) : throwError(() => new HttpErrorResponse({ status: 401 }))),
          csrf: () => of(undefined),
        },
      },
      {
        provide: ConfigStore,
        useValue: { demoMode: signal(demoMode), version: signal('test'), demoInboxUrl: signal(demoMode ? 'http://127.0.0.1:2580' : null) },
      },
      // The portal home lists the athlete's assessments; none here.
      { provide: AssessmentsApi, useValue: { list: () => of([]) } },
      // …and the athlete's plan card; no plan here.
      { provide: PlansApi, useValue: { plansOf: () => of([]) } },
      // …what the clinic shared with them; nothing yet.
      { provide: StillsApi, useValue: { portalShared: () => of({ stills: [], summaries: [] }) } },
      // …the annotated clips shared with them; none.
      { provide: AnnotatedClipsApi, useValue: { clipsOf: () => of([]) } },
      // The shell's clinic letterhead: no logo.
      { provide: ClinicBrandStore, useValue: { brand: signal(null), logoUrl: signal(null) } },
      // …and what they owe; nothing.
      {
        provide: BillingApi,
        useValue: {
          invoices: () =>
            of({ invoices: [], totals: { currency: 'EUR', count: 0, totalMinor: 0, outstandingMinor: 0, paidMinor: 0, refundedMinor: 0 } }),
        },
      },
    ],
  });
  await TestBed.inject(AuthStore).load();
  const fixture = TestBed.createComponent(App);
  await TestBed.inject(Router).navigateByUrl(url);
  await fixture.whenStable();
  return { fixture, element: fixture.nativeElement as HTMLElement, router: TestBed.inject(Router) };
}

describe('App', () => {
  it('shows the sign-in page to a signed-out visitor who opens /', async () => {
    const { element, router } = await boot(null, '/');
    expect(router.url).toBe('/sign-in');
    expect(element.querySelector('h1')?.textContent).toContain('Sign in');
    expect(element.querySelector('app-shell')).toBeNull();
    expect(element.textContent).toContain('Forgot password?');
  });

  it('puts a signed-in athlete in the shell on their portal home with their own navigation', async () => {
    const { element, router } = await boot(athlete, '/');
    expect(router.url).toBe('/portal');
    expect(element.querySelector('app-shell')).not.toBeNull();
    expect(element.querySelector('.top-bar')?.textContent).toContain('Trailframe');
    expect(element.querySelector('.top-bar')?.textContent).toContain('Test Clinic');
    const nav = [...element.querySelectorAll('nav[aria-label="Main"] [matListItemTitle]')].map((a) => a.textContent?.trim());
    expect(nav).toEqual(['Home', 'My plan', 'My invoices', 'My profile', 'Account']);
    expect(element.querySelector('h1')?.textContent).toContain('Welcome, Sam');
    expect(element.textContent).toContain('Your assessments');
    TestBed.inject(HttpTestingController).verify();
  });

  it('shows the demo sign-in note and where the demo inbox is, only in demo mode', async () => {
    const { element } = await boot(null, '/sign-in', true);
    expect(element.textContent).toContain('Demo sign-ins are printed by npm start');
    expect(element.querySelector('a[href="http://127.0.0.1:2580"]')?.textContent).toContain('http://127.0.0.1:2580');
    TestBed.resetTestingModule();
    const off = await boot(null, '/sign-in', false);
    expect(off.element.textContent).not.toContain('demo inbox');
  });

  it('answers unknown addresses with a not-found page once signed in', async () => {
    const { element } = await boot(athlete, '/no/such/page');
    expect(element.querySelector('h1')?.textContent).toContain('Page not found');
  });

  it('asks signed-out visitors to sign in first, remembering where they were going', async () => {
    const { router } = await boot(null, '/athletes/4');
    expect(router.url).toBe('/sign-in?returnUrl=%2Fathletes%2F4');
  });
});
