import fs from 'node:fs';
import type { MediaStore } from '../../server/storage/media-store';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import type { Express } from 'express';
import pino, { type Logger } from 'pino';
import { createApp } from '../../server/app';
import { loadConfig, type Config } from '../../server/config';
import { mediaStoreFor } from '../../server/services';
import type { Db } from '../../server/db/knex';
import { openTestDb, s3Endpoint } from './test-db';
import { openOwnBucket, type OwnBucket } from './own-bucket';
import { createSmtpMailer, type Mailer, type MailMessage } from '../../server/mail/mailer';
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp';
import { hashPassword } from '../../server/auth/passwords';
import { seed } from '../../seeds/demo-scenario';
import type { Worker } from '../../server/processing/worker';
import type { Processing } from '../../server/processing/processing';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { startFakePayments, type FakePayments } from '../../server/billing/fake-payments/fake-payments';

/**
 * The mailer of test apps. By default (`fakeSmtp`, see {@link TestAppOptions}) every message goes
 * the real way — nodemailer over SMTP to the local fake receiver, parsed and stored there — and
 * `sent` holds each message as the receiver stored it, so assertions read what an inbox would show.
 * Without the receiver `sent` holds the messages as handed over (tests about something else).
 */
export class MemoryMailer implements Mailer {
  readonly sent: MailMessage[] = [];
  failNext = false;
  /** Sends every message on (to the fake SMTP receiver) and reads it back from `db`. */
  forward: { mailer: Mailer; db: Db } | null = null;
  private readBack = 0;
  async send(message: MailMessage): Promise<void> {
    if (this.failNext) {
      this.failNext = false;
      throw new Error('relay refused');
    }
    if (!this.forward) {
      this.sent.push(message);
      return;
    }
    await this.forward.mailer.send(message);
    // The receiver stores a message before its "250 OK", so it is there once send resolves.
    const row = await this.forward
      .db('mailbox_messages')
      .where('id', '>', this.readBack)
      .andWhere({ to_address: message.to, subject: message.subject })
      .orderBy('id')
      .first<{ id: number; to_address: string; subject: string; text: string } | undefined>();
    if (!row) throw new Error(`the fake SMTP receiver did not store the message to ${message.to}`);
    this.readBack = Math.max(this.readBack, row.id);
    this.sent.push({ to: row.to_address, subject: row.subject, text: row.text });
  }
  close(): void {
    this.forward?.mailer.close();
  }
  /** The first link in the newest message to `to`. */
  lastLinkTo(to: string): string {
    const msg = [...this.sent].reverse().find((m) => m.to === to);
    const link = msg?.text.match(/https?:\/\/\S+/)?.[0];
    if (!link) throw new Error(`no link mailed to ${to}`);
    return link;
  }
}

export interface TestApp {
  app: Express;
  db: Db;
  mailer: MemoryMailer;
  config: Config;
  /** Where the app keeps media: local folders under `config.uploadsDir`, or (on S3) a bucket of the app's own. */
  store: MediaStore;
  /** Every media key the app has stored, sorted (reads the store, local or bucket). */
  mediaKeys(): Promise<string[]>;
  /** The in-process worker. */
  worker: Worker | null;
  /** The app's processing layer (tests that run without the worker drive its queue themselves). */
  processing: Processing;
  /** Moves the app's clock forward. */
  advance(ms: number): void;
  /** Deletes expired session rows now; answers how many. */
  clearExpiredSessions(): Promise<number>;
  /** The daily privacy check now (retention lists, expired export zips). */
  runDailyPrivacyCheck(): Promise<void>;
  /** With `{ fakePayments: true }`: the fake payment service and the app listening for its webhooks. */
  fakePayments: FakePayments | null;
  /** With `{ fakePayments: true }`: base URL of the listening app. */
  url: string | null;
  close(): Promise<void>;
}

/** Extra parts a test may ask for. */
export interface TestAppOptions {
  /** Start the local fake payment service and listen on a port so its webhooks reach the app. */
  fakePayments?: boolean;
  /** The app's logger (default: silent), for tests that read what the server logs. */
  logger?: Logger;
  /**
   * Send every e-mail through nodemailer to the demo's fake SMTP receiver (stored in
   * `mailbox_messages`, read back into `mailer.sent`). Default true; `false` keeps mail in memory,
   * for tests about something else that send many messages (say why where you use it).
   */
  fakeSmtp?: boolean;
  /** A database file (in the test's temp folder) instead of memory: plain reads then use the reader connection, as a real server's do. */
  onDisk?: boolean;
  /**
   * The media store (default: local folders under the test's uploads folder, or — when the suite runs
   * with `TEST_S3_ENDPOINT` — a bucket of the app's own on that fake), e.g. an S3 store on a local fake.
   */
  store?: MediaStore;
}

