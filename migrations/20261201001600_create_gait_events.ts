import type { Knex } from 'knex';

/** Gait events a coach tagged on a clip (initial contact, midstance, toe-off per side). */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('gait_events', (t) => {
    t.increments('id');
    t.integer('clip_id').notNullable().references('clips.id').onDelete('CASCADE');
    t.integer('frame').notNullable();
    t.string('side', 5).notNullable();
    t.string('kind', 16).notNullable();
    t.unique(['clip_id', 'frame', 'side']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('gait_events');
}
