/**
 * Compare visits in Debian chromium: two synthetic runner clips (a test fixture with known joint
 * angles — not a published source; ~4° and ~11° hip extension at toe-off, 6 s: 8 toe-offs a side,
 * past the 7 steps of Dingenen et al. 2018 [pub]) marked on every frame through the API, one on
 * the Baseline and one on the Re-test. The coach opens "Compare visits", which opens at toe-off;
 * sees both frames at the same toe-off with labels of at least 12 CSS px, steps with ] and [ (and
 * ← → after clicking a toggle),
 * switches to the overlay (both skeletons and a legend), reads the hip-extension change as beyond
 * measurement error and better ([calc] half of Damsted et al. 2015's 11° hip width = 5.5°; more
 * extension toward the textbook ~10° [trade]) and sees the trend chart with its unit and the
 * caution line — at 1440×900 and on a 390×844 phone, with screenshots of each.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { tempDir } from '../server/media/fixtures';
import { canvasDrawn, markDemoVisits } from './marked-clip';

const [, coach] = DEMO_SIGN_INS;
let h: Harness;
let dir: { dir: string; cleanup: () => Promise<void> };
let athleteId = 0;

beforeAll(async () => {
  h = await startHarness();
  dir = await tempDir('e2e-compare');
  athleteId = (await markDemoVisits(h, dir.dir)).athleteId;
}, 240_000);
afterAll(async () => {
  await h?.close();
  await dir?.cleanup();
});

const drawn = (selector: string) => (page: import('playwright-core').Page) => canvasDrawn(page, selector);

describe('compare visits', () => {
  for (const [w, hgt, tag] of [
    [1440, 900, 'desktop'],
    [390, 844, 'phone'],
  ] as const) {
    it(`${w}×${hgt}: both visits at the same toe-off, readable labels, steps together, overlay with legend, the change judged with its direction, trend with unit`, async () => {
      const { page, context, problems } = await h.newPage();
      await page.setViewportSize({ width: w, height: hgt });
      await page.goto(`${h.baseUrl}/sign-in`);
      await page.getByLabel('E-mail').fill(coach.email);
      await page.getByLabel('Password', { exact: true }).fill(coach.password);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.waitForURL(/\/athletes$/);
      await page.goto(`${h.baseUrl}/athletes/${athleteId}`);
      await page.getByRole('tab', { name: 'Assessments' }).click();
      await page.getByRole('link', { name: 'Compare visits' }).click();
      await page.waitForURL(/compare$/);

      await expect
        .poll(() => page.getByText("These figures support, and do not replace, a licensed clinician's judgement.").count())
        .toBe(1);
      const hipRow = page.locator('tr', { hasText: 'Hip extension at toe-off (thigh from vertical, right)' });
      await expect.poll(() => hipRow.textContent(), { timeout: 20_000 }).toContain('Beyond measurement error · better');
      // Baseline → Re-test: on a phone the visits stack and the arrow between them points down.
      const arrowTurn = await page.locator('.pickers > mat-icon').evaluate((i) => {
        const t = getComputedStyle(i).transform;
        const m = new DOMMatrix(t === 'none' ? undefined : t);
        return Math.round((Math.atan2(m.b, m.a) * 180) / Math.PI);
      });
      expect(arrowTurn).toBe(tag === 'phone' ? 90 : 0);
      // The page opens at toe-off, where the headline measure is read.
      await expect.poll(() => page.locator('.event-field mat-select').textContent()).toContain('Toe-off');
      for (const label of ['Baseline frame with skeleton', 'Re-test frame with skeleton']) {
        const canvas = `canvas[aria-label="${label}"]`;
        await expect.poll(() => drawn(canvas)(page), { timeout: 20_000 }).toBe(true);
        // Labels sized in view pixels: at least 12 CSS px however small the frame is shown.
        await expect.poll(async () => Number(await page.locator(canvas).getAttribute('data-label-px'))).toBeGreaterThanOrEqual(12);
      }
      const stepText = () => page.getByText(/^Step \d+ of \d+$/).textContent();
      expect(await stepText()).toMatch(/^Step 1 of [2-9]/);
      await page.locator('h1').click();
      await page.keyboard.press(']');
      await expect.poll(stepText).toMatch(/^Step 2 of/);
      await page.keyboard.press('[');
      await expect.poll(stepText).toMatch(/^Step 1 of/);
      // After a click on a toggle the arrows still step both visits (the toggle does not take them).
      await page.getByRole('radio', { name: 'Right' }).click();
      await page.keyboard.press('ArrowRight');
      await expect.poll(stepText).toMatch(/^Step 2 of/);
      await page.keyboard.press('ArrowLeft');
      await expect.poll(stepText).toMatch(/^Step 1 of/);
      expect(await page.getByRole('radio', { name: 'Right' }).getAttribute('aria-checked')).toBe('true');
      await page.locator('.canvases').scrollIntoViewIfNeeded();
      await page.screenshot({ path: path.join(SCREENSHOTS, `compare-side-by-side-${tag}.png`), fullPage: true });

      await page
        .getByRole('radio', { name: 'Overlay' })
        .or(page.getByRole('button', { name: 'Overlay' }))
        .first()
        .click();
      const overlay = 'canvas[aria-label="Re-test frame with both skeletons"]';
      await expect.poll(() => drawn(overlay)(page), { timeout: 20_000 }).toBe(true);
      await expect.poll(async () => Number(await page.locator(overlay).getAttribute('data-label-px'))).toBeGreaterThanOrEqual(12);
      const legend = page.getByRole('list', { name: 'Skeletons' });
      await expect.poll(() => legend.textContent()).toContain('Baseline');
      expect(await legend.textContent()).toContain('dashed, lighter');
      await page.locator('figure.overlay').scrollIntoViewIfNeeded();
      await page.screenshot({ path: path.join(SCREENSHOTS, `compare-overlay-${tag}.png`) });

      await expect.poll(() => page.locator('.trends canvas[basechart]').count()).toBe(1);
      await expect.poll(() => page.locator('.chart-key').textContent()).toContain('Degrees (°)');
      await page.locator('.trends').scrollIntoViewIfNeeded();
      await page.screenshot({ path: path.join(SCREENSHOTS, `compare-trends-${tag}.png`) });
      await page.screenshot({ path: path.join(SCREENSHOTS, `compare-page-${tag}.png`), fullPage: true });
      expect(problems).toEqual([]);
      await context.close();
    });
  }
});
