import type { Knex } from 'knex';

/**
 * Annotated clips: a frame range of one clip in slow motion with the overlay on every frame, or a
 * Baseline and a Re-test clip side by side, lined up at each initial contact. The marks are frozen
 * when the coach makes it; it is rendered in the background (a processed item; progress on the processing stream); published to the athlete or not.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('annotated_clips', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('athlete_id').notNullable().references('athletes.id').onDelete('CASCADE');
    t.integer('assessment_id').notNullable().references('assessments.id').onDelete('CASCADE');
    // The clip whose folder holds the video (a side-by-side clip: the Re-test); the row goes with it.
    t.integer('clip_id').notNullable().references('clips.id').onDelete('CASCADE');
    // A side-by-side clip's Baseline clip; null once that clip is deleted (the row then shows why and can be deleted with its video).
    t.integer('other_clip_id').nullable().references('clips.id').onDelete('SET NULL');
    t.string('kind', 14).notNullable();
    // Panels with the frozen landmarks, events, gauges, direction and near side, and the frames per step (JSON).
    t.text('panels').notNullable();
    t.double('factor').notNullable();
    t.string('caption', 400).notNullable().defaultTo('');
    t.boolean('show_angles').notNullable().defaultTo(true);
    t.string('status', 12).notNullable();
    t.text('error').nullable();
    t.integer('width').nullable();
    t.integer('height').nullable();
    t.integer('frame_count').nullable();
    t.double('fps').nullable();
    t.double('duration_s').nullable();
    t.integer('repeat').nullable();
    t.text('note').nullable();
    t.integer('render_version').notNullable().defaultTo(1);
    t.string('published_at').nullable();
    t.integer('published_by').nullable().references('users.id').onDelete('SET NULL');
    t.integer('created_by').nullable().references('users.id').onDelete('SET NULL');
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.index(['athlete_id', 'created_at']);
    t.index(['clip_id']);
    t.index(['other_clip_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('annotated_clips');
}
