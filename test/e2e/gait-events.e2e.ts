/**
 * Proposed gait events and gait-cycle curves in Debian chromium. Two synthetic runner clips (a
 * synthetic fixture with known truth — not a real person or a published dataset; ~4° and ~11° hip
 * extension at toe-off) are marked on every frame through the API; the Re-test clip's events are
 * then removed. The coach opens its review, asks for proposed events (coordinate method refined for
 * running: Zeni et al. 2008, Fellin et al. 2010 [pub], as quoted in REFERENCES.md), sees them listed
 * as proposed, accepts them all, and reads the gait-cycle curves in the Measures tab; the Re-test
 * comparison then shows baseline and re-test curves together. At 1440×900 and 390×844, with screenshots.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { Client } from '../support/test-app';
import { tempDir } from '../server/media/fixtures';
import { canvasDrawn, markDemoVisits } from './marked-clip';
import type { ClipAnnotations } from '../../src/contracts/annotations';

const [, coach] = DEMO_SIGN_INS;
let h: Harness;
let dir: { dir: string; cleanup: () => Promise<void> };
let visits: Awaited<ReturnType<typeof markDemoVisits>>;
let api: Client;

beforeAll(async () => {
  h = await startHarness();
  dir = await tempDir('e2e-gait-events');
  visits = await markDemoVisits(h, dir.dir);
  api = new Client(h.baseUrl);
  await api.signIn(coach.email, coach.password);
}, 300_000);
afterAll(async () => {
  await h?.close();
  await dir?.cleanup();
});

/** Removes every event of the Re-test clip (landmarks stay), so proposals start from nothing. */
async function clearRetestEvents(): Promise<void> {
  const id = visits.retest.clipId;
  const a = (await api.get(`/api/clips/${id}/annotations`)).body as ClipAnnotations;
  const res = await api.put(`/api/clips/${id}/annotations`, {
    baseRevision: a.revision,
    landmarks: a.landmarks,
    events: [],
    scale: a.scale,
  });
  expect(res.status).toBe(200);
}

async function signIn(page: Page): Promise<void> {
  await page.goto(`${h.baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(coach.email);
  await page.getByLabel('Password', { exact: true }).fill(coach.password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/\/athletes$/);
}

describe('proposed events and gait-cycle curves', () => {
  for (const [w, hgt, tag] of [
    [1440, 900, 'desktop'],
    [390, 844, 'phone'],
  ] as const) {
    it(`${w}×${hgt}: propose, see them as proposed, accept all, read the curves; the comparison shows both visits' curves`, async () => {
      await clearRetestEvents();
      const { page, context, problems } = await h.newPage();
      await page.setViewportSize({ width: w, height: hgt });
      await signIn(page);
      const { athleteId, retest } = visits;
      await page.goto(`${h.baseUrl}/athletes/${athleteId}/assessments/${retest.assessmentId}/clips/${retest.clipId}/review`);
      await page.getByRole('tab', { name: /Events/ }).click();
      await page.getByRole('button', { name: 'Propose from landmarks' }).click();
      await expect.poll(() => page.getByRole('status').filter({ hasText: 'events proposed' }).count(), { timeout: 20_000 }).toBe(1);
      const proposedRows = page.locator('.events li.origin-proposed');
      // 6 s at 60 fps: about 8 contacts and 8 toe-offs a side.
      await expect.poll(() => proposedRows.count()).toBeGreaterThanOrEqual(24);
      await expect.poll(() => page.locator('.tick.proposed').count()).toBeGreaterThanOrEqual(24);
      await page.locator('.proposals').scrollIntoViewIfNeeded();
      await page.screenshot({ path: path.join(SCREENSHOTS, `events-proposed-${tag}.png`) });

      await page.getByRole('button', { name: /^Accept all \d+$/ }).click();
      await expect.poll(() => proposedRows.count()).toBe(0);
      await expect.poll(() => page.locator('.events li.origin-accepted').count()).toBeGreaterThanOrEqual(24);
      await expect.poll(() => page.getByText('Saved', { exact: true }).count(), { timeout: 15_000 }).toBeGreaterThan(0);

      await page.getByRole('tab', { name: 'Measures' }).click();
      const chart = 'app-cycle-panel app-gait-cycle-chart canvas';
      await page.locator(chart).scrollIntoViewIfNeeded();
      await expect.poll(() => canvasDrawn(page, chart), { timeout: 20_000 }).toBe(true);
      await expect.poll(() => page.locator('app-cycle-panel .legend li').count()).toBe(2);
      expect(await page.locator('app-cycle-panel .legend').textContent()).toMatch(/Right.*strides · toe-off 3\d\.\d% ±/);
      const cyclePanel = page.locator('app-cycle-panel');
      await cyclePanel
        .getByRole('button', { name: 'Knee', exact: true })
        .or(cyclePanel.getByRole('radio', { name: 'Knee', exact: true }))
        .first()
        .click();
      await expect.poll(() => cyclePanel.locator('.cycle-sub').textContent()).toContain('Knee flexion');
      await cyclePanel.scrollIntoViewIfNeeded();
      await page.screenshot({ path: path.join(SCREENSHOTS, `gait-cycle-review-${tag}.png`) });

      await page.goto(`${h.baseUrl}/athletes/${athleteId}/compare`);
      const compareChart = 'section.cycles app-gait-cycle-chart canvas';
      await expect.poll(() => page.locator(compareChart).count(), { timeout: 20_000 }).toBe(1);
      await page.locator(compareChart).scrollIntoViewIfNeeded();
      await expect.poll(() => canvasDrawn(page, compareChart), { timeout: 20_000 }).toBe(true);
      const legend = page.locator('section.cycles .legend');
      await expect.poll(() => legend.textContent()).toContain('Baseline · right');
      expect(await legend.textContent()).toContain('Re-test · right');
      await page.screenshot({ path: path.join(SCREENSHOTS, `gait-cycle-compare-${tag}.png`) });
      expect(problems).toEqual([]);
      await context.close();
    });
  }
});
