/**
 * Precision of marking on the review canvas at every common display scaling. A 1280 × 720 clip made
 * by ffmpeg (a test fixture, not a published source) shows one smooth dark spot per frame on white
 * whose centre is a known frame point (smooth, so downscaling cannot move its centroid). In Debian
 * chromium at device pixel ratios 1, 1.5, 2 and 3 and window sizes 1440×900, 1366×768 and 390×844,
 * the test finds the spot on a screenshot as a coach's eye would (centroid of its darkness, in device
 * pixels), clicks there, and checks (a) the landmark the API stores is within a quarter of a frame pixel of
 * the spot's centre (ffmpeg drew it there), corrected by where the browser says the press was, and
 * (b) the marker drawn for it sits within half a CSS pixel of the press (centroid of the pixels the
 * click changed). Nothing here uses the app's own screen↔frame mapping.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { loadImage, createCanvas } from '@napi-rs/canvas';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { Client } from '../support/test-app';
import { ffmpegRun, tempDir } from '../server/media/fixtures';
import { uploadReadyClip } from './marked-clip';

const [, coach, , athlete] = DEMO_SIGN_INS;
const W = 1280;
const H = 720;
/** Spread of each dark spot, frame px: smooth enough that any downscaling keeps its centre. */
const SIGMA = 16;
/** Centres of the dark spots (frame pixels, continuous: pixel i spans i…i+1); one spot per frame. */
const SPOTS = [
  { x: 100, y: 90 },
  { x: 640.5, y: 360.25 },
  { x: 1180, y: 630 },
  { x: 1020.75, y: 120 },
  { x: 170, y: 620.5 },
];
const VIEWPORTS = [
  { width: 1440, height: 900 },
  { width: 1366, height: 768 },
  { width: 390, height: 844 },
];

let h: Harness;
let dir: { dir: string; cleanup: () => Promise<void> };
let api: Client;
let clipId = 0;
let reviewUrl = '';
let storageState: Awaited<ReturnType<import('playwright-core').BrowserContext['storageState']>>;

beforeAll(async () => {
  h = await startHarness();
  dir = await tempDir('e2e-precision');
  const file = path.join(dir.dir, 'squares.mp4');
  // Frame k shows only spot k (so each frame gets one marker): a Gaussian dip in brightness.
  const spot = (k: number) => `exp(-((X+0.5-${SPOTS[k]!.x})^2+(Y+0.5-${SPOTS[k]!.y})^2)/${2 * SIGMA * SIGMA})`;
  const lum = SPOTS.map((_, k) => `eq(N,${k})*${spot(k)}`).join('+');
  await ffmpegRun([
    '-f',
    'lavfi',
    '-i',
    `color=c=white:s=${W}x${H}:r=30:d=1`,
    '-vf',
    `format=gray,geq=lum='255-255*(${lum})'`,
    '-c:v',
    'libx264',
    '-preset',
    'ultrafast',
    '-qp',
    '0',
    '-pix_fmt',
    'yuv420p',
    file,
  ]);
  api = new Client(h.baseUrl);
  await api.signIn(coach.email, coach.password);
  const ada = await h.server.db('athletes').where({ email: athlete.email }).first();
  const assessmentId = (await h.server.db('assessments').where({ athlete_id: ada.id, kind: 'baseline' }).first()).id;
  clipId = await uploadReadyClip(api, assessmentId, file);
  reviewUrl = `${h.baseUrl}/athletes/${ada.id}/assessments/${assessmentId}/clips/${clipId}/review`;
  const { page, context } = await h.newPage();
  await h.signIn(page, coach.email, coach.password);
  storageState = await context.storageState();
  await context.close();
}, 240_000);
afterAll(async () => {
  await h?.close();
  await dir?.cleanup();
});

