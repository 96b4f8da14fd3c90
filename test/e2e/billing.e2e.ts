/**
 * Billing in Debian chromium: the owner bills the demo athlete for her Re-test (price list: Re-test
 * 65.00 EUR at 20 % tax = 65.00 + 13.00 = 78.00 EUR) and issues it; the athlete (on a phone) pays on
 * the local fake payment page; the signed webhook marks it paid; the receipt PDF and both e-mails
 * exist; the owner refunds and the refund round-trips through the payment service. Before issuing, the
 * owner corrects the draft (2 → 1 Re-test: 156.00 → 78.00 EUR); a stray draft is deleted; the
 * currency cannot change once invoices exist. Invoice states read in our own words (Draft → Issued
 * → Paid, Cancelled, Refunded). The owner fills in the clinic's legal details, invoices an athlete
 * without an account (prompted to invite her; the e-mail says how to get access), records her bank
 * transfer and its refund without the payment service, and the receipt says how it was paid.
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { PDFParse } from 'pdf-parse';
import { axeProblems } from './axe';
import { SCREENSHOTS, startHarness, type Harness } from './harness';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';

const [owner, coach, , athlete] = DEMO_SIGN_INS;
const PHONE = { width: 390, height: 844 };
const DESKTOP = { width: 1440, height: 900 };
const shot = (name: string) => path.join(SCREENSHOTS, name);

let h: Harness;
let invoiceId = 0;
let invoiceNumber = '';

beforeAll(async () => {
  h = await startHarness();
});
afterAll(async () => {
  await h?.close();
});

const signIn = (page: Page, email: string, password: string) => h.signIn(page, email, password);

/** Opens a Material select by keyboard (its floating label covers the trigger) and picks an option. */
async function choose(page: Page, label: string, option: string | RegExp): Promise<void> {
  await page.getByRole('combobox', { name: label }).focus();
  await page.keyboard.press('Enter');
  await page.getByRole('option', { name: option }).click();
  await expect.poll(() => page.getByRole('listbox').count()).toBe(0);
}

/** A phone-width screenshot of the whole page, then back to the desktop size. */
async function phoneShot(page: Page, name: string): Promise<void> {
  const size = page.viewportSize()!;
  await page.setViewportSize(PHONE);
  // The shell switches its navigation to the phone layout (closed drawer) after a breakpoint change.
  await page.waitForTimeout(800);
  const height = await page.evaluate(() => {
    const pane = document.querySelector('mat-sidenav-content');
    return pane ? pane.scrollHeight + pane.getBoundingClientRect().top : document.documentElement.scrollHeight;
  });
  await page.setViewportSize({ width: PHONE.width, height: Math.min(4000, Math.max(PHONE.height, Math.ceil(height))) });
  await page.screenshot({ path: shot(name) });
  await page.setViewportSize(size);
}

/** Closes the confirmation snack bar (if any) and waits until it and its fade are gone. */
async function dismissSnackBar(page: Page): Promise<void> {
  const snack = page.locator('mat-snack-bar-container');
  if (await snack.count()) await snack.getByRole('button').click();
  await expect.poll(() => snack.count()).toBe(0);
  await page.waitForTimeout(400);
}

const invoice = () => h.server.db('invoices').where({ id: invoiceId }).first();
const mailTo = (to: string, subject: string) =>
  h.server.db('mailbox_messages').where('to_address', 'like', `%${to}%`).andWhere('subject', subject).first();

