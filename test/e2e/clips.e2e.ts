/**
 * Assessments and clips in Debian chromium: a coach creates an assessment, uploads a clip generated
 * with ffmpeg, watches processing reach Ready and sees thumbnails; the athlete uploads a clip to
 * their own assessment from the portal.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { makeClip, tempDir } from '../server/media/fixtures';

const [, coach, , athlete] = DEMO_SIGN_INS;
let h: Harness;
let clipFile: string;
let dir: { dir: string; cleanup: () => Promise<void> };

beforeAll(async () => {
  h = await startHarness();
  dir = await tempDir('e2e-clips');
  clipFile = await makeClip(path.join(dir.dir, 'treadmill-side.mp4'), { fps: 60, width: 640, height: 360, seconds: 2 });
});
afterAll(async () => {
  await h?.close();
  await dir?.cleanup();
});

const signIn = (page: Page, email: string, password: string) => h.signIn(page, email, password);

async function uploadAndWaitReady(page: Page, name: string): Promise<void> {
  await page.locator('input[type=file][multiple]').setInputFiles(clipFile);
  await expect.poll(() => page.getByText('Ready', { exact: true }).count(), { timeout: 60_000 }).toBeGreaterThan(0);
  const thumbs = page.getByRole('list', { name: `Thumbnails of ${name}` }).locator('img');
  await expect.poll(() => thumbs.count()).toBeGreaterThan(0);
  await expect.poll(() => thumbs.first().evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth > 0)).toBe(true);
}

describe('assessments and clips', () => {
  let assessmentId = 0;

  it('coach creates an assessment, uploads a clip and sees it processed with thumbnails', async () => {
    const { page, context, problems } = await h.newPage();
    await signIn(page, coach.email, coach.password);
    const ada = await h.server.db('athletes').where({ email: athlete.email }).first();
    await page.goto(`${h.baseUrl}/athletes/${ada.id}?tab=assessments`);
    await page.getByRole('button', { name: 'New assessment' }).click();
    await page.getByRole('combobox', { name: 'Surface' }).click();
    await page.getByRole('option', { name: 'Treadmill' }).click();
    await page.getByLabel('Speed').fill('10.8');
    await page.getByRole('button', { name: 'Create assessment' }).click();
    await expect.poll(async () => (await h.server.db('assessments').where({ athlete_id: ada.id })).length).toBe(3);
    const created = await h.server.db('assessments').where({ athlete_id: ada.id }).orderBy('id', 'desc').first();
    assessmentId = created.id;
    expect(created.speed_mps).toBeCloseTo(3.0, 6);

    await page.goto(`${h.baseUrl}/athletes/${ada.id}/assessments/${assessmentId}`);
    await uploadAndWaitReady(page, 'treadmill-side.mp4');
    await page.screenshot({ path: path.join(SCREENSHOTS, 'assessment-clips.png'), fullPage: true });
    const clip = await h.server.db('clips').where({ assessment_id: assessmentId }).first();
    expect(clip).toMatchObject({ status: 'ready', frame_count: 120, fps: 60 });
    expect(problems).toEqual([]);
    await context.close();
  });

  it('the athlete uploads a clip to their own assessment from the portal', async () => {
    const { page, context, problems } = await h.newPage();
    await page.setViewportSize({ width: 390, height: 844 });
    await signIn(page, athlete.email, athlete.password);
    await page.goto(`${h.baseUrl}/portal/assessments/${assessmentId}`);
    await page.locator('input[type=file][multiple]').setInputFiles(clipFile);
    await expect
      .poll(async () => (await h.server.db('clips').where({ assessment_id: assessmentId, status: 'ready' })).length, { timeout: 60_000 })
      .toBe(2);
    await expect.poll(() => page.getByText('Ready', { exact: true }).count()).toBe(2);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'portal-assessment-phone.png'), fullPage: true });
    const mine = await h.server.db('clips').where({ assessment_id: assessmentId }).orderBy('id', 'desc').first();
    const user = await h.server.db('users').where({ email: athlete.email }).first();
    expect(mine.uploaded_by).toBe(user.id);
    expect(problems).toEqual([]);
    await context.close();
  });

  it('once the coach has marked a clip, the athlete sees its settings locked and why', async () => {
    const coachClip = await h.server.db('clips').where({ assessment_id: assessmentId }).orderBy('id').first();
    await h.server
      .db('clip_landmarks')
      .insert({ clip_id: coachClip.id, frame: 3, side: 'right', landmark: 'hip', x: 0.5, y: 0.4, origin: 'placed' });
    const { page, context, problems } = await h.newPage();
    await page.setViewportSize({ width: 390, height: 844 });
    await signIn(page, athlete.email, athlete.password);
    await page.goto(`${h.baseUrl}/portal/assessments/${assessmentId}`);
    const marked = page.getByRole('group', { name: `Settings of ${coachClip.original_name}` }).first();
    await expect.poll(() => marked.getByText('Your clinician has marked this clip').count()).toBe(1);
    const toggles = marked.getByRole('radio');
    expect(await toggles.count()).toBe(4);
    for (let i = 0; i < 4; i++) expect(await toggles.nth(i).isDisabled()).toBe(true);
    expect(await marked.getByLabel('Capture frame rate').isDisabled()).toBe(true);
    // The athlete's own, unmarked clip keeps its settings.
    const groups = page.getByRole('group', { name: /^Settings of / });
    expect(await groups.count()).toBe(2);
    expect(await groups.nth(1).getByRole('radio').first().isDisabled()).toBe(false);
    await marked.scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(SCREENSHOTS, 'portal-assessment-locked-phone.png'), fullPage: true });
    expect(problems).toEqual([]);
    await context.close();
  });
});
