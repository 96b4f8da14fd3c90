import type { Knex } from 'knex';

/**
 * Annotated stills: one frame (or a Re-test/Baseline pair) with the overlay frozen as it was when
 * the coach saved it; rendered to PNG + phone JPEG by a job; published to the athlete or not.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('stills', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('athlete_id').notNullable().references('athletes.id').onDelete('CASCADE');
    t.integer('assessment_id').notNullable().references('assessments.id').onDelete('CASCADE');
    // The clip whose folder holds the files; null once that clip is deleted (the row explains why).
    t.integer('clip_id').nullable().references('clips.id').onDelete('SET NULL');
    t.string('kind', 10).notNullable();
    // Panels with the frozen landmarks, scale, direction and near side (JSON).
    t.text('panels').notNullable();
    t.string('caption', 400).notNullable().defaultTo('');
    t.boolean('show_angles').notNullable().defaultTo(true);
    t.string('status', 12).notNullable();
    t.double('progress').notNullable().defaultTo(0);
    t.text('error').nullable();
    t.integer('width').nullable();
    t.integer('height').nullable();
    // Where each panel's frame sits in the PNG, and the degree labels drawn (JSON).
    t.text('layout').nullable();
    t.text('labels').nullable();
    t.integer('render_version').notNullable().defaultTo(0);
    t.string('published_at').nullable();
    t.integer('published_by').nullable().references('users.id').onDelete('SET NULL');
    t.integer('created_by').nullable().references('users.id').onDelete('SET NULL');
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.index(['athlete_id', 'created_at']);
    t.index(['clip_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('stills');
}
