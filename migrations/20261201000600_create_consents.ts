import type { Knex } from 'knex';

/** Append-only consent history: the latest row per athlete and kind is in force. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('consents', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('athlete_id').notNullable().references('athletes.id').onDelete('CASCADE');
    t.string('kind', 20).notNullable();
    t.boolean('granted').notNullable();
    t.integer('recorded_by').references('users.id').onDelete('SET NULL');
    t.string('recorded_at').notNullable();
    t.index(['athlete_id', 'kind']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('consents');
}
