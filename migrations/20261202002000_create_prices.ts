import type { Knex } from 'knex';

/** The clinic's price list (amounts in integer minor units of the clinic's currency). */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('prices', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.string('item').notNullable();
    t.text('description').notNullable().defaultTo('');
    t.integer('amount_minor').notNullable();
    t.string('currency', 3).notNullable();
    t.integer('tax_rate_bp').nullable();
    t.string('archived_at').nullable();
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.index(['clinic_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('prices');
}
