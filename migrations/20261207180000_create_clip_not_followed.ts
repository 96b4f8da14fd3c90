import type { Knex } from 'knex';

/**
 * Frames marker following could not follow a marker on, with why (`not_found`, `broke_links`,
 * `on_other_marker`): one row per clip, frame, side and landmark, kept beside the clip's followed
 * points so the review can send the coach to check them. A follow run replaces the rows of the
 * markers and frames it followed; a person placing or accepting the marker on the frame clears it.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('clip_not_followed', (t) => {
    t.integer('clip_id').notNullable().references('clips.id').onDelete('CASCADE');
    t.integer('frame').notNullable();
    t.string('side', 5).notNullable();
    t.string('landmark', 10).notNullable();
    t.string('reason', 20).notNullable();
    t.primary(['clip_id', 'frame', 'side', 'landmark']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('clip_not_followed');
}
