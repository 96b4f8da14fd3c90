/**
 * Accessibility walk in Debian chromium: every main page and dialog, for each role, judged by
 * axe-core (npm; the WCAG 2 A/AA rules it ships): no critical and no serious violation. Staff pages
 * at 1440×900; the signed-out pages and the athlete's portal also on a 390×844 phone. The demo
 * scenario supplies the data; two synthetic runner clips (marked through the API) give the review
 * workspace, the Re-test comparison, a rendered, published still and annotated clip. Each checked view leaves a
 * screenshot `a11y-*.png`.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Locator, Page } from 'playwright-core';
import { axeProblems } from './axe';
import { SCREENSHOTS, lastMailLink, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { seedDemoHamstringPlan } from '../../seeds/demo-plans';
import { Client } from '../support/test-app';
import { tempDir } from '../server/media/fixtures';
import { markDemoVisits } from './marked-clip';

const [owner, coach, , athlete] = DEMO_SIGN_INS;
const DESKTOP = { width: 1440, height: 900 };
const PHONE = { width: 390, height: 844 };

let h: Harness;
let dir: { dir: string; cleanup: () => Promise<void> };
let adaId = 0;
let baseline = { assessmentId: 0, clipId: 0 };
let retest = { assessmentId: 0, clipId: 0 };
let planId = 0;
let resetLink = '';
let inviteLink = '';

beforeAll(async () => {
  h = await startHarness();
  dir = await tempDir('e2e-a11y');
  const marked = await markDemoVisits(h, dir.dir);
  adaId = marked.athleteId;
  baseline = marked.baseline;
  retest = marked.retest;
  const ada = await h.server.db('athletes').where({ id: adaId }).first();
  await seedDemoHamstringPlan(h.server.db, ada.clinic_id, ada, retest.assessmentId);
  planId = (await h.server.db('plans').where({ athlete_id: adaId }).first()).id;

  // A rendered, published still of the pair, so the Shared tab, the viewer and the portal show one.
  const api = new Client(h.baseUrl);
  await api.signIn(coach.email, coach.password);
  const still = await api.post(`/api/clips/${retest.clipId}/stills`, {
    frameIndex: 40,
    caption: 'Hip extension at toe-off: Baseline beside Re-test.',
    showAngles: true,
    pairWith: { clipId: baseline.clipId, frameIndex: 40 },
  });
  if (still.status !== 202) throw new Error(`still: ${still.status} ${JSON.stringify(still.body)}`);
  for (let i = 0; ; i++) {
    const s = (await api.get(`/api/stills/${still.body.id}`)).body;
    if (s.status === 'ready') break;
    if (s.status === 'failed' || i > 300) throw new Error(`still ${s.status}`);
    await new Promise((r) => setTimeout(r, 200));
  }
  await api.post(`/api/stills/${still.body.id}/publish`, {});

  // A rendered, published annotated clip, so the Shared tab, its preview and the portal's player show one.
  const clip = await api.post(`/api/clips/${retest.clipId}/annotated-clips`, {
    fromFrame: 30,
    toFrame: 59,
    factor: 1,
    caption: 'Toe-off in slow motion.',
    showAngles: true,
  });
  if (clip.status !== 202) throw new Error(`annotated clip: ${clip.status} ${JSON.stringify(clip.body)}`);
  for (let i = 0; ; i++) {
    const c = (await api.get(`/api/annotated-clips/${clip.body.id}`)).body;
    if (c.status === 'ready') break;
    if (c.status === 'failed' || i > 300) throw new Error(`annotated clip ${c.status}`);
    await new Promise((r) => setTimeout(r, 200));
  }
  await api.post(`/api/annotated-clips/${clip.body.id}/publish`, {});

  // The signed-out pages that need a link from an e-mail.
  const anon = new Client(h.baseUrl);
  await anon.post('/api/password-resets', { email: coach.email });
  resetLink = await lastMailLink(h.server, coach.email);
  const carys = await h.server.db('athletes').where({ last_name: 'Holmgren' }).first();
  const invited = await api.post(`/api/athletes/${carys.id}/invitation`, {});
  if (invited.status !== 201) throw new Error(`invitation: ${invited.status}`);
  inviteLink = await lastMailLink(h.server, carys.email);
}, 300_000);
afterAll(async () => {
  const bad = [...found].filter(([, v]) => v.length);
  console.log(
    `axe-core: ${found.size} views checked, ${bad.length} with problems\n${bad.map(([k, v]) => `${k}: ${v.join('; ')}`).join('\n')}`,
  );
  await h?.close();
  await dir?.cleanup();
});

/** Every view checked in this file: its name, and what axe found. */
const found = new Map<string, string[]>();

