import type { Knex } from 'knex';

/**
 * How an invoice was paid: by card (through the payment service) or recorded by the owner as a
 * bank transfer or cash, with the day the money arrived and a note; and a note on a recorded
 * refund. Card payments already stored become `card`, dated by when they were paid.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('invoices', (t) => {
    t.string('payment_method').nullable();
    t.string('paid_on').nullable();
    t.text('payment_note').nullable();
    t.text('refund_note').nullable();
    t.integer('payment_recorded_by').nullable().references('users.id').onDelete('SET NULL');
  });
  await knex('invoices')
    .whereNotNull('payment_intent_id')
    .whereNotNull('paid_at')
    .update({ payment_method: 'card', paid_on: knex.raw('substr(paid_at, 1, 10)') });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('invoices', (t) => {
    t.dropColumn('payment_recorded_by');
    t.dropColumn('refund_note');
    t.dropColumn('payment_note');
    t.dropColumn('paid_on');
    t.dropColumn('payment_method');
  });
}
