import { HttpClient, HttpXsrfTokenExtractor, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { firstValueFrom } from 'rxjs';
import { AuthStore } from './auth-store';
import { csrfRetryInterceptor } from './csrf-retry-interceptor';

const STALE = { error: { code: 'csrf_invalid', message: 'stale token' } };

describe('csrfRetryInterceptor', () => {
  let http: HttpClient;
  let backend: HttpTestingController;
  let token: string;
  let ensureCsrf: ReturnType<typeof vi.fn>;
  let sameUser: boolean;

  beforeEach(() => {
    token = 'old-token';
    // Fetching a token sets the cookie the extractor reads.
    sameUser = true;
    ensureCsrf = vi.fn(async () => {
      token = 'fresh-token';
      return sameUser;
    });
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(withInterceptors([csrfRetryInterceptor])),
        provideHttpClientTesting(),
        { provide: AuthStore, useValue: { refreshCsrfForSameUser: ensureCsrf } },
        { provide: HttpXsrfTokenExtractor, useValue: { getToken: () => token } },
      ],
    });
    http = TestBed.inject(HttpClient);
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => backend.verify());

  const settle = () => new Promise((r) => setTimeout(r, 0));

  it('sends a refused POST once more with a fresh token, and the caller gets the second answer', async () => {
    const result = firstValueFrom(http.post('/api/plans/5/logs', { key: 'k' }));
    backend.expectOne('/api/plans/5/logs').flush(STALE, { status: 403, statusText: 'Forbidden' });
    await settle();
    expect(ensureCsrf).toHaveBeenCalledTimes(1);
    const again = backend.expectOne('/api/plans/5/logs');
    expect(again.request.headers.get('X-XSRF-TOKEN')).toBe('fresh-token');
    expect(again.request.body).toEqual({ key: 'k' });
    again.flush({ id: 1 });
    expect(await result).toEqual({ id: 1 });
  });

  it('an ended session: the second try answers 401, which reaches the caller (no third try)', async () => {
    const result = firstValueFrom(http.put('/api/athletes/2/intake', {})).catch((e: unknown) => e);
    backend.expectOne('/api/athletes/2/intake').flush(STALE, { status: 403, statusText: 'Forbidden' });
    await settle();
    backend
      .expectOne('/api/athletes/2/intake')
      .flush({ error: { code: 'unauthenticated', message: 'Sign in' } }, { status: 401, statusText: 'x' });
    expect((await result) as { status: number }).toMatchObject({ status: 401 });
  });

  it('a second 403 csrf_invalid is not retried again', async () => {
    const result = firstValueFrom(http.post('/api/x', {})).catch((e: unknown) => e);
    backend.expectOne('/api/x').flush(STALE, { status: 403, statusText: 'Forbidden' });
    await settle();
    backend.expectOne('/api/x').flush(STALE, { status: 403, statusText: 'Forbidden' });
    expect((await result) as { status: number }).toMatchObject({ status: 403 });
    expect(ensureCsrf).toHaveBeenCalledTimes(1);
  });

  it('someone else signed in on this browser meanwhile: the change is not sent in their name, the refusal reaches the caller', async () => {
    sameUser = false;
    const result = firstValueFrom(http.put('/api/clips/3/annotations', { baseRevision: 4 })).catch((e: unknown) => e);
    backend.expectOne('/api/clips/3/annotations').flush(STALE, { status: 403, statusText: 'Forbidden' });
    await settle();
    backend.expectNone('/api/clips/3/annotations');
    expect((await result) as { status: number }).toMatchObject({ status: 403 });
  });

  it('leaves other refusals and GETs alone', async () => {
    const denied = firstValueFrom(http.post('/api/x', {})).catch((e: unknown) => e);
    backend.expectOne('/api/x').flush({ error: { code: 'forbidden', message: 'No' } }, { status: 403, statusText: 'Forbidden' });
    expect((await denied) as { status: number }).toMatchObject({ status: 403 });
    const read = firstValueFrom(http.get('/api/y')).catch((e: unknown) => e);
    backend.expectOne('/api/y').flush(STALE, { status: 403, statusText: 'Forbidden' });
    expect((await read) as { status: number }).toMatchObject({ status: 403 });
    expect(ensureCsrf).not.toHaveBeenCalled();
  });
});
