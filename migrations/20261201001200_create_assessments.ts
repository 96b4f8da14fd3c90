import type { Knex } from 'knex';

/** A dated gait visit of one athlete (Baseline or Re-test). */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('assessments', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('athlete_id').notNullable().references('athletes.id').onDelete('CASCADE');
    t.string('date', 10).notNullable();
    t.string('kind', 10).notNullable();
    t.string('surface', 12).notNullable();
    t.double('speed_mps');
    t.string('speed_unit', 12).notNullable().defaultTo('kmh');
    t.double('incline_percent');
    t.string('shoes', 120);
    t.string('camera_notes', 500);
    t.text('notes');
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.index(['athlete_id', 'date']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('assessments');
}
