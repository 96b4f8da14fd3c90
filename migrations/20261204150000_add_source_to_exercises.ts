import type { Knex } from 'knex';

/**
 * Where an exercise comes from: the published programme it is written from, cited plainly for the
 * staff (e.g. "Askling et al. 2013, Br J Sports Med 47:953–959"). Empty for the clinic's own.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('exercises', (t) => {
    t.string('source', 300).notNullable().defaultTo('');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('exercises', (t) => {
    t.dropColumn('source');
  });
}
