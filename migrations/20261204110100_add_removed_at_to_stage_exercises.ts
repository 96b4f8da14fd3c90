import type { Knex } from 'knex';

/**
 * A stage exercise the coach removed from a plan is kept, marked removed, so a session the athlete
 * logged for it offline (before the edit) can still be recorded under its name and flagged.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('stage_exercises', (t) => {
    t.string('removed_at').nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('stage_exercises', (t) => {
    t.dropColumn('removed_at');
  });
}
