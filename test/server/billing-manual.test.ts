/**
 * Billing beyond the card: the owner records a bank transfer or cash payment (with a note and the
 * day it arrived) and its refund without the payment service; the clinic's legal details (legal
 * name, address, tax number, contact line) on invoices and receipts; the invoice e-mail to an
 * athlete without an account. Amounts are the demo price list's (Re-test 65.00 + 20 % = 78.00 EUR).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PDFParse } from 'pdf-parse';
import { makeTestApp, OTHER, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import type { InvoiceDetail, Price } from '../../src/contracts/billing';

const [owner, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let o: Client;
let a: Client;
let adaId: number;
let carysId: number;
let retest: Price;

const today = () => new Date().toISOString().slice(0, 10);
const dayBefore = (iso: string) => new Date(Date.parse(`${iso}T00:00:00Z`) - 86_400_000).toISOString().slice(0, 10);

async function issuedFor(athleteId: number): Promise<InvoiceDetail> {
  const d = await o.post('/api/invoices', {
    athleteId,
    assessmentId: null,
    dueDate: '2026-12-31',
    note: null,
    lines: [{ priceId: retest.id, description: 'Re-test', quantity: 1, unitAmountMinor: retest.amountMinor, taxRateBp: retest.taxRateBp }],
  });
  expect(d.status, JSON.stringify(d.body)).toBe(201);
  const res = await o.post(`/api/invoices/${d.body.id}/issue`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body;
}

async function receiptText(client: Client, id: number): Promise<string> {
  const pdf = await client
    .get(`/api/invoices/${id}/receipt`)
    .buffer(true)
    .parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
  expect(pdf.status).toBe(200);
  return (await new PDFParse({ data: pdf.body as Buffer }).getText()).text;
}

beforeAll(async () => {
  t = await makeTestApp({}, { fakePayments: true });
  o = await signedIn(t.app, owner.email, owner.password);
  a = await signedIn(t.app, athlete.email, athlete.password);
  adaId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  carysId = (await t.db('athletes').where({ last_name: 'Holmgren' }).first()).id;
  retest = (await o.get('/api/prices')).body.prices.find((p: Price) => p.item === 'Re-test');
});
afterAll(async () => {
  await t.close();
});

describe('clinic legal details (owner settings)', () => {
  const details = {
    legalName: 'Larchwood Running Clinic Ltd',
    address: '  12 Mill Lane \n\n Larchwood LW1 2AB ',
    taxNumber: 'GB 123 4567 89',
    contactLine: 'billing@larchwood.test · 01632 960000',
  };

  it('starts empty, saves trimmed details, and only the owner may read or change them', async () => {
    expect((await o.get('/api/clinic/legal-details')).body).toEqual({ legalName: '', address: '', taxNumber: '', contactLine: '' });
    const res = await o.put('/api/clinic/legal-details', details);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toEqual({ ...details, address: '12 Mill Lane\nLarchwood LW1 2AB' });
    const c = await signedIn(t.app, coach.email, coach.password);
    expect((await c.get('/api/clinic/legal-details')).status).toBe(403);
    expect((await a.put('/api/clinic/legal-details', details)).status).toBe(403);
    // Another clinic's owner reads and writes their own clinic's, never this one's.
    const far = await signedIn(t.app, OTHER.owner.email, OTHER.owner.password);
    expect((await far.get('/api/clinic/legal-details')).body.legalName).toBe('');
  });

  it('refuses bad input with field errors (422) and keeps what was stored', async () => {
    const cases: [Record<string, unknown>, string][] = [
      [{ ...details, legalName: '  ' }, 'legalName'],
      [{ ...details, address: '' }, 'address'],
      [{ ...details, address: Array.from({ length: 7 }, (_, i) => `Line ${i}`).join('\n') }, 'address'],
      [{ ...details, taxNumber: 'GB<script>' }, 'taxNumber'],
      [{ ...details, taxNumber: 'X'.repeat(41) }, 'taxNumber'],
      [{ ...details, contactLine: 'one\ntwo' }, 'contactLine'],
      [{ ...details, legalName: 42 }, 'legalName'],
      [{ ...details, logo: 'x' }, ''],
    ];
    for (const [body, path] of cases) {
      const res = await o.put('/api/clinic/legal-details', body);
      expect(res.status, JSON.stringify(body)).toBe(422);
      expect(res.body.error.details.map((d: { path: (string | number)[] }) => d.path.join('.'))).toContain(path);
    }
    expect((await o.get('/api/clinic/legal-details')).body.legalName).toBe('Larchwood Running Clinic Ltd');
  });

  it('invoices carry them (owner and athlete) and the receipt prints them', async () => {
    const inv = await issuedFor(adaId);
    expect(inv.clinicLegal).toEqual({
      legalName: 'Larchwood Running Clinic Ltd',
      address: '12 Mill Lane\nLarchwood LW1 2AB',
      taxNumber: 'GB 123 4567 89',
      contactLine: 'billing@larchwood.test · 01632 960000',
    });
    expect((await a.get(`/api/invoices/${inv.id}`)).body.clinicLegal.taxNumber).toBe('GB 123 4567 89');
    await o.post(`/api/invoices/${inv.id}/payments`, { method: 'cash', paidOn: today(), note: '' });
    const text = await receiptText(a, inv.id);
    for (const s of [
      'Larchwood Running Clinic Ltd',
      'Trading as Larchwood Running Clinic',
      '12 Mill Lane',
      'Larchwood LW1 2AB',
      'Tax number: GB 123 4567 89',
      'billing@larchwood.test',
    ])
      expect(text).toContain(s);
  });
});

describe('a payment recorded by the owner (bank transfer or cash)', () => {
  it('marks an issued invoice paid by bank transfer with the day and note; the receipt says how it was paid; no payment service involved', async () => {
    const inv = await issuedFor(adaId);
    const events = t.fakePayments!.events.length;
    const mails = t.mailer.sent.length;
    const res = await o.post(`/api/invoices/${inv.id}/payments`, {
      method: 'bank_transfer',
      paidOn: today(),
      note: 'Transfer ref. RT-2211',
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({
      status: 'paid',
      paymentMethod: 'bank_transfer',
      paidOn: today(),
      paymentNote: 'Transfer ref. RT-2211',
    });
    expect(res.body.paidAt).toBeTruthy();
    expect(t.fakePayments!.events.length).toBe(events);
    const mail = t.mailer.sent.slice(mails).find((m) => m.subject === `Payment received for invoice ${inv.number}`)!;
    expect(mail.text).toContain('78.00 EUR');
    expect(mail.text).toContain('by bank transfer');
    const text = await receiptText(o, inv.id);
    expect(text).toContain('by bank transfer');
    expect(text).toContain('Payment note: Transfer ref. RT-2211');
    expect(text).toMatch(/Total paid\s+78\.00 EUR/);
    // Paid is paid: no second payment, no card payment page.
    expect((await o.post(`/api/invoices/${inv.id}/payments`, { method: 'cash', paidOn: today(), note: '' })).status).toBe(409);
    const pay = await a.post(`/api/invoices/${inv.id}/checkout`);
    expect(pay.status).toBe(409);
    expect(pay.body.error.code).toBe('invoice_not_payable');
  });

  it('refunding a recorded payment records it with a note, without calling the payment service', async () => {
    const inv = await issuedFor(adaId);
    await o.post(`/api/invoices/${inv.id}/payments`, { method: 'cash', paidOn: today(), note: 'Paid at the desk' });
    const events = t.fakePayments!.events.length;
    const res = await o.post(`/api/invoices/${inv.id}/refund`, { note: 'Cash handed back at the desk' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ status: 'refunded', paymentMethod: 'cash', refundNote: 'Cash handed back at the desk' });
    expect(res.body.refundedAt).toBeTruthy();
    expect(t.fakePayments!.events.length).toBe(events);
    const text = await receiptText(a, inv.id);
    expect(text).toContain('by the clinic (cash payment)');
    expect(text).toContain('Refund note: Cash handed back at the desk');
    expect((await o.post(`/api/invoices/${inv.id}/refund`)).status).toBe(409);
  });

  it('refuses bad input with field errors (422) and writes nothing', async () => {
    const inv = await issuedFor(adaId);
    const tomorrow = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);
    const cases: [Record<string, unknown>, string][] = [
      [{ method: 'card', paidOn: today(), note: '' }, 'method'],
      [{ method: 'cheque', paidOn: today(), note: '' }, 'method'],
      [{ method: 'cash', paidOn: tomorrow, note: '' }, 'paidOn'],
      [{ method: 'cash', paidOn: '2026-02-30', note: '' }, 'paidOn'],
      [{ method: 'cash', paidOn: dayBefore(inv.issuedAt!.slice(0, 10)), note: '' }, 'paidOn'],
      [{ method: 'cash', note: '' }, 'paidOn'],
      [{ method: 'cash', paidOn: today(), note: 'x'.repeat(301) }, 'note'],
      [{ method: 'cash', paidOn: today(), note: '', amountMinor: 1 }, ''],
    ];
    for (const [body, path] of cases) {
      const res = await o.post(`/api/invoices/${inv.id}/payments`, body);
      expect(res.status, JSON.stringify(body)).toBe(422);
      expect(res.body.error.details.map((d: { path: (string | number)[] }) => d.path.join('.'))).toContain(path);
    }
    expect((await o.get(`/api/invoices/${inv.id}`)).body).toMatchObject({ status: 'issued', paymentMethod: null, paidOn: null });
    expect((await o.post(`/api/invoices/${inv.id}/refund`, { note: 42 })).status).toBe(422);
  });

  it('only an issued invoice can be marked paid (409); coaches and athletes 403; another clinic 404', async () => {
    const draft = (
      await o.post('/api/invoices', {
        athleteId: adaId,
        assessmentId: null,
        dueDate: '2026-12-31',
        note: null,
        lines: [{ priceId: null, description: 'Taping', quantity: 1, unitAmountMinor: 500, taxRateBp: null }],
      })
    ).body;
    const body = { method: 'cash', paidOn: today(), note: '' };
    expect((await o.post(`/api/invoices/${draft.id}/payments`, body)).body.error.code).toBe('invalid_transition');
    const inv = await issuedFor(adaId);
    const c = await signedIn(t.app, coach.email, coach.password);
    expect((await c.post(`/api/invoices/${inv.id}/payments`, body)).status).toBe(403);
    expect((await a.post(`/api/invoices/${inv.id}/payments`, body)).status).toBe(403);
    const far = await signedIn(t.app, OTHER.owner.email, OTHER.owner.password);
    expect((await far.post(`/api/invoices/${inv.id}/payments`, body)).status).toBe(404);
    expect((await far.post(`/api/invoices/${inv.id}/refund`, {})).status).toBe(404);
    expect((await o.post('/api/invoices/999999/payments', body)).status).toBe(404);
    expect((await o.get(`/api/invoices/${inv.id}`)).body.status).toBe('issued');
  });
});

describe('an athlete without an account', () => {
  it('gets the invoice by e-mail without a portal link they cannot use, and is told how to get access', async () => {
    const carys = await t.db('athletes').where({ id: carysId }).first();
    expect(carys.user_id).toBeNull();
    expect(carys.email).toBeTruthy();
    const inv = await issuedFor(carysId);
    const mail = t.mailer.sent.find((m) => m.subject === `Invoice ${inv.number} from Larchwood Running Clinic`)!;
    expect(mail.to).toBe(carys.email);
    expect(mail.text).toContain('78.00 EUR');
    expect(mail.text).not.toMatch(/https?:\/\//);
    expect(mail.text).toContain('You do not have a Trailframe account yet');
    expect(mail.text).toContain('accept the invitation');
    expect(mail.text).toContain('bank transfer or in cash');
    // The athlete with an account gets the link.
    const ada = await issuedFor(adaId);
    expect(t.mailer.sent.find((m) => m.subject.includes(ada.number!))!.text).toContain(`/portal/invoices/${ada.id}`);
  });
});
