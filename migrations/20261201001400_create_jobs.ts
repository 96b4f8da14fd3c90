import type { Knex } from 'knex';

/**
 * Durable job queue. A worker claims a row by setting `status = running` and a lease; a row
 * whose lease ran out (its worker died) is claimed again until `max_attempts`.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('jobs', (t) => {
    t.increments('id');
    t.string('type', 40).notNullable();
    t.string('subject', 60).notNullable();
    t.text('payload').notNullable();
    t.string('status', 10).notNullable();
    t.integer('attempts').notNullable().defaultTo(0);
    t.integer('max_attempts').notNullable().defaultTo(3);
    t.string('lease_until');
    t.string('run_after').notNullable();
    t.string('error', 1000);
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.index(['status', 'run_after']);
    t.index(['subject']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('jobs');
}