/** A screenshot of the window as RGBA device pixels. */
async function grab(page: Page): Promise<{ data: Uint8ClampedArray; width: number; height: number }> {
  const img = await loadImage(await page.screenshot({ scale: 'device' }));
  const c = createCanvas(img.width, img.height);
  const ctx = c.getContext('2d');
  ctx.drawImage(img, 0, 0);
  return { data: ctx.getImageData(0, 0, img.width, img.height).data, width: img.width, height: img.height };
}

type Shot = Awaited<ReturnType<typeof grab>>;

/**
 * Weighted centroid (CSS px of the window) of `weight` over device pixels in a square window of
 * `half` CSS px around `near`; a device pixel (i, j) has its centre at ((i + ½) / dpr, (j + ½) / dpr).
 */
function centroid(shot: Shot, dpr: number, near: { x: number; y: number }, half: number, weight: (i: number) => number) {
  const x0 = Math.max(0, Math.floor((near.x - half) * dpr));
  const x1 = Math.min(shot.width - 1, Math.ceil((near.x + half) * dpr));
  const y0 = Math.max(0, Math.floor((near.y - half) * dpr));
  const y1 = Math.min(shot.height - 1, Math.ceil((near.y + half) * dpr));
  let sw = 0;
  let sx = 0;
  let sy = 0;
  for (let j = y0; j <= y1; j++)
    for (let i = x0; i <= x1; i++) {
      const w = weight((j * shot.width + i) * 4);
      sw += w;
      sx += w * (i + 0.5);
      sy += w * (j + 0.5);
    }
  return { x: sx / sw / dpr, y: sy / sw / dpr, weight: sw };
}

/** Removes every mark from the clip (each layout starts unmarked). */
async function clearMarks(): Promise<void> {
  const { revision } = (await api.get(`/api/clips/${clipId}/annotations`)).body as { revision: number };
  const res = await api.put(`/api/clips/${clipId}/annotations`, {
    baseRevision: revision,
    landmarks: [],
    events: [],
    scale: null,
    gauges: [],
  });
  expect(res.status).toBe(200);
}

interface Miss {
  layout: string;
  square: number;
  storedErrPx: number;
  markerErrCss: number;
}

