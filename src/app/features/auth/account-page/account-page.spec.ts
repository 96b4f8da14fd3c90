import { TestBed } from '@angular/core/testing';
import type { SessionUser } from '../../../../contracts/api';
import { AuthStore } from '../../../core/auth-store';
import { mountPage, settlePage, type MountedPage } from '../../../shared/testing/mount-page';
import { AccountPage } from './account-page';

const athlete: SessionUser = {
  id: 7,
  email: 'sam@runner.test',
  name: 'Sam Runner',
  role: 'athlete',
  clinicId: 1,
  clinicName: 'Test Clinic',
  athleteId: 3,
};

describe('AccountPage', () => {
  let page: MountedPage<AccountPage>;

  beforeEach(async () => {
    page = mountPage(AccountPage, {});
    const auth = TestBed.inject(AuthStore);
    const signedIn = auth.setUser(athlete);
    page.backend.expectOne('/api/auth/csrf').flush({ token: 't' });
    await signedIn;
    await settlePage(page.fixture);
  });

  afterEach(() => page.backend.verify());

  const input = (name: string) => page.element.querySelector<HTMLInputElement>(`input[name="${name}"]`)!;
  function type(name: string, value: string) {
    input(name).value = value;
    input(name).dispatchEvent(new Event('input'));
  }
  const fieldError = (name: string) => input(name).closest('mat-form-field')?.querySelector('mat-error')?.textContent?.trim() ?? '';
  const submit = async () => {
    page.element.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
    await settlePage(page.fixture);
  };
  const fillIn = (current: string, next: string, repeat = next) => {
    type('currentPassword', current);
    type('password', next);
    type('confirm', repeat);
  };

  it('shows who is signed in', () => {
    expect(page.element.querySelector('h1')?.textContent).toContain('Account');
    expect(page.element.textContent).toContain('sam@runner.test');
    expect(page.element.textContent).toContain('Athlete · Test Clinic');
  });

  it('says beside each field what is missing, too short or not repeated, and sends nothing', async () => {
    fillIn('', 'short', 'other');
    await submit();
    expect(fieldError('currentPassword')).toBe('Current password is required');
    expect(fieldError('password')).toMatch(/at least \d+ characters/);
    expect(fieldError('confirm')).toBe('The passwords do not match');
    page.backend.expectNone('/api/auth/password');
  });

  it('shows and hides each password', async () => {
    type('currentPassword', 'secret words');
    const toggle = page.element.querySelector<HTMLButtonElement>('button[aria-label="Show current password"]')!;
    toggle.click();
    await settlePage(page.fixture);
    expect(input('currentPassword').type).toBe('text');
    expect(toggle.getAttribute('aria-pressed')).toBe('true');
    expect(input('password').type).toBe('password');
    toggle.click();
    await settlePage(page.fixture);
    expect(input('currentPassword').type).toBe('password');
  });

  it('puts a wrong current password beside that field and keeps everything typed', async () => {
    fillIn('not my password', 'a-new-long-passphrase');
    await submit();
    const req = page.backend.expectOne('/api/auth/password');
    expect(req.request.body).toEqual({ currentPassword: 'not my password', newPassword: 'a-new-long-passphrase' });
    const message = 'That is not your current password.';
    req.flush(
      { error: { code: 'wrong_password', message, details: [{ path: ['currentPassword'], message }] } },
      { status: 422, statusText: 'x' },
    );
    await settlePage(page.fixture);
    expect(fieldError('currentPassword')).toBe(message);
    expect(input('currentPassword').value).toBe('not my password');
    expect(input('password').value).toBe('a-new-long-passphrase');
    expect(input('confirm').value).toBe('a-new-long-passphrase');
    expect(page.element.querySelector('[role="status"]')).toBeNull();
  });

  it('puts the server’s word on the new password beside the new-password field', async () => {
    fillIn('same-old-passphrase', 'same-old-passphrase');
    await submit();
    const message = 'Choose a new password that differs from your current one.';
    page.backend
      .expectOne('/api/auth/password')
      .flush(
        { error: { code: 'same_password', message, details: [{ path: ['newPassword'], message }] } },
        { status: 422, statusText: 'x' },
      );
    await settlePage(page.fixture);
    expect(fieldError('password')).toBe(message);
    expect(page.element.querySelector('[role="alert"]')).toBeNull();
  });

  it('shows a refusal of no field (too many attempts) above the form, keeping what was typed', async () => {
    fillIn('guess', 'a-new-long-passphrase');
    await submit();
    const message = 'Too many failed sign-ins for this account. Try again in a minute, or reset your password.';
    page.backend.expectOne('/api/auth/password').flush({ error: { code: 'too_many_attempts', message } }, { status: 429, statusText: 'x' });
    await settlePage(page.fixture);
    expect(page.element.querySelector('[role="alert"]')?.textContent).toContain(message);
    expect(input('currentPassword').value).toBe('guess');
  });

  it('after a change: says so, empties the form and keeps the user signed in', async () => {
    fillIn('old-passphrase', 'a-new-long-passphrase');
    await submit();
    page.backend.expectOne('/api/auth/password').flush({ user: athlete });
    await settlePage(page.fixture);
    page.backend.expectOne('/api/auth/csrf').flush({ token: 'fresh' });
    await settlePage(page.fixture);
    expect(page.element.querySelector('[role="status"]')?.textContent).toContain('Your password is changed');
    expect(input('currentPassword').value).toBe('');
    expect(input('password').value).toBe('');
    expect(fieldError('currentPassword')).toBe('');
    expect(TestBed.inject(AuthStore).user()).toEqual(athlete);
  });
});
