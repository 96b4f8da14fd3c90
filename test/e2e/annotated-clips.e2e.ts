/**
 * Annotated clips in Debian chromium: two synthetic runner clips (a test fixture with known joint
 * angles and gait events — not a published source) marked through the API on the Baseline and the
 * Re-test. The coach (1440×900) makes a side-by-side clip on the Re-test comparison, watches it
 * render on the Shared tab, previews it in the app and publishes it. The athlete, on a 390×844
 * phone, plays it inline on the portal home and steps one frame; the notice e-mail carries no
 * caption and no measures.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { tempDir } from '../server/media/fixtures';
import { canvasDrawn, markDemoVisits } from './marked-clip';

const [, coach, , athlete] = DEMO_SIGN_INS;
const DESKTOP = { width: 1440, height: 900 };
const PHONE = { width: 390, height: 844 };
const CAPTION = 'Then and now: watch the hip pass further behind you before the foot leaves the belt.';
const shot = (name: string) => path.join(SCREENSHOTS, name);

let h: Harness;
let dir: { dir: string; cleanup: () => Promise<void> };
let athleteId = 0;
let retest = { assessmentId: 0, clipId: 0 };

beforeAll(async () => {
  h = await startHarness();
  dir = await tempDir('e2e-annotated');
  const marked = await markDemoVisits(h, dir.dir);
  athleteId = marked.athleteId;
  retest = marked.retest;
}, 240_000);
afterAll(async () => {
  await h?.close();
  await dir?.cleanup();
});

/** The player's video: loaded with its first frame decoded, and where it stands. */
const videoState = (page: Page, scope: string) =>
  page.locator(`${scope} video`).evaluate((v: HTMLVideoElement) => ({
    ready: v.readyState >= 2 && v.videoWidth > 0,
    width: v.videoWidth,
    time: v.currentTime,
    paused: v.paused,
    error: v.error?.message ?? null,
  }));

