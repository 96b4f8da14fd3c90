/**
 * Billing API: price list, invoices with server-computed totals (tax half-up per line, integer
 * minor units), issue/cancel/refund transitions in our own words (draft → issued → paid, cancelled,
 * refunded), recorded bank-transfer and cash payments, card payment through the provider's SDK against the
 * local fake payment service, signed idempotent webhooks, receipt PDF and e-mails.
 * Worked examples are stated in the test titles ([calc]).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { PDFParse } from 'pdf-parse';
import { makeTestApp, OTHER, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { hashPassword } from '../../server/auth/passwords';
import { DEMO_SESSION_SECRET, FAKE_PAYMENTS_KEYS, loadConfig } from '../../server/config';
import type { InvoiceDetail, InvoiceWrite, Price } from '../../src/contracts/billing';

const [owner, coach, , athlete] = DEMO_SIGN_INS;
const SECOND = { email: 'second.athlete@runner.test', password: 'second-athlete-pw-1' };
let t: TestApp;
let o: Client;
let a: Client;
let adaId: number;
let teodorId: number;
let prices: Price[];

const due = '2026-12-31';
const price = (item: string) => prices.find((p) => p.item === item)!;
const line = (p: Price, quantity = 1) => ({
  priceId: p.id,
  description: p.item,
  quantity,
  unitAmountMinor: p.amountMinor,
  taxRateBp: p.taxRateBp,
});

async function draft(over: Partial<InvoiceWrite> = {}): Promise<InvoiceDetail> {
  const res = await o.post('/api/invoices', {
    athleteId: adaId,
    assessmentId: null,
    dueDate: due,
    note: null,
    lines: [line(price('Re-test'))],
    ...over,
  });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body;
}

async function issued(over: Partial<InvoiceWrite> = {}): Promise<InvoiceDetail> {
  const d = await draft(over);
  const res = await o.post(`/api/invoices/${d.id}/issue`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body;
}

/** The athlete opens the payment page and presses a button there; answers where it sends the browser. */
async function payOnPage(invoiceId: number, action: 'pay' | 'cancel' | 'decline'): Promise<string> {
  const start = await a.post(`/api/invoices/${invoiceId}/checkout`);
  expect(start.status, JSON.stringify(start.body)).toBe(200);
  const url: string = start.body.url;
  expect(url).toContain(`${t.fakePayments!.url}/pay/cs_`);
  const page = await fetch(url);
  expect(await page.text()).toMatch(/Pay[\s\S]*Cancel/);
  const res = await fetch(`${url}/${action}`, { method: 'POST', redirect: 'manual' });
  expect(res.status).toBe(303);
  await t.fakePayments!.idle();
  return res.headers.get('location')!;
}

async function paidInvoice(): Promise<InvoiceDetail> {
  const inv = await issued();
  await payOnPage(inv.id, 'pay');
  return (await o.get(`/api/invoices/${inv.id}`)).body;
}

beforeAll(async () => {
  t = await makeTestApp({}, { fakePayments: true });
  o = await signedIn(t.app, owner.email, owner.password);
  a = await signedIn(t.app, athlete.email, athlete.password);
  adaId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  const teodor = await t.db('athletes').where({ email: 'teodor.brannick@runner.test' }).first();
  teodorId = teodor.id;
  // A second athlete account in the same clinic (Teodor), for "another athlete's invoice".
  const at = new Date().toISOString();
  const [u] = await t
    .db('users')
    .insert({
      clinic_id: teodor.clinic_id,
      email: SECOND.email,
      name: 'Teodor B',
      role: 'athlete',
      password_hash: await hashPassword(SECOND.password),
      created_at: at,
      updated_at: at,
    })
    .returning('id');
  await t
    .db('athletes')
    .where({ id: teodorId })
    .update({ user_id: (u as { id: number }).id });
  prices = (await o.get('/api/prices')).body.prices;
});
afterAll(async () => {
  await t.close();
});

