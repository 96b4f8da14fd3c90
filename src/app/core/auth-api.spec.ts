import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { firstValueFrom } from 'rxjs';
import { AuthApi } from './auth-api';
import { SKIP_ERROR_SNACKBAR } from './http-context';

describe('AuthApi', () => {
  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
  });

  it('reads the user from /me, accepts { user: null } as signed out, and keeps the snackbar quiet', async () => {
    const api = TestBed.inject(AuthApi);
    const backend = TestBed.inject(HttpTestingController);
    const signedOut = firstValueFrom(api.me());
    const req = backend.expectOne('/api/auth/me');
    expect(req.request.context.get(SKIP_ERROR_SNACKBAR)).toBe(true);
    req.flush({ user: null });
    expect(await signedOut).toBeNull();
    backend.verify();
  });

  it('encodes tokens in invitation and reset paths', async () => {
    const api = TestBed.inject(AuthApi);
    const backend = TestBed.inject(HttpTestingController);
    const preview = firstValueFrom(api.previewInvitation('a/b?c'));
    backend.expectOne('/api/invitations/a%2Fb%3Fc').flush({ email: 'x@y.test', name: 'X', role: 'coach', clinicName: 'C' });
    await preview;
    backend.verify();
  });
});
