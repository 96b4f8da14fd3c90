/**
 * Who gets a share notice (`server/mail/share-notice.ts`): only an athlete with an account in the
 * clinic and an e-mail address, through nodemailer to the local SMTP receiver, with nothing of the
 * shared item in it. An address alone is not an account — not even when the same address has an
 * account in another clinic.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import pino from 'pino';
import { makeTestApp, OTHER, type TestApp } from '../support/test-app';
import { sendShareNotice } from '../../server/mail/share-notice';
import { DEMO_CLINIC_NAME, DEMO_SIGN_INS } from '../../seeds/demo-scenario';

const athlete = DEMO_SIGN_INS[3];
let t: TestApp;
let logs: { msg: string; athleteId?: number }[];

beforeEach(async () => {
  t = await makeTestApp();
  logs = [];
});
afterEach(async () => {
  await t.close();
});

const deps = () => ({
  db: t.db,
  mailer: t.mailer,
  logger: pino({ level: 'info' }, { write: (line: string) => void logs.push(JSON.parse(line)) }),
  publicUrl: 'http://app.test',
});
/** What the SMTP receiver stored for `to`. */
const received = (to: string) => t.db('mailbox_messages').where('to_address', 'like', `%${to}%`).select('subject', 'text');

async function athleteRow(where: Record<string, unknown>) {
  return t.db('athletes').where(where).first<{ id: number; email: string | null; user_id: number | null; clinic_id: number }>();
}

describe('share notices', () => {
  it('reach an athlete with an account: one message to their address, naming their clinic, linking to the portal', async () => {
    const a = await athleteRow({ email: athlete.email });
    expect(a?.user_id).not.toBeNull();
    expect(await sendShareNotice(deps(), a!.id, 'summary')).toBe(true);
    const mail = await received(athlete.email);
    expect(mail).toHaveLength(1);
    expect(mail[0]!.subject).toBe(`${DEMO_CLINIC_NAME} shared something with you on Trailframe`);
    expect(mail[0]!.text).toContain(`${DEMO_CLINIC_NAME} has shared a visit summary with you.`);
    expect(mail[0]!.text).toContain('Sign in to see it: http://app.test/portal');
  });

  it('do not go to an athlete with an e-mail address but no account', async () => {
    const a = await t.db('athletes').whereNull('user_id').whereNotNull('email').first<{ id: number; email: string }>();
    expect(a).toBeDefined();
    expect(await sendShareNotice(deps(), a!.id, 'still')).toBe(false);
    expect(await received(a!.email)).toEqual([]);
    expect(await t.db('mailbox_messages').count({ n: '*' }).first()).toEqual({ n: 0 });
    expect(logs).toContainEqual(expect.objectContaining({ msg: 'share notice not sent: athlete has no account', athleteId: a!.id }));
  });

  it('do not go to an athlete without an e-mail address', async () => {
    const a = await t.db('athletes').whereNull('email').first<{ id: number }>();
    expect(a).toBeDefined();
    expect(await sendShareNotice(deps(), a!.id, 'still')).toBe(false);
    expect(await t.db('mailbox_messages').count({ n: '*' }).first()).toEqual({ n: 0 });
  });

  it('do not go to an athlete without an account whose address has an account in another clinic', async () => {
    // The demo clinic records an athlete under the other clinic's athlete's address, without an account here.
    const demo = await athleteRow({ email: athlete.email });
    const [row] = await t
      .db('athletes')
      .insert({
        clinic_id: demo!.clinic_id,
        first_name: 'Same',
        last_name: 'Address',
        email: OTHER.athlete.email,
        created_at: new Date().toISOString(),
        updated_at: new Date().toISOString(),
      })
      .returning('id');
    expect(await sendShareNotice(deps(), (row as { id: number }).id, 'summary')).toBe(false);
    expect(await received(OTHER.athlete.email)).toEqual([]);
  });

  it("name the athlete's own clinic: the other clinic's athlete hears from the other clinic", async () => {
    const other = await athleteRow({ email: OTHER.athlete.email });
    expect(await sendShareNotice(deps(), other!.id, 'still')).toBe(true);
    const [mail] = await received(OTHER.athlete.email);
    expect(mail!.subject).toBe(`${OTHER.clinic} shared something with you on Trailframe`);
    expect(mail!.text).toContain(`${OTHER.clinic} has shared an annotated still from your running assessment with you.`);
    expect(mail!.text).not.toContain(DEMO_CLINIC_NAME);
  });

  it('an unknown athlete id sends nothing', async () => {
    expect(await sendShareNotice(deps(), 987_654, 'still')).toBe(false);
    expect(await t.db('mailbox_messages').count({ n: '*' }).first()).toEqual({ n: 0 });
  });

  it('a refused relay is logged and answered false, never thrown (the publish stands)', async () => {
    const a = await athleteRow({ email: athlete.email });
    t.mailer.failNext = true;
    expect(await sendShareNotice(deps(), a!.id, 'still')).toBe(false);
    expect(logs.map((l) => l.msg)).toContain('share notice failed');
  });
});
