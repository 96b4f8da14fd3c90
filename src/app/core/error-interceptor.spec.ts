import { HttpClient, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, provideRouter } from '@angular/router';
import { firstValueFrom, of } from 'rxjs';
import type { SessionUser } from '../../contracts/api';
import { AuthApi } from './auth-api';
import { AuthStore } from './auth-store';
import { errorInterceptor } from './error-interceptor';
import { skipErrorSnackbar } from './http-context';

const owner: SessionUser = {
  id: 1,
  email: 'owner@clinic.test',
  name: 'Test Owner',
  role: 'owner',
  clinicId: 1,
  clinicName: 'Test Clinic',
  athleteId: null,
};

describe('errorInterceptor', () => {
  let http: HttpClient;
  let backend: HttpTestingController;
  let snackBar: { open: ReturnType<typeof vi.fn> };
  let router: Router;
  let auth: AuthStore;

  beforeEach(async () => {
    snackBar = { open: vi.fn() };
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(withInterceptors([errorInterceptor])),
        provideHttpClientTesting(),
        provideRouter([]),
        { provide: MatSnackBar, useValue: snackBar },
        { provide: AuthApi, useValue: { me: () => of(owner), csrf: () => of(undefined) } },
      ],
    });
    http = TestBed.inject(HttpClient);
    backend = TestBed.inject(HttpTestingController);
    router = TestBed.inject(Router);
    auth = TestBed.inject(AuthStore);
    await auth.load();
    vi.spyOn(router, 'url', 'get').mockReturnValue('/athletes/3');
    vi.spyOn(router, 'navigate').mockResolvedValue(true);
  });

  afterEach(() => backend.verify());

  /** Issues a GET, answers it with an error, and returns what the caller received. */
  async function failWith(url: string, status: number, body: object | null = null, options = {}) {
    const result = firstValueFrom(http.get(url, options)).catch((e: unknown) => e);
    backend.expectOne(url).flush(body, { status, statusText: 'Error' });
    return result;
  }

  it('on 401 forgets the user and goes to sign-in with the current page as returnUrl', async () => {
    const err = await failWith('/api/athletes', 401, { error: { code: 'unauthenticated', message: 'Sign in' } });
    expect(auth.user()).toBeNull();
    expect(router.navigate).toHaveBeenCalledWith(['/sign-in'], { queryParams: { returnUrl: '/athletes/3' } });
    expect(snackBar.open).toHaveBeenCalledWith(expect.stringContaining('session has ended'), 'Dismiss', expect.anything());
    expect((err as { status: number }).status).toBe(401);
  });

  it('leaves a 401 from the session probe alone', async () => {
    await failWith('/api/auth/me', 401);
    expect(router.navigate).not.toHaveBeenCalled();
    expect(snackBar.open).not.toHaveBeenCalled();
    expect(auth.user()).not.toBeNull();
  });

  it("shows the server's message for other errors and still rethrows", async () => {
    const err = await failWith('/api/staff', 500, { error: { code: 'internal', message: 'Database unavailable' } });
    expect(snackBar.open).toHaveBeenCalledWith('Database unavailable', 'Dismiss', expect.anything());
    expect(router.navigate).not.toHaveBeenCalled();
    expect((err as { status: number }).status).toBe(500);
  });

  it("says the server can't be reached on status 0", async () => {
    const result = firstValueFrom(http.get('/api/staff')).catch((e: unknown) => e);
    backend.expectOne('/api/staff').error(new ProgressEvent('error'), { status: 0 });
    await result;
    expect(snackBar.open).toHaveBeenCalledWith(expect.stringContaining("Can't reach the server"), 'Dismiss', expect.anything());
  });

  it('stays quiet for statuses the caller shows inline, but not for others', async () => {
    await failWith(
      '/api/athletes/3/intake',
      422,
      { error: { code: 'validation', message: 'Invalid' } },
      {
        context: skipErrorSnackbar(422),
      },
    );
    expect(snackBar.open).not.toHaveBeenCalled();
    await failWith('/api/athletes/3/intake', 500, null, { context: skipErrorSnackbar(422) });
    expect(snackBar.open).toHaveBeenCalledTimes(1);
  });
});
