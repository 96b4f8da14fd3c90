/**
 * Compare visits in Debian chromium: two synthetic runner clips (a test fixture with known joint
 * angles — not a published source; ~4° and ~11° hip extension at toe-off) marked on every frame
 * through the API, one on the Baseline and one on the Re-test. The coach opens "Compare visits",
 * sees both frames at the same initial contact, steps with ] and [ (and ← → after clicking a
 * toggle), switches to the overlay, reads
 * the hip-extension change as beyond measurement error ([calc] half of Damsted et al. 2015's 11°
 * hip width = 5.5°) and sees the trend chart and the caution line.
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
  it('shows both visits at the same event, steps together, overlays, and judges the change', async () => {
    const { page, context, problems } = await h.newPage();
    await page.goto(`${h.baseUrl}/sign-in`);
    await page.getByLabel('E-mail').fill(coach.email);
    await page.getByLabel('Password', { exact: true }).fill(coach.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/athletes$/);
    await page.goto(`${h.baseUrl}/athletes/${athleteId}`);
    await page.getByRole('tab', { name: 'Assessments' }).click();
    await page.getByRole('link', { name: 'Compare visits' }).click();
    await page.waitForURL(/compare$/);

    await expect.poll(() => page.getByText("These figures support, and do not replace, a licensed clinician's judgement.").count()).toBe(1);
    const hipRow = page.locator('tr', { hasText: 'Hip extension at toe-off (thigh from vertical) (right)' });
    await expect.poll(() => hipRow.textContent(), { timeout: 20_000 }).toContain('Beyond measurement error');
    await expect.poll(() => drawn('canvas[aria-label="Baseline frame with skeleton"]')(page), { timeout: 20_000 }).toBe(true);
    await expect.poll(() => drawn('canvas[aria-label="Re-test frame with skeleton"]')(page), { timeout: 20_000 }).toBe(true);
    const stepText = () => page.getByText(/^Step \d+ of \d+$/).textContent();
    expect(await stepText()).toMatch(/^Step 1 of [2-9]/);
    await page.locator('body').click({ position: { x: 5, y: 5 } });
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
    await page.screenshot({ path: path.join(SCREENSHOTS, 'compare-side-by-side.png'), fullPage: true });

    await page.getByRole('radio', { name: 'Overlay' }).or(page.getByRole('button', { name: 'Overlay' })).first().click();
    await expect.poll(() => drawn('canvas[aria-label="Re-test frame with both skeletons"]')(page), { timeout: 20_000 }).toBe(true);
    await expect.poll(() => page.locator('canvas[basechart]').count()).toBe(1);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'compare-overlay.png'), fullPage: true });
    expect(problems).toEqual([]);
    await context.close();
  });
});