/** Clicks every spot in every window size at each ratio; the misses of each click. */
async function clickSpots(dprs: number[]): Promise<Miss[]> {
  const results: Miss[] = [];
  for (const viewport of VIEWPORTS) {
    for (const dpr of dprs) {
      const layout = `${viewport.width}x${viewport.height}@${dpr}`;
      await clearMarks();
      const context = await h.browser.newContext({ viewport, deviceScaleFactor: dpr, storageState });
      const page = await context.newPage();
      await page.goto(reviewUrl);
      // Where the browser says each press was (a mouse points at whole device pixels).
      await page.evaluate(() => {
        window.addEventListener(
          'pointerdown',
          (e) => ((window as unknown as { lastDown: unknown }).lastDown = { x: e.clientX, y: e.clientY }),
          true,
        );
      });
      const canvas = page.locator('app-frame-viewer canvas');
      await canvas.waitFor();
      await canvas.scrollIntoViewIfNeeded();
      await page.locator('app-frame-viewer .frame-status').waitFor({ state: 'detached' });
      const box = (await canvas.boundingBox())!;
      // Where the frame roughly is (fitted with a margin); the squares are then found on the pixels.
      const scale = Math.min((box.width - 16) / W, (box.height - 16) / H);
      const rough = (fx: number, fy: number) => ({
        x: box.x + (box.width - W * scale) / 2 + fx * scale,
        y: box.y + (box.height - H * scale) / 2 + fy * scale,
      });
      const half = 3 * SIGMA * scale;
      const dark = (shot: Shot) => (i: number) => {
        const luma = 0.299 * shot.data[i]! + 0.587 * shot.data[i + 1]! + 0.114 * shot.data[i + 2]!;
        return Math.max(0, (245 - luma) / 245);
      };

      for (let k = 0; k < SPOTS.length; k++) {
        const want = SPOTS[k]!;
        await page.keyboard.press('Home');
        for (let s = 0; s < k; s++) await page.keyboard.press('ArrowRight');
        await expect.poll(() => page.locator('.frame-no strong').textContent()).toBe(String(k));
        await page.locator('app-frame-viewer .frame-status').waitFor({ state: 'detached' });
        await page.waitForTimeout(100);
        const before = await grab(page);
        const seen = centroid(before, dpr, rough(want.x, want.y), half, dark(before));
        expect(seen.weight, `${layout}: square ${k} found`).toBeGreaterThan(4);

        await page.mouse.click(seen.x, seen.y);
        const down = (await page.evaluate(() => (window as unknown as { lastDown: { x: number; y: number } }).lastDown))!;
        // The frame pixel under the press: the square's centre moved by where the press really was.
        const aim = { x: want.x + (down.x - seen.x) / scale, y: want.y + (down.y - seen.y) / scale };
        let stored: { x: number; y: number } | undefined;
        await expect
          .poll(
            async () => {
              const marks = (await api.get(`/api/clips/${clipId}/annotations`)).body as {
                landmarks: { frame: number; points: Record<string, { x: number; y: number }> }[];
              };
              stored = Object.values(marks.landmarks.find((l) => l.frame === k)?.points ?? {})[0];
              return !!stored;
            },
            { timeout: 15_000 },
          )
          .toBe(true);
        const storedErrPx = Math.hypot(stored!.x * W - aim.x, stored!.y * H - aim.y);

        await page.waitForTimeout(100);
        const after = await grab(page);
        const changed = (i: number) => (Math.max(...[0, 1, 2].map((c) => Math.abs(after.data[i + c]! - before.data[i + c]!))) > 48 ? 1 : 0);
        const marker = centroid(after, dpr, down, 16, changed);
        const markerErrCss = Math.hypot(marker.x - down.x, marker.y - down.y);
        results.push({ layout, square: k, storedErrPx, markerErrCss });
        if (k === 2) await page.screenshot({ path: path.join(SCREENSHOTS, `review-precision-${layout}.png`) });
      }
      await context.close();
    }
  }
  return results;
}

function expectWithinHalfPixel(results: Miss[]): void {
  const round = (r: Miss) => ({ ...r, storedErrPx: +r.storedErrPx.toFixed(2), markerErrCss: +r.markerErrCss.toFixed(2) });
  console.log(
    results
      .map((r) => `${r.layout} #${r.square}: stored ${r.storedErrPx.toFixed(2)} px, marker ${r.markerErrCss.toFixed(2)} css`)
      .join('\n'),
  );
  // A quarter of a frame pixel for the stored point (measured: at most 0.07 at every ratio); the
  // marker's centre within half a CSS pixel of the click.
  expect(results.filter((r) => r.storedErrPx > 0.25).map(round)).toEqual([]);
  expect(results.filter((r) => r.markerErrCss > 0.5).map(round)).toEqual([]);
}

describe('marking precision on the review canvas', () => {
  it('stores a click within a quarter of a frame pixel of the clicked frame pixel and draws the marker under it, at DPR 1, 2 and 3', async () => {
    expectWithinHalfPixel(await clickSpots([1, 2, 3]));
  }, 600_000);

  // At 150 % a whole CSS pixel may be half a device pixel. Two causes put clicks about 1 frame px
  // off there: the canvas box (at y = 283 CSS px = 424.5 device px, 257.39 px tall) stretched its
  // backing store, and the scrolling content pane below a 45 px top bar (67.5 device px) was drawn
  // by the compositor on a whole device pixel, half a pixel below its layout position. The canvas
  // is now placed on whole device pixels (canvas-pixels.ts) and the bar's rule no longer adds to
  // its height.
  it('the same at DPR 1.5', async () => {
    expectWithinHalfPixel(await clickSpots([1.5]));
  }, 600_000);
});
