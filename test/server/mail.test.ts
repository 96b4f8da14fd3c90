import http from 'node:http';
import { afterEach, describe, expect, it } from 'vitest';
import type { Db } from '../../server/db/knex';
import { openTestDb, type TestDb } from '../support/test-db';
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp';
import { createSmtpMailer } from '../../server/mail/mailer';
import { startDemoInbox, type DemoInbox } from '../../server/mail/demo-inbox';
import { loadConfig } from '../../server/config';

let db: Db | undefined;
let testDb: TestDb | undefined;
let smtp: FakeSmtp | undefined;
let inbox: DemoInbox | undefined;

afterEach(async () => {
  await inbox?.close();
  inbox = undefined;
  await smtp?.close();
  await testDb?.close();
});

/** A GET to the inbox with a chosen Host header (fetch would not let us set it). */
function getWithHost(url: string, host: string, method = 'GET'): Promise<{ status: number; body: string }> {
  return new Promise((resolve, reject) => {
    const req = http.request(url, { method, headers: { host } }, (res) => {
      let body = '';
      res.setEncoding('utf8');
      res.on('data', (c: string) => (body += c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body }));
    });
    req.on('error', reject);
    req.end();
  });
}

describe('the demo inbox (outside the app, 127.0.0.1 only)', () => {
  async function withMail(): Promise<DemoInbox> {
    testDb = await openTestDb();
    db = testDb.db;
    smtp = await startFakeSmtp(db, 0);
    const mailer = createSmtpMailer({
      from: 'Trailframe <no-reply@trailframe.test>',
      host: '127.0.0.1',
      port: smtp.port,
      secure: false,
      user: null,
      pass: null,
    });
    await mailer.send({
      to: 'first@runner.test',
      subject: 'First <b>message</b>',
      text: 'Open http://localhost:3000/invitation/abc_DEF-123 to join.\n<script>alert(1)</script>',
    });
    await mailer.send({
      to: 'second@runner.test',
      subject: 'Reset your Trailframe password',
      text: 'http://localhost:3000/reset-password/xyz',
    });
    mailer.close();
    return startDemoInbox(db, 0);
  }

  it('listens on 127.0.0.1 only and lists every caught message, newest first', async () => {
    inbox = await withMail();
    expect(inbox.url).toBe(`http://127.0.0.1:${inbox.port}`);
    const res = await fetch(inbox.url);
    expect(res.status).toBe(200);
    expect(res.headers.get('cache-control')).toBe('no-store');
    expect(res.headers.get('content-security-policy')).toContain("default-src 'none'");
    const html = await res.text();
    expect(html.indexOf('Reset your Trailframe password')).toBeLessThan(html.indexOf('First &#60;b&#62;message'));
    expect(html).not.toContain('<b>message</b>');
    // Not reachable on any other address of the machine.
    await expect(fetch(`http://[::1]:${inbox.port}/`)).rejects.toThrow();
  });

  it('shows a message with its link clickable and any HTML in it escaped', async () => {
    inbox = await withMail();
    const first = await db!('mailbox_messages').where({ to_address: 'first@runner.test' }).first();
    const html = await (await fetch(`${inbox.url}/messages/${first.id}`)).text();
    expect(html).toContain('<a href="http://localhost:3000/invitation/abc_DEF-123">http://localhost:3000/invitation/abc_DEF-123</a>');
    expect(html).toContain('&#60;script&#62;alert(1)&#60;/script&#62;');
    expect(html).not.toContain('<script>');
    expect((await fetch(`${inbox.url}/messages/999`)).status).toBe(404);
    expect((await fetch(`${inbox.url}/messages/x`)).status).toBe(404);
  });

  it('refuses another Host (a DNS-rebinding page) and anything but GET', async () => {
    inbox = await withMail();
    expect((await getWithHost(inbox.url, 'evil.example.test')).status).toBe(421);
    expect((await getWithHost(inbox.url, `evil.example.test:${inbox.port}`)).status).toBe(421);
    expect((await getWithHost(inbox.url, `localhost:${inbox.port}`)).status).toBe(200);
    expect((await getWithHost(inbox.url, `127.0.0.1:${inbox.port}`, 'POST')).status).toBe(405);
  });

  it('runs only in demo mode with the fake SMTP receiver', () => {
    expect(loadConfig({} as NodeJS.ProcessEnv).demoInboxPort).toBe(2580);
    expect(loadConfig({ DEMO_INBOX_PORT: '0' } as NodeJS.ProcessEnv).demoInboxPort).toBe(0);
    expect(loadConfig({ SMTP_PORT: '587' } as NodeJS.ProcessEnv).demoInboxPort).toBeNull();
    expect(loadConfig({ DEMO_MODE: 'false', SESSION_SECRET: 's'.repeat(40) } as NodeJS.ProcessEnv).demoInboxPort).toBeNull();
  });
});

describe('mail through nodemailer to the fake SMTP receiver', () => {
  it('stores a sent message, readable at once after sendMail resolves', async () => {
    testDb = await openTestDb();
    db = testDb.db;
    smtp = await startFakeSmtp(db, 0);
    const mailer = createSmtpMailer({
      from: 'Trailframe <no-reply@trailframe.test>',
      host: '127.0.0.1',
      port: smtp.port,
      secure: false,
      user: null,
      pass: null,
    });
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
    const env = {
      DEMO_MODE: 'false',
      SESSION_SECRET: 's'.repeat(40),
      SMTP_HOST: 'smtp.clinic.test',
      SMTP_PORT: '587',
      SMTP_USER: 'u',
      SMTP_PASS: 'p',
      PUBLIC_URL: 'https://gait.clinic.test/',
    } as NodeJS.ProcessEnv;
    const c = loadConfig(env);
    expect(c.mail).toMatchObject({ host: 'smtp.clinic.test', port: 587, user: 'u' });
    expect(c.publicUrl).toBe('https://gait.clinic.test');
    expect(() => loadConfig({ DEMO_MODE: 'false' } as NodeJS.ProcessEnv)).toThrow(/SESSION_SECRET/);
    expect(() => loadConfig({ PORT: 'eighty' } as NodeJS.ProcessEnv)).toThrow(/PORT/);
  });
});
