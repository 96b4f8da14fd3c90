/**
 * Plans in Debian chromium: the coach builds a three-stage plan from the exercise library for the
 * demo athlete recovering from a hamstring strain and starts it; the athlete logs two sessions on a phone
 * (390×844) — one with the next-morning check, one sent through a dropped connection and a lost
 * answer without making a duplicate; the coach sees adherence and the pain chart, and the rise in
 * pain raises alerts on the roster, the profile and the plan, each naming the rule that fired.
 * Alert rule: REFERENCES.md's pain-monitoring entry (Silbernagel et al. 2007 [mem], from memory):
 * pain during may reach 5/10 and must not rise week to week. Cautions read as calm information
 * beside pain scores and alerts; an athlete without an account is a prompt to invite them.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Locator, Page } from 'playwright-core';
import { axeProblems } from './axe';
import { SCREENSHOTS, lastMailLink, startHarness, type Harness } from './harness';
import { Client } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';

const [, coach, , athlete] = DEMO_SIGN_INS;
const DAY = 86_400_000;
const PHONE = { width: 390, height: 844 };
const DESKTOP = { width: 1440, height: 900 };
const shot = (name: string) => path.join(SCREENSHOTS, name);
/** Console noise a deliberately dropped connection causes; anything else is a problem. */
const networkNoise = (m: string) => /ERR_INTERNET_DISCONNECTED|ERR_FAILED|Failed to load resource/.test(m);

let h: Harness;
let adaId = 0;
let planId = 0;

beforeAll(async () => {
  h = await startHarness();
  adaId = (await h.server.db('athletes').where({ email: athlete.email }).first()).id;
});
afterAll(async () => {
  await h?.close();
});

const signIn = (page: Page, email: string, password: string) => h.signIn(page, email, password);

async function pickExercise(page: Page, stage: number, name: string, search?: string): Promise<void> {
  await page
    .getByRole('group', { name: `Stage ${stage}` })
    .getByRole('button', { name: 'Add exercise from library' })
    .click();
  const dialog = page.getByRole('dialog');
  if (search) {
    await dialog.getByRole('combobox', { name: 'Loading' }).click();
    await page.getByRole('option', { name: 'Any kind' }).click();
    await dialog.getByLabel('Search the library').fill(search);
  }
  await dialog.getByRole('button', { name: `Add ${name}` }).click();
  await expect.poll(() => page.getByRole('dialog').count()).toBe(0);
  // The exercise shows in its stage at once, without another click.
  await expect
    .poll(
      () =>
        page
          .getByRole('group', { name: `Stage ${stage}` })
          .getByRole('listitem', { name })
          .count(),
      { timeout: 2_000 },
    )
    .toBe(1);
}

const logs = () => h.server.db('log_entries').where({ plan_id: planId }).orderBy('id');
const isoDay = (ms: number) => new Date(ms).toISOString().slice(0, 10);

async function tickAllSets(page: Page): Promise<void> {
  const sets = page.getByRole('button', { name: /^Set \d+ of / });
  const n = await sets.count();
  expect(n).toBeGreaterThan(0);
  for (let i = 0; i < n; i++) await sets.nth(i).click();
}

/**
 * Screenshot of the whole page: the shell scrolls inside its own content pane, so the viewport is
 * grown to the content's height first (and put back after).
 */
async function fullShot(page: Page, name: string): Promise<void> {
  const size = page.viewportSize()!;
  const height = await page.evaluate(() => {
    const pane = document.querySelector('mat-sidenav-content');
    return pane ? pane.scrollHeight + pane.getBoundingClientRect().top : document.documentElement.scrollHeight;
  });
  await page.setViewportSize({ width: size.width, height: Math.min(6000, Math.max(size.height, Math.ceil(height))) });
  await page.screenshot({ path: shot(name) });
  await page.setViewportSize(size);
}

/**
 * WCAG 2.x contrast ratio of an element's text colour against its own (or nearest painted)
 * background [calc]: relative luminance from sRGB, (L1 + 0.05) / (L2 + 0.05).
 */
