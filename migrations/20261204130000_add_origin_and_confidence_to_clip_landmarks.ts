import type { Knex } from 'knex';

/**
 * Where each landmark point came from — `placed` (by a person), `followed` (marker following),
 * `proposed` (suggested by the app, not yet accepted) or `accepted` (a proposal the coach
 * accepted) — and the confidence (0–1) of an automatic point. Replaces the old `source`
 * ('manual' / 'tracked'); every existing row was placed by a person.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('clip_landmarks', (t) => {
    t.string('origin', 10).notNullable().defaultTo('placed');
    t.double('confidence').nullable();
  });
  await knex('clip_landmarks').where({ source: 'tracked' }).update({ origin: 'followed' });
  await knex.schema.alterTable('clip_landmarks', (t) => {
    t.dropColumn('source');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('clip_landmarks', (t) => {
    t.string('source', 10).notNullable().defaultTo('manual');
  });
  await knex('clip_landmarks').whereIn('origin', ['followed', 'proposed']).update({ source: 'tracked' });
  await knex.schema.alterTable('clip_landmarks', (t) => {
    t.dropColumn('origin');
    t.dropColumn('confidence');
  });
}
