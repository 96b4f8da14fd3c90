/**
 * Two coaches edit the demo athlete's running hamstring plan at once in Debian chromium: the first saves a
 * longer stage; the second, saving a new title from the older copy, is told a colleague saved
 * since, sees what each changed, keeps the edit on top of the colleague's, and both changes are
 * stored. The plan editor's move and remove buttons are at least 44 px on a phone (common
 * practice: WCAG 2.5.5 target size, from memory).
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { axeProblems } from './axe';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { seedDemoHamstringPlan } from '../../seeds/demo-plans';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';

const [, tobin, ilse, athlete] = DEMO_SIGN_INS;
const PHONE = { width: 390, height: 844 };
const DESKTOP = { width: 1440, height: 900 };
/** The 409 of the stale save shows in the console as a failed resource; anything else is a problem. */
const expectedNoise = (m: string) => /status of 409/.test(m);

let h: Harness;
let planId = 0;

beforeAll(async () => {
  h = await startHarness();
  const ada = await h.server.db('athletes').where({ email: athlete.email }).first();
  const retest = await h.server.db('assessments').where({ athlete_id: ada.id, kind: 'retest' }).first();
  await seedDemoHamstringPlan(h.server.db, ada.clinic_id, ada, retest.id);
  planId = (await h.server.db('plans').where({ athlete_id: ada.id, status: 'active' }).first()).id;
});
afterAll(async () => {
  await h?.close();
});

async function openEditor(page: Page, who: { email: string; password: string }): Promise<void> {
  await h.signIn(page, who.email, who.password);
  await page.goto(`${h.baseUrl}/plans/${planId}/edit`);
  await page.getByRole('group', { name: 'Stage 2' }).waitFor();
}

describe('two coaches editing one plan', () => {
  it('the later save is told of the earlier one, shows both changes, and keeps both on “Keep my changes”', async () => {
    const first = await h.newPage();
    const second = await h.newPage();
    await openEditor(first.page, tobin);
    await openEditor(second.page, ilse);
    await second.page.setViewportSize(DESKTOP);

    // Tobin lengthens stage 2 and saves.
    const weeks = first.page.getByRole('group', { name: 'Stage 2' }).getByLabel('Target duration');
    const before = Number(await weeks.inputValue());
    await weeks.fill(String(before + 2));
    await first.page.getByRole('button', { name: 'Save plan' }).click();
    await first.page.waitForURL(new RegExp(`/plans/${planId}$`));

    // Ilse, from the copy she opened before, renames the plan and saves.
    const title = second.page.getByLabel('Title');
    await title.fill('Hamstring plan, from week 4');
    await second.page.getByRole('button', { name: 'Save plan' }).click();
    const panel = second.page.getByRole('alert').filter({ hasText: 'A colleague saved this plan after you opened it' });
    await panel.waitFor();
    await expect
      .poll(() => panel.getByRole('region', { name: 'Their save changed' }).textContent())
      .toContain(`target duration (${before} → ${before + 2} weeks) changed`);
    expect(await panel.getByRole('region', { name: 'Your unsaved changes' }).textContent()).toContain('→ “Hamstring plan, from week 4”');
    // No other message tells her to reload and type her changes again.
    expect(await second.page.getByText('make your changes again').count()).toBe(0);
    // Nothing she typed is lost while she chooses.
    expect(await title.inputValue()).toBe('Hamstring plan, from week 4');
    expect(await axeProblems(second.page, 'app-plan-conflict')).toEqual([]);
    await second.page.screenshot({ path: path.join(SCREENSHOTS, 'plan-conflict-desktop.png') });
    await second.page.setViewportSize(PHONE);
    await panel.scrollIntoViewIfNeeded();
    await second.page.screenshot({ path: path.join(SCREENSHOTS, 'plan-conflict-phone.png') });

    // On a phone each move and remove button of a stage or exercise is a target of at least 44 × 44 px.
    const sizes = await second.page.locator('app-reorder-buttons button').evaluateAll((buttons) =>
      buttons.map((b) => {
        const r = b.getBoundingClientRect();
        return Math.min(r.width, r.height);
      }),
    );
    expect(sizes.length).toBeGreaterThan(3);
    expect(Math.min(...sizes)).toBeGreaterThanOrEqual(44);
    await second.page.getByRole('group', { name: 'Stage 3' }).scrollIntoViewIfNeeded();
    await second.page.screenshot({ path: path.join(SCREENSHOTS, 'plan-editor-stages-phone.png') });

    await panel.getByRole('button', { name: 'Keep my changes' }).click();
    await second.page.waitForURL(new RegExp(`/plans/${planId}$`));
    const stored = await h.server.db('plans').where({ id: planId }).first();
    expect(stored.title).toBe('Hamstring plan, from week 4');
    const stages = await h.server.db('plan_stages').where({ plan_id: planId }).orderBy('position');
    expect(stages[1].target_weeks).toBe(before + 2);

    expect(first.problems).toEqual([]);
    expect(second.problems.filter((m) => !expectedNoise(m))).toEqual([]);
    await first.context.close();
    await second.context.close();
  });
});