/** A fresh app on a database of its own (SQLite in memory, or PostgreSQL: see `test-db.ts`) with the demo scenario and a second clinic. */
export async function makeTestApp(overrides: Partial<Config> = {}, options: TestAppOptions = {}): Promise<TestApp> {
  const base = loadConfig({ DEMO_MODE: 'true', LOG_LEVEL: 'silent', CLIENT_DIR: '' } as NodeJS.ProcessEnv);
  const uploadsDir = fs.mkdtempSync(path.join(os.tmpdir(), 'trailframe-test-'));
  const dbFile = options.onDisk ? path.join(uploadsDir, 'db.sqlite') : ':memory:';
  let config: Config = { ...base, clientDir: null, dbFile, uploadsDir, ...overrides };
  let fakePayments: FakePayments | null = null;
  if (options.fakePayments && config.payments) {
    fakePayments = await startFakePayments({ port: 0, secretKey: config.payments.secretKey, webhookSecret: config.payments.webhookSecret });
    config = { ...config, payments: { ...config.payments, apiHost: '127.0.0.1', apiPort: fakePayments.port, apiProtocol: 'http' } };
  }
  const testDb = await openTestDb({ file: dbFile });
  const db = testDb.db;
  config = { ...config, databaseUrl: testDb.target.startsWith('postgres') ? testDb.target : null };
  await seed(db);
  await addOtherClinic(db);
  // On S3 (see test-db.ts `onS3`) a bucket of this app's own, so test files running at once never share keys.
  let bucket: OwnBucket | null = null;
  if (!options.store && s3Endpoint) {
    bucket = await openOwnBucket(s3Endpoint);
    config = { ...config, s3: bucket.options };
  }
  const store = options.store ?? bucket?.store ?? mediaStoreFor(config);
  const mailer = new MemoryMailer();
  let fakeSmtp: FakeSmtp | null = null;
  if (options.fakeSmtp ?? true) {
    fakeSmtp = await startFakeSmtp(db, 0);
    mailer.forward = { mailer: createSmtpMailer({ ...config.mail, host: '127.0.0.1', port: fakeSmtp.port }), db };
  }
  let offset = 0;
  const { app, close, worker, processing, clearExpiredSessions, runDailyPrivacyCheck } = createApp({
    config,
    db,
    mailer,
    logger: options.logger ?? pino({ level: 'silent' }),
    clock: () => new Date(Date.now() + offset),
    store,
  });
  let listener: http.Server | null = null;
  let url: string | null = null;
  if (fakePayments) {
    const server = http.createServer(app);
    listener = server;
    await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', () => resolve()));
    url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    fakePayments.setWebhookUrl(`${url}/api/billing/webhook`);
  }
  return {
    fakePayments,
    url,
    app,
    db,
    mailer,
    config,
    store,
    mediaKeys: () => (bucket ? bucket.keys() : localKeys(config.uploadsDir)),
    advance: (ms) => {
      offset += ms;
    },
    worker,
    processing,
    clearExpiredSessions,
    runDailyPrivacyCheck,
    async close() {
      await fakePayments?.idle();
      await fakePayments?.close();
      if (listener) {
        listener.closeAllConnections();
        await new Promise<void>((resolve) => listener!.close(() => resolve()));
      }
      await close();
      mailer.close();
      await fakeSmtp?.close();
      await testDb.close();
      await bucket?.remove();
      fs.rmSync(uploadsDir, { recursive: true, force: true });
    },
  };
}

/**
 * What a folder listing of `prefix` (ending with `/`) would show in the store, local or bucket: the
 * distinct next parts of the keys under it, sorted (`clips/` → the clip ids with media).
 */
export async function storedNames(store: MediaStore, prefix: string): Promise<string[]> {
  const names = new Set((await store.list(prefix)).map((key) => key.slice(prefix.length).split('/')[0]!));
  return [...names].sort();
}