/**
 * Runs axe on the page (or only on the open dialog's overlay when `dialog`), records the problems
 * under `name` and leaves a screenshot.
 */
async function check(page: Page, name: string, dialog = false): Promise<void> {
  // A snack bar is a passing message, not the view: judge the page without it.
  await page
    .locator('.mat-mdc-snack-bar-container')
    .waitFor({ state: 'detached', timeout: 10_000 })
    .catch(() => undefined);
  const problems = await axeProblems(page, dialog ? '.cdk-overlay-container' : undefined);
  const size = page.viewportSize()!;
  found.set(`${name} (${size.width}×${size.height})`, problems);
  const slug = name.toLowerCase().replace(/[^a-z0-9]+/g, '-');
  await page.screenshot({ path: path.join(SCREENSHOTS, `a11y-${slug}-${size.width}.png`) });
}

/** The views of this run that had problems, each with its problems. */
function failures(prefix: string): Record<string, string[]> {
  return Object.fromEntries([...found].filter(([k, v]) => k.startsWith(prefix) && v.length));
}

/** Waits for the page's main heading and for loading bars to go. */
async function ready(page: Page, heading?: string | RegExp): Promise<void> {
  const h1 = heading ? page.getByRole('heading', { name: heading }).first() : page.locator('h1').first();
  await h1.waitFor({ timeout: 20_000 });
  await expect.poll(() => page.locator('mat-progress-bar[mode="indeterminate"]').count(), { timeout: 20_000 }).toBe(0);
}

/** Goes to `to` (a path of the app, or a whole link), waits until it is ready and checks it. */
async function visit(page: Page, to: string, name: string, heading?: string | RegExp): Promise<void> {
  await page.goto(to.startsWith('http') ? to : `${h.baseUrl}${to}`);
  await ready(page, heading);
  await check(page, name);
}

/** Opens a dialog with `button` (a locator, or a key to press), checks it, and closes it. */
async function checkDialog(page: Page, name: string, button: Locator | string): Promise<void> {
  if (typeof button === 'string') await page.keyboard.press(button);
  else await button.click();
  await page.getByRole('dialog').last().waitFor();
  await page.waitForTimeout(300);
  await check(page, name, true);
  await closeDialog(page);
}

/** Closes the open dialog with Escape, or with its Cancel/Close button where Escape is kept for unsaved text. */
async function closeDialog(page: Page): Promise<void> {
  await page.keyboard.press('Escape');
  await page.waitForTimeout(300);
  if (await page.getByRole('dialog').count()) {
    await page
      .getByRole('dialog')
      .last()
      .getByRole('button', { name: /^(Cancel|Close)$/ })
      .first()
      .click();
  }
  await expect.poll(() => page.getByRole('dialog').count()).toBe(0);
}

/** Opens the Re-test clip in the review workspace and waits for its first frame. */
async function openReview(page: Page): Promise<void> {
  await page.goto(`${h.baseUrl}/athletes/${adaId}/assessments/${retest.assessmentId}/clips/${retest.clipId}/review`);
  await expect.poll(() => page.getByText(/^Frame \d+ \/ \d+/).count(), { timeout: 20_000 }).toBe(1);
  await page.waitForTimeout(500);
}

/** Opens the Re-test comparison and waits for its verdicts. */
async function openComparison(page: Page): Promise<void> {
  await page.goto(`${h.baseUrl}/athletes/${adaId}/compare`);
  await expect
    .poll(() => page.locator('tr', { hasText: 'Hip extension at toe-off' }).first().textContent(), { timeout: 20_000 })
    .toContain('measurement error');
  await page.waitForTimeout(500);
}

async function signedIn(email: string, password: string, viewport = DESKTOP): Promise<{ context: BrowserContext; page: Page }> {
  const context = await h.browser.newContext({ viewport });
  const page = await context.newPage();
  await h.signIn(page, email, password);
  return { context, page };
}

