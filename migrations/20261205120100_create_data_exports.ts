import type { Knex } from 'knex';

/**
 * Data exports: one zip of everything held about an athlete, built in the background (a processed
 * item), downloadable until `expires_at`; the zip is stored by key under `exports/<athleteId>/`.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('data_exports', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('athlete_id').notNullable().references('athletes.id').onDelete('CASCADE');
    t.integer('requested_by').nullable().references('users.id').onDelete('SET NULL');
    t.string('status', 12).notNullable();
    t.text('error').nullable();
    t.bigInteger('size_bytes').nullable();
    t.integer('file_count').nullable();
    t.string('ready_at').nullable();
    t.string('expires_at').nullable();
    t.string('created_at').notNullable();
    t.index(['athlete_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('data_exports');
}
