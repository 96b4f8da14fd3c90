/**
 * Foundation journey in Debian chromium: a coach adds an athlete, fills the intake and invites
 * them; the athlete joins through the link in the e-mail caught by the fake SMTP receiver and sees
 * only their own profile. The e-mail is read in the demo inbox (127.0.0.1, outside the app).
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { lastMailLink, SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';

const [owner, coach] = DEMO_SIGN_INS;
let h: Harness;

beforeAll(async () => {
  h = await startHarness();
});
afterAll(async () => {
  await h?.close();
});

async function signIn(page: Page, email: string, password: string): Promise<void> {
  await page.goto(`${h.baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

async function choose(page: Page, label: string, option: string, nth = 0): Promise<void> {
  await page.getByRole('combobox', { name: label }).nth(nth).click();
  await page.getByRole('option', { name: option, exact: true }).click();
}

describe('foundation journey', () => {
  let athleteId = 0;
  const email = 'juno.marlowe@runner.test';

  it('coach signs in and sees the roster', async () => {
    const { page, context, problems } = await h.newPage();
    await signIn(page, coach.email, coach.password);
    await page.waitForURL(/\/athletes$/);
    await expect.poll(() => page.getByRole('link', { name: /Kestrel/ }).count()).toBeGreaterThan(0);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'roster.png'), fullPage: true });
    expect(await page.getByRole('link', { name: 'Team' }).count()).toBe(0);
    expect(problems).toEqual([]);
    await context.close();
  });

  it('coach adds an athlete, fills the intake and invites them', async () => {
    const { page, context, problems } = await h.newPage();
    await signIn(page, coach.email, coach.password);
    await page.waitForURL(/\/athletes$/);
    await page.getByRole('link', { name: 'Add athlete' }).first().click();
    await page.getByLabel('First name').fill('Juno');
    await page.getByLabel('Last name').fill('Marlowe');
    await page.getByLabel('E-mail (optional)').fill(email);
    await page.getByRole('button', { name: 'Add athlete' }).click();
    await page.waitForURL(/\/athletes\/\d+$/);
    athleteId = Number(/\/athletes\/(\d+)$/.exec(page.url())![1]);

    // Dates are typed day first (en-GB) and shown back in words; a day that does not exist is refused and kept.
    const dob = page.getByLabel('Date of birth');
    await dob.fill('31/02/1991');
    await dob.blur();
    await expect.poll(() => page.getByText('Enter a real date as day/month/year, e.g. 14/03/2024').count()).toBe(1);
    expect(await dob.inputValue()).toBe('31/02/1991');
    await dob.fill('2/4/1991');
    await dob.blur();
    await expect.poll(() => dob.inputValue()).toBe('2 Apr 1991');
    await page.getByLabel('Height').fill('170');
    await page.getByLabel('Weekly distance').fill('40');
    await page.getByLabel('Longest recent run').fill('18');
    await page.getByLabel('Goal event').fill('Autumn trail marathon');
    await page.getByRole('option', { name: 'Trail' }).click();
    await page.getByRole('button', { name: 'Add injury' }).click();
    await choose(page, 'Region', 'Hamstring');
    await choose(page, 'Side', 'Left');
    await page.getByLabel('Began').fill('2026-06');
    // Beside the browser's month picker (which shows the month in words) the hint asks for no format.
    const began = page.locator('mat-form-field').filter({ has: page.getByLabel('Began') });
    expect((await began.locator('mat-hint').innerText()).trim()).toBe('Month and year');
    expect(await page.locator('mat-hint').filter({ hasText: 'YYYY' }).count()).toBe(0);
    await page.getByLabel('Began').scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(SCREENSHOTS, 'intake-dates.png') });
    await choose(page, 'Status', 'Recovering');
    await page.getByRole('button', { name: 'Add painful area' }).click();
    await choose(page, 'Area', 'Hamstring');
    const slider = page.getByLabel('Pain score for area 1, 0 to 10');
    await slider.focus();
    for (let i = 0; i < 3; i++) await slider.press('ArrowRight');
    await page.getByRole('checkbox', { name: /video recording/i }).check();
    await page.getByRole('checkbox', { name: /stills/i }).check();
    await page.getByRole('button', { name: 'Save intake' }).click();

    await expect.poll(async () => (await h.server.db('consents').where({ athlete_id: athleteId, kind: 'video_recording' })).length).toBe(1);
    const row = await h.server.db('athletes').where({ id: athleteId }).first();
    expect(row).toMatchObject({
      date_of_birth: '1991-04-02',
      height_cm: 170,
      weekly_km: 40,
      longest_run_km: 18,
      goal_event: 'Autumn trail marathon',
    });
    expect(JSON.parse(row.surfaces)).toEqual(['trail']);
    expect(await h.server.db('injuries').where({ athlete_id: athleteId })).toMatchObject([
      { region: 'hamstring', side: 'left', began: '2026-06', status: 'recovering' },
    ]);
    expect(await h.server.db('pain_entries').where({ athlete_id: athleteId, current: true })).toMatchObject([
      { region: 'hamstring', score: 3 },
    ]);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'intake.png'), fullPage: true });

    await page.getByRole('button', { name: 'Invite to Trailframe' }).click();
    // The invitation is mailed over SMTP before the answer: under load that takes longer than a second.
    await expect.poll(() => page.getByText('Invitation sent').count(), { timeout: 10_000 }).toBeGreaterThan(0);
    expect(problems).toEqual([]);
    await context.close();
  });

  it('the athlete joins from the e-mailed link and sees only their own profile', async () => {
    const link = await lastMailLink(h.server, email);
    expect(link.startsWith(`${h.baseUrl}/invitation/`)).toBe(true);
    const { page, context, problems } = await h.newPage();
    await page.goto(link);
    await page.getByLabel('Your name').fill('Juno Marlowe');
    await page.getByLabel('Password', { exact: true }).fill('juno-runs-trails');
    await page.getByLabel('Confirm password').fill('juno-runs-trails');
    await page.getByRole('button', { name: 'Join and sign in' }).click();
    await page.waitForURL(/\/portal/);
    expect(await page.getByRole('link', { name: 'Athletes' }).count()).toBe(0);

    await page.goto(`${h.baseUrl}/portal/profile`);
    await expect.poll(() => page.getByText('Autumn trail marathon').count()).toBeGreaterThan(0);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'portal-profile.png'), fullPage: true });

    // Staff pages stay closed, and the API answers 404 for another athlete.
    await page.goto(`${h.baseUrl}/athletes`);
    await page.waitForLoadState('networkidle');
    expect(page.url()).not.toMatch(/\/athletes$/);
    expect(problems).toEqual([]);
    // Chromium logs the deliberate 404 below as a console error; it is the point of the check.
    const ada = await h.server.db('athletes').where({ email: 'ada.kestrel@runner.test' }).first();
    const status = await page.evaluate(async (id) => (await fetch(`/api/athletes/${id}`)).status, ada.id);
    expect(status).toBe(404);
    const own = await page.evaluate(async (id) => (await fetch(`/api/athletes/${id}`)).status, athleteId);
    expect(own).toBe(200);
    await context.close();
  });

  it('the owner deactivates a coach on the Team page (athletes to the owner), then reactivates her; desktop and phone', async () => {
    const { page, context, problems } = await h.newPage();
    await page.setViewportSize({ width: 1440, height: 900 });
    await signIn(page, owner.email, owner.password);
    await page.waitForURL(/\/athletes$/);
    await page.getByRole('link', { name: 'Team' }).click();
    const ilse = DEMO_SIGN_INS[2];
    const row = page.getByRole('row', { name: new RegExp(ilse.name) });
    await expect.poll(() => row.count()).toBe(1);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'team-desktop.png'), fullPage: true });

    await page.getByRole('button', { name: `Deactivate ${ilse.name}` }).click();
    const dialog = page.getByRole('dialog');
    await expect.poll(() => dialog.getByText(/athletes move/).count()).toBe(1);
    await dialog.getByRole('combobox', { name: 'Athletes go to' }).click();
    await page.getByRole('option', { name: `You (${owner.name})` }).click();
    await page.getByRole('listbox').waitFor({ state: 'hidden' });
    await page.waitForTimeout(300);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'team-deactivate-dialog.png') });
    await dialog.getByRole('button', { name: 'Deactivate' }).click();
    await expect.poll(() => row.getByText(/since \d+ \w+ \d{4}/).count()).toBe(1);
    const ilseId = (await h.server.db('users').where({ email: ilse.email }).first()).id;
    expect(await h.server.db('athletes').where({ coach_id: ilseId })).toHaveLength(0);

    expect(problems).toEqual([]);
    await context.close();

    // On a phone (a fresh page at that size): the states and buttons stay in view.
    const phone = await h.newPage();
    await phone.page.setViewportSize({ width: 390, height: 844 });
    await signIn(phone.page, owner.email, owner.password);
    await phone.page.waitForURL(/\/athletes$/);
    await phone.page.goto(`${h.baseUrl}/team`);
    const reactivate = phone.page.getByRole('button', { name: `Reactivate ${ilse.name}` });
    await reactivate.waitFor();
    await phone.page.screenshot({ path: path.join(SCREENSHOTS, 'team-phone.png'), fullPage: true });
    await reactivate.evaluate((el) => el.scrollIntoView({ block: 'center' }));
    await phone.page.screenshot({ path: path.join(SCREENSHOTS, 'team-phone-staff.png') });
    const overflow = await phone.page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    const box = (await reactivate.boundingBox())!;
    expect(box.x + box.width).toBeLessThanOrEqual(390);

    await reactivate.click();
    await phone.page.getByRole('dialog').getByRole('button', { name: 'Reactivate' }).click();
    await expect.poll(() => phone.page.getByRole('button', { name: `Deactivate ${ilse.name}` }).count()).toBe(1);
    expect(phone.problems).toEqual([]);
    await phone.context.close();
  });

  it('the demo inbox on 127.0.0.1 shows the invitation; the app itself has no mailbox', async () => {
    const inbox = h.server.inboxUrl!;
    expect(inbox).toMatch(/^http:\/\/127\.0\.0\.1:\d+$/);
    const { page, context, problems } = await h.newPage();
    await page.goto(inbox);
    await page
      .getByRole('link', { name: /invited to Larchwood/ })
      .first()
      .click();
    await expect.poll(() => page.getByText(`${h.baseUrl}/invitation/`).count()).toBeGreaterThan(0);
    expect(await page.getByText(email).count()).toBeGreaterThan(0);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'demo-inbox.png'), fullPage: true });

    await signIn(page, owner.email, owner.password);
    await page.waitForURL(/\/athletes$/);
    expect(await page.getByRole('link', { name: 'Mailbox' }).count()).toBe(0);
    expect(await page.evaluate(async () => (await fetch('/api/mailbox')).status)).toBe(404);
    expect(problems.filter((p) => !p.includes('404'))).toEqual([]);
    await context.close();
  });
});
