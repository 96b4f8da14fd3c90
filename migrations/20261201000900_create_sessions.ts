import type { Knex } from 'knex';

/** Session store table in the shape connect-session-knex reads and writes. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('sessions', (t) => {
    t.string('sid').primary();
    t.text('sess').notNullable();
    t.string('expired').notNullable().index();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('sessions');
}
