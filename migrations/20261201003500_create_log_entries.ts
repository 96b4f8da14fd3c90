import type { Knex } from 'knex';

/**
 * The athlete's log: one row per session, with pain during and the next-morning check. The
 * client-generated idempotency key is unique, so a retried submission never makes a second row.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('log_entries', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('athlete_id').notNullable().references('athletes.id').onDelete('CASCADE');
    t.integer('plan_id').notNullable().references('plans.id').onDelete('CASCADE');
    t.integer('stage_id').notNullable().references('plan_stages.id').onDelete('CASCADE');
    t.string('idempotency_key', 64).notNullable().unique();
    t.string('session_date', 10).notNullable();
    t.integer('pain_during').notNullable();
    t.integer('morning_pain');
    t.string('morning_at');
    /** JSON array of sets done per stage exercise, with name and sets prescribed at the time. */
    t.text('sets').notNullable();
    t.text('note');
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.index(['plan_id', 'session_date']);
    t.index(['stage_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('log_entries');
}
