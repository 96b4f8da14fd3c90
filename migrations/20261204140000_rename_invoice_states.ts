import type { Knex } from 'knex';

/**
 * Invoice states in our own words: open → issued, void → cancelled (and `voided_at` →
 * `cancelled_at`). Stored rows are rewritten both ways.
 */
export async function up(knex: Knex): Promise<void> {
  await knex('invoices').where({ status: 'open' }).update({ status: 'issued' });
  await knex('invoices').where({ status: 'void' }).update({ status: 'cancelled' });
  await knex.schema.alterTable('invoices', (t) => t.renameColumn('voided_at', 'cancelled_at'));
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('invoices', (t) => t.renameColumn('cancelled_at', 'voided_at'));
  await knex('invoices').where({ status: 'cancelled' }).update({ status: 'void' });
  await knex('invoices').where({ status: 'issued' }).update({ status: 'open' });
}
