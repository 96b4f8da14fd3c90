/**
 * Review workspace in Debian chromium: a coach opens a synthetic runner clip (a test fixture with
 * known joint angles — not a published source), steps with the keyboard, places landmarks by
 * clicking at the generator's true marker positions, marks gait events, draws a scale bar, and the
 * saved measures show hip extension at toe-off close to the generator's truth.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { Client } from '../support/test-app';
import { tempDir } from '../server/media/fixtures';
import { generateRunnerClip, type GroundTruth } from '../../scripts/demo-clip/clip';
import { fitTransform, fractionToScreen } from '../../src/app/features/review/view-transform';
import type { ClipMeasures } from '../../src/contracts/measures';

const [, coach, , athlete] = DEMO_SIGN_INS;
let h: Harness;
let dir: { dir: string; cleanup: () => Promise<void> };
let truth: GroundTruth;
let clipId = 0;
let athleteId = 0;
let assessmentId = 0;

beforeAll(async () => {
  h = await startHarness();
  dir = await tempDir('e2e-review');
  const file = path.join(dir.dir, 'runner.mp4');
  truth = await generateRunnerClip({ fps: 120, width: 960, height: 540, seconds: 2, hipExtensionDeg: 5, facing: 'right', outFile: file, preset: 'ultrafast' });
  const api = new Client(h.baseUrl);
  await api.signIn(coach.email, coach.password);
  const ada = await h.server.db('athletes').where({ email: athlete.email }).first();
  athleteId = ada.id;
  assessmentId = (await h.server.db('assessments').where({ athlete_id: ada.id, kind: 'baseline' }).first()).id;
  const up = await api.agent.post(`/api/assessments/${assessmentId}/clips`).set('X-XSRF-TOKEN', await api.xsrf()).attach('file', file);
  clipId = up.body.id;
  await api.patch(`/api/clips/${clipId}`, { nearSide: truth.nearSide, direction: 'left_to_right' });
  for (let i = 0; ; i++) {
    const clip = (await api.get(`/api/clips/${clipId}`)).body;
    if (clip.status === 'ready') break;
    if (clip.status === 'failed' || i > 300) throw new Error(`clip ${clip.status}: ${clip.error}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}, 180_000);
afterAll(async () => {
  await h?.close();
  await dir?.cleanup();
});

async function frameNumber(page: Page): Promise<number> {
  return Number(await page.locator('.frame-no strong').textContent());
}

/** Steps with the keyboard to `target` (Shift+→ for tens, → for ones). */
async function goTo(page: Page, target: number): Promise<void> {
  await page.keyboard.press('Home');
  for (let i = 0; i < Math.floor(target / 10); i++) await page.keyboard.press('Shift+ArrowRight');
  for (let i = 0; i < target % 10; i++) await page.keyboard.press('ArrowRight');
  await expect.poll(() => frameNumber(page)).toBe(target);
}

/** Clicks on the canvas where a stored point (fractions of the frame) is drawn. */
async function clickAt(page: Page, p: { x: number; y: number }): Promise<void> {
  const canvas = page.locator('app-frame-viewer canvas');
  const box = (await canvas.boundingBox())!;
  const t = fitTransform({ width: truth.width, height: truth.height }, { width: box.width, height: box.height });
  const s = fractionToScreen(t, { width: truth.width, height: truth.height }, p);
  await page.mouse.click(box.x + s.x, box.y + s.y);
}

