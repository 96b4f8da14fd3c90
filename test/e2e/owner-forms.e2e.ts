/**
 * The clinic owner's forms in Debian chromium, typed the way people type: a reference-band limit
 * with a decimal comma ("12,5") is saved as 12.5 — a number field of the browser used to drop the
 * comma and save 125 — and a price of "12,50" as 12.50 EUR (1250 cents), not 1,250.00; leaving a
 * page with unsaved edits asks first (staying keeps them), at 1440×900 and 390×844.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';

const [owner] = DEMO_SIGN_INS;
const shot = (name: string) => path.join(SCREENSHOTS, name);

let h: Harness;
beforeAll(async () => {
  h = await startHarness();
});
afterAll(async () => {
  await h?.close();
});

/** The band card of one measure. */
const bandCard = (page: Page, title: string) => page.locator('app-band-editor').filter({ has: page.getByRole('heading', { name: title }) });

describe('owner forms: decimal commas and unsaved edits', () => {
  it('saves a band limit typed as 12,5 as 12.5 and asks before leaving a changed band', async () => {
    const { page, problems } = await h.newPage();
    await page.setViewportSize({ width: 1440, height: 900 });
    await h.signIn(page, owner.email, owner.password);
    await page.getByRole('link', { name: 'Reference bands' }).click();
    const hip = bandCard(page, 'Hip extension at toe-off (thigh from vertical)');
    const low = hip.getByLabel('Lower limit');
    await low.fill('');
    await low.pressSequentially('12,5');
    expect(await low.inputValue()).toBe('12,5');
    await hip.getByRole('button', { name: 'Save band' }).click();
    await page.getByText('Band saved').waitFor();
    await expect.poll(async () => (await h.server.db('reference_bands').where({ key: 'hip_extension_toe_off' }).first())?.low).toBe(12.5);

    // Text that is not a number is refused by the field, and nothing is sent.
    await low.fill('twelve');
    await low.blur();
    await hip.getByRole('button', { name: 'Save band' }).click();
    await hip.getByText('Enter a number, e.g. 12.5 or 12,5').waitFor();
    expect((await h.server.db('reference_bands').where({ key: 'hip_extension_toe_off' }).first()).low).toBe(12.5);

    // Leaving with the unsaved edit asks; staying keeps what was typed.
    await low.fill('11');
    await page.getByRole('link', { name: 'Team' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByText('Leave without saving?').waitFor();
    await page.screenshot({ path: shot('owner-forms-band-leave-1440.png') });
    await dialog.getByRole('button', { name: 'Cancel' }).click();
    await expect.poll(() => dialog.count()).toBe(0);
    expect(page.url()).toContain('/settings/reference-bands');
    expect(await low.inputValue()).toBe('11');
    await page.getByRole('link', { name: 'Team' }).click();
    await dialog.getByRole('button', { name: 'Leave and discard' }).click();
    await page.waitForURL(/\/team$/);
    expect(problems).toEqual([]);
  });

  it('adds a price typed as 12,50 at 12.50 EUR on a phone, and asks before leaving a typed price', async () => {
    const { page, problems } = await h.newPage();
    await page.setViewportSize({ width: 390, height: 844 });
    await h.signIn(page, owner.email, owner.password);
    await page.goto(`${h.baseUrl}/billing/prices`);
    await page.getByLabel('Item').fill('Short review');
    await page.getByLabel('Amount').fill('12,50');
    await page.getByLabel('Tax rate').fill('7,5');
    await page.screenshot({ path: shot('owner-forms-price-comma-390.png') });
    await page.getByRole('button', { name: 'Add price' }).click();
    await page.getByText('12.50 EUR').first().waitFor();
    const row = await h.server.db('prices').where({ item: 'Short review' }).first();
    expect(row).toMatchObject({ amount_minor: 1250, tax_rate_bp: 750 });

    await page.getByLabel('Item').fill('Half-typed');
    await page.getByRole('link', { name: 'Invoices' }).first().click();
    await page.getByRole('dialog').getByText('Leave without saving?').waitFor();
    await page.screenshot({ path: shot('owner-forms-price-leave-390.png') });
    expect(problems).toEqual([]);
  });
});
