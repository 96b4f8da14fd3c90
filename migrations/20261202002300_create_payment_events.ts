import type { Knex } from 'knex';

/** Payment-provider webhook events already handled (the event id makes handling idempotent). */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('payment_events', (t) => {
    t.string('id').primary();
    t.string('type').notNullable();
    t.integer('invoice_id').nullable().references('invoices.id').onDelete('SET NULL');
    t.string('received_at').notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('payment_events');
}