describe('price list', () => {
  it('the demo list has Gait assessment, Re-test and the 8-week plan package in EUR', async () => {
    expect(prices.map((p) => p.item).sort()).toEqual(['8-week plan package', 'Gait assessment', 'Re-test']);
    expect(price('Re-test')).toMatchObject({ amountMinor: 6500, currency: 'EUR', taxRateBp: 2000 });
    expect((await o.get('/api/billing/settings')).body).toEqual({ currency: 'EUR' });
  });

  it('creates, edits and archives a price; archived ones leave the list', async () => {
    const created = await o.post('/api/prices', {
      item: 'Shoe check',
      description: 'Wear pattern review',
      amountMinor: 2500,
      taxRateBp: null,
    });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ item: 'Shoe check', amountMinor: 2500, currency: 'EUR', taxRateBp: null, archived: false });
    expect((await o.patch(`/api/prices/${created.body.id}`, { amountMinor: 3000 })).body.amountMinor).toBe(3000);
    expect((await o.delete(`/api/prices/${created.body.id}`)).status).toBe(204);
    expect((await o.get('/api/prices')).body.prices.some((p: Price) => p.id === created.body.id)).toBe(false);
    expect((await o.get('/api/prices?archived=true')).body.prices.some((p: Price) => p.id === created.body.id)).toBe(true);
  });

  it.each([
    ['zero', 0],
    ['negative', -100],
    ['too large (over 1,000,000.00)', 100_000_001],
    ['fractional minor units (45.5 cents)', 45.5],
    ['a string', '45.00'],
  ])('refuses an amount that is %s with 422 on amountMinor', async (_what, amountMinor) => {
    const res = await o.post('/api/prices', { item: 'Bad', description: '', amountMinor, taxRateBp: null });
    expect(res.status).toBe(422);
    expect(res.body.error.details[0].path).toEqual(['amountMinor']);
  });

  it('refuses a tax rate over 100 % or in fractions of a basis point', async () => {
    for (const taxRateBp of [10_001, -1, 12.5]) {
      const res = await o.post('/api/prices', { item: 'Bad', description: '', amountMinor: 100, taxRateBp });
      expect(res.status).toBe(422);
      expect(res.body.error.details[0].path).toEqual(['taxRateBp']);
    }
  });

  it('coaches and athletes cannot touch the price list', async () => {
    const c = await signedIn(t.app, coach.email, coach.password);
    expect((await c.get('/api/prices')).status).toBe(403);
    expect((await a.post('/api/prices', { item: 'X', amountMinor: 1 })).status).toBe(403);
  });

  it('the currency changes only while no invoice uses the old one', async () => {
    const other = await makeTestApp();
    try {
      const oo = await signedIn(other.app, owner.email, owner.password);
      // The demo's billing history (Ada's two invoices) is in EUR: without it the currency may change.
      expect((await oo.put('/api/billing/settings', { currency: 'GBP' })).status).toBe(409);
      await other.db('payment_events').delete();
      await other.db('invoice_lines').delete();
      await other.db('invoices').delete();
      expect((await oo.put('/api/billing/settings', { currency: 'GBP' })).body).toEqual({ currency: 'GBP' });
      expect((await oo.get('/api/prices')).body.prices[0].currency).toBe('GBP');
      expect((await oo.put('/api/billing/settings', { currency: 'XYZ' })).status).toBe(422);
    } finally {
      await other.close();
    }
    await draft();
    expect((await o.put('/api/billing/settings', { currency: 'GBP' })).status).toBe(409);
  });
});

