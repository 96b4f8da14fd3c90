import type { Knex } from 'knex';

/** When the owner deactivated a staff member (null while active), shown on the Team page. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('users', (t) => {
    t.string('deactivated_at');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('users', (t) => {
    t.dropColumn('deactivated_at');
  });
}
