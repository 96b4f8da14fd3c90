/**
 * Following markers in Debian chromium. A synthetic runner clip (scripts/demo-clip — a synthetic
 * fixture with known truth, not a real person; 640×360 at 120 fps) is uploaded and its six
 * near-side markers placed on frame 0 from the generator's truth through the API. The coach opens
 * the review, asks to follow the markers, sees progress and then the followed points; the stored
 * points are checked against the generator truth. At 1440×900 and 390×844, with screenshots.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { Client } from '../support/test-app';
import { tempDir } from '../server/media/fixtures';
import { generateRunnerClip } from '../../scripts/demo-clip/clip';
import type { GroundTruth } from '../../scripts/demo-clip/ground-truth';
import type { ClipAnnotations } from '../../src/contracts/annotations';
import { uploadReadyClip } from './marked-clip';

const [, coach, , athlete] = DEMO_SIGN_INS;
const MARKERS = ['shoulder', 'hip', 'knee', 'ankle', 'heel', 'toe'] as const;
let h: Harness;
let dir: { dir: string; cleanup: () => Promise<void> };
let api: Client;
let truth: GroundTruth;
let athleteId: number;
let assessmentId: number;

beforeAll(async () => {
  h = await startHarness();
  dir = await tempDir('e2e-follow');
  api = new Client(h.baseUrl);
  await api.signIn(coach.email, coach.password);
  const ada = await h.server.db('athletes').where({ email: athlete.email }).first();
  athleteId = ada.id;
  assessmentId = (await h.server.db('assessments').where({ athlete_id: ada.id, kind: 'baseline' }).first()).id;
  truth = await generateRunnerClip({
    fps: 120,
    width: 640,
    height: 360,
    seconds: 1,
    hipExtensionDeg: 8,
    facing: 'right',
    outFile: path.join(dir.dir, 'runner.mp4'),
    preset: 'ultrafast',
  });
}, 300_000);
afterAll(async () => {
  await h?.close();
  await dir?.cleanup();
});

/** Uploads the clip, waits for its frames, and places the near-side markers on frame 0. */
async function uploadWithStart(): Promise<number> {
  const clipId = await uploadReadyClip(api, assessmentId, path.join(dir.dir, 'runner.mp4'));
  const points = Object.fromEntries(MARKERS.map((k) => [k, truth.frames[0]!.landmarksNormalised.near[k]]));
  const res = await api.put(`/api/clips/${clipId}/annotations`, {
    baseRevision: 0,
    landmarks: [{ frame: 0, side: truth.nearSide, points }],
    events: [],
    scale: null,
  });
  expect(res.status).toBe(200);
  return clipId;
}

async function signIn(page: Page): Promise<void> {
  await page.goto(`${h.baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(coach.email);
  await page.getByLabel('Password', { exact: true }).fill(coach.password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/\/athletes$/);
}

describe('following markers in the review', () => {
  for (const [w, hgt, tag] of [
    [1440, 900, 'desktop'],
    [390, 844, 'phone'],
  ] as const) {
    it(`${w}×${hgt}: follow from frame 0, see the result, stored points within 3 px of the truth at the median`, async () => {
      const clipId = await uploadWithStart();
      const { page, context, problems } = await h.newPage();
      await page.setViewportSize({ width: w, height: hgt });
      await signIn(page);
      await page.goto(`${h.baseUrl}/athletes/${athleteId}/assessments/${assessmentId}/clips/${clipId}/review`);
      const button = page.getByRole('button', { name: /Follow markers from this frame/ });
      await expect.poll(() => button.isEnabled(), { timeout: 20_000 }).toBe(true);
      await button.click();
      await expect.poll(() => page.getByText(/^Markers followed/).count(), { timeout: 60_000 }).toBe(1);
      await page.keyboard.press('ArrowRight');
      await page.keyboard.press('ArrowRight');
      await expect.poll(() => page.locator('app-landmarks-panel .state.followed').count()).toBe(6);
      await button.scrollIntoViewIfNeeded();
      await page.screenshot({ path: path.join(SCREENSHOTS, `follow-markers-${tag}.png`) });

      const stored = (await api.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
      const errors: number[] = [];
      for (const row of stored.landmarks) {
        if (row.frame === 0) continue;
        for (const k of MARKERS) {
          const p = row.points[k];
          if (!p) continue;
          expect(p.origin).toBe('followed');
          const want = truth.frames[row.frame]!.landmarks.near[k];
          errors.push(Math.hypot(p.x * truth.width - want.x, p.y * truth.height - want.y));
        }
      }
      expect(errors.length).toBeGreaterThan(0.9 * 6 * (truth.frameCount - 1));
      errors.sort((a, b) => a - b);
      expect(errors[Math.floor(errors.length / 2)]).toBeLessThanOrEqual(3);
      expect(problems).toEqual([]);
      await context.close();
    });
  }
});
