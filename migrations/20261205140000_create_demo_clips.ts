import type { Knex } from 'knex';

/**
 * The one demonstration clip of an exercise: its caption, its place among the pictures, the upload
 * as received and the phone MP4 and poster made from it (by render version), with its state.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('demo_clips', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('exercise_id').notNullable().references('exercises.id').onDelete('CASCADE');
    t.integer('position').notNullable().defaultTo(0);
    t.string('caption', 120).notNullable().defaultTo('');
    t.string('stored_name', 20).notNullable();
    t.string('status', 12).notNullable();
    t.text('error');
    t.integer('version').notNullable().defaultTo(1);
    t.float('duration_s').notNullable();
    t.integer('width');
    t.integer('height');
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.unique(['exercise_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('demo_clips');
}