describe('review workspace', () => {
  it('coach steps, marks landmarks and events, draws a scale bar, and reads hip extension at toe-off', async () => {
    const { page, context, problems } = await h.newPage();
    await page.setViewportSize({ width: 1440, height: 960 });
    await page.goto(`${h.baseUrl}/sign-in`);
    await page.getByLabel('E-mail').fill(coach.email);
    await page.getByLabel('Password', { exact: true }).fill(coach.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/athletes$/);
    await page.goto(`${h.baseUrl}/athletes/${athleteId}/assessments/${assessmentId}/clips/${clipId}/review`);
    await page.locator('app-frame-viewer canvas').waitFor();
    await page.locator('app-frame-viewer canvas').click({ position: { x: 5, y: 5 } }).catch(() => undefined);
    await page.keyboard.press('Escape');

    // Keyboard stepping.
    await page.keyboard.press('Home');
    await page.keyboard.press('ArrowRight');
    await page.keyboard.press('ArrowRight');
    await expect.poll(() => frameNumber(page)).toBe(2);
    await page.keyboard.press('Shift+ArrowRight');
    await expect.poll(() => frameNumber(page)).toBe(12);

    const near = truth.nearSide;
    const ic = truth.events.near.initialContact[0]!;
    const to = truth.events.near.toeOff.find((f) => f > ic)!;

    // Initial contact, then toe-off with every near-side landmark placed by clicking.
    await goTo(page, ic);
    await page.keyboard.press('i');
    await goTo(page, to);
    await page.keyboard.press('1');
    const points = truth.frames[to]!.landmarksNormalised.near;
    for (const name of ['shoulder', 'hip', 'knee', 'ankle', 'heel', 'toe'] as const) await clickAt(page, points[name]);
    await page.keyboard.press('o');

    // Scale bar: 1 m along the belt, drawn with the scale tool.
    await page.keyboard.press('b');
    const y = 0.95;
    const a = { x: 0.1, y };
    const b = { x: 0.1 + truth.pxPerMetre / truth.width, y };
    const canvas = page.locator('app-frame-viewer canvas');
    const box = (await canvas.boundingBox())!;
    const t = fitTransform({ width: truth.width, height: truth.height }, { width: box.width, height: box.height });
    const sa = fractionToScreen(t, { width: truth.width, height: truth.height }, a);
    const sb = fractionToScreen(t, { width: truth.width, height: truth.height }, b);
    await page.mouse.move(box.x + sa.x, box.y + sa.y);
    await page.mouse.down();
    await page.mouse.move(box.x + sb.x, box.y + sb.y, { steps: 8 });
    await page.mouse.up();
    await page.getByRole('tab', { name: 'Scale' }).click();
    await page.getByLabel('Length of the object').first().fill('1');
    await page.getByRole('button', { name: 'Use this scale' }).click();

    // Autosave, then the server's snapshot.
    await expect.poll(async () => (await h.server.db('clips').where({ id: clipId }).first()).annotation_revision, { timeout: 20_000 }).toBeGreaterThan(0);
    await expect.poll(async () => (await h.server.db('scale_bars').where({ clip_id: clipId })).length, { timeout: 20_000 }).toBe(1);
    await expect.poll(async () => (await h.server.db('gait_events').where({ clip_id: clipId })).length, { timeout: 20_000 }).toBe(2);
    await expect.poll(async () => (await h.server.db('clip_landmarks').where({ clip_id: clipId, frame: to, side: near })).length, { timeout: 20_000 }).toBe(6);
    const api = new Client(h.baseUrl);
    await api.signIn(coach.email, coach.password);
    const measures = (await api.get(`/api/clips/${clipId}/measures`)).body as ClipMeasures;
    const hip = measures.measures.find((m) => m.key === 'hip_extension_toe_off' && m.side === near)!;
    expect(hip.status).toBe('ok');
    expect(Math.abs(hip.mean! - truth.hipExtensionAtToeOffDeg.near[0]!)).toBeLessThan(1);
    const bar = (await h.server.db('scale_bars').where({ clip_id: clipId }).first()).length_m;
    expect(bar).toBe(1);

    await page.getByRole('tab', { name: 'Measures' }).click();
    await page.screenshot({ path: path.join(SCREENSHOTS, 'review-workspace.png') });
    expect(problems).toEqual([]);
    await context.close();
  });
});
