import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { spawnSync } from 'node:child_process';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { loadConfig } from '../../server/config';
import { createDb, migrate } from '../../server/db/knex';
import { startServer, type RunningServer } from '../../server/main';
import { seed } from '../../seeds/demo-scenario';

export const SCREENSHOTS = path.resolve('test-results/screenshots');

/** Chromium flags for this machine: headless, no sandbox (root), no background network. */
export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
  '--disable-quic',
];

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as net.AddressInfo).port;
      s.close(() => resolve(port));
    });
  });
}

export interface Harness {
  server: RunningServer;
  browser: Browser;
  baseUrl: string;
  /** Signs in through the sign-in page and waits for the role's home (roster or portal). */
  signIn(page: Page, email: string, password: string): Promise<void>;
  /** A fresh browser context (own cookies) with a page that records console errors. */
  newPage(): Promise<{ context: BrowserContext; page: Page; problems: string[] }>;
  close(): Promise<void>;
}

/** Builds the app if needed, starts the server on a fresh database, launches Debian chromium. */
export async function startHarness(): Promise<Harness> {
  const clientDir = path.resolve('dist/trailframe/browser');
  if (!fs.existsSync(path.join(clientDir, 'index.html'))) {
    const r = spawnSync('npx', ['ng', 'build'], { stdio: 'inherit' });
    if (r.status !== 0) throw new Error('ng build failed');
  }
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'trailframe-e2e-'));
  const port = await freePort();
  const config = loadConfig({
    PORT: String(port),
    DB_FILE: path.join(dir, 'e2e.sqlite'),
    UPLOADS_DIR: path.join(dir, 'uploads'),
    CLIENT_DIR: clientDir,
    FAKE_SMTP_PORT: '0',
    DEMO_INBOX_PORT: '0',
    FAKE_PAYMENTS_PORT: '0',
    DEMO_MODE: 'true',
    LOG_LEVEL: 'warn',
  } as NodeJS.ProcessEnv);
  const db = createDb(config.dbFile);
  await migrate(db);
  await seed(db);
  await db.destroy();
  const server = await startServer(config);
  const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: CHROMIUM_ARGS });
  fs.mkdirSync(SCREENSHOTS, { recursive: true });
  return {
    server,
    browser,
    baseUrl: server.url,
    async signIn(page, email, password) {
      await page.goto(`${server.url}/sign-in`);
      await page.getByLabel('E-mail').fill(email);
      await page.getByLabel('Password', { exact: true }).fill(password);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.waitForURL(/\/(athletes|portal)/);
    },
    async newPage() {
      const context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
      const page = await context.newPage();
      const problems: string[] = [];
      page.on('console', (m) => {
        if (m.type() === 'error') problems.push(m.text());
      });
      page.on('pageerror', (e) => problems.push(e.message));
      return { context, page, problems };
    },
    async close() {
      await browser.close();
      await server.stop();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** The newest message the fake SMTP receiver stored for `to`, and the first link in it. */
export async function lastMailLink(server: RunningServer, to: string): Promise<string> {
  const row = await server.db('mailbox_messages').where('to_address', 'like', `%${to}%`).orderBy('id', 'desc').first();
  const link = (row?.text as string | undefined)?.match(/https?:\/\/\S+/)?.[0];
  if (!link) throw new Error(`no mail with a link to ${to}`);
  return link;
}
