/**
 * The billing migrations of our own invoice words, up and down on a seeded database: stored
 * states are rewritten both ways (open ↔ issued, void ↔ cancelled, `voided_at` ↔ `cancelled_at`),
 * and card payments stored before `payment_method` existed become `card`.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Db } from '../../server/db/knex';
import { openTestDb, type TestDb } from '../support/test-db';
import { seed } from '../../seeds/demo-scenario';

const RENAME = '20261204140000_rename_invoice_states.ts';
const PAYMENTS = '20261204140100_add_invoice_payment_records.ts';

let db: Db;
let testDb: TestDb;
beforeAll(async () => {
  testDb = await openTestDb();
  db = testDb.db;
  await seed(db);
});
afterAll(async () => {
  await testDb.close();
});

const columns = async () => Object.keys(await db('invoices').columnInfo());

describe('invoice states in our own words (migration)', () => {
  it('rewrites stored states down to the old words and up again, keeping the cancel time', async () => {
    const [any] = await db('invoices').select('id', 'clinic_id', 'athlete_id', 'currency');
    const [row] = await db('invoices')
      .insert({
        clinic_id: any.clinic_id,
        athlete_id: any.athlete_id,
        status: 'cancelled',
        currency: any.currency,
        subtotal_minor: 100,
        tax_minor: 0,
        total_minor: 100,
        due_date: '2026-12-31',
        cancelled_at: '2026-12-02T10:00:00.000Z',
        created_at: '2026-12-01T10:00:00.000Z',
        updated_at: '2026-12-02T10:00:00.000Z',
      })
      .returning('id');
    const cancelledId = (row as { id: number }).id;
    const states = async () => (await db('invoices').orderBy('id').select('status')).map((r: { status: string }) => r.status);
    const before = await states();
    expect(before).toContain('issued');
    expect(before).not.toContain('open');

    await db.migrate.down({ name: PAYMENTS });
    await db.migrate.down({ name: RENAME });
    const old = await states();
    expect(old).toEqual(before.map((s) => ({ issued: 'open', cancelled: 'void' })[s] ?? s));
    expect(await columns()).toContain('voided_at');
    expect((await db('invoices').where({ id: cancelledId }).first()).voided_at).toBe('2026-12-02T10:00:00.000Z');

    await db.migrate.up({ name: RENAME });
    await db.migrate.up({ name: PAYMENTS });
    expect(await states()).toEqual(before);
    expect(await columns()).toContain('cancelled_at');
    expect(await columns()).not.toContain('voided_at');
    expect((await db('invoices').where({ id: cancelledId }).first()).cancelled_at).toBe('2026-12-02T10:00:00.000Z');
  });

  it('a card payment stored before payment methods existed reads as a card payment on the day it was paid', async () => {
    const paid = await db('invoices').where({ number: 'TF-2026-0001' }).first();
    expect(paid).toMatchObject({ status: 'paid', payment_method: 'card', paid_on: paid.paid_at.slice(0, 10) });
    expect((await db('invoices').where({ number: 'TF-2026-0002' }).first()).payment_method).toBeNull();
  });
});
