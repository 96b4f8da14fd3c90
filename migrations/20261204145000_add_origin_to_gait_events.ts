import type { Knex } from 'knex';

/** Where a gait event came from: placed by a person, proposed from landmark positions, or an accepted proposal. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('gait_events', (t) => {
    t.string('origin', 10).notNullable().defaultTo('placed');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('gait_events', (t) => {
    t.dropColumn('origin');
  });
}
