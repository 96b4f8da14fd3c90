import { HttpErrorResponse } from '@angular/common/http';
import { TestBed } from '@angular/core/testing';
import { of, throwError } from 'rxjs';
import type { SessionUser } from '../../contracts/api';
import { AuthApi } from './auth-api';
import { AuthStore } from './auth-store';

const coach: SessionUser = {
  id: 2,
  email: 'coach@clinic.test',
  name: 'Test Coach',
  role: 'coach',
  clinicId: 1,
  clinicName: 'Test Clinic',
  athleteId: null,
};

describe('AuthStore', () => {
  let api: {
    me: ReturnType<typeof vi.fn>;
    csrf: ReturnType<typeof vi.fn>;
    signIn: ReturnType<typeof vi.fn>;
    signOut: ReturnType<typeof vi.fn>;
  };

  beforeEach(() => {
    api = {
      me: vi.fn(() => of(coach)),
      csrf: vi.fn(() => of(undefined)),
      signIn: vi.fn(() => of(coach)),
      signOut: vi.fn(() => of(undefined)),
    };
    TestBed.configureTestingModule({ providers: [{ provide: AuthApi, useValue: api }] });
  });

  it('loads the signed-in user and derives role, staff flag and home page', async () => {
    const store = TestBed.inject(AuthStore);
    await store.load();
    expect(store.user()).toEqual(coach);
    expect(store.role()).toBe('coach');
    expect(store.isStaff()).toBe(true);
    expect(store.homePath()).toBe('/athletes');
  });

  it('treats a 401 from /me as signed out', async () => {
    api.me.mockReturnValue(throwError(() => new HttpErrorResponse({ status: 401 })));
    const store = TestBed.inject(AuthStore);
    await store.load();
    expect(store.user()).toBeNull();
    expect(store.isSignedIn()).toBe(false);
    expect(store.homePath()).toBe('/sign-in');
  });

  it('signs in, then fetches a fresh XSRF token for the new session', async () => {
    const store = TestBed.inject(AuthStore);
    await store.signIn('coach@clinic.test', 'long enough password');
    expect(api.signIn).toHaveBeenCalledWith('coach@clinic.test', 'long enough password');
    expect(store.user()).toEqual(coach);
    expect(api.csrf).toHaveBeenCalled();
  });

  it('forgets the user on sign-out even when the server call fails', async () => {
    api.signOut.mockReturnValue(throwError(() => new HttpErrorResponse({ status: 0 })));
    const store = TestBed.inject(AuthStore);
    await store.load();
    await store.signOut();
    expect(store.user()).toBeNull();
  });

  it('knows athletes are not staff', async () => {
    api.me.mockReturnValue(of({ ...coach, role: 'athlete', athleteId: 7 }));
    const store = TestBed.inject(AuthStore);
    await store.load();
    expect(store.isStaff()).toBe(false);
    expect(store.homePath()).toBe('/portal');
  });

  it("after a stale token: a fresh one, and whether the session is still this page's user (or nobody's)", async () => {
    const store = TestBed.inject(AuthStore);
    await store.load();
    expect(await store.refreshCsrfForSameUser()).toBe(true);
    expect(api.csrf).toHaveBeenCalled();
    api.me.mockReturnValueOnce(of({ ...coach, id: 7, email: 'other@clinic.test' }));
    expect(await store.refreshCsrfForSameUser()).toBe(false);
    api.me.mockReturnValueOnce(of(null));
    expect(await store.refreshCsrfForSameUser()).toBe(true);
  });
});
