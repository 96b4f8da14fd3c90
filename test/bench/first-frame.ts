/**
 * Benchmark: first frames reviewable, and two clips processed side by side.
 *
 * 1. For clips of different lengths (1280×720 at 120 fps: 3 s, 10 s, 20 s), the time from the
 *    upload being accepted (the 201 answer) to frame 0 being served by its authorised route,
 *    following the athlete's progress stream as the review does (first `running` event with
 *    frames ready → GET frame 0). Target ≤ 1 s whatever the length; printed as a ratio.
 * 2. With `--browser` (needs a built app, `npx ng build`): the same in headless Debian chromium —
 *    the review page is opened right after the 201 and the time to the first frame bitmap drawn on
 *    its canvas is taken (page load included, so an upper bound of what a coach waits).
 * 3. Two 10 s clips uploaded together: wall time until both are ready, beside one alone, and
 *    whether their extractions ran at the same time (the worker runs one item per core).
 *
 * Prints numbers only; not a timed test. Run: npx tsx test/bench/first-frame.ts [--browser]
 */
import path from 'node:path';
import os from 'node:os';
import { parseArgs } from 'node:util';
import { chromium } from 'playwright-core';
import { loadConfig } from '../../server/config';
import { createDb, migrate } from '../../server/db/knex';
import { startServer } from '../../server/main';
import { DEMO_SIGN_INS, seed } from '../../seeds/demo-scenario';
import type { ProcessingEvent } from '../../src/contracts/processing';
import { followProcessingEvents, type FollowedStream } from '../support/event-stream';
import { freePort } from '../support/server-process';
import { Client } from '../support/test-app';
import { makeClip, tempDir } from '../server/media/fixtures';

const { values: args } = parseArgs({ options: { browser: { type: 'boolean', default: false } } });
const [, coach, , athlete] = DEMO_SIGN_INS;
const TARGET_MS = 1000;
const f0 = (n: number) => n.toFixed(0);
const f2 = (n: number) => n.toFixed(2);

const dir = await tempDir('bench-first-frame');
const dbFile = path.join(dir.dir, 'db.sqlite');
const db = createDb(dbFile);
await migrate(db);
await seed(db);
await db.destroy();
const config = loadConfig({
  PORT: String(await freePort()),
  DB_FILE: dbFile,
  UPLOADS_DIR: path.join(dir.dir, 'uploads'),
  CLIENT_DIR: args.browser ? path.resolve('dist/trailframe/browser') : '',
  FAKE_SMTP_PORT: '0',
  DEMO_INBOX_PORT: '0',
  FAKE_PAYMENTS_PORT: '0',
  LOG_LEVEL: 'warn',
} as NodeJS.ProcessEnv);
const server = await startServer(config);
const base = server.url;

