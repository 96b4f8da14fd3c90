import type { Knex } from 'knex';

/** Pain scores over time; the intake's "current pain" is the latest set (`current = 1`). */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('pain_entries', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('athlete_id').notNullable().references('athletes.id').onDelete('CASCADE');
    t.string('region', 20).notNullable();
    t.integer('score').notNullable();
    t.boolean('current').notNullable().defaultTo(true);
    t.string('source', 12).notNullable().defaultTo('intake');
    t.integer('recorded_by').references('users.id').onDelete('SET NULL');
    t.string('recorded_at').notNullable();
    t.index(['athlete_id', 'current']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('pain_entries');
}
