import type { Knex } from 'knex';

/**
 * A plan's revision: raised by one on every save of its content (PUT), so an edit started from an
 * older revision (another coach saved meanwhile) is refused instead of overwriting theirs.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('plans', (t) => {
    t.integer('revision').notNullable().defaultTo(0);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('plans', (t) => {
    t.dropColumn('revision');
  });
}
