/**
 * An act on an invoice (issue, recorded payment, cancel, refund) sent again after its answer was lost,
 * or twice at once (a double click): with the same `Idempotency-Key` it answers the invoice as the act
 * left it, and the act happens once (one number, one e-mail, one payment); once the invoice has moved
 * on since (cancelled after the issue, refunded after the payment) 409 `invoice_changed_since` says so; a
 * different key, or the same key with other payment details, is refused as before. Amounts: the demo's Re-test, 65.00 + 20 % = 78.00 EUR.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import type { InvoiceDetail, Price } from '../../src/contracts/billing';

const [owner, , , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let o: Client;
let adaId: number;
let retest: Price;

const today = () => new Date().toISOString().slice(0, 10);
const keyed = (path: string, key: string, body?: unknown) => o.send('post', path, body, { 'Idempotency-Key': key });
const mailsTo = (to: string) => t.mailer.sent.filter((m) => m.to === to).length;

async function draft(): Promise<InvoiceDetail> {
  const d = await o.post('/api/invoices', {
    athleteId: adaId,
    assessmentId: null,
    dueDate: '2026-12-31',
    note: null,
    lines: [{ priceId: retest.id, description: 'Re-test', quantity: 1, unitAmountMinor: retest.amountMinor, taxRateBp: retest.taxRateBp }],
  });
  expect(d.status, JSON.stringify(d.body)).toBe(201);
  return d.body;
}

async function issued(): Promise<InvoiceDetail> {
  const d = await draft();
  const res = await o.post(`/api/invoices/${d.id}/issue`);
  expect(res.status).toBe(200);
  return res.body;
}

beforeAll(async () => {
  t = await makeTestApp({}, { fakePayments: true });
  o = await signedIn(t.app, owner.email, owner.password);
  adaId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  retest = (await o.get('/api/prices')).body.prices.find((p: Price) => p.item === 'Re-test');
});
afterAll(async () => {
  await t.close();
});

describe('issuing sent again', () => {
  it('the same key twice at once and again after success: one number, one e-mail, every answer 200 with that number', async () => {
    const d = await draft();
    const before = mailsTo(athlete.email);
    const together = await Promise.all([1, 2].map(() => keyed(`/api/invoices/${d.id}/issue`, 'issue-key-0001')));
    expect(together.map((r) => r.status)).toEqual([200, 200]);
    const retry = await keyed(`/api/invoices/${d.id}/issue`, 'issue-key-0001');
    expect(retry.status).toBe(200);
    expect(new Set([...together, retry].map((r) => r.body.number)).size).toBe(1);
    expect(retry.body).toMatchObject({ status: 'issued', totalMinor: 7800 });
    expect(mailsTo(athlete.email) - before).toBe(1);
    // Another key (another act of issuing) and no key are refused as before.
    const other = await keyed(`/api/invoices/${d.id}/issue`, 'issue-key-0002');
    expect(other.status).toBe(409);
    expect(other.body.error.code).toBe('invalid_transition');
    expect((await o.post(`/api/invoices/${d.id}/issue`)).status).toBe(409);
  });

  it("an issue key is not a cancel: cancelling with the issue's key is a new act (done); issuing again after that answers 409 invoice_changed_since", async () => {
    const d = await draft();
    expect((await keyed(`/api/invoices/${d.id}/issue`, 'issue-key-0003')).status).toBe(200);
    const cancel = await keyed(`/api/invoices/${d.id}/cancel`, 'issue-key-0003');
    expect(cancel.status).toBe(200);
    expect(cancel.body.status).toBe('cancelled');
    const retry = await keyed(`/api/invoices/${d.id}/issue`, 'issue-key-0003');
    expect(retry.status).toBe(409);
    expect(retry.body.error.code).toBe('invoice_changed_since');
    expect(retry.body.error.message).toContain('issued by this request and has since been cancelled');
  });

  it('the issue sent again after someone cancelled the invoice answers 409 saying so, never 200 with the cancelled invoice; nothing changes', async () => {
    const d = await draft();
    const first = await keyed(`/api/invoices/${d.id}/issue`, 'issue-key-0004');
    expect(first.status).toBe(200);
    expect((await o.post(`/api/invoices/${d.id}/cancel`)).status).toBe(200);
    const before = mailsTo(athlete.email);
    const retry = await keyed(`/api/invoices/${d.id}/issue`, 'issue-key-0004');
    expect(retry.status).toBe(409);
    expect(retry.body.error).toMatchObject({ code: 'invoice_changed_since' });
    expect(retry.body.error.message).toContain('has since been cancelled');
    expect(mailsTo(athlete.email)).toBe(before);
    expect(await t.db('invoices').where({ id: d.id }).first()).toMatchObject({ status: 'cancelled', number: first.body.number });
  });
});

describe('a recorded payment sent again', () => {
  const body = { method: 'bank_transfer', paidOn: today(), note: 'Transfer ref. 2211' };

  it('the same key twice at once and again after success: paid once, one e-mail, each answer the paid invoice', async () => {
    const inv = await issued();
    const before = mailsTo(athlete.email);
    const together = await Promise.all([1, 2].map(() => keyed(`/api/invoices/${inv.id}/payments`, 'pay-key-0001', body)));
    expect(together.map((r) => r.status)).toEqual([200, 200]);
    const retry = await keyed(`/api/invoices/${inv.id}/payments`, 'pay-key-0001', body);
    expect(retry.status).toBe(200);
    expect(retry.body).toMatchObject({
      status: 'paid',
      paymentMethod: 'bank_transfer',
      paidOn: today(),
      paymentNote: 'Transfer ref. 2211',
    });
    expect(mailsTo(athlete.email) - before).toBe(1);
    const row = await t.db('invoices').where({ id: inv.id }).first();
    expect(row).toMatchObject({ status: 'paid', payment_key: 'pay-key-0001', total_minor: 7800 });
  });

  it('a second payment with a different key answers 409; the same key with other details 422; what was recorded stays', async () => {
    const inv = await issued();
    expect((await keyed(`/api/invoices/${inv.id}/payments`, 'pay-key-0002', body)).status).toBe(200);
    const second = await keyed(`/api/invoices/${inv.id}/payments`, 'pay-key-0003', body);
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe('invalid_transition');
    for (const other of [
      { ...body, method: 'cash' },
      { ...body, note: 'Another transfer' },
    ]) {
      const res = await keyed(`/api/invoices/${inv.id}/payments`, 'pay-key-0002', other);
      expect(res.status).toBe(422);
      expect(res.body.error.code).toBe('idempotency_key_reused');
    }
    // An amount is not the client's to give: the total is the invoice's (422 for the unknown field).
    expect((await keyed(`/api/invoices/${inv.id}/payments`, 'pay-key-0002', { ...body, amountMinor: 100 })).status).toBe(422);
    expect(await t.db('invoices').where({ id: inv.id }).first()).toMatchObject({
      status: 'paid',
      payment_method: 'bank_transfer',
      payment_note: 'Transfer ref. 2211',
    });
  });

  it('sent again after the payment was refunded answers 409 invoice_changed_since; the refund stays', async () => {
    const inv = await issued();
    expect((await keyed(`/api/invoices/${inv.id}/payments`, 'pay-key-0005', body)).status).toBe(200);
    expect((await o.post(`/api/invoices/${inv.id}/refund`, { note: 'Returned' })).status).toBe(200);
    const retry = await keyed(`/api/invoices/${inv.id}/payments`, 'pay-key-0005', body);
    expect(retry.status).toBe(409);
    expect(retry.body.error.code).toBe('invoice_changed_since');
    expect(retry.body.error.message).toContain('marked paid by this request and has since been refunded');
    expect((await t.db('invoices').where({ id: inv.id }).first()).status).toBe('refunded');
  });

  it('a malformed key answers 422 and records nothing', async () => {
    const inv = await issued();
    expect((await keyed(`/api/invoices/${inv.id}/payments`, 'bad key!', body)).status).toBe(422);
    expect((await t.db('invoices').where({ id: inv.id }).first()).status).toBe('issued');
  });
});

describe('cancel and a recorded refund sent again', () => {
  it('cancel: the same key at once and after success answers the cancelled invoice; another key 409', async () => {
    const inv = await issued();
    const together = await Promise.all([1, 2].map(() => keyed(`/api/invoices/${inv.id}/cancel`, 'cancel-key-0001')));
    expect(together.map((r) => r.status)).toEqual([200, 200]);
    expect((await keyed(`/api/invoices/${inv.id}/cancel`, 'cancel-key-0001')).body.status).toBe('cancelled');
    expect((await keyed(`/api/invoices/${inv.id}/cancel`, 'cancel-key-0002')).status).toBe(409);
  });

  it('refund of a recorded cash payment: the same key at once and after success is one refund; another key 409', async () => {
    const inv = await issued();
    expect((await o.post(`/api/invoices/${inv.id}/payments`, { method: 'cash', paidOn: today(), note: '' })).status).toBe(200);
    const together = await Promise.all(
      [1, 2].map(() => keyed(`/api/invoices/${inv.id}/refund`, 'refund-key-0001', { note: 'Handed back' })),
    );
    expect(together.map((r) => r.status)).toEqual([200, 200]);
    const retry = await keyed(`/api/invoices/${inv.id}/refund`, 'refund-key-0001', { note: 'Handed back' });
    expect(retry.body).toMatchObject({ status: 'refunded', refundNote: 'Handed back' });
    expect((await keyed(`/api/invoices/${inv.id}/refund`, 'refund-key-0002', { note: 'Handed back' })).status).toBe(409);
  });
});
