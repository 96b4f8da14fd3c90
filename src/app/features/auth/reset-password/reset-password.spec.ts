import { TestBed } from '@angular/core/testing';
import { Router } from '@angular/router';
import type { SessionUser } from '../../../../contracts/api';
import { AuthStore } from '../../../core/auth-store';
import { mountPage, settlePage, type MountedPage } from '../../../shared/testing/mount-page';
import { ResetPassword } from './reset-password';

const TOKEN = 'T'.repeat(43);
const coach: SessionUser = {
  id: 2,
  email: 'coach@clinic.test',
  name: 'Test Coach',
  role: 'coach',
  clinicId: 1,
  clinicName: 'Test Clinic',
  athleteId: null,
};

describe('ResetPassword', () => {
  let page: MountedPage<ResetPassword>;

  beforeEach(async () => {
    page = mountPage(ResetPassword, { token: TOKEN });
    page.backend.expectOne(`/api/password-resets/${TOKEN}`).flush({ email: coach.email });
    await settlePage(page.fixture);
  });

  afterEach(() => page.backend.verify());

  function type(name: string, value: string) {
    const input = page.element.querySelector<HTMLInputElement>(`input[formcontrolname="${name}"]`)!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
  }

  it('in a browser signed in to the same account: after the reset it knows the session ended, so the sign-in page opens with the success message', async () => {
    const auth = TestBed.inject(AuthStore);
    const signingIn = auth.setUser(coach);
    page.backend.expectOne('/api/auth/csrf').flush({ token: 't' });
    await signingIn;
    const router = TestBed.inject(Router);
    const navigate = vi.spyOn(router, 'navigateByUrl').mockResolvedValue(true);
    type('password', 'a-new-long-passphrase');
    type('confirm', 'a-new-long-passphrase');
    page.element.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
    await settlePage(page.fixture);
    page.backend.expectOne(`/api/password-resets/${TOKEN}`).flush(null, { status: 204, statusText: 'No Content' });
    await settlePage(page.fixture);
    // The reset ended this browser's session too: the app asks, and forgets the user before leaving.
    page.backend.expectOne('/api/auth/me').flush({ user: null });
    await settlePage(page.fixture);
    expect(auth.user()).toBeNull();
    expect(navigate).toHaveBeenCalledWith('/sign-in');
  });
});