try {
  const api = new Client(base);
  await api.signIn(coach.email, coach.password);
  const ada = await server.db('athletes').where({ email: athlete.email }).first();
  const assessment = await server.db('assessments').where({ athlete_id: ada.id }).first();
  const stream = await followProcessingEvents(`${base}/api/athletes/${ada.id}/processing-events`, api.cookieHeader());
  const event = (id: number, test: (e: ProcessingEvent) => boolean, ms = 300_000) =>
    stream.waitFor((e) => e.subject === 'clip' && e.id === id && test(e), ms);

  async function upload(file: string): Promise<{ id: number; acceptedAt: number }> {
    const res = await api.agent
      .post(`/api/assessments/${assessment.id}/clips`)
      .set('X-XSRF-TOKEN', await api.xsrf())
      .attach('file', file);
    if (res.status !== 201) throw new Error(`upload answered ${res.status}`);
    return { id: res.body.id as number, acceptedAt: performance.now() };
  }

  console.log(`${os.cpus().length} CPUs, load ${os.loadavg().map(f2).join(' ')}; worker runs ${config.jobs.concurrency} items at once\n`);
  console.log('1. Upload accepted → frame 0 served (progress stream + frame route)');
  const lengths = [3, 10, 20];
  const clips = new Map<number, string>();
  for (const seconds of lengths) {
    clips.set(seconds, await makeClip(path.join(dir.dir, `${seconds}s.mp4`), { fps: 120, width: 1280, height: 720, seconds }));
  }
  const aloneMs = new Map<number, number>();
  for (const seconds of lengths) {
    const { id, acceptedAt } = await upload(clips.get(seconds)!);
    await event(id, (e) => e.state === 'ready' || (e.state === 'running' && (e.progress?.done ?? 0) > 0));
    const frame = await api.get(`/api/clips/${id}/frames/0`);
    const firstMs = performance.now() - acceptedAt;
    if (frame.status !== 200) throw new Error(`frame 0 answered ${frame.status} ${JSON.stringify(frame.body)}`);
    await event(id, (e) => e.state === 'ready');
    const readyMs = performance.now() - acceptedAt;
    aloneMs.set(seconds, readyMs);
    console.log(
      `  ${String(seconds).padStart(2)} s clip (${seconds * 120} frames): first frame ${f0(firstMs)} ms (target ≤ ${TARGET_MS}, ratio ${f2(firstMs / TARGET_MS)}); all frames ready ${f0(readyMs)} ms`,
    );
  }

  if (args.browser) {
    console.log('\n2. Upload accepted → first frame bitmap drawn on the review canvas (headless chromium, page load included)');
    const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: ['--no-sandbox', '--disable-gpu'] });
    try {
      const page = await (await browser.newContext({ viewport: { width: 1440, height: 900 } })).newPage();
      await page.goto(`${base}/sign-in`);
      await page.getByLabel('E-mail').fill(coach.email);
      await page.getByLabel('Password', { exact: true }).fill(coach.password);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.waitForURL(/\/athletes$/);
      await page.addInitScript(() => {
        const proto = CanvasRenderingContext2D.prototype;
        const original = proto.drawImage;
        proto.drawImage = function (this: CanvasRenderingContext2D, ...a: unknown[]) {
          const w = window as unknown as { firstDrawnAt?: number };
          if (a[0] instanceof ImageBitmap && w.firstDrawnAt === undefined) w.firstDrawnAt = performance.timeOrigin + performance.now();
          return (original as (...x: unknown[]) => void).apply(this, a);
        } as typeof proto.drawImage;
      });
      for (const seconds of [3, 20]) {
        const { id } = await upload(clips.get(seconds)!);
        const acceptedAt = Date.now();
        await page.goto(`${base}/athletes/${ada.id}/assessments/${assessment.id}/clips/${id}/review`);
        await page.waitForFunction(() => (window as unknown as { firstDrawnAt?: number }).firstDrawnAt !== undefined, null, {
          timeout: 120_000,
        });
        const drawnAt = await page.evaluate(() => (window as unknown as { firstDrawnAt: number }).firstDrawnAt);
        const ms = drawnAt - acceptedAt;
        console.log(
          `  ${String(seconds).padStart(2)} s clip: first frame on the canvas ${f0(ms)} ms (target ≤ ${TARGET_MS}, ratio ${f2(ms / TARGET_MS)})`,
        );
        await event(id, (e) => e.state === 'ready');
      }
    } finally {
      await browser.close();
    }
  }

  console.log('\n3. Two clips uploaded together');
  const ten = await makeClip(path.join(dir.dir, '10s.mp4'), { fps: 120, width: 1280, height: 720, seconds: 10 });
  const alone = await upload(ten);
  await event(alone.id, (e) => e.state === 'ready');
  const oneMs = performance.now() - alone.acceptedAt;
  const started = performance.now();
  const [a, b] = await Promise.all([upload(ten), upload(ten)]);
  await Promise.all([a, b].map((u) => event(u.id, (e) => e.state === 'ready')));
  const bothMs = performance.now() - started;
  const overlap = sideBySide(stream, a!.id, b!.id);
  console.log(
    `  one 10 s clip alone: ready in ${f0(oneMs)} ms; two together: both ready in ${f0(bothMs)} ms ` +
      `(${f2(bothMs / oneMs)} × one; 2.00 would be one after the other); extractions ran side by side: ${overlap ? 'yes' : 'no'}`,
  );
  stream.close();
} catch (err) {
  console.error(err);
  process.exitCode = 1;
} finally {
  await server.stop();
  await dir.cleanup();
}

/** Whether both clips were running at the same time (each had progress before the other was ready). */
function sideBySide(stream: FollowedStream, a: number, b: number): boolean {
  const at = (id: number, test: (e: ProcessingEvent) => boolean) =>
    stream.events.findIndex((e) => e.subject === 'clip' && e.id === id && test(e));
  const running = (e: ProcessingEvent) => e.state === 'running' && (e.progress?.done ?? 0) > 0;
  const ready = (e: ProcessingEvent) => e.state === 'ready';
  return at(a, running) < at(b, ready) && at(b, running) < at(a, ready);
}
