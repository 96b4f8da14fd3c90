import type { Knex } from 'knex';

/** Who did what to which athlete, when. Never updated, only appended. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('audit_log', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('actor_id').references('users.id').onDelete('SET NULL');
    t.integer('athlete_id').references('athletes.id').onDelete('SET NULL');
    t.string('action', 60).notNullable();
    t.text('detail');
    t.string('at').notNullable();
    t.index(['clinic_id', 'at']);
    t.index(['athlete_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('audit_log');
}
