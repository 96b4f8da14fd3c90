import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('clinics', (t) => {
    t.increments('id');
    t.string('name', 120).notNullable();
    t.string('currency', 3).notNullable().defaultTo('EUR');
    t.string('distance_unit', 2).notNullable().defaultTo('km');
    t.string('created_at').notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('clinics');
}