describe('invoices', () => {
  it("the demo history: Ada's Baseline billed and paid (its checkout event recorded), her Re-test billed and issued", async () => {
    const mine = (await a.get('/api/invoices')).body.invoices as InvoiceDetail[];
    const seeded = mine.filter((i) => i.number === 'TF-2026-0001' || i.number === 'TF-2026-0002').sort((x, y) => x.id - y.id);
    expect(seeded.map((i) => [i.number, i.status, i.totalMinor, i.dueDate])).toEqual([
      ['TF-2026-0001', 'paid', 14400, '2026-10-20'],
      ['TF-2026-0002', 'issued', 7800, '2026-12-08'],
    ]);
    const paid = (await a.get(`/api/invoices/${seeded[0]!.id}`)).body as InvoiceDetail;
    expect(paid.assessment).toMatchObject({ kind: 'baseline', date: '2026-10-06' });
    expect(paid.paidAt).toBeTruthy();
    expect(paid.lines.map((l) => [l.description, l.totalMinor])).toEqual([['Gait assessment', 14400]]);
    expect(await t.db('payment_events').where({ invoice_id: paid.id, type: 'checkout.session.completed' }).first()).toBeTruthy();
    expect((await a.get(`/api/invoices/${seeded[1]!.id}`)).body.assessment).toMatchObject({ kind: 'retest', date: '2026-11-24' });
  });

  it('computes totals on the server: 3 × Re-test 65.00 at 20 % = 195.00 + 39.00 = 234.00, plus a custom 12.34 untaxed line = 246.34', async () => {
    const d = await draft({
      lines: [
        { ...line(price('Re-test'), 3), unitAmountMinor: 6500 },
        { priceId: null, description: 'Taping', quantity: 1, unitAmountMinor: 1234, taxRateBp: null },
      ],
    });
    expect(d).toMatchObject({ status: 'draft', number: null, currency: 'EUR', subtotalMinor: 20734, taxMinor: 3900, totalMinor: 24634 });
    expect(d.lines.map((l) => l.totalMinor)).toEqual([23400, 1234]);
  });

  it('refuses bad lines with 422 and the line path', async () => {
    const bad = async (l: object, path: (string | number)[]) => {
      const res = await o.post('/api/invoices', {
        athleteId: adaId,
        assessmentId: null,
        dueDate: due,
        note: null,
        lines: [{ priceId: null, description: 'X', quantity: 1, unitAmountMinor: 100, taxRateBp: null, ...l }],
      });
      expect(res.status, JSON.stringify(res.body)).toBe(422);
      expect(res.body.error.details[0].path).toEqual(path);
    };
    await bad({ unitAmountMinor: 0 }, ['lines', 0, 'unitAmountMinor']);
    await bad({ unitAmountMinor: -500 }, ['lines', 0, 'unitAmountMinor']);
    await bad({ unitAmountMinor: 99.99 }, ['lines', 0, 'unitAmountMinor']);
    await bad({ unitAmountMinor: 1e12 }, ['lines', 0, 'unitAmountMinor']);
    await bad({ quantity: 0 }, ['lines', 0, 'quantity']);
    await bad({ priceId: 999_999 }, ['lines', 0, 'priceId']);
    const noLines = await o.post('/api/invoices', { athleteId: adaId, assessmentId: null, dueDate: due, note: null, lines: [] });
    expect(noLines.body.error.details[0].path).toEqual(['lines']);
    const badDate = await o.post('/api/invoices', {
      athleteId: adaId,
      assessmentId: null,
      dueDate: '2026-02-30',
      note: null,
      lines: [line(price('Re-test'))],
    });
    expect(badDate.body.error.details[0].path).toEqual(['dueDate']);
  });

  it("bills an assessment of the athlete, and refuses another athlete's assessment (422)", async () => {
    const ada = (await t.db('assessments').where({ athlete_id: adaId }).first()).id;
    const d = await draft({ assessmentId: ada });
    expect(d.assessmentId).toBe(ada);
    const visit = await t.db('assessments').where({ id: ada }).first('kind', 'date');
    expect(d.assessment).toEqual({ id: ada, kind: visit.kind, date: visit.date });
    expect((await o.get(`/api/invoices/${d.id}`)).body.assessment).toEqual({ id: ada, kind: visit.kind, date: visit.date });
    expect((await draft()).assessment).toBeNull();
    const res = await o.post('/api/invoices', {
      athleteId: teodorId,
      assessmentId: ada,
      dueDate: due,
      note: null,
      lines: [line(price('Re-test'))],
    });
    expect(res.status).toBe(422);
    expect(res.body.error.details[0].path).toEqual(['assessmentId']);
  });

  it('issue gives the next clinic number (TF-<year>-0001, …) and e-mails the athlete a portal link, no health details', async () => {
    const year = new Date().getUTCFullYear();
    const first = await issued();
    const second = await issued();
    expect(first.number).toMatch(new RegExp(`^TF-${year}-\\d{4}$`));
    expect(Number(second.number!.slice(-4))).toBe(Number(first.number!.slice(-4)) + 1);
    expect(first.status).toBe('issued');
    const mail = t.mailer.sent.find((m) => m.subject.includes(first.number!))!;
    expect(mail.to).toBe(athlete.email);
    expect(mail.text).toContain(`/portal/invoices/${first.id}`);
    expect(mail.text).toContain('78.00 EUR');
    expect(mail.text).not.toMatch(/hamstring|pain|Re-test/i);
    expect((await o.post(`/api/invoices/${first.id}/issue`)).status).toBe(409);
  });

  it('twenty drafts issued at once get twenty consecutive numbers: no gap, no duplicate, no error', async () => {
    const drafts = [];
    for (let i = 0; i < 20; i++) drafts.push(await draft());
    const answers = await Promise.all(drafts.map((d) => o.post(`/api/invoices/${d.id}/issue`)));
    expect(answers.map((r) => r.status)).toEqual(drafts.map(() => 200));
    const numbers = answers.map((r) => Number((r.body as InvoiceDetail).number!.split('-')[2])).sort((x, y) => x - y);
    expect(numbers).toEqual(numbers.map((_, i) => numbers[0]! + i));
  });

  it('numbering goes on past 9999 as 10000, 10001 (the highest number is read as a number, not as text)', async () => {
    const year = new Date().getUTCFullYear();
    const last = await issued();
    await t
      .db('invoices')
      .where({ id: last.id })
      .update({ number: `TF-${year}-9999` });
    expect((await issued()).number).toBe(`TF-${year}-10000`);
    expect((await issued()).number).toBe(`TF-${year}-10001`);
  });

  it('lists with filters and totals; the athlete sees only their own issued invoices', async () => {
    const open = await issued();
    const d = await draft();
    const teodor = await o.post('/api/invoices', {
      athleteId: teodorId,
      assessmentId: null,
      dueDate: due,
      note: null,
      lines: [line(price('Gait assessment'))],
    });
    const all = (await o.get('/api/invoices')).body;
    expect(all.invoices.length).toBeGreaterThanOrEqual(3);
    const sum = all.invoices
      .filter((i: InvoiceDetail) => i.status !== 'cancelled')
      .reduce((s: number, i: InvoiceDetail) => s + i.totalMinor, 0);
    expect(all.totals.totalMinor).toBe(sum);
    const drafts = (await o.get(`/api/invoices?status=draft&athleteId=${teodorId}`)).body;
    expect(drafts.invoices.map((i: InvoiceDetail) => i.id)).toEqual([teodor.body.id]);
    expect(drafts.totals).toMatchObject({ count: 1, totalMinor: 14400, currency: 'EUR' });
    const today = new Date().toISOString().slice(0, 10);
    const madeToday = all.invoices.filter((i: InvoiceDetail) => i.createdAt.startsWith(today)).length;
    expect(madeToday).toBeGreaterThanOrEqual(3);
    expect((await o.get(`/api/invoices?from=${today}&to=${today}`)).body.invoices.length).toBe(madeToday);
    // The demo history: Ada's Baseline invoice was made on 6 Oct 2026, her Re-test's on 24 Nov 2026.
    expect((await o.get('/api/invoices?from=2026-10-01&to=2026-10-31')).body.invoices.map((i: InvoiceDetail) => i.number)).toEqual([
      'TF-2026-0001',
    ]);
    expect((await o.get('/api/invoices?from=2000-01-01&to=2000-01-02')).body.invoices).toEqual([]);
    expect((await o.get('/api/invoices?status=late')).status).toBe(422);
    const mine = (await a.get('/api/invoices')).body.invoices.map((i: InvoiceDetail) => i.id);
    expect(mine).toContain(open.id);
    expect(mine).not.toContain(d.id);
    expect(mine).not.toContain(teodor.body.id);
    expect((await a.get(`/api/invoices/${d.id}`)).status).toBe(404);
    const c = await signedIn(t.app, coach.email, coach.password);
    expect((await c.get('/api/invoices')).status).toBe(403);
  });

  it('cancel: draft and issued invoices can be cancelled, a cancelled one cannot be paid (409) or issued', async () => {
    const inv = await issued();
    const v = await o.post(`/api/invoices/${inv.id}/cancel`);
    expect(v.body).toMatchObject({ status: 'cancelled' });
    expect(v.body.cancelledAt).toBeTruthy();
    const pay = await a.post(`/api/invoices/${inv.id}/checkout`);
    expect(pay.status).toBe(409);
    expect(pay.body.error.code).toBe('invoice_not_payable');
    expect((await o.post(`/api/invoices/${inv.id}/issue`)).status).toBe(409);
    expect((await o.post(`/api/invoices/${(await draft()).id}/cancel`)).body.status).toBe('cancelled');
    // The old provider-style route is gone.
    expect((await o.post(`/api/invoices/${inv.id}/void`)).status).toBe(404);
  });

  it("an athlete paying another athlete's invoice gets 404; so does another clinic", async () => {
    const inv = await issued();
    const second = await signedIn(t.app, SECOND.email, SECOND.password);
    expect((await second.post(`/api/invoices/${inv.id}/checkout`)).status).toBe(404);
    expect((await second.get(`/api/invoices/${inv.id}`)).status).toBe(404);
    const far = await signedIn(t.app, OTHER.athlete.email, OTHER.athlete.password);
    expect((await far.post(`/api/invoices/${inv.id}/checkout`)).status).toBe(404);
    const farOwner = await signedIn(t.app, OTHER.owner.email, OTHER.owner.password);
    expect((await farOwner.get(`/api/invoices/${inv.id}`)).status).toBe(404);
  });
});

