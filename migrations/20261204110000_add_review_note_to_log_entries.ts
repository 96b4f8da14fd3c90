import type { Knex } from 'knex';

/**
 * Why the coach should look at a log entry: it was sent for exercises the coach changed meanwhile
 * (an athlete's offline session queued before a plan edit). Null for most entries.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('log_entries', (t) => {
    t.text('review_note').nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('log_entries', (t) => {
    t.dropColumn('review_note');
  });
}
