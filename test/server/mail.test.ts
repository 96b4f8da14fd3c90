import { afterEach, describe, expect, it } from 'vitest';
import { createDb, migrate, type Db } from '../../server/db/knex';
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp';
import { createSmtpMailer } from '../../server/mail/mailer';
import { loadConfig } from '../../server/config';

let db: Db | undefined;
let smtp: FakeSmtp | undefined;

afterEach(async () => {
  await smtp?.close();
  await db?.destroy();
});

describe('mail through nodemailer to the fake SMTP receiver', () => {
  it('stores a sent message, readable at once after sendMail resolves', async () => {
    db = createDb(':memory:');
    await migrate(db);
    smtp = await startFakeSmtp(db, 0);
    const mailer = createSmtpMailer({ from: 'Trailframe <no-reply@trailframe.test>', host: '127.0.0.1', port: smtp.port, secure: false, user: null, pass: null });
    await mailer.send({ to: 'runner@runner.test', subject: 'Your link', text: 'Open http://localhost/invitation/abc' });
    mailer.close();
    const rows = await db('mailbox_messages');
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ to_address: 'runner@runner.test', subject: 'Your link' });
    expect(rows[0].text).toContain('/invitation/abc');
    expect(rows[0].from_address).toContain('no-reply@trailframe.test');
  });
});

describe('configuration', () => {
  it('defaults to demo mode on port 3000 with the fake SMTP port', () => {
    const c = loadConfig({} as NodeJS.ProcessEnv, '/srv/tf');
    expect(c).toMatchObject({ port: 3000, demoMode: true, publicUrl: 'http://localhost:3000', dbFile: '/srv/tf/data/trailframe.sqlite' });
    expect(c.mail.port).toBe(2525);
  });

  it('reads real SMTP settings and refuses production without a session secret', () => {
    const env = { DEMO_MODE: 'false', SESSION_SECRET: 's'.repeat(40), SMTP_HOST: 'smtp.clinic.test', SMTP_PORT: '587', SMTP_USER: 'u', SMTP_PASS: 'p', PUBLIC_URL: 'https://gait.clinic.test/' } as NodeJS.ProcessEnv;
    const c = loadConfig(env);
    expect(c.mail).toMatchObject({ host: 'smtp.clinic.test', port: 587, user: 'u' });
    expect(c.publicUrl).toBe('https://gait.clinic.test');
    expect(() => loadConfig({ DEMO_MODE: 'false' } as NodeJS.ProcessEnv)).toThrow(/SESSION_SECRET/);
    expect(() => loadConfig({ PORT: 'eighty' } as NodeJS.ProcessEnv)).toThrow(/PORT/);
  });
});