describe('editing and deleting drafts', () => {
  const body = (d: InvoiceDetail, over: Partial<InvoiceWrite> = {}): InvoiceWrite => ({
    athleteId: d.athleteId,
    assessmentId: d.assessmentId,
    dueDate: d.dueDate,
    note: d.note,
    lines: d.lines.map(({ priceId, description, quantity, unitAmountMinor, taxRateBp }) => ({
      priceId,
      description,
      quantity,
      unitAmountMinor,
      taxRateBp,
    })),
    ...over,
  });

  it('PUT replaces a draft and recomputes on the server [calc]: 2 × Gait assessment 120.00 at 20 % = 240.00 + 48.00; 3 × 4.99 taping at 7.5 % = 14.97 + 1.12 (1.12275 half-up); totals 254.97 + 49.12 = 304.09', async () => {
    const d = await draft();
    expect(d.totalMinor).toBe(7800);
    const ada = (await t.db('assessments').where({ athlete_id: adaId }).first()).id;
    const res = await o.put(`/api/invoices/${d.id}`, {
      athleteId: adaId,
      assessmentId: ada,
      dueDate: '2027-01-15',
      note: 'Two gait sessions and tape.',
      lines: [
        line(price('Gait assessment'), 2),
        { priceId: null, description: 'Taping', quantity: 3, unitAmountMinor: 499, taxRateBp: 750 },
      ],
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({
      id: d.id,
      status: 'draft',
      number: null,
      assessmentId: ada,
      dueDate: '2027-01-15',
      note: 'Two gait sessions and tape.',
      subtotalMinor: 25497,
      taxMinor: 4912,
      totalMinor: 30409,
    });
    expect(res.body.lines.map((l: InvoiceDetail['lines'][number]) => [l.description, l.netMinor, l.taxMinor, l.totalMinor])).toEqual([
      ['Gait assessment', 24000, 4800, 28800],
      ['Taping', 1497, 112, 1609],
    ]);
    expect((await o.get(`/api/invoices/${d.id}`)).body).toEqual(res.body);
    expect(await t.db('invoice_lines').where({ invoice_id: d.id }).count({ n: '*' })).toEqual([{ n: 2 }]);
    // Totals sent by the client are not accepted (the body is strict).
    const sneaky = await o.put(`/api/invoices/${d.id}`, { ...body(res.body), totalMinor: 1 });
    expect(sneaky.status).toBe(422);
    // Issuing the edited draft e-mails the new total.
    const issuedNow = (await o.post(`/api/invoices/${d.id}/issue`)).body as InvoiceDetail;
    expect(t.mailer.sent.find((m) => m.subject.includes(issuedNow.number!))!.text).toContain('304.09 EUR');
  });

  it('refuses bad lines with the same 422s as create, and nothing changes', async () => {
    const d = await draft({ note: 'Keep me.' });
    const bad = async (over: Partial<InvoiceWrite>, path: (string | number)[]) => {
      const res = await o.put(`/api/invoices/${d.id}`, body(d, over));
      expect(res.status, JSON.stringify(res.body)).toBe(422);
      expect(res.body.error.details[0].path).toEqual(path);
    };
    const custom = { priceId: null, description: 'X', quantity: 1, unitAmountMinor: 100, taxRateBp: null };
    await bad({ lines: [{ ...custom, unitAmountMinor: 0 }] }, ['lines', 0, 'unitAmountMinor']);
    await bad({ lines: [custom, { ...custom, unitAmountMinor: 12.5 }] }, ['lines', 1, 'unitAmountMinor']);
    await bad({ lines: [{ ...custom, quantity: 1001 }] }, ['lines', 0, 'quantity']);
    await bad({ lines: [{ ...custom, description: '  ' }] }, ['lines', 0, 'description']);
    await bad({ lines: [{ ...custom, priceId: 999_999 }] }, ['lines', 0, 'priceId']);
    await bad({ lines: [] }, ['lines']);
    await bad({ dueDate: '2026-13-01' }, ['dueDate']);
    const teodors = (await t.db('assessments').where({ athlete_id: teodorId }).first())?.id ?? null;
    if (teodors) await bad({ assessmentId: teodors }, ['assessmentId']);
    expect((await o.get(`/api/invoices/${d.id}`)).body).toEqual(d);
  });

  it('a price archived after drafting may stay on its line; a newly chosen archived price is refused', async () => {
    const p = (await o.post('/api/prices', { item: 'Hill session', description: '', amountMinor: 4000, taxRateBp: null })).body as Price;
    const other = (await o.post('/api/prices', { item: 'Track session', description: '', amountMinor: 3000, taxRateBp: null }))
      .body as Price;
    const d = await draft({ lines: [line(p)] });
    await o.delete(`/api/prices/${p.id}`);
    await o.delete(`/api/prices/${other.id}`);
    const kept = await o.put(`/api/invoices/${d.id}`, body(d, { lines: [line(p, 2)] }));
    expect(kept.status, JSON.stringify(kept.body)).toBe(200);
    expect(kept.body.totalMinor).toBe(8000);
    const added = await o.put(`/api/invoices/${d.id}`, body(d, { lines: [line(p), line(other)] }));
    expect(added.status).toBe(422);
    expect(added.body.error.details[0].path).toEqual(['lines', 1, 'priceId']);
  });

  it('an issued, paid or cancelled invoice cannot be edited or deleted (409 invoice_not_draft), and stays as it was', async () => {
    const open = await issued();
    const paid = await paidInvoice();
    const voided = (await o.post(`/api/invoices/${(await draft()).id}/cancel`)).body as InvoiceDetail;
    for (const inv of [open, paid, voided]) {
      const edit = await o.put(`/api/invoices/${inv.id}`, body(inv, { note: 'Changed after issue' }));
      expect(edit.status, JSON.stringify(edit.body)).toBe(409);
      expect(edit.body.error.code).toBe('invoice_not_draft');
      expect(edit.body.error.message).toMatch(/^Only a draft can be edited/);
      const del = await o.delete(`/api/invoices/${inv.id}`);
      expect(del.status).toBe(409);
      expect(del.body.error.code).toBe('invoice_not_draft');
      const after = (await o.get(`/api/invoices/${inv.id}`)).body as InvoiceDetail;
      expect(after).toMatchObject({ status: inv.status, note: null, totalMinor: inv.totalMinor });
    }
    expect((await o.delete(`/api/invoices/${open.id}`)).body.error.message).toContain(
      `invoice ${open.number} is issued. Cancel it and make a new one instead.`,
    );
  });

  it("athletes and coaches get 403, another clinic's owner 404; the draft is untouched", async () => {
    const d = await draft();
    const c = await signedIn(t.app, coach.email, coach.password);
    const farOwner = await signedIn(t.app, OTHER.owner.email, OTHER.owner.password);
    expect((await a.put(`/api/invoices/${d.id}`, body(d, { note: 'x' }))).status).toBe(403);
    expect((await a.delete(`/api/invoices/${d.id}`)).status).toBe(403);
    expect((await c.put(`/api/invoices/${d.id}`, body(d, { note: 'x' }))).status).toBe(403);
    expect((await c.delete(`/api/invoices/${d.id}`)).status).toBe(403);
    const farAthlete = (await t.db('athletes').where({ email: OTHER.athlete.email }).first()).id;
    expect((await farOwner.put(`/api/invoices/${d.id}`, body(d, { athleteId: farAthlete }))).status).toBe(404);
    expect((await farOwner.delete(`/api/invoices/${d.id}`)).status).toBe(404);
    expect((await o.put('/api/invoices/999999', body(d))).status).toBe(404);
    expect((await o.delete('/api/invoices/abc')).status).toBe(404);
    expect((await o.get(`/api/invoices/${d.id}`)).body).toEqual(d);
  });

  it('DELETE removes a draft and its lines (204); the id is then unknown (404)', async () => {
    const d = await draft();
    const res = await o.delete(`/api/invoices/${d.id}`);
    expect(res.status).toBe(204);
    expect((await o.get(`/api/invoices/${d.id}`)).status).toBe(404);
    expect(await t.db('invoice_lines').where({ invoice_id: d.id }).count({ n: '*' })).toEqual([{ n: 0 }]);
    expect((await o.delete(`/api/invoices/${d.id}`)).status).toBe(404);
    expect((await o.get('/api/invoices')).body.invoices.some((i: InvoiceDetail) => i.id === d.id)).toBe(false);
  });
});

describe('card payment through the fake payment service', () => {
  it('Pay on the payment page → signed webhook → paid, e-mail, receipt PDF (Re-test 65.00 + 13.00 tax = 78.00 EUR)', async () => {
    const inv = await issued();
    const back = await payOnPage(inv.id, 'pay');
    expect(back).toBe(`${t.config.publicUrl}/portal/invoices/${inv.id}?checkout=success`);
    const after = (await a.get(`/api/invoices/${inv.id}`)).body as InvoiceDetail;
    expect(after).toMatchObject({ status: 'paid', totalMinor: 7800 });
    expect(after.paidAt).toBeTruthy();
    const mail = t.mailer.sent.filter((m) => m.subject === `Payment received for invoice ${inv.number}`);
    expect(mail).toHaveLength(1);
    expect(mail[0]!.text).toContain('78.00 EUR');
    const pdf = await a
      .get(`/api/invoices/${inv.id}/receipt`)
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(pdf.status).toBe(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    const text = (await new PDFParse({ data: pdf.body as Buffer }).getText()).text;
    expect(text).toContain(`Receipt for invoice ${inv.number}`);
    expect(text).toContain('Larchwood Running Clinic');
    expect(text).toContain('Ada Kestrel');
    expect(text).toContain('Re-test');
    expect(text).toMatch(/Subtotal\s+65\.00 EUR/);
    expect(text).toMatch(/Tax\s+13\.00 EUR/);
    expect(text).toMatch(/Total paid\s+78\.00 EUR/);
  });

  it('the browser coming back alone changes nothing: Cancel leaves it issued; a receipt is refused while unpaid', async () => {
    const inv = await issued();
    const back = await payOnPage(inv.id, 'cancel');
    expect(back).toContain('?checkout=cancel');
    expect((await a.get(`/api/invoices/${inv.id}`)).body).toMatchObject({ status: 'issued', checkoutState: 'pending' });
    expect((await a.get(`/api/invoices/${inv.id}/receipt`)).status).toBe(409);
  });

  it('a declined card marks the attempt failed and leaves the invoice issued, to pay again', async () => {
    const inv = await issued();
    await payOnPage(inv.id, 'decline');
    expect((await a.get(`/api/invoices/${inv.id}`)).body).toMatchObject({ status: 'issued', checkoutState: 'failed' });
    await payOnPage(inv.id, 'pay');
    expect((await a.get(`/api/invoices/${inv.id}`)).body).toMatchObject({ status: 'paid', checkoutState: 'none' });
  });

  it('paying a cancelled invoice is refused: no new payment page; one opened before it was cancelled is refunded at once', async () => {
    const inv = await issued();
    const start = await a.post(`/api/invoices/${inv.id}/checkout`);
    await o.post(`/api/invoices/${inv.id}/cancel`);
    expect((await a.post(`/api/invoices/${inv.id}/checkout`)).status).toBe(409);
    const res = await fetch(`${start.body.url}/pay`, { method: 'POST', redirect: 'manual' });
    expect(res.status).toBe(303);
    await t.fakePayments!.idle();
    expect((await o.get(`/api/invoices/${inv.id}`)).body).toMatchObject({ status: 'cancelled', paidAt: null });
    expect(t.fakePayments!.events.slice(-2).map((e) => e.type)).toEqual(['checkout.session.completed', 'charge.refunded']);
  });

  it('a second card payment of a paid invoice (on a payment page opened before) is refunded at once; the first is kept', async () => {
    const inv = await issued();
    const first = await a.post(`/api/invoices/${inv.id}/checkout`);
    const second = await a.post(`/api/invoices/${inv.id}/checkout`);
    expect((await fetch(`${first.body.url}/pay`, { method: 'POST', redirect: 'manual' })).status).toBe(303);
    await t.fakePayments!.idle();
    const paid = (await t.db('invoices').where({ id: inv.id }).first()) as { payment_intent_id: string };
    expect((await fetch(`${second.body.url}/pay`, { method: 'POST', redirect: 'manual' })).status).toBe(303);
    await t.fakePayments!.idle();
    expect(t.fakePayments!.events.slice(-2).map((e) => e.type)).toEqual(['checkout.session.completed', 'charge.refunded']);
    const refunded = JSON.parse(t.fakePayments!.events.at(-1)!.payload).data.object as { payment_intent: string };
    expect(refunded.payment_intent).not.toBe(paid.payment_intent_id);
    expect((await o.get(`/api/invoices/${inv.id}`)).body).toMatchObject({ status: 'paid', paymentMethod: 'card', refundedAt: null });
    expect((await t.db('invoices').where({ id: inv.id }).first()).payment_intent_id).toBe(paid.payment_intent_id);
  });

  it('the same event delivered twice is processed once', async () => {
    const inv = await issued();
    await payOnPage(inv.id, 'pay');
    const event = t.fakePayments!.events.at(-1)!;
    expect(event.type).toBe('checkout.session.completed');
    const mails = t.mailer.sent.length;
    expect(await t.fakePayments!.redeliver(event.id)).toBe(200);
    expect(await t.db('payment_events').where({ id: event.id }).count({ n: '*' })).toEqual([{ n: 1 }]);
    expect(t.mailer.sent.length).toBe(mails);
    const res = await fetch(`${t.url}/api/billing/webhook`, {
      method: 'POST',
      headers: {
        'content-type': 'application/json',
        'stripe-signature': new Stripe('sk_x').webhooks.generateTestHeaderString({
          payload: event.payload,
          secret: t.config.payments!.webhookSecret,
        }),
      },
      body: event.payload,
    });
    expect(await res.json()).toEqual({ received: true, duplicate: true });
  });

  it('unsigned or wrongly signed webhooks answer 400 and change nothing', async () => {
    const inv = await issued();
    const session = await (
      await fetch(`${t.fakePayments!.url}/v1/checkout/sessions`, {
        method: 'POST',
        headers: { authorization: `Bearer ${t.config.payments!.secretKey}`, 'content-type': 'application/x-www-form-urlencoded' },
        body: 'line_items[0][quantity]=1&line_items[0][price_data][currency]=eur&line_items[0][price_data][unit_amount]=7800&success_url=http://x/s&cancel_url=http://x/c',
      })
    ).json();
    const payload = JSON.stringify({
      id: 'evt_forged_1',
      object: 'event',
      type: 'checkout.session.completed',
      data: { object: { ...session, payment_status: 'paid', metadata: { invoice_id: String(inv.id) } } },
    });
    const events = await t.db('payment_events').count({ n: '*' });
    const post = (headers: Record<string, string>, body = payload) =>
      fetch(`${t.url}/api/billing/webhook`, { method: 'POST', headers: { 'content-type': 'application/json', ...headers }, body });
    const unsigned = await post({});
    expect(unsigned.status).toBe(400);
    expect((await unsigned.json()).error.code).toBe('invalid_signature');
    const wrongSecret = new Stripe('sk_x').webhooks.generateTestHeaderString({ payload, secret: 'whsec_wrong' });
    expect((await post({ 'stripe-signature': wrongSecret })).status).toBe(400);
    // Signed for one body, sent with another (re-serialised JSON breaks the signature too).
    const good = new Stripe('sk_x').webhooks.generateTestHeaderString({ payload, secret: t.config.payments!.webhookSecret });
    expect((await post({ 'stripe-signature': good }, JSON.stringify(JSON.parse(payload), null, 1))).status).toBe(400);
    expect(await t.db('payment_events').count({ n: '*' })).toEqual(events);
    expect((await o.get(`/api/invoices/${inv.id}`)).body.status).toBe('issued');
  });

  it('a correctly signed event whose session the provider says is unpaid does not mark the invoice paid', async () => {
    const inv = await issued();
    const start = await a.post(`/api/invoices/${inv.id}/checkout`);
    const sessionId = start.body.url.split('/pay/')[1];
    const payload = JSON.stringify({
      id: 'evt_claims_paid',
      object: 'event',
      type: 'checkout.session.completed',
      data: { object: { id: sessionId, object: 'checkout.session', payment_status: 'paid', metadata: { invoice_id: String(inv.id) } } },
    });
    const sig = new Stripe('sk_x').webhooks.generateTestHeaderString({ payload, secret: t.config.payments!.webhookSecret });
    const res = await fetch(`${t.url}/api/billing/webhook`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'stripe-signature': sig },
      body: payload,
    });
    expect(res.status).toBe(200);
    expect((await o.get(`/api/invoices/${inv.id}`)).body.status).toBe('issued');
  });

  it('refund round-trips: owner refunds through the provider, charge.refunded arrives once, receipt says refunded', async () => {
    const inv = await paidInvoice();
    expect(inv.status).toBe('paid');
    expect((await o.post(`/api/invoices/${inv.id}/cancel`)).status).toBe(409);
    const c = await signedIn(t.app, coach.email, coach.password);
    expect((await c.post(`/api/invoices/${inv.id}/refund`)).status).toBe(403);
    const res = await o.post(`/api/invoices/${inv.id}/refund`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ status: 'refunded' });
    await t.fakePayments!.idle();
    const refunded = t.fakePayments!.events.at(-1)!;
    expect(refunded.type).toBe('charge.refunded');
    expect(await t.db('payment_events').where({ id: refunded.id }).first()).toMatchObject({ invoice_id: inv.id });
    expect((await o.get(`/api/invoices/${inv.id}`)).body.status).toBe('refunded');
    expect((await o.post(`/api/invoices/${inv.id}/refund`)).status).toBe(409);
    const pdf = await a
      .get(`/api/invoices/${inv.id}/receipt`)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (ch: Buffer) => chunks.push(ch));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect((await new PDFParse({ data: pdf.body as Buffer }).getText()).text).toMatch(/Refunded on .*78\.00 EUR/);
  });

  it('a card refund sent twice at once and again with the same Idempotency-Key: one refund at the provider, each answer the invoice', async () => {
    const inv = await paidInvoice();
    const refund = () => o.send('post', `/api/invoices/${inv.id}/refund`, {}, { 'Idempotency-Key': 'card-refund-0001' });
    const together = await Promise.all([refund(), refund()]);
    expect(together.map((r) => r.status)).toEqual([200, 200]);
    await t.fakePayments!.idle();
    const retry = await refund();
    expect(retry.status).toBe(200);
    expect(retry.body.status).toBe('refunded');
    expect(await t.db('payment_events').where({ invoice_id: inv.id, type: 'charge.refunded' })).toHaveLength(1);
    expect((await o.send('post', `/api/invoices/${inv.id}/refund`, {}, { 'Idempotency-Key': 'card-refund-0002' })).status).toBe(409);
  });

  it('without payment configuration, paying answers 503 and the webhook refuses', async () => {
    const off = await makeTestApp({ payments: null });
    try {
      const oo = await signedIn(off.app, owner.email, owner.password);
      const id = (
        await oo.post('/api/invoices', {
          athleteId: adaId,
          assessmentId: null,
          dueDate: due,
          note: null,
          lines: [{ priceId: null, description: 'X', quantity: 1, unitAmountMinor: 100, taxRateBp: null }],
        })
      ).body.id;
      await oo.post(`/api/invoices/${id}/issue`);
      const aa = await signedIn(off.app, athlete.email, athlete.password);
      const res = await aa.post(`/api/invoices/${id}/checkout`);
      expect(res.status).toBe(503);
      expect(res.body.error.code).toBe('payments_unavailable');
      const hook = await aa.post('/api/billing/webhook', { id: 'evt_x', type: 'checkout.session.completed' });
      expect(hook.status).toBe(503);
    } finally {
      await off.close();
    }
  });
});