describe('annotated clips', () => {
  it('coach makes, previews and publishes a side-by-side clip; the athlete plays it on a phone and steps a frame', async () => {
    // ── Coach, desktop ──
    const coachContext = await h.browser.newContext({ viewport: DESKTOP });
    const page = await coachContext.newPage();
    const problems: string[] = [];
    page.on('console', (m) => m.type() === 'error' && problems.push(m.text()));
    page.on('pageerror', (e) => problems.push(e.message));
    await h.signIn(page, coach.email, coach.password);

    // From the review: two strides around the current frame by default, at 1/4 speed.
    await page.goto(`${h.baseUrl}/athletes/${athleteId}/assessments/${retest.assessmentId}/clips/${retest.clipId}/review`);
    await expect.poll(() => page.getByText(/^Frame \d+ \/ \d+/).count(), { timeout: 20_000 }).toBe(1);
    await page.getByRole('button', { name: 'Make clip' }).click();
    const single = page.getByRole('dialog', { name: 'Make annotated clip' });
    // 60 fps runner, 42-frame strides (truth): 85 frames from frame 0 → 85 ÷ 15 = 5.7 s at 1/4 speed.
    await expect.poll(() => single.textContent()).toContain('85 frames → 5.7 s at 1/4 speed');
    expect(await single.getByLabel('First frame').inputValue()).toBe('0');
    expect(await single.getByLabel('Last frame').inputValue()).toBe('84');
    await page.screenshot({ path: shot('annotated-clip-review-dialog.png') });
    await single.getByRole('button', { name: 'Make clip' }).click();
    await expect.poll(() => page.getByText('Annotated clip started — rendering…').count()).toBe(1);

    await page.goto(`${h.baseUrl}/athletes/${athleteId}/compare`);
    await expect.poll(() => canvasDrawn(page, 'canvas[aria-label="Re-test frame with skeleton"]'), { timeout: 20_000 }).toBe(true);
    await page.getByRole('button', { name: 'Side-by-side clip' }).click();
    const dialog = page.getByRole('dialog', { name: 'Make side-by-side clip' });
    await dialog
      .getByRole('radio', { name: '1/2 speed' })
      .or(dialog.getByRole('button', { name: '1/2 speed' }))
      .first()
      .click();
    await dialog.getByLabel('Caption').fill(CAPTION);
    await page.screenshot({ path: shot('annotated-clip-dialog.png') });
    await dialog.getByRole('button', { name: 'Make clip' }).click();
    await expect.poll(() => page.getByText('Annotated clip started — rendering…').count()).toBe(1);
    await page.getByRole('button', { name: 'View shared items' }).click();
    await page.waitForURL(/tab=shared/);

    const card = page.locator('li.clip-card').filter({ hasText: 'Then and now' });
    await expect.poll(() => card.count(), { timeout: 20_000 }).toBe(1);
    await card.scrollIntoViewIfNeeded();
    await page.screenshot({ path: shot('annotated-clip-shared-tab-rendering.png') });
    await expect.poll(() => card.getByRole('button', { name: /^Preview/ }).count(), { timeout: 120_000 }).toBe(1);
    expect(await card.textContent()).toContain('1/2 speed');
    expect(await card.textContent()).toMatch(/landmarks marked on/i);
    await page.screenshot({ path: shot('annotated-clip-shared-tab.png'), fullPage: true });

    // Preview in the app: the video loads and shows its first frame.
    await card.getByRole('button', { name: /^Preview/ }).click();
    const preview = page.getByRole('dialog');
    await expect.poll(() => videoState(page, 'mat-dialog-container').then((s) => s.ready), { timeout: 20_000 }).toBe(true);
    expect((await videoState(page, 'mat-dialog-container')).width).toBeLessThanOrEqual(1280);
    await page.screenshot({ path: shot('annotated-clip-preview.png') });
    await preview.getByRole('button', { name: 'Close' }).click();
    await expect.poll(() => page.getByRole('dialog').count()).toBe(0);

    await card.getByRole('button', { name: 'Publish clip', exact: true }).click();
    const confirm = page.getByRole('dialog');
    await expect.poll(() => confirm.textContent(), { timeout: 8000 }).toContain('e-mail notice');
    await confirm.getByRole('button', { name: 'Publish and notify' }).click();
    await expect.poll(() => card.getByRole('button', { name: 'Unpublish clip', exact: true }).count()).toBe(1);
    expect(problems).toEqual([]);
    await coachContext.close();

    // ── The notice e-mail: no caption, no measures ──
    const mails = await h.server.db('mailbox_messages').where('to_address', 'like', `%${athlete.email}%`).orderBy('id');
    const notice = mails.filter((m) => /shared something/.test(m.subject)).at(-1)!;
    const text = `${notice.subject}\n${notice.text}\n${notice.html ?? ''}`;
    expect(text).toContain('annotated slow-motion clip');
    expect(text).not.toContain('Then and now');
    expect(text).not.toMatch(/\d\s*°|degrees|Hip extension/i);

    // ── Athlete, phone ──
    const phone = await h.browser.newContext({ viewport: PHONE, isMobile: true, hasTouch: true, deviceScaleFactor: 2 });
    const p = await phone.newPage();
    const athleteProblems: string[] = [];
    p.on('console', (m) => m.type() === 'error' && athleteProblems.push(m.text()));
    p.on('pageerror', (e) => athleteProblems.push(e.message));
    await h.signIn(p, athlete.email, athlete.password);
    await p.goto(`${h.baseUrl}/portal`);
    const section = p.locator('app-portal-clips');
    await expect.poll(() => section.getByText('Clips from your clinic').count(), { timeout: 20_000 }).toBe(1);
    await section.scrollIntoViewIfNeeded();
    await expect.poll(() => videoState(p, 'app-portal-clips').then((s) => s.ready), { timeout: 20_000 }).toBe(true);
    // The player fits the phone's width.
    const box = (await section.locator('video').boundingBox())!;
    expect(box.width).toBeLessThanOrEqual(PHONE.width);
    await p.screenshot({ path: shot('annotated-clip-portal-phone.png') });

    // Play, then pause: the video moved on.
    await section.getByRole('button', { name: 'Play' }).click();
    await expect.poll(() => videoState(p, 'app-portal-clips').then((s) => s.time), { timeout: 10_000 }).toBeGreaterThan(0.3);
    await section.getByRole('button', { name: 'Pause' }).click();
    await expect.poll(() => videoState(p, 'app-portal-clips').then((s) => s.paused)).toBe(true);
    // One frame on: "Frame n of N" moves by one.
    const position = section.locator('.position');
    const before = Number(/Frame (\d+)/.exec((await position.textContent()) ?? '')?.[1]);
    await section.getByRole('button', { name: 'One frame on' }).click();
    await expect.poll(async () => Number(/Frame (\d+)/.exec((await position.textContent()) ?? '')?.[1])).toBe(before + 1);
    await section.getByRole('button', { name: 'One frame back' }).click();
    await expect.poll(async () => Number(/Frame (\d+)/.exec((await position.textContent()) ?? '')?.[1])).toBe(before);
    await p.screenshot({ path: shot('annotated-clip-portal-phone-stepped.png') });
    expect(athleteProblems).toEqual([]);
    await phone.close();
  });
});
