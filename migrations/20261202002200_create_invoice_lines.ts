import type { Knex } from 'knex';

/** Line items of an invoice, with the amounts computed on the server (tax half-up per line). */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('invoice_lines', (t) => {
    t.increments('id');
    t.integer('invoice_id').notNullable().references('invoices.id').onDelete('CASCADE');
    t.integer('position').notNullable();
    t.integer('price_id').nullable().references('prices.id').onDelete('SET NULL');
    t.string('description').notNullable();
    t.integer('quantity').notNullable();
    t.integer('unit_amount_minor').notNullable();
    t.integer('tax_rate_bp').nullable();
    t.integer('net_minor').notNullable();
    t.integer('tax_minor').notNullable();
    t.integer('total_minor').notNullable();
    t.index(['invoice_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('invoice_lines');
}
