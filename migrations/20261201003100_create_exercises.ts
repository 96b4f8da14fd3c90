import type { Knex } from 'knex';

/** A clinic's exercise library: what an exercise is for, how to do it, its default dose. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('exercises', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.string('name', 80).notNullable();
    t.string('purpose', 300).notNullable();
    t.string('region', 20).notNullable();
    t.string('kind', 20).notNullable();
    t.integer('sets').notNullable();
    t.integer('reps');
    t.integer('hold_seconds');
    t.string('tempo', 40);
    t.string('load', 60);
    t.integer('rest_seconds');
    t.integer('days_per_week').notNullable();
    /** JSON array of instruction steps, in order. */
    t.text('instructions').notNullable();
    t.text('cautions').notNullable();
    t.boolean('archived').notNullable().defaultTo(false);
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.unique(['clinic_id', 'name']);
    t.index(['clinic_id', 'archived']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('exercises');
}
