/**
 * The demo scenario in Debian chromium: the demo athlete (recovering from a hamstring strain) signs
 * in on a phone (390×844) and finds her running plan — the lengthening stage of staged hamstring
 * loading, with the safety caution — and her coach sees the same plan with the published
 * programme each exercise comes from (REFERENCES.md, "Published exercise programmes" [mem], from
 * memory). The plan is the one `npm start` seeds with the demo clips; here it is inserted on its
 * own, without rendering the clips.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { seedDemoHamstringPlan } from '../../seeds/demo-plans';

const [, coach, , athlete] = DEMO_SIGN_INS;
const PHONE = { width: 390, height: 844 };
const LENGTHENING = ['Hip-flexed knee extension', 'Single-leg forward tilt with reach', 'Gliding split'];

let h: Harness;
let planId = 0;

beforeAll(async () => {
  h = await startHarness();
  const ada = await h.server.db('athletes').where({ email: athlete.email }).first();
  const retest = await h.server.db('assessments').where({ athlete_id: ada.id, kind: 'retest' }).first();
  await seedDemoHamstringPlan(h.server.db, ada.clinic_id, ada, retest.id);
  planId = (await h.server.db('plans').where({ athlete_id: ada.id }).first()).id;
});
afterAll(async () => {
  await h?.close();
});

describe('demo scenario: the demo athlete’s plan', () => {
  it('the demo athlete opens today’s session of her hamstring-strain plan on a phone, with the caution', async () => {
    const { page, context, problems } = await h.newPage();
    await page.setViewportSize(PHONE);
    await h.signIn(page, athlete.email, athlete.password);
    await page.getByRole('link', { name: "Open today's session" }).click();
    await page.waitForURL(/\/portal\/plan$/);
    await expect.poll(() => page.getByRole('heading', { name: "Today's session: Lengthening" }).count()).toBe(1);
    expect(await page.getByText('Hamstring strain: staged loading back to the trails').count()).toBe(1);
    expect(await page.getByText('Stage 2 of 3').count()).toBe(1);
    expect(await page.getByRole('heading', { level: 3 }).allTextContents()).toEqual(LENGTHENING);
    expect(await page.getByText('Stop an exercise that causes sharp or worsening pain').count()).toBe(1);
    // Instructions in the clinic's words; the citation is for the staff, not on the athlete's phone.
    await page.getByRole('button', { name: 'How to do it' }).first().click();
    await expect.poll(() => page.getByText(/Straighten the knee slowly as far as it goes without pain/).count()).toBe(1);
    expect(await page.getByText(/Askling et al\. 2013/).count()).toBe(0);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'demo-portal-plan-phone.png') });
    await page.getByRole('button', { name: 'Hide how to do it' }).first().click();
    await page.getByRole('group', { name: 'Sets done of Gliding split' }).scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(SCREENSHOTS, 'demo-portal-plan-phone-sets.png') });
    expect(problems).toEqual([]);
    await context.close();
  });

  it('the coach sees the plan’s three stages with each exercise’s source', async () => {
    const { page, context, problems } = await h.newPage();
    await page.setViewportSize({ width: 1440, height: 900 });
    await h.signIn(page, coach.email, coach.password);
    await page.goto(`${h.baseUrl}/plans/${planId}`);
    await expect.poll(() => page.getByText('Stage 2 of 3 · Lengthening').count()).toBe(1);
    expect(await page.getByText('Stop an exercise that causes sharp or worsening pain').count()).toBeGreaterThan(0);
    const toggles = page.getByRole('button', { name: 'How to do it' });
    await expect.poll(() => toggles.count()).toBe(9);
    await toggles.nth(3).click();
    // The lengthening programme's first exercise (Askling et al. 2013 [mem]).
    await expect.poll(() => page.getByText(/^Source\s+Askling et al\. 2013, Br J Sports Med 47:953–959/).count()).toBe(1);
    await page.getByText(/^Source\s+Askling/).scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(SCREENSHOTS, 'demo-plan-page-source.png') });
    expect(problems).toEqual([]);
    await context.close();
  });
});