async function contrastOf(locator: Locator): Promise<number> {
  const [fg, bg] = await locator.evaluate((el) => {
    let bgEl: Element | null = el;
    let bg = 'rgba(0, 0, 0, 0)';
    while (bgEl && /rgba\(0, 0, 0, 0\)|transparent/.test(bg)) {
      bg = getComputedStyle(bgEl).backgroundColor;
      bgEl = bgEl.parentElement;
    }
    return [getComputedStyle(el).color, bg];
  });
  const lum = (css: string) => {
    const [r, g, b] = css
      .match(/\d+(\.\d+)?/g)!
      .slice(0, 3)
      .map(Number)
      .map((v) => v / 255)
      .map((c) => (c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4)) as [number, number, number];
    return 0.2126 * r + 0.7152 * g + 0.0722 * b;
  };
  const [a, b] = [lum(fg), lum(bg)].sort((x, y) => y - x) as [number, number];
  return (a + 0.05) / (b + 0.05);
}

/** The same page at 390×844 (whole page), then back to 1440×900. */
async function phoneShot(page: Page, name: string): Promise<void> {
  await page.setViewportSize(PHONE);
  await page.waitForTimeout(800); // the shell switches to its phone layout
  await fullShot(page, name);
  await page.setViewportSize(DESKTOP);
}

async function phone(clockAt?: number): Promise<{ context: BrowserContext; page: Page; problems: string[] }> {
  const s = await h.newPage();
  await s.page.setViewportSize(PHONE);
  if (clockAt !== undefined) await s.page.clock.setFixedTime(new Date(clockAt));
  return s;
}

/**
 * The athlete's plan page on a phone with the session form open: today's session may have been
 * saved by an earlier test, then the page says so and offers another one, which is taken.
 */
async function athleteSessionForm(): Promise<{ context: BrowserContext; page: Page; problems: string[] }> {
  const s = await phone();
  await signIn(s.page, athlete.email, athlete.password);
  await s.page.goto(`${h.baseUrl}/portal/plan`);
  const another = s.page.getByRole('button', { name: 'Log another session' });
  await expect.poll(async () => (await another.count()) + (await s.page.getByRole('button', { name: 'Save session' }).count())).toBe(1);
  if (await another.count()) await another.click();
  await expect.poll(() => s.page.getByRole('button', { name: 'Save session' }).count()).toBe(1);
  return s;
}

