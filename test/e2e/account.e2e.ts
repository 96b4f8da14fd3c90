/**
 * The Account page in Debian chromium: the athlete on a 390×844 phone opens it from the portal's
 * navigation, is told beside the field that a wrong current password is wrong (nothing typed
 * lost), changes the password, and signs in with the new one; a coach reaches it from the account
 * menu at 1440×900. axe-core (npm) judges both views. Screenshots `account-*.png`.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { axeProblems } from './axe';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';

const [, coach, , athlete] = DEMO_SIGN_INS;
const PHONE = { width: 390, height: 844 };
const DESKTOP = { width: 1440, height: 900 };
const NEW = 'trail-legs-and-lungs-2';
let h: Harness;

beforeAll(async () => {
  h = await startHarness();
}, 300_000);
afterAll(async () => {
  await h?.close();
});

describe('account page', () => {
  it('the athlete changes their password on a phone and signs in with the new one', async () => {
    const context = await h.browser.newContext({ viewport: PHONE });
    const page = await context.newPage();
    const problems: string[] = [];
    page.on('pageerror', (e) => problems.push(e.message));
    await h.signIn(page, athlete.email, athlete.password);
    await page.getByRole('button', { name: 'Navigation menu' }).click();
    await page.getByRole('link', { name: 'Account' }).click();
    await page.waitForURL(/\/account$/);
    await page.getByRole('heading', { name: 'Change password' }).waitFor();
    expect(await page.getByText(athlete.email).count()).toBeGreaterThan(0);
    await page.screenshot({ path: path.join(SCREENSHOTS, 'account-athlete-390.png'), fullPage: true });
    expect(await axeProblems(page)).toEqual([]);

    // A wrong current password: said beside that field, everything typed kept.
    await page.getByLabel('Current password', { exact: true }).fill('not-my-password');
    await page.getByLabel('New password', { exact: true }).fill(NEW);
    await page.getByLabel('Repeat new password', { exact: true }).fill(NEW);
    await page.getByRole('button', { name: 'Show new password' }).click();
    await expect.poll(() => page.getByLabel('New password', { exact: true }).getAttribute('type')).toBe('text');
    await page.getByRole('button', { name: 'Change password' }).click();
    await page.getByText('That is not your current password.').waitFor();
    await page.screenshot({ path: path.join(SCREENSHOTS, 'account-athlete-refused-390.png'), fullPage: true });
    expect(await page.getByLabel('New password', { exact: true }).inputValue()).toBe(NEW);
    expect(await page.getByLabel('Repeat new password', { exact: true }).inputValue()).toBe(NEW);

    await page.getByLabel('Current password', { exact: true }).fill(athlete.password);
    await page.getByRole('button', { name: 'Change password' }).click();
    await page.getByRole('status').filter({ hasText: 'Your password is changed' }).waitFor();
    await page.screenshot({ path: path.join(SCREENSHOTS, 'account-athlete-changed-390.png'), fullPage: true });
    // Still signed in here: the portal opens without a sign-in.
    await page.goto(`${h.baseUrl}/portal`);
    await page.waitForURL(/\/portal$/);
    await context.close();

    // A fresh browser: the old password is refused, the new one signs in.
    const fresh = await h.browser.newContext({ viewport: PHONE });
    const again = await fresh.newPage();
    await again.goto(`${h.baseUrl}/sign-in`);
    await again.getByLabel('E-mail').fill(athlete.email);
    await again.getByLabel('Password', { exact: true }).fill(athlete.password);
    await again.getByRole('button', { name: 'Sign in' }).click();
    await again.getByRole('alert').first().waitFor();
    await h.signIn(again, athlete.email, NEW);
    expect(again.url()).toMatch(/\/portal$/);
    await fresh.close();
    expect(problems).toEqual([]);
  });

  it('a coach reaches it from the account menu on a desktop', async () => {
    const context = await h.browser.newContext({ viewport: DESKTOP });
    const page = await context.newPage();
    await h.signIn(page, coach.email, coach.password);
    await page.getByRole('button', { name: /Account menu for/ }).click();
    await page.getByRole('menuitem', { name: 'Account' }).click();
    await page.waitForURL(/\/account$/);
    await page.getByRole('heading', { name: 'Change password' }).waitFor();
    await page.getByRole('button', { name: 'Change password' }).click();
    await page.getByText('Current password is required').waitFor();
    await page.screenshot({ path: path.join(SCREENSHOTS, 'account-coach-1440.png'), fullPage: true });
    expect(await axeProblems(page)).toEqual([]);
    await context.close();
  });
});
