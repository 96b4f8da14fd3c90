import type { Knex } from 'knex';
import { byName } from '../db/name-order';
import type { Price, PriceWrite } from '../../src/contracts/billing';

/** A `prices` row. */
export interface PriceRow {
  id: number;
  clinic_id: number;
  item: string;
  description: string;
  amount_minor: number;
  currency: string;
  tax_rate_bp: number | null;
  archived_at: string | null;
  created_at: string;
  updated_at: string;
}

export const toPrice = (r: PriceRow): Price => ({
  id: r.id,
  item: r.item,
  description: r.description,
  amountMinor: r.amount_minor,
  currency: r.currency,
  taxRateBp: r.tax_rate_bp,
  archived: r.archived_at !== null,
});

/** Knex access to the price list; every call is scoped by clinic. */
export const pricesRepository = {
  /** The price list in alphabetical order of items ({@link byName}). */
  async list(db: Knex, clinicId: number, includeArchived: boolean): Promise<PriceRow[]> {
    const q = db<PriceRow>('prices').where({ clinic_id: clinicId });
    if (!includeArchived) q.whereNull('archived_at');
    return (await q.orderBy('id')).sort((a, b) => byName(a.item, b.item) || a.id - b.id);
  },
  find(db: Knex, clinicId: number, id: number): Promise<PriceRow | undefined> {
    return db<PriceRow>('prices').where({ clinic_id: clinicId, id }).first();
  },
  async insert(db: Knex, clinicId: number, currency: string, w: PriceWrite, at: string): Promise<number> {
    const [row] = await db('prices')
      .insert({
        clinic_id: clinicId,
        item: w.item,
        description: w.description,
        amount_minor: w.amountMinor,
        currency,
        tax_rate_bp: w.taxRateBp,
        created_at: at,
        updated_at: at,
      })
      .returning('id');
    return (row as { id: number }).id;
  },
  async update(db: Knex, clinicId: number, id: number, w: Partial<PriceWrite>, at: string): Promise<void> {
    const patch: Partial<PriceRow> = { updated_at: at };
    if (w.item !== undefined) patch.item = w.item;
    if (w.description !== undefined) patch.description = w.description;
    if (w.amountMinor !== undefined) patch.amount_minor = w.amountMinor;
    if (w.taxRateBp !== undefined) patch.tax_rate_bp = w.taxRateBp;
    await db('prices').where({ clinic_id: clinicId, id }).update(patch);
  },
  async archive(db: Knex, clinicId: number, id: number, at: string): Promise<void> {
    await db('prices').where({ clinic_id: clinicId, id }).update({ archived_at: at, updated_at: at });
  },
  async setCurrency(db: Knex, clinicId: number, currency: string): Promise<void> {
    await db('prices').where({ clinic_id: clinicId }).update({ currency });
  },
};
