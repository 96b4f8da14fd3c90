import type { Knex } from 'knex';
import { createOnce } from '../db/create-once';
import type { SessionUser } from '../../src/contracts/api';
import type { BillingSettings, Price, PriceWrite } from '../../src/contracts/billing';
import { ConflictError, NotFoundError } from '../errors';
import { assertRole } from '../policy/enforce';
import type { BillingContext } from './billing-context';
import { pricesRepository as prices, toPrice } from './prices-repository';

/** The clinic's currency and price list (owner). */
export interface PriceListService {
  settings(user: SessionUser): Promise<BillingSettings>;
  /** Changes the clinic's currency; refused once an invoice exists (its amounts are in the old one). */
  putSettings(user: SessionUser, s: BillingSettings): Promise<BillingSettings>;
  listPrices(user: SessionUser, includeArchived: boolean): Promise<Price[]>;
  /** A new price; with `key` (the client's `Idempotency-Key`), the same price sent again answers the one it made. */
  createPrice(user: SessionUser, w: PriceWrite, key?: string): Promise<Price>;
  updatePrice(user: SessionUser, id: number, w: Partial<PriceWrite>): Promise<Price>;
  /** Removes a price from the list; invoices that used it keep their lines. */
  archivePrice(user: SessionUser, id: number): Promise<void>;
}

export function priceListService(ctx: BillingContext): PriceListService {
  const { db } = ctx;
  return {
    async settings(user) {
      assertRole(user, 'billing-settings:read');
      return { currency: (await ctx.clinicOf(user.clinicId)).currency };
    },

    async putSettings(user, s) {
      assertRole(user, 'billing-settings:update');
      await db.transaction(async (trx) => {
        const used = await trx('invoices').where({ clinic_id: user.clinicId }).whereNot({ currency: s.currency }).first('id');
        if (used)
          throw new ConflictError('Invoices already exist in the current currency; the currency cannot change now.', 'currency_in_use');
        await trx('clinics').where({ id: user.clinicId }).update({ currency: s.currency });
        await prices.setCurrency(trx, user.clinicId, s.currency);
      });
      return { currency: s.currency };
    },

    async listPrices(user, includeArchived) {
      assertRole(user, 'price:list');
      return (await prices.list(db, user.clinicId, includeArchived)).map(toPrice);
    },

    async createPrice(user, w, key) {
      assertRole(user, 'price:create');
      const { currency } = await ctx.clinicOf(user.clinicId);
      const at = ctx.now();
      const create = (trx: Knex) => prices.insert(trx, user.clinicId, currency, w, at);
      const id = await createOnce(db, { clinicId: user.clinicId, kind: 'price', key, request: w, at, create });
      return toPrice((await prices.find(db, user.clinicId, id))!);
    },

    async updatePrice(user, id, w) {
      assertRole(user, 'price:update');
      if (!(await prices.find(db, user.clinicId, id))) throw new NotFoundError('Price');
      await prices.update(db, user.clinicId, id, w, ctx.now());
      return toPrice((await prices.find(db, user.clinicId, id))!);
    },

    async archivePrice(user, id) {
      assertRole(user, 'price:archive');
      if (!(await prices.find(db, user.clinicId, id))) throw new NotFoundError('Price');
      await prices.archive(db, user.clinicId, id, ctx.now());
    },
  };
}