describe('accessibility: axe-core finds no critical or serious problem', () => {
  it('signed-out pages: sign-in, forgot and reset password, invitation, page not found — desktop and phone', async () => {
    for (const viewport of [DESKTOP, PHONE]) {
      const context = await h.browser.newContext({ viewport });
      const page = await context.newPage();
      await visit(page, '/sign-in', 'signed out: sign-in');
      await page.getByLabel('E-mail').fill('nobody@larchwood-clinic.test');
      await page.getByLabel('Password', { exact: true }).fill('not-the-password');
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.getByRole('alert').first().waitFor();
      await check(page, 'signed out: sign-in refused');
      await visit(page, '/forgot-password', 'signed out: forgot password');
      await visit(page, resetLink, 'signed out: reset password');
      await visit(page, inviteLink, 'signed out: invitation');
      await visit(page, '/no-such-page', 'signed out: page not found');
      await context.close();
    }
    expect(failures('signed out')).toEqual({});
  });

  it('coach: roster, athlete pages and tabs, assessment, review workspace, comparison, exercises, plans — and their dialogs', async () => {
    const { context, page } = await signedIn(coach.email, coach.password);
    await ready(page, 'Athletes');
    await check(page, 'coach: roster');

    await visit(page, '/athletes/new', 'coach: new athlete');
    await page.getByRole('button', { name: 'Add athlete' }).click();
    await page.locator('mat-error').first().waitFor();
    await check(page, 'coach: new athlete with errors');

    await visit(page, `/athletes/${adaId}`, 'coach: athlete profile, intake tab');
    await checkDialog(page, 'coach: edit athlete dialog', page.getByRole('button', { name: /Edit details/ }));
    await page.getByRole('tab', { name: 'Assessments' }).click();
    await page.getByRole('link', { name: 'Compare visits' }).waitFor();
    await check(page, 'coach: athlete profile, assessments tab');
    await checkDialog(page, 'coach: new assessment dialog', page.getByRole('button', { name: /New assessment/ }).first());
    await page.getByRole('tab', { name: 'Plan' }).click();
    await page.waitForURL(/tab=plan/);
    await page.waitForTimeout(500);
    await check(page, 'coach: athlete profile, plan tab');
    await page.getByRole('tab', { name: 'Shared' }).click();
    await page.waitForURL(/tab=shared/);
    const thumb = page.getByRole('button', { name: /^Enlarge: / }).first();
    await thumb.waitFor({ timeout: 20_000 });
    await check(page, 'coach: athlete profile, shared tab');
    await checkDialog(page, 'coach: still viewer', thumb);
    await checkDialog(page, 'coach: visit summary dialog', page.getByRole('button', { name: 'New visit summary' }));
    await checkDialog(page, 'coach: annotated clip preview', page.getByRole('button', { name: /^Preview: / }).first());

    await page.goto(`${h.baseUrl}/athletes/${adaId}/assessments/${retest.assessmentId}`);
    await ready(page);
    await page.locator('app-clip-card').first().waitFor();
    await check(page, 'coach: assessment page with clips and upload');
    await checkDialog(page, 'coach: edit assessment dialog', page.getByRole('button', { name: /^Edit/ }).first());
    await checkDialog(page, 'coach: confirm dialog (delete assessment)', page.getByRole('button', { name: /^Delete/ }).first());

    await openReview(page);
    await check(page, 'coach: review workspace');
    for (const tab of ['Events', 'Scale', 'Measures']) {
      await page.getByRole('tab', { name: tab }).click();
      await page.waitForTimeout(400);
      await check(page, `coach: review workspace, ${tab.toLowerCase()} tab`);
    }
    await page.locator('body').click({ position: { x: 5, y: 5 } });
    await checkDialog(page, 'coach: review key help dialog', '?');
    await checkDialog(page, 'coach: save still dialog (review)', 'k');
    await checkDialog(page, 'coach: make annotated clip dialog', page.getByRole('button', { name: 'Make clip' }));

    await openComparison(page);
    await check(page, 'coach: re-test comparison');
    await checkDialog(page, 'coach: save still dialog (comparison)', page.getByRole('button', { name: 'Save still of the pair' }));
    await checkDialog(page, 'coach: side-by-side clip dialog', page.getByRole('button', { name: 'Side-by-side clip' }));

    await page.goto(`${h.baseUrl}/exercises`);
    await ready(page, 'Exercise library');
    await page.locator('app-exercise-card').first().waitFor();
    await check(page, 'coach: exercise library');
    await page.getByRole('button', { name: 'New exercise' }).first().click();
    await page.getByRole('dialog').waitFor();
    await check(page, 'coach: exercise dialog', true);
    await page.getByRole('dialog').getByRole('button', { name: 'Add to library' }).click();
    await page.getByRole('dialog').locator('mat-error').first().waitFor();
    await check(page, 'coach: exercise dialog with errors', true);
    await closeDialog(page);

    await page.goto(`${h.baseUrl}/plans/new?athlete=${adaId}`);
    await ready(page);
    await page.getByRole('button', { name: 'Start from three stages' }).click();
    await page.waitForTimeout(300);
    await check(page, 'coach: plan builder');
    await checkDialog(page, 'coach: exercise picker dialog', page.getByRole('button', { name: 'Add exercise from library' }).first());

    await visit(page, `/plans/${planId}`, 'coach: plan page');
    await checkDialog(page, 'coach: pain rule dialog', page.getByRole('button', { name: 'Edit rule' }));

    await context.close();
    expect(failures('coach:')).toEqual({});
  });

  it('coach on a phone: roster, athlete profile, review workspace, comparison, plan page', async () => {
    const { context, page } = await signedIn(coach.email, coach.password, PHONE);
    await ready(page, 'Athletes');
    await check(page, 'coach phone: roster');
    await visit(page, `/athletes/${adaId}`, 'coach phone: athlete profile');
    await openReview(page);
    await check(page, 'coach phone: review workspace');
    await openComparison(page);
    await check(page, 'coach phone: re-test comparison');
    await visit(page, `/plans/${planId}`, 'coach phone: plan page');
    await context.close();
    expect(failures('coach phone')).toEqual({});
  });

  it('owner: team, reference bands, clinic details, billing — and their dialogs', async () => {
    const { context, page } = await signedIn(owner.email, owner.password);
    const deactivate = page.getByRole('button', { name: /^Deactivate / }).first();
    await page.goto(`${h.baseUrl}/team`);
    await ready(page, 'Team');
    await deactivate.waitFor();
    await check(page, 'owner: team');
    await checkDialog(page, 'owner: deactivate coach dialog', deactivate);

    await page.goto(`${h.baseUrl}/settings/reference-bands`);
    await ready(page, 'Reference bands');
    await page.locator('app-band-editor').first().waitFor();
    await check(page, 'owner: reference bands');
    const add = page.getByRole('combobox', { name: 'Add a band for another measure' });
    await add.focus();
    await page.keyboard.press('Enter');
    await page.getByRole('option').first().click();
    await page.waitForTimeout(400);
    await check(page, 'owner: reference bands, new band editor');

    await visit(page, '/settings/clinic', 'owner: clinic details');
    await page.goto(`${h.baseUrl}/billing/invoices`);
    await ready(page);
    await page.getByText('TF-2026-0002').first().waitFor();
    await check(page, 'owner: invoices');
    await visit(page, '/billing/invoices/new', 'owner: new invoice');
    await visit(page, '/billing/prices', 'owner: prices');
    const issued = await h.server.db('invoices').where({ number: 'TF-2026-0002' }).first();
    const record = page.getByRole('button', { name: 'Record payment' });
    await page.goto(`${h.baseUrl}/billing/invoices/${issued.id}`);
    await ready(page);
    await record.waitFor();
    await check(page, 'owner: invoice');
    await checkDialog(page, 'owner: record payment dialog', record);

    await context.close();
    expect(failures('owner')).toEqual({});
  });

  it('athlete portal: home, enlarged still, profile, assessment, plan, invoices — phone and desktop', async () => {
    const paid = await h.server.db('invoices').where({ number: 'TF-2026-0001' }).first();
    for (const viewport of [PHONE, DESKTOP]) {
      const { context, page } = await signedIn(athlete.email, athlete.password, viewport);
      await ready(page);
      const still = page.getByRole('button', { name: /^Enlarge still: / }).first();
      await still.waitFor({ timeout: 20_000 });
      await page.getByRole('button', { name: 'One frame on' }).first().waitFor({ timeout: 20_000 });
      await check(page, 'athlete: portal home');
      await checkDialog(page, 'athlete: enlarged still', still);
      await visit(page, '/portal/profile', 'athlete: profile');
      await visit(page, `/portal/assessments/${retest.assessmentId}`, 'athlete: assessment');
      await visit(page, '/portal/plan', 'athlete: plan');
      await visit(page, '/portal/invoices', 'athlete: invoices');
      await visit(page, `/portal/invoices/${paid.id}`, 'athlete: invoice');
      await context.close();
    }
    expect(failures('athlete')).toEqual({});
  });

  it('walked every view', () => {
    console.log(`axe-core checked ${found.size} views:\n${[...found.keys()].join('\n')}`);
    // 6 signed-out views × 2 sizes, 37 of the coach (32 desktop, 5 phone), 10 of the owner, 7 of the athlete × 2 sizes.
    expect(found.size).toBe(73);
  });
});
