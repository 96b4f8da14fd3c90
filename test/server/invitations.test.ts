import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { Client, OTHER, makeTestApp, signedIn, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { REPEATED_INVITATION_MS } from '../../server/auth/invitations-service';

const [owner, coach] = DEMO_SIGN_INS;
let t: TestApp;

beforeEach(async () => {
  t = await makeTestApp();
});
afterEach(async () => {
  await t.close();
});

const tokenOf = (link: string) => link.split('/').pop()!;

describe('coach invitations (owner)', () => {
  it('e-mails a single-use link; accepting creates the coach and signs them in', async () => {
    const o = await signedIn(t.app, owner.email, owner.password);
    const res = await o.post('/api/staff/invitations', { email: 'New.Coach@Larchwood-Clinic.test', name: 'Noor Pell' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ email: 'new.coach@larchwood-clinic.test', role: 'coach' });
    const link = t.mailer.lastLinkTo('new.coach@larchwood-clinic.test');
    expect(link.startsWith(`${t.config.publicUrl}/invitation/`)).toBe(true);

    const invitee = new Client(t.app);
    const preview = await invitee.get(`/api/invitations/${tokenOf(link)}`);
    expect(preview.body).toEqual({
      email: 'new.coach@larchwood-clinic.test',
      name: 'Noor Pell',
      role: 'coach',
      clinicName: 'Larchwood Running Clinic',
    });
    const accepted = await invitee.post(`/api/invitations/${tokenOf(link)}/accept`, { name: 'Noor Pell', password: 'a-long-password' });
    expect(accepted.status).toBe(201);
    expect(accepted.body.user).toMatchObject({ role: 'coach', clinicName: 'Larchwood Running Clinic' });
    expect((await invitee.get('/api/athletes')).status).toBe(200);

    const again = await new Client(t.app).post(`/api/invitations/${tokenOf(link)}/accept`, { name: 'X', password: 'a-long-password' });
    expect(again.status).toBe(410);
    expect(again.body.error.code).toBe('token_used');
  });

  it('one link used twice at the same moment: one accept and one password reset succeed, the other answers 410 token_used', async () => {
    const o = await signedIn(t.app, owner.email, owner.password);
    await o.post('/api/staff/invitations', { email: 'race@larchwood-clinic.test', name: 'Race Pair' });
    const invite = tokenOf(t.mailer.lastLinkTo('race@larchwood-clinic.test'));
    const accepts = await Promise.all(
      [1, 2].map(() => new Client(t.app).post(`/api/invitations/${invite}/accept`, { name: 'Race Pair', password: 'a-long-password' })),
    );
    expect(accepts.map((r) => r.status).sort()).toEqual([201, 410]);
    expect(accepts.find((r) => r.status === 410)!.body.error.code).toBe('token_used');
    expect(await t.db('users').where({ email: 'race@larchwood-clinic.test' })).toHaveLength(1);

    await new Client(t.app).post('/api/password-resets', { email: coach.email });
    const reset = tokenOf(t.mailer.lastLinkTo(coach.email));
    const uses = await Promise.all(
      ['first-new-password', 'second-new-password'].map((password) =>
        new Client(t.app).post(`/api/password-resets/${reset}`, { password }),
      ),
    );
    expect(uses.map((r) => r.status).sort()).toEqual([204, 410]);
    expect(uses.find((r) => r.status === 410)!.body.error.code).toBe('token_used');
  });

  it('refuses expired links (410) and unknown links (404)', async () => {
    const o = await signedIn(t.app, owner.email, owner.password);
    await o.post('/api/staff/invitations', { email: 'late@larchwood-clinic.test', name: 'Late Comer' });
    const token = tokenOf(t.mailer.lastLinkTo('late@larchwood-clinic.test'));
    t.advance(8 * 24 * 3_600_000);
    const res = await new Client(t.app).post(`/api/invitations/${token}/accept`, { name: 'Late', password: 'a-long-password' });
    expect(res.status).toBe(410);
    expect(res.body.error.code).toBe('token_expired');
    expect((await t.db('users').where({ email: 'late@larchwood-clinic.test' })).length).toBe(0);
    expect((await new Client(t.app).get(`/api/invitations/${'x'.repeat(43)}`)).status).toBe(404);
    // A link cut short or mistyped is an unknown link (the page says so), never a pattern in a 422.
    for (const bad of ['short', 'has%20space', 'x'.repeat(101)]) {
      const anon = new Client(t.app);
      expect((await anon.get(`/api/invitations/${bad}`)).status).toBe(404);
      expect((await anon.post(`/api/invitations/${bad}/accept`, { name: 'Late', password: 'a-long-password' })).status).toBe(404);
      expect((await anon.get(`/api/password-resets/${bad}`)).body.error).toEqual({ code: 'not_found', message: 'Reset link not found.' });
      expect((await anon.post(`/api/password-resets/${bad}`, { password: 'a-long-password' })).status).toBe(404);
    }
  });

  it('a new invitation to the same address revokes the earlier link', async () => {
    const o = await signedIn(t.app, owner.email, owner.password);
    await o.post('/api/staff/invitations', { email: 'twice@larchwood-clinic.test', name: 'Twice' });
    const first = tokenOf(t.mailer.lastLinkTo('twice@larchwood-clinic.test'));
    // Sent again later (Resend); the same one asked for again at once answers the first (test/server/concurrent-writes.test.ts).
    t.advance(REPEATED_INVITATION_MS + 1_000);
    await o.post('/api/staff/invitations', { email: 'twice@larchwood-clinic.test', name: 'Twice' });
    expect((await new Client(t.app).get(`/api/invitations/${first}`)).status).toBe(410);
    const staff = await o.get('/api/staff');
    expect(staff.body.invitations.filter((i: { email: string }) => i.email === 'twice@larchwood-clinic.test')).toHaveLength(1);
  });

  it('revoking makes the link unusable', async () => {
    const o = await signedIn(t.app, owner.email, owner.password);
    const inv = await o.post('/api/staff/invitations', { email: 'gone@larchwood-clinic.test', name: 'Gone' });
    expect((await o.delete(`/api/staff/invitations/${inv.body.id}`)).status).toBe(204);
    expect((await o.delete(`/api/staff/invitations/${inv.body.id}`)).status).toBe(404);
    const token = tokenOf(t.mailer.lastLinkTo('gone@larchwood-clinic.test'));
    expect((await new Client(t.app).get(`/api/invitations/${token}`)).status).toBe(410);
  });

  it('refuses an address of its own clinic that already has an account (409), bad input (422), and coaches (403)', async () => {
    const o = await signedIn(t.app, owner.email, owner.password);
    expect((await o.post('/api/staff/invitations', { email: coach.email, name: 'Dup' })).status).toBe(409);
    expect((await o.post('/api/staff/invitations', { email: 'not-an-email', name: 'X' })).status).toBe(422);
    expect((await o.post('/api/staff/invitations', { email: 'ok@x.test', name: '' })).status).toBe(422);
    expect((await o.post('/api/staff/invitations', { email: 'ok@x.test', name: 'X', role: 'owner' })).status).toBe(422);
    const c = await signedIn(t.app, coach.email, coach.password);
    expect((await c.post('/api/staff/invitations', { email: 'ok@x.test', name: 'X' })).status).toBe(403);
  });

  it('an address with an account in another clinic answers exactly as a new address; its owner gets a notice with no link', async () => {
    const o = await signedIn(t.app, owner.email, owner.password);
    const fresh = await o.post('/api/staff/invitations', { email: 'brand.new@larchwood-clinic.test', name: 'Brand New' });
    const taken = await o.post('/api/staff/invitations', { email: OTHER.coach.email, name: 'Someone' });
    expect(taken.status).toBe(fresh.status);
    expect(taken.status).toBe(201);
    expect(Object.keys(taken.body).sort()).toEqual(Object.keys(fresh.body).sort());
    expect(taken.body).toMatchObject({ email: OTHER.coach.email, name: 'Someone', role: 'coach', athleteId: null });
    // Listed and revocable like any pending invitation.
    const pending = (await o.get('/api/staff')).body.invitations as { id: number; email: string }[];
    expect(pending.map((i) => i.email)).toEqual(expect.arrayContaining(['brand.new@larchwood-clinic.test', OTHER.coach.email]));
    // The existing user is told, with nothing that grants anything: no link, no token.
    const notice = t.mailer.sent.filter((m) => m.to === OTHER.coach.email);
    expect(notice).toHaveLength(1);
    expect(notice[0]!.subject).toContain('Larchwood Running Clinic');
    expect(notice[0]!.text).toMatch(/already has a Trailframe account/);
    expect(notice[0]!.text).not.toMatch(/https?:\/\/|invitation\/|reset-password/);
    // Their account is untouched and still belongs to their clinic.
    const other = await signedIn(t.app, OTHER.coach.email, OTHER.coach.password);
    expect((await other.get('/api/auth/me')).body.user.clinicName).toBe(OTHER.clinic);
    expect((await o.delete(`/api/staff/invitations/${taken.body.id}`)).status).toBe(204);
  });

  it('an athlete whose e-mail has an account in another clinic is invited as any other athlete, and that account gets a notice', async () => {
    const c = await signedIn(t.app, coach.email, coach.password);
    const created = await c.post('/api/athletes', { firstName: 'Same', lastName: 'Address', email: OTHER.owner.email });
    const res = await c.post(`/api/athletes/${created.body.id}/invitation`);
    expect(res.status).toBe(201);
    expect((await c.get(`/api/athletes/${created.body.id}`)).body.invitationPending).toBe(true);
    const notice = t.mailer.sent.filter((m) => m.to === OTHER.owner.email);
    expect(notice).toHaveLength(1);
    expect(notice[0]!.text).not.toMatch(/https?:\/\//);
  });

  it('leaves no invitation behind when the e-mail cannot be sent', async () => {
    const o = await signedIn(t.app, owner.email, owner.password);
    t.mailer.failNext = true;
    const res = await o.post('/api/staff/invitations', { email: 'bounce@larchwood-clinic.test', name: 'Bounce' });
    expect(res.status).toBe(502);
    expect(await t.db('invitations').where({ email: 'bounce@larchwood-clinic.test' })).toHaveLength(0);
  });
});

describe('athlete invitations (coach)', () => {
  it('links the new account to the athlete, who then sees only their own record', async () => {
    const c = await signedIn(t.app, coach.email, coach.password);
    const list = (await c.get('/api/athletes')).body.athletes as { id: number; email: string; hasAccount: boolean }[];
    const teodor = list.find((a) => a.email === 'teodor.brannick@runner.test')!;
    const inv = await c.post(`/api/athletes/${teodor.id}/invitation`);
    expect(inv.status).toBe(201);
    expect((await c.get(`/api/athletes/${teodor.id}`)).body.invitationPending).toBe(true);

    const a = new Client(t.app);
    const token = tokenOf(t.mailer.lastLinkTo('teodor.brannick@runner.test'));
    const accepted = await a.post(`/api/invitations/${token}/accept`, { name: 'Teodor Brannick', password: 'knee-runner-1' });
    expect(accepted.body.user).toMatchObject({ role: 'athlete', athleteId: teodor.id });
    expect((await a.get(`/api/athletes/${teodor.id}`)).status).toBe(200);
    expect((await a.get('/api/athletes')).status).toBe(403);
    const other = list.find((x) => x.id !== teodor.id)!;
    expect((await a.get(`/api/athletes/${other.id}`)).status).toBe(404);
    expect((await c.post(`/api/athletes/${teodor.id}/invitation`)).status).toBe(409);
  });

  it('needs an e-mail on the athlete (422)', async () => {
    const c = await signedIn(t.app, coach.email, coach.password);
    const created = await c.post('/api/athletes', { firstName: 'No', lastName: 'Mail' });
    const res = await c.post(`/api/athletes/${created.body.id}/invitation`);
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/e-mail/i);
  });
});

describe('password reset', () => {
  it('answers 202 whether or not the account exists, and mails only real accounts', async () => {
    const anon = new Client(t.app);
    expect((await anon.post('/api/password-resets', { email: 'nobody@nowhere.test' })).status).toBe(202);
    expect(t.mailer.sent).toHaveLength(0);
    expect((await anon.post('/api/password-resets', { email: coach.email })).status).toBe(202);
    expect(t.mailer.sent).toHaveLength(1);
  });

  it('sets a new password once; the old one and other sessions stop working', async () => {
    const elsewhere = await signedIn(t.app, coach.email, coach.password);
    const anon = new Client(t.app);
    await anon.post('/api/password-resets', { email: coach.email });
    const token = tokenOf(t.mailer.lastLinkTo(coach.email));
    expect((await anon.get(`/api/password-resets/${token}`)).body).toEqual({ email: coach.email });
    expect((await anon.post(`/api/password-resets/${token}`, { password: 'short' })).status).toBe(422);
    expect((await anon.post(`/api/password-resets/${token}`, { password: 'a-brand-new-password' })).status).toBe(204);
    expect((await anon.post(`/api/password-resets/${token}`, { password: 'another-new-password' })).status).toBe(410);
    expect((await new Client(t.app).post('/api/auth/sign-in', { email: coach.email, password: coach.password })).status).toBe(401);
    await signedIn(t.app, coach.email, 'a-brand-new-password');
    expect((await elsewhere.get('/api/auth/me')).body).toEqual({ user: null });
  });

  it('expires after an hour', async () => {
    const anon = new Client(t.app);
    await anon.post('/api/password-resets', { email: coach.email });
    const token = tokenOf(t.mailer.lastLinkTo(coach.email));
    t.advance(61 * 60_000);
    const res = await anon.post(`/api/password-resets/${token}`, { password: 'a-brand-new-password' });
    expect(res.status).toBe(410);
    expect(res.body.error.code).toBe('token_expired');
  });
});
