import type { Knex } from 'knex';

/** Exercises of a stage with the dose prescribed there. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('stage_exercises', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('stage_id').notNullable().references('plan_stages.id').onDelete('CASCADE');
    t.integer('exercise_id').notNullable().references('exercises.id').onDelete('RESTRICT');
    t.integer('position').notNullable();
    t.integer('sets').notNullable();
    t.integer('reps');
    t.integer('hold_seconds');
    t.string('tempo', 40);
    t.string('load', 60);
    t.integer('rest_seconds');
    t.integer('days_per_week').notNullable();
    t.string('notes', 200);
    t.index(['stage_id', 'position']);
    t.index(['exercise_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('stage_exercises');
}
