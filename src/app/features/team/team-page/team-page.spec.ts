import { signal } from '@angular/core';
import { AuthStore } from '../../../core/auth-store';
import { leaveGuard } from '../../../core/leave-guard';
import { buttonWithText, flushApiError } from '../../../shared/testing/api-errors';
import { mountPage, settlePage, typeInto } from '../../../shared/testing/mount-page';
import { TeamPage } from './team-page';

describe('TeamPage', () => {
  it('warns before leaving a typed invitation; a refused one keeps what was typed and says why; a sent one clears it', async () => {
    const { fixture, element, backend } = mountPage(TeamPage, {}, [{ provide: AuthStore, useValue: { user: signal({ id: 1 }) } }]);
    backend.expectOne('/api/staff').flush({ staff: [], invitations: [] });
    await settlePage(fixture);
    const page = fixture.componentInstance;
    expect(page.leaveWarning()).toBeNull();
    const type = (name: string, value: string) => typeInto(element, name, value);
    type('name', 'Robin Coach');
    type('email', 'robin@clinic.test');
    await settlePage(fixture);
    expect(page.leaveWarning()?.title).toBe('Leave without saving?');

    buttonWithText(element, 'Send invitation').click();
    flushApiError(backend.expectOne('/api/staff/invitations'), 409, 'Someone with this e-mail address is already on the team.');
    await settlePage(fixture);
    expect(element.querySelector<HTMLInputElement>('input[formcontrolname="email"]')!.value).toBe('robin@clinic.test');
    expect(element.textContent).toContain('Someone with this e-mail address is already on the team.');
    expect(page.leaveWarning()).not.toBeNull();

    type('email', 'robin2@clinic.test');
    buttonWithText(element, 'Send invitation').click();
    backend
      .expectOne('/api/staff/invitations')
      .flush({ id: 5, name: 'Robin Coach', email: 'robin2@clinic.test', expiresAt: '2026-12-20T10:00:00Z' });
    await settlePage(fixture);
    expect(page.leaveWarning()).toBeNull();
    backend.verify();
  });

  it('is guarded against leaving with unsaved work', async () => {
    expect((await import('../team.routes')).default[0].canDeactivate).toEqual([leaveGuard]);
  });
});
