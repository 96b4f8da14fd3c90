/**
 * Assessments and clips in Debian chromium: a coach creates an assessment, uploads a clip generated
 * with ffmpeg (as a resumable tus upload carrying the CSRF header), watches processing reach Ready
 * and sees thumbnails; the athlete uploads a clip to their own assessment from the portal; an
 * upload whose connection drops shows "reconnecting" and continues, and after a reload the same
 * file resumes from the bytes the server holds, to a stored original with the source's SHA-256.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { makeClip, tempDir } from '../server/media/fixtures';
import { UPLOAD } from '../../src/contracts/assessment';

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
    const sent: { method: string; url: string; xsrf: boolean }[] = [];
    page.on('request', (r) => {
      if (r.url().includes('/clip-uploads')) sent.push({ method: r.method(), url: r.url(), xsrf: Boolean(r.headers()['x-xsrf-token']) });
    });
    await uploadAndWaitReady(page, 'treadmill-side.mp4');
    // The clip went as a resumable upload: created, then its bytes, each request with the CSRF header.
    expect(sent.map((r) => r.method)).toEqual(['POST', 'PATCH']);
    expect(sent.every((r) => r.xsrf)).toBe(true);
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
    await expect.poll(() => page.getByText('Ready', { exact: true }).count()).toBe(1);
    // The coach uploaded this very file (same name and size) before: it is held back, not sent twice
    // unless the athlete asks.
    await page.locator('input[type=file][multiple]').setInputFiles(clipFile);
    await expect.poll(() => page.getByText(/^This file is already in this assessment/).count()).toBe(1);
    await page.waitForTimeout(1_000);
    expect((await h.server.db('clips').where({ assessment_id: assessmentId })).length).toBe(1);
    await page.getByRole('button', { name: 'Upload anyway' }).click();
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

  it('a dropped connection shows reconnecting and continues; after a reload the same file resumes from what the server holds', async () => {
    // Three chunks of 4 MiB (UPLOAD.chunkBytes): the first is acknowledged, the second's connection drops.
    const big = await makeClip(path.join(dir.dir, 'long-run.mp4'), { fps: 60, width: 1280, height: 720, seconds: 6 });
    const size = fs.statSync(big).size;
    expect(size).toBeGreaterThan(2 * UPLOAD.chunkBytes);
    const { page, context, problems } = await h.newPage();
    await signIn(page, coach.email, coach.password);
    const ada = await h.server.db('athletes').where({ email: athlete.email }).first();
    await page.goto(`${h.baseUrl}/athletes/${ada.id}/assessments/${assessmentId}`);
    const offsets: number[] = [];
    page.on('response', (r) => {
      if (r.request().method() === 'HEAD' && r.url().includes('/clip-uploads/')) offsets.push(Number(r.headers()['upload-offset']));
      if (r.url().includes('/clip-uploads')) answers.push(`${r.request().method()} ${r.status()} ${r.headers()['upload-offset'] ?? ''}`);
    });
    const answers: string[] = [];
    const status = page.locator('li.upload .upload-status').first();

    // The network: PATCH 1 goes through, then there is no connection (HEAD and PATCH fail) until
    // it is back for the second chunk; the third finds none again (the tab is reloaded while it retries).
    let patches = 0;
    let refused = 0;
    let connected = false;
    await page.route('**/clip-uploads/*', async (route) => {
      const method = route.request().method();
      if (method === 'POST' || (patches === 0 && method === 'HEAD')) return route.continue();
      if (method === 'PATCH') patches += 1;
      const offset = Number(route.request().headers()['upload-offset'] ?? 0);
      if (method === 'PATCH' && offset >= 2 * UPLOAD.chunkBytes) connected = false;
      if (patches === 1 || connected) return route.continue();
      refused += 1;
      return route.abort('internetdisconnected');
    });
    await page.locator('input[type=file][multiple]').setInputFiles(big);
    await expect.poll(() => status.textContent(), { timeout: 30_000 }).toMatch(/^Connection lost — reconnecting… \(\d+ % kept\)$/);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'clip-upload-reconnecting.png') });
    // Retries that find no connection keep it saying so.
    await expect.poll(() => refused, { timeout: 30_000 }).toBeGreaterThanOrEqual(3);
    expect(await status.textContent()).toMatch(/^Connection lost — reconnecting…/);
    connected = true;
    // It continues by itself from the offset the server answers (the first chunk's end).
    await expect.poll(() => offsets.includes(UPLOAD.chunkBytes), { timeout: 30_000 }).toBe(true);
    await expect.poll(() => answers.includes(`PATCH 204 ${2 * UPLOAD.chunkBytes}`), { timeout: 30_000 }).toBe(true);
    await expect.poll(() => status.textContent(), { timeout: 30_000 }).toMatch(/^Connection lost — reconnecting… \(\d+ % kept\)$/);

    // The tab is reloaded mid-upload; the same file chosen again continues from the second chunk's end.
    await page.reload();
    await page.unrouteAll({ behavior: 'ignoreErrors' });
    const before = offsets.length;
    await page.locator('input[type=file][multiple]').setInputFiles(big);
    await expect.poll(() => offsets.length > before, { timeout: 30_000 }).toBe(true);
    expect(offsets[before], answers.join('\n')).toBe(2 * UPLOAD.chunkBytes);
    await expect
      .poll(async () => (await h.server.db('clips').where({ assessment_id: assessmentId, original_name: 'long-run.mp4' })).length, {
        timeout: 60_000,
      })
      .toBe(1);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'clip-upload-resumed.png') });
    const made = await h.server.db('clips').where({ assessment_id: assessmentId, original_name: 'long-run.mp4' }).first();
    const digest = (f: string) => crypto.createHash('sha256').update(fs.readFileSync(f)).digest('hex');
    // Outside reference: the source file's own bytes.
    expect(digest(path.join(h.server.config.uploadsDir, 'clips', String(made.id), 'original.mp4'))).toBe(digest(big));
    await expect.poll(() => page.getByText('Ready', { exact: true }).count(), { timeout: 120_000 }).toBeGreaterThan(2);
    // Only the dropped requests complain (the browser logs each failed request); nothing else.
    expect(problems.filter((p) => !/ERR_INTERNET_DISCONNECTED|Failed to load resource/.test(p))).toEqual([]);
    await context.close();
  }, 300_000);
});