describe('billing: invoice, card payment on the fake payment page, webhook, receipt, refund', () => {
  it('the owner sees the demo price list and invoices Ada for her Re-test (78.00 EUR) and issues it', async () => {
    const { page, problems, context } = await h.newPage();
    await signIn(page, owner.email, owner.password);
    await page.getByRole('link', { name: 'Billing' }).click();
    await page.getByRole('heading', { name: 'Invoices' }).waitFor();
    await page.getByRole('link', { name: 'Prices' }).click();
    await page.getByRole('cell', { name: /^Re-test/ }).waitFor();
    await expect.poll(() => page.getByRole('row', { name: /Re-test/ }).innerText()).toMatch(/65\.00 EUR\s+20 %/);
    await page.screenshot({ path: shot('billing-prices-desktop.png') });
    await phoneShot(page, 'billing-prices-phone.png');

    // From the visit itself: "Invoice this visit" chooses Ada, her Re-test and its price.
    const retest = await h.server
      .db('assessments as s')
      .join('athletes as a', 'a.id', 's.athlete_id')
      .where({ 'a.email': athlete.email, 's.kind': 'retest' })
      .first('s.id', 's.athlete_id');
    await page.goto(`${h.baseUrl}/athletes/${retest.athlete_id}/assessments/${retest.id}`);
    await page.getByRole('link', { name: 'Invoice this visit' }).waitFor();
    await page.screenshot({ path: shot('billing-assessment-link-desktop.png') });
    await phoneShot(page, 'billing-assessment-link-phone.png');
    await page.getByRole('link', { name: 'Invoice this visit' }).click();
    await page.waitForURL(new RegExp(`/billing/invoices/new\\?athlete=${retest.athlete_id}&assessment=${retest.id}$`));
    await expect.poll(() => page.getByRole('combobox', { name: 'Athlete' }).innerText()).toContain('Ada Kestrel');
    await expect.poll(() => page.getByRole('combobox', { name: 'For assessment' }).innerText()).toMatch(/^Re-test ·/);
    await expect.poll(() => page.getByLabel('Description').inputValue()).toBe('Re-test');
    await expect.poll(() => page.getByTestId('preview-total').innerText()).toBe('78.00 EUR');
    await page.screenshot({ path: shot('billing-new-invoice-desktop.png'), fullPage: true });
    await phoneShot(page, 'billing-new-invoice-phone.png');
    // A slip (two Re-tests), saved, then corrected on the draft before issuing.
    await page.getByLabel('Qty').fill('2');
    await expect.poll(() => page.getByTestId('preview-total').innerText()).toBe('156.00 EUR');
    await page.getByRole('button', { name: 'Save draft' }).click();
    await page.waitForURL(/\/billing\/invoices\/\d+$/);
    invoiceId = Number(page.url().split('/').pop());
    await expect.poll(() => page.getByTestId('invoice-total').innerText()).toBe('156.00 EUR');
    await expect.poll(() => page.getByTestId('invoice-assessment').innerText()).toBe('Re-test · 24 Nov 2026');
    expect(await page.getByTestId('invoice-assessment').getAttribute('href')).toBe(
      `/athletes/${retest.athlete_id}/assessments/${retest.id}`,
    );
    await page.screenshot({ path: shot('billing-draft-desktop.png') });
    await phoneShot(page, 'billing-draft-phone.png');
    await page.getByRole('link', { name: 'Edit' }).click();
    await page.waitForURL(/\/billing\/invoices\/\d+\/edit$/);
    await page.getByRole('heading', { name: 'Edit draft invoice' }).waitFor();
    await expect.poll(() => page.getByLabel('Qty').inputValue()).toBe('2');
    await page.getByLabel('Qty').fill('1');
    await expect.poll(() => page.getByTestId('preview-total').innerText()).toBe('78.00 EUR');
    await page.screenshot({ path: shot('billing-edit-draft-desktop.png'), fullPage: true });
    await phoneShot(page, 'billing-edit-draft-phone.png');
    await page.getByRole('button', { name: 'Save changes' }).click();
    await page.waitForURL(new RegExp(`/billing/invoices/${invoiceId}$`));
    await expect.poll(() => page.getByTestId('invoice-total').innerText()).toBe('78.00 EUR');
    expect(await invoice()).toMatchObject({ status: 'draft', total_minor: 7800 });

    await page.getByRole('button', { name: 'Issue' }).click();
    await page.getByRole('dialog').getByRole('button', { name: 'Issue' }).click();
    await expect.poll(async () => (await invoice()).status).toBe('issued');
    await page.getByTestId('invoice-status').getByText('Issued').waitFor();
    invoiceNumber = (await invoice()).number;
    // Numbers continue per clinic and year after the demo's own (Ada's TF-2026-0001 and -0002).
    const year = new Date().getUTCFullYear();
    const before = await h.server
      .db('invoices')
      .where('number', 'like', `TF-${year}-%`)
      .whereNot({ id: invoiceId })
      .count<{ n: number }[]>({ n: '*' });
    expect(invoiceNumber).toBe(`TF-${year}-${String(Number(before[0]!.n) + 1).padStart(4, '0')}`);
    await page.getByRole('heading', { name: `Invoice ${invoiceNumber}` }).waitFor();
    await page.screenshot({ path: shot('billing-invoice-issued-desktop.png') });
    await phoneShot(page, 'billing-invoice-issued-phone.png');
    const issuedMail = await mailTo(athlete.email, `Invoice ${invoiceNumber} from Larchwood Running Clinic`);
    expect(issuedMail?.text).toContain(`/portal/invoices/${invoiceId}`);

    await page.goto(`${h.baseUrl}/billing/invoices`);
    await page.getByRole('link', { name: invoiceNumber }).waitFor();
    await page.screenshot({ path: shot('billing-invoices-desktop.png') });
    expect(problems).toEqual([]);
    await context.close();
  });

  it('the athlete pays on the payment page (phone); the webhook — not the redirect — marks it paid; receipt and e-mail exist', async () => {
    const { page, problems, context } = await h.newPage();
    await page.setViewportSize(PHONE);
    await signIn(page, athlete.email, athlete.password);
    // The demo's issued Re-test invoice (78.00 EUR) and the one just issued.
    await expect.poll(() => page.getByTestId('invoices-due').innerText()).toMatch(/^2 invoices to pay · 156\.00 EUR, the next due /);
    await page.getByTestId('invoices-due').scrollIntoViewIfNeeded();
    await page.screenshot({ path: shot('billing-portal-home-phone.png') });
    await page.getByRole('link', { name: 'Open my invoices' }).click();
    await page.getByRole('heading', { name: 'My invoices' }).waitFor();
    await page.screenshot({ path: shot('billing-portal-invoices-phone.png'), fullPage: true });
    await page.getByRole('link', { name: new RegExp(invoiceNumber) }).click();
    await page.getByText('78.00 EUR due').waitFor();
    await page.screenshot({ path: shot('billing-portal-invoice-open-phone.png'), fullPage: true });

    // Cancel on the payment page first: back with nothing charged, still issued.
    await page.getByRole('button', { name: /Pay 78\.00 EUR by card/ }).click();
    await page.waitForURL(/\/pay\/cs_/);
    await page.getByRole('button', { name: 'Cancel' }).click();
    await page.waitForURL(/checkout=cancel/);
    await page.getByText('Payment cancelled').waitFor();
    expect((await invoice()).status).toBe('issued');

    await page.getByRole('button', { name: /Pay 78\.00 EUR by card/ }).click();
    await page.waitForURL(/\/pay\/cs_/);
    expect(await page.getByTestId('amount').innerText()).toBe('78.00 EUR');
    await page.screenshot({ path: shot('billing-payment-page-phone.png') });
    await page.getByRole('button', { name: 'Pay', exact: true }).click();
    await page.waitForURL(new RegExp(`/portal/invoices/${invoiceId}\\?checkout=success`));
    await page.getByText('Paid by card on').waitFor({ timeout: 30_000 });
    expect((await invoice()).status).toBe('paid');
    const event = await h.server.db('payment_events').where({ invoice_id: invoiceId, type: 'checkout.session.completed' }).first();
    expect(event).toBeTruthy();
    await page.screenshot({ path: shot('billing-portal-invoice-paid-phone.png'), fullPage: true });

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('link', { name: 'Download receipt (PDF)' }).click(),
    ]);
    const file = path.join(SCREENSHOTS, `receipt-${invoiceNumber}.pdf`);
    await download.saveAs(file);
    const text = (await new PDFParse({ data: fs.readFileSync(file) }).getText()).text;
    expect(text).toContain(`Receipt for invoice ${invoiceNumber}`);
    expect(text).toMatch(/Total paid\s+78\.00 EUR/);
    const paidMail = await mailTo(athlete.email, `Payment received for invoice ${invoiceNumber}`);
    expect(paidMail?.text).toContain('78.00 EUR');
    expect(problems).toEqual([]);
    await context.close();
  });

  it('the owner refunds; charge.refunded comes back from the payment service; the athlete sees Refunded', async () => {
    const { page, problems, context } = await h.newPage();
    await signIn(page, owner.email, owner.password);
    await page.goto(`${h.baseUrl}/billing/invoices/${invoiceId}`);
    await page.getByRole('button', { name: 'Refund' }).click();
    await page.getByRole('dialog').getByRole('button', { name: 'Refund' }).click();
    await expect.poll(async () => (await invoice()).status).toBe('refunded');
    await h.server.fakePayments!.idle();
    await expect.poll(() => h.server.db('payment_events').where({ invoice_id: invoiceId, type: 'charge.refunded' }).first()).toBeTruthy();
    await page.getByTestId('invoice-status').getByText('Refunded').waitFor();
    await page.screenshot({ path: shot('billing-invoice-refunded-desktop.png') });
    await page.setViewportSize(PHONE);
    await page.goto(`${h.baseUrl}/billing/invoices`);
    await page.getByRole('link', { name: invoiceNumber }).waitFor();
    await page.screenshot({ path: shot('billing-invoices-phone.png'), fullPage: true });
    await context.close();

    const a = await h.newPage();
    await signIn(a.page, athlete.email, athlete.password);
    await a.page.goto(`${h.baseUrl}/portal/invoices/${invoiceId}`);
    await a.page.getByText('This payment was refunded').waitFor();
    expect([...problems, ...a.problems]).toEqual([]);
    await a.context.close();
  });

  it('the owner deletes a stray draft made from the athlete profile; the currency cannot change once invoices exist', async () => {
    const { page, problems, context } = await h.newPage();
    await signIn(page, owner.email, owner.password);
    const ada = await h.server.db('athletes').where({ email: athlete.email }).first();
    await page.goto(`${h.baseUrl}/athletes/${ada.id}`);
    await page.getByRole('link', { name: 'New invoice' }).waitFor();
    await page.screenshot({ path: shot('billing-athlete-link-desktop.png') });
    await phoneShot(page, 'billing-athlete-link-phone.png');
    await page.getByRole('link', { name: 'New invoice' }).click();
    await page.waitForURL(new RegExp(`/billing/invoices/new\\?athlete=${ada.id}$`));
    await choose(page, 'From the price list', /^Gait assessment/);
    await expect.poll(() => page.getByTestId('preview-total').innerText()).toBe('144.00 EUR');
    await page.getByRole('button', { name: 'Save draft' }).click();
    await page.waitForURL(/\/billing\/invoices\/\d+$/);
    const strayId = Number(page.url().split('/').pop());
    await page.getByRole('button', { name: 'Delete draft' }).click();
    await page.getByRole('dialog').getByRole('button', { name: 'Delete draft' }).click();
    await page.waitForURL(/\/billing\/invoices$/);
    expect(await h.server.db('invoices').where({ id: strayId }).first()).toBeUndefined();

    await page.goto(`${h.baseUrl}/billing/prices`);
    await choose(page, 'Currency', 'GBP');
    await page.getByRole('button', { name: 'Save', exact: true }).click();
    await page.getByText('Invoices already exist in the current currency').waitFor();
    expect((await h.server.db('clinics').where({ id: ada.clinic_id }).first()).currency).toBe('EUR');
    await page.waitForTimeout(300); // the field's error colour fades in
    await page.screenshot({ path: shot('billing-currency-refused-desktop.png') });
    await phoneShot(page, 'billing-currency-refused-phone.png');
    // The refusal is shown, not also snackbarred: expected 409 is no "problem" of the page.
    expect(problems.filter((p) => !p.includes('409'))).toEqual([]);
    await context.close();

    // Coaches do not bill: no billing links on the same pages.
    const c = await h.newPage();
    await signIn(c.page, coach.email, coach.password);
    await c.page.goto(`${h.baseUrl}/athletes/${ada.id}`);
    await c.page.getByRole('button', { name: 'Edit details' }).waitFor();
    expect(await c.page.getByRole('link', { name: 'New invoice' }).count()).toBe(0);
    const visit = await h.server.db('assessments').where({ athlete_id: ada.id }).first('id');
    await c.page.goto(`${h.baseUrl}/athletes/${ada.id}/assessments/${visit.id}`);
    await c.page.getByRole('button', { name: 'Delete' }).waitFor();
    expect(await c.page.getByRole('link', { name: 'Invoice this visit' }).count()).toBe(0);
    expect(c.problems).toEqual([]);
    await c.context.close();
  });

  it('the owner fills in the clinic legal details, then records a bank transfer from an athlete without an account, and its refund', async () => {
    const { page, problems, context } = await h.newPage();
    await page.setViewportSize(DESKTOP);
    await signIn(page, owner.email, owner.password);
    await page.getByRole('link', { name: 'Clinic details' }).click();
    await page.waitForURL(/\/settings\/clinic$/);
    await page.getByRole('heading', { name: 'Legal details on invoices and receipts' }).waitFor();
    await page.getByLabel('Legal name').fill('Larchwood Running Clinic Ltd');
    await page.getByLabel('Address').fill('12 Mill Lane\nLarchwood LW1 2AB');
    await page.getByLabel('Tax number (optional)').fill('GB 123 <4567>');
    await page.getByLabel('Contact line (optional)').fill('billing@larchwood.test');
    await page.getByRole('button', { name: 'Save legal details' }).click();
    await page.getByText('Letters, digits, spaces, dots, dashes and slashes only').waitFor();
    await page.waitForTimeout(300); // the field's error colour fades in
    await page.screenshot({ path: shot('billing-legal-details-error-desktop.png') });
    await page.getByLabel('Tax number (optional)').fill('GB 123 4567 89');
    await page.getByRole('button', { name: 'Save legal details' }).click();
    await expect
      .poll(async () => (await h.server.db('clinics').where({ name: 'Larchwood Running Clinic' }).first()).tax_number)
      .toBe('GB 123 4567 89');
    // Once the confirmation is dismissed and the field's hint has faded back in.
    await dismissSnackBar(page);
    expect(await axeProblems(page)).toEqual([]);
    await page.screenshot({ path: shot('billing-legal-details-desktop.png') });
    await phoneShot(page, 'billing-legal-details-phone.png');

    // An athlete without an account: the invoice page prompts to invite her.
    const carys = await h.server.db('athletes').where({ last_name: 'Holmgren' }).first();
    expect(carys.user_id).toBeNull();
    await page.goto(`${h.baseUrl}/billing/invoices/new?athlete=${carys.id}`);
    await choose(page, 'From the price list', /^Re-test/);
    await expect.poll(() => page.getByTestId('preview-total').innerText()).toBe('78.00 EUR');
    await page.getByRole('button', { name: 'Save draft' }).click();
    await page.waitForURL(/\/billing\/invoices\/\d+$/);
    const id = Number(page.url().split('/').pop());
    const prompt = page.getByRole('note').filter({ hasText: 'has no Trailframe account yet' });
    await expect.poll(() => prompt.count()).toBe(1);
    expect(await prompt.textContent()).toContain('so they cannot see or pay this invoice online');
    await page.getByRole('button', { name: 'Issue' }).click();
    expect(await page.getByRole('dialog').textContent()).toContain('how to get access to pay online');
    await page.getByRole('dialog').getByRole('button', { name: 'Issue' }).click();
    await expect.poll(async () => (await h.server.db('invoices').where({ id }).first()).status).toBe('issued');
    const number = (await h.server.db('invoices').where({ id }).first()).number;
    await expect.poll(() => mailTo(carys.email, `Invoice ${number} from Larchwood Running Clinic`)).toBeTruthy();
    const mail = await mailTo(carys.email, `Invoice ${number} from Larchwood Running Clinic`);
    expect(mail.text).not.toMatch(/https?:\/\//);
    expect(mail.text).toContain('You do not have a Trailframe account yet');
    // The invoice page names the seller with the legal details.
    const from = page.getByRole('region', { name: 'From' });
    await expect.poll(() => from.textContent()).toContain('Tax number: GB 123 4567 89');
    await dismissSnackBar(page);
    expect(await axeProblems(page)).toEqual([]);
    await page.screenshot({ path: shot('billing-invoice-no-account-desktop.png') });
    await phoneShot(page, 'billing-invoice-no-account-phone.png');

    // She paid by bank transfer: the owner records it.
    await page.getByRole('button', { name: 'Record payment' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByRole('heading', { name: 'Record a payment' }).waitFor();
    await dialog.getByLabel('Note (optional)').fill('Transfer ref. RT-2211');
    await page.waitForTimeout(400); // the dialog's opening animation
    expect(await axeProblems(page, '.cdk-overlay-container')).toEqual([]);
    await page.screenshot({ path: shot('billing-record-payment-desktop.png') });
    await dialog.getByRole('button', { name: 'Mark as paid' }).click();
    await expect.poll(async () => (await h.server.db('invoices').where({ id }).first()).status).toBe('paid');
    expect(await h.server.db('invoices').where({ id }).first()).toMatchObject({
      payment_method: 'bank_transfer',
      payment_note: 'Transfer ref. RT-2211',
    });
    await page.getByTestId('invoice-status').getByText('Paid').waitFor();
    expect(await page.getByTestId('invoice-paid').textContent()).toContain('Paid by bank transfer on');
    await dismissSnackBar(page);
    expect(await axeProblems(page)).toEqual([]);
    await page.screenshot({ path: shot('billing-invoice-paid-transfer-desktop.png') });
    await phoneShot(page, 'billing-invoice-paid-transfer-phone.png');
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Receipt (PDF)' }).click()]);
    const file = path.join(SCREENSHOTS, `receipt-${number}.pdf`);
    await download.saveAs(file);
    const text = (await new PDFParse({ data: fs.readFileSync(file) }).getText()).text;
    for (const s of [
      'Larchwood Running Clinic Ltd',
      '12 Mill Lane',
      'Tax number: GB 123 4567 89',
      'by bank transfer',
      'Payment note: Transfer ref. RT-2211',
    ])
      expect(text).toContain(s);

    // The refund is recorded, not sent to the payment service.
    const events = h.server.fakePayments!.events.length;
    await page.getByRole('button', { name: 'Record refund' }).click();
    await page.getByRole('dialog').getByLabel('Note (optional)').fill('Transferred back');
    await page.getByRole('dialog').getByRole('button', { name: 'Record refund' }).click();
    await expect.poll(async () => (await h.server.db('invoices').where({ id }).first()).status).toBe('refunded');
    expect(h.server.fakePayments!.events.length).toBe(events);
    await page.getByTestId('invoice-status').getByText('Refunded').waitFor();
    expect(problems).toEqual([]);
    await context.close();
  });
});
