import { ChangeDetectionStrategy, Component, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { of } from 'rxjs';
import type { Role, SessionUser } from '../../contracts/api';
import { AuthApi } from './auth-api';
import { anonymousOnlyGuard, redirectHome, roleGuard, signedInGuard } from './auth-guards';
import { AuthStore } from './auth-store';
import { ConfigStore } from './config-store';

@Component({ template: 'page', changeDetection: ChangeDetectionStrategy.OnPush })
class Page {}

function userWith(role: Role): SessionUser {
  return {
    id: 1,
    email: `${role}@clinic.test`,
    name: 'Test User',
    role,
    clinicId: 1,
    clinicName: 'Test Clinic',
    athleteId: role === 'athlete' ? 5 : null,
  };
}

async function setUp(role: Role | null, demoMode = false): Promise<RouterTestingHarness> {
  TestBed.configureTestingModule({
    providers: [
      {
        provide: AuthApi,
        useValue: { me: () => of(role ? userWith(role) : null), csrf: () => of(undefined) },
      },
      { provide: ConfigStore, useValue: { demoMode: signal(demoMode) } },
      provideRouter([
        { path: 'sign-in', canActivate: [anonymousOnlyGuard], component: Page },
        {
          path: '',
          canMatch: [signedInGuard],
          children: [
            { path: '', pathMatch: 'full', redirectTo: redirectHome },
            { path: 'athletes', canMatch: [roleGuard('owner', 'coach')], component: Page },
            { path: 'team', canMatch: [roleGuard('owner')], component: Page },
            { path: 'portal', canMatch: [roleGuard('athlete')], component: Page },
          ],
        },
      ]),
    ],
  });
  if (role) await TestBed.inject(AuthStore).load();
  return RouterTestingHarness.create();
}

async function land(harness: RouterTestingHarness, url: string): Promise<string> {
  await harness.navigateByUrl(url);
  return TestBed.inject(Router).url;
}

describe('route guards', () => {
  it('sends signed-out visitors to sign-in with the page they wanted', async () => {
    const harness = await setUp(null);
    expect(await land(harness, '/athletes?page=2')).toBe('/sign-in?returnUrl=%2Fathletes%3Fpage%3D2');
  });

  it('sends signed-out visitors of / to sign-in without a returnUrl', async () => {
    const harness = await setUp(null);
    expect(await land(harness, '/')).toBe('/sign-in');
  });

  it('redirects / by role: athletes to the portal, staff to the roster', async () => {
    expect(await land(await setUp('athlete'), '/')).toBe('/portal');
    TestBed.resetTestingModule();
    expect(await land(await setUp('coach'), '/')).toBe('/athletes');
  });

  it('lets a role into its own pages', async () => {
    const harness = await setUp('owner');
    expect(await land(harness, '/team')).toBe('/team');
    expect(await land(harness, '/athletes')).toBe('/athletes');
  });

  it('sends a role away from pages it may not use, to its own home', async () => {
    const coach = await setUp('coach');
    expect(await land(coach, '/team')).toBe('/athletes');
    expect(await land(coach, '/portal')).toBe('/athletes');
    TestBed.resetTestingModule();
    const athlete = await setUp('athlete');
    expect(await land(athlete, '/athletes')).toBe('/portal');
  });

  it('keeps signed-in users off the sign-in page', async () => {
    expect(await land(await setUp('athlete'), '/sign-in')).toBe('/portal');
  });
});
