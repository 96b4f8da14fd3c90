import type { Knex } from 'knex';

/** Optimistic concurrency for a clip's annotations: who saved last, when, and which revision. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('clips', (t) => {
    t.integer('annotation_revision').notNullable().defaultTo(0);
    t.integer('annotated_by').references('users.id').onDelete('SET NULL');
    t.string('annotated_at');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('clips', (t) => {
    t.dropColumn('annotation_revision');
    t.dropColumn('annotated_by');
    t.dropColumn('annotated_at');
  });
}
