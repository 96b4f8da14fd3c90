import { HttpErrorResponse } from '@angular/common/http';
import type { AthleteSummary } from '../../../contracts/api';
import { mountPage, settlePage } from '../testing/mount-page';
import { buttonWithText } from '../testing/api-errors';
import { InvitePrompt } from './invite-prompt';

const athlete: AthleteSummary = {
  id: 9,
  firstName: 'Ada',
  lastName: 'Kestrel',
  email: 'ada@runner.test',
  dateOfBirth: null,
  goalEvent: null,
  goalDate: null,
  coachId: 3,
  coachName: 'Robin Coach',
  hasAccount: false,
  invitationPending: false,
  videoConsent: true,
  maxPain: null,
  createdAt: '2026-11-01T10:00:00Z',
  updatedAt: '2026-11-01T10:00:00Z',
};

const busy = new HttpErrorResponse({
  status: 503,
  statusText: 'Service Unavailable',
  error: { error: { code: 'busy', message: 'The server is busy.' } },
});

describe('InvitePrompt', () => {
  it('offers the invitation to an athlete without an account, and nothing for one with an account', async () => {
    const { fixture, element } = mountPage(InvitePrompt, { athlete, cannot: 'see or pay this invoice online' });
    await settlePage(fixture);
    expect(element.textContent).toContain('Ada has no Trailframe account yet, so they cannot see or pay this invoice online.');
    expect(element.querySelector('app-error-note')).toBeNull();

    fixture.componentRef.setInput('athlete', { ...athlete, hasAccount: true });
    await settlePage(fixture);
    expect(element.textContent?.trim()).toBe('');
  });

  it('says when the athlete could not be loaded (so their account is unknown) and asks for them again on Try again', async () => {
    const { fixture, element } = mountPage(InvitePrompt, { athlete: null, loadError: busy, cannot: 'see this plan or log its sessions' });
    let retries = 0;
    fixture.componentInstance.retry.subscribe(() => retries++);
    await settlePage(fixture);
    const note = element.querySelector('app-error-note');
    expect(note?.getAttribute('role')).toBe('status');
    expect(note?.textContent).toContain(
      "Couldn't check whether the athlete has a Trailframe account (they need one to see this plan or log its sessions). The server is busy.",
    );
    buttonWithText(element, 'Try again').click();
    expect(retries).toBe(1);

    fixture.componentRef.setInput('loadError', undefined);
    fixture.componentRef.setInput('athlete', athlete);
    await settlePage(fixture);
    expect(element.querySelector('app-error-note')).toBeNull();
    expect(element.textContent).toContain('Ada has no Trailframe account yet');
  });

  it('shows nothing while the athlete is still loading', async () => {
    const { fixture, element } = mountPage(InvitePrompt, { athlete: null, cannot: 'see this plan or log its sessions' });
    await settlePage(fixture);
    expect(element.textContent?.trim()).toBe('');
  });
});