/** The files under `dir` as media keys (`a/b/c`), sorted. */
function localKeys(dir: string): Promise<string[]> {
  const files = fs.existsSync(dir) ? (fs.readdirSync(dir, { recursive: true, withFileTypes: true }) as fs.Dirent[]) : [];
  const keys = files.filter((f) => f.isFile()).map((f) => path.relative(dir, path.join(f.parentPath, f.name)).split(path.sep).join('/'));
  return Promise.resolve(keys.sort());
}

export const OTHER = {
  clinic: 'Birchfield Physio (test)',
  owner: { email: 'owner@birchfield.test', password: 'birchfield-owner-1' },
  coach: { email: 'coach@birchfield.test', password: 'birchfield-coach-1' },
  athlete: { email: 'athlete@birchfield.test', password: 'birchfield-athlete-1' },
};

/** A second clinic with an owner, a coach and an athlete with an account (for 404 checks). */
async function addOtherClinic(db: Db): Promise<void> {
  const at = new Date().toISOString();
  const [c] = await db('clinics').insert({ name: OTHER.clinic, created_at: at }).returning('id');
  const clinicId = (c as { id: number }).id;
  const ids: Record<string, number> = {};
  for (const role of ['owner', 'coach', 'athlete'] as const) {
    const [u] = await db('users')
      .insert({
        clinic_id: clinicId,
        email: OTHER[role].email,
        name: `Other ${role}`,
        role,
        password_hash: await hashPassword(OTHER[role].password),
        created_at: at,
        updated_at: at,
      })
      .returning('id');
    ids[role] = (u as { id: number }).id;
  }
  await db('athletes').insert({
    clinic_id: clinicId,
    user_id: ids['athlete'],
    coach_id: ids['coach'],
    first_name: 'Other',
    last_name: 'Athlete',
    email: OTHER.athlete.email,
    created_at: at,
    updated_at: at,
  });
}

/** A cookie-keeping client that sends the CSRF header the way the Angular app does. */
export class Client {
  readonly agent;
  private token = '';
  private sid = '';

  /** An Express app (in process) or a base URL of a running server. */
  constructor(app: Express | string) {
    this.agent = request.agent(app);
  }

  private async csrf(): Promise<string> {
    if (!this.token) await this.refreshToken();
    return this.token;
  }

  /** Reads the XSRF-TOKEN cookie the server set (after sign-in it changes). */
  async refreshToken(): Promise<void> {
    const res = await this.agent.get('/api/auth/csrf');
    this.token = (res.body as { token: string }).token;
  }

  get(path: string) {
    return this.agent.get(path);
  }

  /** A GET whose body is kept as raw bytes (`res.body` is a Buffer): images, PDFs. */
  binary(path: string) {
    return this.agent
      .get(path)
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      });
  }

  async send(method: 'post' | 'put' | 'patch' | 'delete' | 'head', path: string, body?: unknown, headers: Record<string, string> = {}) {
    const token = await this.csrf();
    const req = this.agent[method](path).set('X-XSRF-TOKEN', token).set(headers);
    const res = body === undefined ? await req : await req.send(body as object);
    const cookie = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((c) => c.startsWith('XSRF-TOKEN='));
    if (cookie) this.token = decodeURIComponent(cookie.split(';')[0]!.slice('XSRF-TOKEN='.length));
    return res;
  }

  post(path: string, body?: unknown) {
    return this.send('post', path, body);
  }
  put(path: string, body?: unknown) {
    return this.send('put', path, body);
  }
  patch(path: string, body?: unknown) {
    return this.send('patch', path, body);
  }
  delete(path: string) {
    return this.send('delete', path);
  }

  async signIn(email: string, password: string) {
    const res = await this.post('/api/auth/sign-in', { email, password });
    if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
    const sid = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((c) => c.startsWith('tf.sid='));
    if (sid) this.sid = sid.split(';')[0]!;
    return res;
  }

  /** The session cookie, for requests made outside supertest (e.g. server-sent events). */
  cookieHeader(): string {
    return this.sid;
  }

  /** The CSRF token to send with a hand-built request (e.g. a multipart upload). */
  async xsrf(): Promise<string> {
    return this.csrf();
  }
}

/** A signed-in client. */
export async function signedIn(app: Express, email: string, password: string): Promise<Client> {
  const c = new Client(app);
  await c.signIn(email, password);
  return c;
}
