import type { Knex } from 'knex';

/**
 * The key the browser sends with a new invoice (`Idempotency-Key`): the same key again (a retry
 * after the answer was lost) finds the draft already made instead of making a second invoice.
 * Unique per clinic; null for invoices made without one.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('invoices', (t) => {
    t.string('create_key', 64).nullable();
    t.unique(['clinic_id', 'create_key'], { indexName: 'invoices_clinic_create_key_unique' });
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('invoices', (t) => {
    t.dropUnique(['clinic_id', 'create_key'], 'invoices_clinic_create_key_unique');
    t.dropColumn('create_key');
  });
}
