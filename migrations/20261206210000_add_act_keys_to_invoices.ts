import type { Knex } from 'knex';

/**
 * The key the browser sends with each act on an invoice (issue, recorded payment, cancel, refund;
 * `Idempotency-Key`): the same act sent again with the same key after its answer was lost finds it
 * done and answers the invoice, instead of 409. Each act happens at most once per invoice, so one
 * column per act; null for acts made without a key.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('invoices', (t) => {
    t.string('issue_key', 64).nullable();
    t.string('payment_key', 64).nullable();
    t.string('cancel_key', 64).nullable();
    t.string('refund_key', 64).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('invoices', (t) => {
    t.dropColumn('issue_key');
    t.dropColumn('payment_key');
    t.dropColumn('cancel_key');
    t.dropColumn('refund_key');
  });
}
