import type { Knex } from 'knex';

/** Demonstration pictures of an exercise: ordered, captioned, stored processed (picture and thumbnail). */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('demo_pictures', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('exercise_id').notNullable().references('exercises.id').onDelete('CASCADE');
    t.integer('position').notNullable();
    t.string('caption', 120).notNullable().defaultTo('');
    t.integer('width').notNullable();
    t.integer('height').notNullable();
    t.integer('thumb_width').notNullable();
    t.integer('thumb_height').notNullable();
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.string('created_at').notNullable();
    t.index(['exercise_id', 'position']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('demo_pictures');
}
