/**
 * Review workspace: marks that were not saved yet are not lost. A coach places landmarks whose save
 * meets an ended session (signed out in another tab): after signing in again the clip opens with the
 * marks put back and saved. A reload while the
 * save cannot get through puts them back too. Leaving with "Leave and discard" forgets them.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { Client } from '../support/test-app';
import { makeClip, tempDir } from '../server/media/fixtures';

const [, coach, , athlete] = DEMO_SIGN_INS;
let h: Harness;
let dir: { dir: string; cleanup: () => Promise<void> };
let api: Client;
let clipId = 0;
let reviewUrl = '';

beforeAll(async () => {
  h = await startHarness();
  dir = await tempDir('e2e-review-unsaved');
  const file = await makeClip(path.join(dir.dir, 'clip.mp4'), { fps: 30, width: 640, height: 360, seconds: 1 });
  api = new Client(h.baseUrl);
  await api.signIn(coach.email, coach.password);
  const ada = await h.server.db('athletes').where({ email: athlete.email }).first();
  const assessmentId = (await h.server.db('assessments').where({ athlete_id: ada.id, kind: 'baseline' }).first()).id;
  const up = await api.agent
    .post(`/api/assessments/${assessmentId}/clips`)
    .set('X-XSRF-TOKEN', await api.xsrf())
    .attach('file', file);
  clipId = up.body.id;
  for (let i = 0; ; i++) {
    const clip = (await api.get(`/api/clips/${clipId}`)).body;
    if (clip.status === 'ready') break;
    if (clip.status === 'failed' || i > 300) throw new Error(`clip ${clip.status}: ${clip.error}`);
    await new Promise((r) => setTimeout(r, 200));
  }
  reviewUrl = `${h.baseUrl}/athletes/${ada.id}/assessments/${assessmentId}/clips/${clipId}/review`;
}, 180_000);
afterAll(async () => {
  await h?.close();
  await dir?.cleanup();
});

async function savedPoints(): Promise<string[]> {
  const body = (await api.get(`/api/clips/${clipId}/annotations`)).body as { landmarks: { points: Record<string, unknown> }[] };
  return body.landmarks.flatMap((row) => Object.keys(row.points)).sort();
}

async function openReview(page: Page): Promise<void> {
  await page.goto(reviewUrl);
  await page.locator('app-frame-viewer canvas').waitFor();
  await expect.poll(() => page.locator('.save span').first().textContent()).toContain('Saved');
}

async function clickFrame(page: Page, fx: number, fy: number): Promise<void> {
  const box = (await page.locator('app-frame-viewer canvas').boundingBox())!;
  await page.mouse.click(box.x + box.width * fx, box.y + box.height * fy);
}

describe('review: unsaved marks', () => {
  it('keeps marks whose save met an ended session and saves them once the coach signs in again', async () => {
    const { context, page } = await h.newPage();
    await h.signIn(page, coach.email, coach.password);
    await openReview(page);
    const before = (await savedPoints()).length;
    // The marks' save is held until the session has ended (signed out in another tab).
    let release: () => void = () => undefined;
    const held = new Promise<void>((resolve) => (release = resolve));
    await page.route('**/api/clips/*/annotations', async (r) => {
      if (r.request().method() === 'PUT') await held;
      await r.continue();
    });
    await clickFrame(page, 0.45, 0.3); // shoulder
    await clickFrame(page, 0.47, 0.5); // hip
    await expect.poll(() => page.locator('.save span').first().textContent()).toContain('Saving');
    const other = await context.newPage();
    await other.goto(`${h.baseUrl}/athletes`);
    const status = await other.evaluate(async () => {
      const token = decodeURIComponent(document.cookie.match(/XSRF-TOKEN=([^;]+)/)?.[1] ?? '');
      return (await fetch('/api/auth/sign-out', { method: 'POST', headers: { 'X-XSRF-TOKEN': token } })).status;
    });
    expect(status).toBe(204);
    await other.close();
    release();
    // The save is refused (the client's one resend with a fresh token meets the ended session): the
    // coach is sent to sign in, or told in a sentence to reload or sign in, and does so.
    await expect.poll(async () => page.url().includes('/sign-in') || !!(await page.locator('.save-problem').count())).toBe(true);
    if (!page.url().includes('/sign-in')) {
      const problem = (await page.locator('.save-problem').textContent()) ?? '';
      expect(problem).toMatch(/reload the page|sign in/i);
      if (/reload the page/i.test(problem)) {
        page.on('dialog', (d) => void d.accept());
        await page.reload();
      }
      await page.waitForURL(/\/sign-in\?returnUrl=/);
    }
    expect(await savedPoints()).toHaveLength(before);

    await page.getByLabel('E-mail').fill(coach.email);
    await page.getByLabel('Password', { exact: true }).fill(coach.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/review$/);
    await expect.poll(() => page.locator('mat-snack-bar-container').textContent()).toContain('were put back');
    await expect.poll(async () => (await savedPoints()).length).toBe(before + 2);
    await expect.poll(() => page.locator('.save span').first().textContent()).toContain('Saved');
    await context.close();
  });

  it('puts back marks a reload cut off before they were saved, and forgets them after "Leave and discard"', async () => {
    const { context, page } = await h.newPage();
    await h.signIn(page, coach.email, coach.password);
    await openReview(page);
    const before = (await savedPoints()).length;
    await page.getByRole('button', { name: 'One frame forward' }).click();
    await expect.poll(() => page.locator('.frame-no strong').textContent()).toBe('1');
    const cut = (r: import('playwright-core').Route) => (r.request().method() === 'PUT' ? r.abort('connectionreset') : r.continue());
    await page.route('**/api/clips/*/annotations', cut);
    await clickFrame(page, 0.5, 0.3);
    await expect.poll(() => page.locator('.save span').first().textContent()).toContain('Offline');
    await page.unroute('**/api/clips/*/annotations', cut);
    page.on('dialog', (d) => void d.accept());
    await page.reload();
    await page.locator('app-frame-viewer canvas').waitFor();
    await expect.poll(async () => (await savedPoints()).length).toBe(before + 1);
    await page.locator('mat-snack-bar-container button').click();

    // A mark left behind on purpose does not come back.
    await page.route('**/api/clips/*/annotations', cut);
    await page.getByRole('button', { name: 'Last frame' }).click();
    await expect.poll(() => page.locator('.frame-no strong').textContent()).not.toBe('0');
    await clickFrame(page, 0.5, 0.6);
    await expect.poll(() => page.locator('.save span').first().textContent()).toContain('Offline');
    await page.getByRole('link', { name: 'Athletes' }).first().click();
    await page.getByRole('button', { name: 'Leave and discard' }).click();
    await page.waitForURL(/\/athletes$/);
    await page.unroute('**/api/clips/*/annotations', cut);
    await openReview(page);
    await page.waitForTimeout(1500);
    expect(await savedPoints()).toHaveLength(before + 1);
    expect(await page.locator('mat-snack-bar-container').count()).toBe(0);
    await context.close();
  });
});