describe('plans: staged loading, athlete log, pain monitoring', () => {
  it('the coach searches the library by region and loading kind', async () => {
    const { page, context, problems } = await h.newPage();
    await signIn(page, coach.email, coach.password);
    await page.getByRole('link', { name: 'Exercise library' }).click();
    await page.waitForURL(/\/exercises$/);
    await page.getByRole('combobox', { name: 'Body region' }).click();
    await page.getByRole('option', { name: 'Hamstring' }).click();
    await page.getByRole('combobox', { name: 'Kind of loading' }).click();
    await page.getByRole('option', { name: 'Isometric' }).click();
    await expect
      .poll(() => page.getByRole('list', { name: 'Exercises' }).getByRole('heading').allTextContents())
      .toEqual(['Bent-knee bridge hold', 'Prone hamstring hold']);
    await page.getByRole('button', { name: 'How to do it' }).first().click();
    expect(await page.getByText('Stop an exercise that causes sharp or worsening pain').count()).toBe(1);
    // The staff see where the exercise comes from (REFERENCES.md, Goom et al. 2016 [mem]).
    await expect.poll(() => page.getByText(/^Source\s+Goom, Malliaras, Reiman & Purdam 2016, J Orthop Sports Phys Ther/).count()).toBe(1);
    await fullShot(page, 'plans-library.png');

    // A new exercise in our own words; a negative dose is refused in the form.
    await page.getByRole('button', { name: 'New exercise' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByLabel('Name').fill('Standing calf raise');
    await dialog.getByRole('combobox', { name: 'Body region' }).click();
    await page.getByRole('option', { name: 'Calf and Achilles' }).click();
    await dialog.getByRole('combobox', { name: 'Kind of loading' }).click();
    await page.getByRole('option', { name: 'Concentric / isotonic' }).click();
    await dialog.getByLabel('Purpose').fill('Builds calf strength through the whole range.');
    await dialog.getByLabel('Sets').fill('-2');
    await dialog.getByLabel('Instructions').fill('Stand on the edge of a step.\nRise onto the balls of the feet.\nLower slowly.');
    await dialog.getByLabel('Source (optional)').fill('Beyer et al. 2015, Am J Sports Med 43:1704–1711');
    await dialog.getByRole('button', { name: 'Add to library' }).click();
    await expect.poll(() => dialog.getByText('Min 1').count()).toBe(1);
    await fullShot(page, 'plans-exercise-dialog.png');
    await dialog.getByLabel('Sets').fill('3');
    await dialog.getByRole('button', { name: 'Add to library' }).click();
    await expect.poll(() => page.getByRole('dialog').count()).toBe(0);
    const created = await h.server.db('exercises').where({ name: 'Standing calf raise' }).first();
    expect(created).toMatchObject({
      region: 'calf_achilles',
      kind: 'isotonic',
      sets: 3,
      source: 'Beyer et al. 2015, Am J Sports Med 43:1704–1711',
    });
    expect(JSON.parse(created.instructions)).toEqual(['Stand on the edge of a step.', 'Rise onto the balls of the feet.', 'Lower slowly.']);
    expect(problems).toEqual([]);
    await context.close();
  });

  it('the coach builds a three-stage plan from the library for Ada and starts it', async () => {
    const { page, context, problems } = await h.newPage();
    await signIn(page, coach.email, coach.password);
    await page.goto(`${h.baseUrl}/athletes/${adaId}?tab=plan`);
    await page.getByRole('link', { name: 'New plan' }).click();
    await page.waitForURL(/\/plans\/new\?athlete=/);
    await page.getByLabel('Title').fill('Hamstring strain: staged loading');
    await page.getByRole('combobox', { name: 'Came from assessment' }).click();
    await page.getByRole('option', { name: /Re-test/ }).click();
    await page.getByRole('button', { name: 'Start from three stages' }).click();
    await pickExercise(page, 1, 'Bent-knee bridge hold');
    await pickExercise(page, 1, 'Prone hamstring hold');
    await pickExercise(page, 2, 'Hip-flexed knee extension');
    await pickExercise(page, 3, 'Springy skips');
    await pickExercise(page, 3, 'Walk-jog return intervals', 'walk');
    // A prescription differs from the library default: 6 sets of the bridge hold.
    await page.getByRole('listitem', { name: 'Bent-knee bridge hold' }).getByLabel('Sets').fill('6');
    // Opening the picker again: the exercise already in the stage is marked, and offered "again".
    await page.getByRole('group', { name: 'Stage 1' }).getByRole('button', { name: 'Add exercise from library' }).click();
    await expect.poll(() => page.getByRole('dialog').getByRole('button', { name: 'Add Prone hamstring hold again' }).count()).toBe(1);
    await page.getByRole('dialog').getByRole('button', { name: 'Close' }).click();
    await expect.poll(() => page.getByRole('dialog').count()).toBe(0);
    // On a phone the editor does not scroll sideways (no button, nor its touch target, past its card) and stage names show whole.
    await page.setViewportSize(PHONE);
    await page.waitForTimeout(800);
    expect(await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)).toBeLessThanOrEqual(0);
    const pastTheirCard = await page
      .locator('.stage-exercise, .stage')
      .evaluateAll((boxes) =>
        boxes.flatMap((box) =>
          [...box.querySelectorAll('button, .mat-mdc-button-touch-target')]
            .filter((b) => b.getBoundingClientRect().right > box.getBoundingClientRect().right + 0.5)
            .map((b) => b.closest('button')?.getAttribute('aria-label')),
        ),
      );
    expect(pastTheirCard).toEqual([]);
    const cutNames = await page
      .locator('.stage-name input')
      .evaluateAll((inputs) => (inputs as HTMLInputElement[]).filter((i) => i.scrollWidth > i.clientWidth).map((i) => i.value));
    expect(cutNames).toEqual([]);
    await fullShot(page, 'plans-builder-phone.png');
    await page.setViewportSize(DESKTOP);
    expect(await axeProblems(page)).toEqual([]);
    await fullShot(page, 'plans-builder.png');
    await page.getByRole('button', { name: 'Create plan' }).click();
    await page.waitForURL(/\/plans\/\d+$/);
    planId = Number(/\/plans\/(\d+)$/.exec(page.url())![1]);
    await page.getByRole('button', { name: 'Start plan' }).click();
    await page.getByRole('dialog').getByRole('button', { name: 'Start plan' }).click();
    await expect.poll(async () => (await h.server.db('plans').where({ id: planId }).first()).status).toBe('active');

    const stages = await h.server.db('plan_stages').where({ plan_id: planId }).orderBy('position');
    expect(stages.map((s) => s.name)).toEqual(['Isometric holds', 'Slow lengthening', 'Fast work and running drills']);
    const items = await h.server
      .db('stage_exercises as se')
      .join('exercises as e', 'e.id', 'se.exercise_id')
      .whereIn(
        'se.stage_id',
        stages.map((s) => s.id),
      )
      .orderBy(['se.stage_id', 'se.position'])
      .select('e.name', 'se.sets');
    expect(items).toEqual([
      { name: 'Bent-knee bridge hold', sets: 6 },
      { name: 'Prone hamstring hold', sets: 4 },
      { name: 'Hip-flexed knee extension', sets: 3 },
      { name: 'Springy skips', sets: 4 },
      { name: 'Walk-jog return intervals', sets: 1 },
    ]);
    const retest = await h.server.db('assessments').where({ athlete_id: adaId, kind: 'retest' }).first();
    expect((await h.server.db('plans').where({ id: planId }).first()).assessment_id).toBe(retest.id);
    await expect.poll(() => page.getByText('Stage 1 of 3 · Isometric holds').count()).toBe(1);
    await fullShot(page, 'plans-plan-started.png');
    // On a phone the breadcrumb stays one line: the plan's title ends in an ellipsis instead of wrapping word by word.
    await page.setViewportSize(PHONE);
    await page.waitForTimeout(800);
    const crumbs = await page
      .locator('nav.crumbs')
      .evaluate((n) => ({ height: n.getBoundingClientRect().height, over: n.scrollWidth - n.clientWidth }));
    expect(crumbs.height, JSON.stringify(crumbs)).toBeLessThanOrEqual(48);
    expect(crumbs.over, JSON.stringify(crumbs)).toBeLessThanOrEqual(0);
    await page.setViewportSize(DESKTOP);
    expect(problems).toEqual([]);
    await context.close();
  });

  it('the athlete logs a first session on a phone, and the next morning answers the one-tap check', async () => {
    // Test fixture: the plan began eight days ago, so the first session can sit in last week.
    const eightDaysAgo = new Date(Date.now() - 8 * DAY).toISOString();
    await h.server.db('plans').where({ id: planId }).update({ started_at: eightDaysAgo });
    await h.server.db('plan_stages').where({ plan_id: planId, position: 1 }).update({ started_at: eightDaysAgo });

    const lastWeek = Date.now() - 7 * DAY;
    const day1 = new Date(`${isoDay(lastWeek)}T18:00:00Z`).getTime();
    const first = await phone(day1);
    await signIn(first.page, athlete.email, athlete.password);
    await first.page.getByRole('link', { name: "Open today's session" }).click();
    await first.page.waitForURL(/\/portal\/plan$/);
    await expect.poll(() => first.page.getByRole('heading', { name: "Today's session: Isometric holds" }).count()).toBe(1);
    expect(await first.page.getByText('Stop an exercise that causes sharp or worsening pain').count()).toBe(1);
    await fullShot(first.page, 'plans-portal-today-phone.png');
    await tickAllSets(first.page);
    await first.page.getByRole('radio', { name: 'Pain during 2 out of 10' }).click();
    await first.page.getByLabel('Note (optional)').fill('Felt steady, a little tight at the end.');
    await first.page.getByRole('button', { name: 'Save session' }).click();
    await expect.poll(async () => (await logs()).length).toBe(1);
    const [one] = await logs();
    expect(one).toMatchObject({ session_date: isoDay(day1), pain_during: 2, note: 'Felt steady, a little tight at the end.' });
    expect(JSON.parse(one.sets).map((s: { setsDone: number; setsPrescribed: number }) => s.setsDone === s.setsPrescribed)).toEqual([
      true,
      true,
    ]);
    await expect.poll(() => first.page.getByRole('list').filter({ hasText: 'Pain during 2/10' }).count()).toBeGreaterThan(0);
    // Saved today: the page says so, also after a reload.
    await expect.poll(() => first.page.getByRole('heading', { name: 'Done for today' }).count()).toBe(1);
    expect(await first.page.getByRole('button', { name: 'Save session' }).count()).toBe(0);
    // Pain 2 is within the plan's limit: no warning beyond the plan's caution.
    expect(await first.page.getByTestId('pain-above-limit').count()).toBe(0);
    await first.page.reload();
    await expect.poll(() => first.page.getByRole('heading', { name: 'Done for today' }).count()).toBe(1);
    expect(await first.page.getByRole('button', { name: 'Save session' }).count()).toBe(0);
    await fullShot(first.page, 'plans-portal-done-phone.png');
    expect(await axeProblems(first.page)).toEqual([]);
    await first.page.goto(`${h.baseUrl}/portal`);
    await expect.poll(() => first.page.getByText("Today's session is done.").count()).toBe(1);
    await first.page.goto(`${h.baseUrl}/portal/plan`);

    // Next morning: the one-tap check.
    await first.page.clock.setFixedTime(new Date(day1 + 13 * 3_600_000));
    await first.page.reload();
    await expect.poll(() => first.page.getByRole('heading', { name: 'Morning check' }).count()).toBe(1);
    await fullShot(first.page, 'plans-portal-morning-check-phone.png');
    await first.page.getByRole('button', { name: 'Morning pain 1 out of 10' }).click();
    await expect.poll(async () => (await logs())[0].morning_pain).toBe(1);
    await fullShot(first.page, 'plans-portal-morning-answered-phone.png');
    expect(first.problems).toEqual([]);
    await first.context.close();
  });

  it('a session saved offline is kept, then sent once despite a lost answer (idempotency key)', async () => {
    const { page, context, problems } = await phone();
    await signIn(page, athlete.email, athlete.password);
    await page.goto(`${h.baseUrl}/portal/plan`);
    await expect.poll(() => page.getByRole('button', { name: 'Save session' }).count()).toBe(1);
    await context.setOffline(true);
    await tickAllSets(page);
    await page.getByRole('radio', { name: 'Pain during 6 out of 10' }).click();
    await page.getByLabel('Note (optional)').fill('Sharp twinge on the hill repeats yesterday.');
    await page.getByRole('button', { name: 'Save session' }).click();
    await expect.poll(() => page.getByText('1 entry waiting to send.').count()).toBe(1);
    await expect.poll(() => page.getByRole('heading', { name: 'Done for today' }).count()).toBe(1);
    // Pain 6 is above the plan's limit of 5: the page says to stop and contact the clinician.
    expect(await page.getByTestId('pain-above-limit').textContent()).toContain('Pain 6/10 is more than the 5/10 your plan allows');
    expect(await page.getByText('Waiting to send', { exact: true }).count()).toBe(1);
    const stored = await page.evaluate(() =>
      Object.entries(localStorage)
        .filter(([k]) => k.startsWith('trailframe.log-outbox'))
        .map(([, v]) => JSON.parse(v) as unknown[]),
    );
    expect(stored.flat()).toHaveLength(1);
    await fullShot(page, 'plans-portal-offline-phone.png');
    expect(await logs()).toHaveLength(1);

    // Back online, the server stores the session but its answer is lost on the way back.
    let dropped = 0;
    await page.route('**/api/plans/*/logs', async (route) => {
      if (route.request().method() === 'POST' && dropped === 0) {
        dropped++;
        await route.fetch();
        await route.abort('failed');
        return;
      }
      await route.continue();
    });
    await context.setOffline(false);
    await expect.poll(() => dropped, { timeout: 20_000 }).toBe(1);
    await expect.poll(() => page.getByText('waiting to send', { exact: false }).count(), { timeout: 30_000 }).toBe(0);
    const all = await logs();
    expect(all).toHaveLength(2);
    expect(all[1]).toMatchObject({ pain_during: 6, session_date: isoDay(Date.now()) });
    expect(new Set(all.map((l) => l.idempotency_key)).size).toBe(2);
    await expect.poll(() => page.getByText('Pain during 6/10').count()).toBe(1);
    await fullShot(page, 'plans-portal-history-phone.png');
    expect(problems.filter((p) => !networkNoise(p))).toEqual([]);
    await context.close();
  });

  it('the coach sees the alert on the roster and profile, adherence and the pain chart on the plan', async () => {
    const { page, context, problems } = await h.newPage();
    await page.setViewportSize(DESKTOP);
    await signIn(page, coach.email, coach.password);
    await page.waitForURL(/\/athletes$/);
    const adaRow = page.getByRole('row').filter({ hasText: 'Ada Kestrel' });
    await expect.poll(() => adaRow.getByRole('link', { name: /Plan alert/ }).count()).toBe(1);
    // The chip names the rule that fired: one session at 6/10 against this plan's 5/10 limit
    // (one session a week is no weekly trend, so no rise alert beside it).
    expect(await adaRow.getByRole('link', { name: /Plan alert/ }).textContent()).toContain('Pain 6/10 > limit 5');
    expect(await adaRow.getByRole('link', { name: /Plan alert/ }).textContent()).not.toContain('+1');
    // The pain column and its chips carry the caution, as information (not the error colour).
    const caution = page.getByRole('note').filter({ hasText: 'Pain scores and plan alerts point to what to look at' });
    await expect.poll(() => caution.count()).toBe(1);
    expect(await contrastOf(caution)).toBeGreaterThanOrEqual(4.5);
    expect(await axeProblems(page)).toEqual([]);
    await fullShot(page, 'plans-roster-alert.png');
    await phoneShot(page, 'plans-roster-alert-phone.png');

    await page.goto(`${h.baseUrl}/athletes/${adaId}`);
    await expect.poll(() => page.getByRole('alert').filter({ hasText: 'Plan alert' }).count()).toBe(1);
    expect(await page.getByRole('alert').filter({ hasText: 'Plan alert' }).textContent()).toContain("above this plan's limit of 5/10");
    await expect
      .poll(() => page.getByRole('note').filter({ hasText: 'Pain scores and plan alerts point to what to look at' }).count())
      .toBeGreaterThan(0);
    await page.getByRole('tab', { name: 'Plan' }).click();
    await expect.poll(() => page.getByRole('list', { name: 'Plans, newest first' }).getByRole('link').count()).toBe(1);
    expect(await page.getByRole('list', { name: 'Plans, newest first' }).textContent()).toContain(
      'Pain 6/10 during, above the limit of 5/10',
    );
    await expect
      .poll(() =>
        page.getByRole('tabpanel').getByRole('note').filter({ hasText: 'Stop an exercise that causes sharp or worsening pain' }).count(),
      )
      .toBe(1);
    expect(await axeProblems(page)).toEqual([]);
    await fullShot(page, 'plans-profile-alert.png');
    await phoneShot(page, 'plans-profile-alert-phone.png');

    await page.goto(`${h.baseUrl}/plans/${planId}`);
    const alerts = page.getByRole('alert').filter({ hasText: 'Pain alerts' });
    await expect.poll(() => alerts.count()).toBe(1);
    expect(await alerts.textContent()).toContain("above this plan's limit of 5/10");
    expect(await alerts.textContent()).not.toContain('Weekly pain rising');
    const adherence = page.getByRole('table').filter({ hasText: 'Week of' });
    await expect.poll(() => adherence.getByRole('row').count()).toBeGreaterThanOrEqual(3);
    const adherenceText = await adherence.textContent();
    expect(adherenceText).toMatch(/1 of \d/);
    const chart = page.locator('app-pain-chart canvas');
    expect(await chart.getAttribute('aria-label')).toContain('pain during 2, 6; next morning 1, not checked');
    expect(await chart.evaluate((c: HTMLCanvasElement) => c.width > 0 && c.height > 0)).toBe(true);
    expect(await page.getByRole('table').filter({ hasText: 'Next morning' }).getByRole('row').count()).toBe(3);
    await fullShot(page, 'plans-plan-progress.png');
    expect(problems).toEqual([]);
    await context.close();
  });

  it('a session the server refuses stays on the phone with the reason; the athlete sends it for today’s stage', async () => {
    const { page, context, problems } = await athleteSessionForm();
    const before = (await logs()).length;
    let refused = 0;
    await page.route('**/api/plans/*/logs', async (route) => {
      if (route.request().method() === 'POST' && refused === 0) {
        refused++;
        await route.fulfill({
          status: 409,
          contentType: 'application/json',
          body: JSON.stringify({
            error: { code: 'stage_not_current', message: 'This stage is not the current stage of this plan any more.' },
          }),
        });
        return;
      }
      await route.continue();
    });
    await tickAllSets(page);
    await page.getByRole('radio', { name: 'Pain during 1 out of 10' }).click();
    await page.getByRole('button', { name: 'Save session' }).click();
    await expect.poll(() => page.getByText('This stage is not the current stage of this plan any more.').count()).toBe(1);
    const send = page.getByRole('button', { name: /^Send the session of .* again, for today’s stage / });
    const discard = page.getByRole('button', { name: /^Discard the session of / });
    expect(await send.count()).toBe(1);
    expect(await discard.count()).toBe(1);
    // Still kept on the phone after a reload.
    await page.reload();
    await expect.poll(() => page.getByText('Not accepted', { exact: true }).count()).toBe(1);
    await send.scrollIntoViewIfNeeded();
    await fullShot(page, 'plans-portal-refused-phone.png');
    await send.click();
    await expect.poll(async () => (await logs()).length).toBe(before + 1);
    await expect.poll(() => page.getByText('Not accepted', { exact: true }).count()).toBe(0);
    expect(problems.filter((p) => !/409|Failed to load resource/.test(p))).toEqual([]);
    await context.close();
  });

  it('a session saved offline while the coach moves the plan on: the page shows the new stage at once and sends it there', async () => {
    const { page, context, problems } = await athleteSessionForm();
    await expect.poll(() => page.getByRole('heading', { name: "Today's session: Isometric holds" }).count()).toBe(1);
    const before = (await logs()).length;
    await context.setOffline(true);
    await tickAllSets(page);
    await page.getByRole('radio', { name: 'Pain during 2 out of 10' }).click();
    await page.getByRole('button', { name: 'Save session' }).click();
    await expect.poll(() => page.getByText('1 entry waiting to send.').count()).toBe(1);
    // Meanwhile the coach moves the plan on to stage 2.
    const api = new Client(h.baseUrl);
    await api.signIn(coach.email, coach.password);
    expect((await api.post(`/api/plans/${planId}/transitions`, { action: 'advance' })).status).toBe(200);
    await context.setOffline(false);
    await expect.poll(() => page.getByText('Not accepted', { exact: true }).count(), { timeout: 20_000 }).toBe(1);
    // Without a reload, the page reads the plan again: today's stage is the new one, and sending
    // "for today's stage" aims at it (before, it named the old stage and was refused again).
    const send = page.getByRole('button', { name: /^Send the session of .* again, for today’s stage Slow lengthening$/ });
    await expect.poll(() => send.count()).toBe(1);
    expect(await page.getByText('Stage 2 of 3').count()).toBeGreaterThan(0);
    await send.click();
    await expect.poll(async () => (await logs()).length).toBe(before + 1);
    await expect.poll(() => page.getByText('Not accepted', { exact: true }).count()).toBe(0);
    const stage2 = await h.server.db('plan_stages').where({ plan_id: planId, position: 2 }).first();
    const all = await logs();
    expect(all.at(-1)).toMatchObject({ stage_id: stage2.id, pain_during: 2 });
    expect(all).toHaveLength(before + 1);
    expect(problems.filter((p) => !networkNoise(p) && !/409/.test(p))).toEqual([]);
    await context.close();
  });

  it('a session saved after the sign-in ended elsewhere (password reset) waits on the phone and is sent once after signing in again', async () => {
    const { page, context, problems } = await athleteSessionForm();
    const before = (await logs()).length;
    // On another device the athlete resets the password (to the same one): every session of hers ends.
    const other = new Client(h.baseUrl);
    expect((await other.post('/api/password-resets', { email: athlete.email })).status).toBe(202);
    const token = new URL(await lastMailLink(h.server, athlete.email)).pathname.split('/').pop()!;
    expect((await other.post(`/api/password-resets/${token}`, { password: athlete.password })).status).toBe(204);

    await tickAllSets(page);
    await page.getByRole('radio', { name: 'Pain during 1 out of 10' }).click();
    await page.getByLabel('Note (optional)').fill('Saved after the reset.');
    await page.getByRole('button', { name: 'Save session' }).click();
    // The phone says the sign-in ended, in plain words; nothing about tokens, nothing refused.
    await page.waitForURL(/\/sign-in/);
    await expect.poll(() => page.getByText('Your session has ended. Sign in to continue.').count()).toBe(1);
    expect(await page.getByText(/token/i).count()).toBe(0);
    expect(await logs()).toHaveLength(before);
    await page.getByLabel('E-mail').fill(athlete.email);
    await page.getByLabel('Password', { exact: true }).fill(athlete.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/portal\/plan$/);
    await expect.poll(async () => (await logs()).length, { timeout: 20_000 }).toBe(before + 1);
    expect((await logs()).at(-1)).toMatchObject({ pain_during: 1, note: 'Saved after the reset.' });
    await expect.poll(() => page.getByText('Saved after the reset.').count()).toBe(1);
    expect(await page.getByText('Not accepted', { exact: true }).count()).toBe(0);
    await page.waitForTimeout(1_500);
    expect(await logs()).toHaveLength(before + 1);
    expect(problems.filter((p) => !/401|Failed to load resource/.test(p))).toEqual([]);
    await context.close();
  });

  it('an athlete without an account: the plan page prompts the coach to invite them; the intake carries the pain caution', async () => {
    const { page, context, problems } = await h.newPage();
    await page.setViewportSize(DESKTOP);
    await signIn(page, coach.email, coach.password);
    const carys = await h.server.db('athletes').where({ last_name: 'Holmgren' }).first();
    expect(carys.user_id).toBeNull();
    const plan = await h.server.db('plans').where({ athlete_id: carys.id }).first();
    await page.goto(`${h.baseUrl}/plans/${plan.id}`);
    const prompt = page.getByRole('note').filter({ hasText: 'has no Trailframe account yet' });
    await expect.poll(() => prompt.count()).toBe(1);
    expect(await prompt.textContent()).toContain('so they cannot see this plan or log its sessions');
    expect(await prompt.getByRole('button', { name: 'Invite to Trailframe' }).count()).toBe(1);
    expect(
      await contrastOf(page.getByRole('note').filter({ hasText: 'Stop an exercise that causes sharp or worsening pain' })),
    ).toBeGreaterThanOrEqual(4.5);
    expect(await axeProblems(page)).toEqual([]);
    await fullShot(page, 'plans-invite-prompt.png');
    await phoneShot(page, 'plans-invite-prompt-phone.png');
    await prompt.getByRole('button', { name: 'Invite to Trailframe' }).click();
    await expect.poll(() => prompt.textContent()).toContain('An invitation is waiting for them to accept');
    expect(await h.server.db('invitations').where({ athlete_id: carys.id }).count<{ n: number }[]>({ n: '*' })).toEqual([{ n: 1 }]);

    // The intake's current-pain section carries the pain caution.
    await page.goto(`${h.baseUrl}/athletes/${carys.id}`);
    const painSection = page.getByRole('region', { name: 'Current pain' });
    await expect.poll(() => painSection.getByRole('note').filter({ hasText: "licensed clinician's examination" }).count()).toBe(1);
    await painSection.scrollIntoViewIfNeeded();
    await page.screenshot({ path: shot('plans-intake-pain-caution.png') });
    expect(problems).toEqual([]);
    await context.close();
  });
});