/** Posts an event signed with the configured webhook secret (the demo's is public, so anyone can). */
async function postSigned(event: Record<string, unknown>): Promise<number> {
  const payload = JSON.stringify({ object: 'event', ...event });
  const sig = new Stripe('sk_x').webhooks.generateTestHeaderString({ payload, secret: t.config.payments!.webhookSecret });
  const res = await fetch(`${t.url}/api/billing/webhook`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'stripe-signature': sig },
    body: payload,
  });
  return res.status;
}

describe('refund events are confirmed with the payment service', () => {
  it('a correctly signed charge.refunded the payment service does not confirm leaves the invoice paid', async () => {
    const inv = await paidInvoice();
    const pi = (await t.db('invoices').where({ id: inv.id }).first()).payment_intent_id as string;
    const forged = {
      id: 'ch_forged_1',
      object: 'charge',
      payment_intent: pi,
      refunded: true,
      amount: inv.totalMinor,
      amount_refunded: inv.totalMinor,
      currency: 'eur',
      status: 'succeeded',
    };
    expect(await postSigned({ id: 'evt_forged_refund_1', type: 'charge.refunded', data: { object: forged } })).toBe(200);
    expect(
      await postSigned({
        id: 'evt_forged_refund_2',
        type: 'refund.updated',
        data: {
          object: { id: 're_forged_1', object: 'refund', payment_intent: pi, status: 'succeeded', amount: inv.totalMinor, currency: 'eur' },
        },
      }),
    ).toBe(200);
    expect((await o.get(`/api/invoices/${inv.id}`)).body).toMatchObject({ status: 'paid', refundedAt: null });
  });

  it("an event naming a real refunded charge is judged by what the service says about it, not by the event's copy", async () => {
    const refunded = await paidInvoice();
    expect((await o.post(`/api/invoices/${refunded.id}/refund`)).status).toBe(200);
    await t.fakePayments!.idle();
    const charge = JSON.parse(t.fakePayments!.events.at(-1)!.payload).data.object as { id: string };
    // Another paid invoice: the forged copy says the real charge belongs to its payment.
    const victim = await paidInvoice();
    const pi = (await t.db('invoices').where({ id: victim.id }).first()).payment_intent_id as string;
    expect(
      await postSigned({ id: 'evt_forged_refund_3', type: 'charge.refunded', data: { object: { ...charge, payment_intent: pi } } }),
    ).toBe(200);
    expect((await o.get(`/api/invoices/${victim.id}`)).body.status).toBe('paid');
  });

  it('a refund made at the payment service itself (not through Trailframe) is confirmed and marks the invoice refunded', async () => {
    const inv = await paidInvoice();
    const pi = (await t.db('invoices').where({ id: inv.id }).first()).payment_intent_id as string;
    const res = await fetch(`${t.fakePayments!.url}/v1/refunds`, {
      method: 'POST',
      headers: { authorization: `Bearer ${t.config.payments!.secretKey}`, 'content-type': 'application/x-www-form-urlencoded' },
      body: `payment_intent=${pi}`,
    });
    expect(res.status).toBe(200);
    await t.fakePayments!.idle();
    expect((await o.get(`/api/invoices/${inv.id}`)).body.status).toBe('refunded');
  });

  it('refuses to start with the demo keys or secrets when demo mode is off', () => {
    const prod = { DEMO_MODE: 'false', SESSION_SECRET: 's'.repeat(40) } as NodeJS.ProcessEnv;
    expect(() =>
      loadConfig({ ...prod, STRIPE_SECRET_KEY: FAKE_PAYMENTS_KEYS.secretKey, STRIPE_WEBHOOK_SECRET: 'whsec_real_looking_0123' }),
    ).toThrow(/STRIPE_SECRET_KEY.*demo/);
    expect(() =>
      loadConfig({ ...prod, STRIPE_SECRET_KEY: 'sk_live_real_looking_0123', STRIPE_WEBHOOK_SECRET: FAKE_PAYMENTS_KEYS.webhookSecret }),
    ).toThrow(/STRIPE_WEBHOOK_SECRET.*demo/);
    expect(() => loadConfig({ ...prod, SESSION_SECRET: DEMO_SESSION_SECRET })).toThrow(/SESSION_SECRET.*demo/);
    expect(
      loadConfig({ ...prod, STRIPE_SECRET_KEY: 'sk_live_real_looking_0123', STRIPE_WEBHOOK_SECRET: 'whsec_real_looking_0123' }).payments
        ?.secretKey,
    ).toBe('sk_live_real_looking_0123');
    // Demo mode keeps its demo keys.
    expect(loadConfig({} as NodeJS.ProcessEnv).payments?.webhookSecret).toBe(FAKE_PAYMENTS_KEYS.webhookSecret);
  });
});

describe('the demo history', () => {
  it("refunds the seeded paid invoice through the local fake (its invented 'pi_demo_' payment)", async () => {
    const seeded = await t.db('invoices').where({ number: 'TF-2026-0001' }).first();
    expect(seeded).toMatchObject({ status: 'paid' });
    expect(seeded.payment_intent_id).toMatch(/^pi_demo_/);
    const res = await o.post(`/api/invoices/${seeded.id}/refund`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ status: 'refunded' });
    await t.fakePayments!.idle();
    expect(t.fakePayments!.events.at(-1)!.type).toBe('charge.refunded');
    expect((await o.get(`/api/invoices/${seeded.id}`)).body.status).toBe('refunded');
  });
});
