/**
 * Benchmark: frame-step latency in the review workspace, in headless Debian chromium, on a clip
 * from a 1920×1080 source (working frames 1280×720) after prefetch. Measures key press → the
 * frame bitmap drawn on the canvas, and to the animation frame after it (presentation), for 200
 * steps, and prints median and p95 against the targets (≤ 16 ms and ≤ 33 ms) as ratios.
 * Run: npx tsx test/bench/frame-step.ts
 */
import path from 'node:path';
import { startHarness } from '../e2e/harness';
import { Client } from '../support/test-app';
import { makeClip, tempDir } from '../server/media/fixtures';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';

const [, coach, , athlete] = DEMO_SIGN_INS;
const STEPS = 200;
const h = await startHarness();
const dir = await tempDir('bench-step');
try {
  const file = await makeClip(path.join(dir.dir, 'hd.mp4'), { fps: 120, width: 1920, height: 1080, seconds: 3 });
  const api = new Client(h.baseUrl);
  await api.signIn(coach.email, coach.password);
  const ada = await h.server.db('athletes').where({ email: athlete.email }).first();
  const assessment = await h.server.db('assessments').where({ athlete_id: ada.id }).first();
  const up = await api.agent
    .post(`/api/assessments/${assessment.id}/clips`)
    .set('X-XSRF-TOKEN', await api.xsrf())
    .attach('file', file);
  const clipId = up.body.id as number;
  for (let i = 0; (await api.get(`/api/clips/${clipId}`)).body.status !== 'ready'; i++) {
    if (i > 600) throw new Error('clip not ready');
    await new Promise((r) => setTimeout(r, 200));
  }
  const { page } = await h.newPage();
  await page.setViewportSize({ width: 1440, height: 960 });
  await page.goto(`${h.baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(coach.email);
  await page.getByLabel('Password', { exact: true }).fill(coach.password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/\/athletes$/);
  await page.goto(`${h.baseUrl}/athletes/${ada.id}/assessments/${assessment.id}/clips/${clipId}/review`);
  await page.locator('app-frame-viewer canvas').waitFor();
  await page.waitForTimeout(3000); // let the prefetch window fill

  // Times the first drawImage of a frame bitmap after each key press (the frame is drawn on the
  // canvas), and the animation frame after it (when the browser presents it).
  await page.evaluate(() => {
    const w = window as unknown as { drawn: number[]; presented: number[] };
    w.drawn = [];
    w.presented = [];
    let t0 = 0;
    let waiting = false;
    document.addEventListener(
      'keydown',
      () => {
        t0 = performance.now();
        waiting = true;
      },
      true,
    );
    const proto = CanvasRenderingContext2D.prototype;
    const original = proto.drawImage;
    proto.drawImage = function (this: CanvasRenderingContext2D, ...args: unknown[]) {
      if (waiting && args[0] instanceof ImageBitmap) {
        waiting = false;
        const start = t0;
        w.drawn.push(performance.now() - start);
        requestAnimationFrame(() => w.presented.push(performance.now() - start));
      }
      return (original as (...a: unknown[]) => void).apply(this, args);
    } as typeof proto.drawImage;
  });
  // Step forwards inside the prefetched window, then back, as a coach does around an event.
  for (let i = 0; i < STEPS; i++) {
    await page.keyboard.press(i % 40 < 20 ? 'ArrowRight' : 'ArrowLeft');
    await page.waitForTimeout(30);
  }
  const { drawn, presented } = await page.evaluate(() => {
    const w = window as unknown as { drawn: number[]; presented: number[] };
    return { drawn: w.drawn, presented: w.presented };
  });
  for (const [name, values] of [
    ['key → frame drawn on the canvas', drawn],
    ['key → next animation frame after drawing', presented],
  ] as const) {
    const lat = [...values].sort((a, b) => a - b);
    const q = (p: number) => lat[Math.min(lat.length - 1, Math.floor(p * lat.length))]!;
    console.log(
      `${name} (${lat.length} steps): median ${q(0.5).toFixed(1)} ms (target ≤ 16, ratio ${(q(0.5) / 16).toFixed(2)}), p95 ${q(0.95).toFixed(1)} ms (target ≤ 33, ratio ${(q(0.95) / 33).toFixed(2)})`,
    );
  }
} finally {
  await h.close();
  await dir.cleanup();
}
