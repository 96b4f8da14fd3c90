import type { Knex } from 'knex';

/** The roster asks, per athlete, whether an invitation is pending: look invitations up by athlete. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('invitations', (t) => {
    t.index(['athlete_id'], 'invitations_athlete_id_index');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('invitations', (t) => {
    t.dropIndex(['athlete_id'], 'invitations_athlete_id_index');
  });
}
