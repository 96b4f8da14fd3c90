import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('injuries', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('athlete_id').notNullable().references('athletes.id').onDelete('CASCADE');
    t.string('region', 20).notNullable();
    t.string('side', 10).notNullable();
    t.string('began', 7).notNullable();
    t.string('status', 12).notNullable();
    t.string('notes', 500).notNullable().defaultTo('');
    t.integer('position').notNullable().defaultTo(0);
    t.index(['athlete_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('injuries');
}
