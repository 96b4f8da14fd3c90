import type { Knex } from 'knex';

/** Measures computed on the server when a clip's annotations change, with the kinematics version. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('measure_snapshots', (t) => {
    t.integer('clip_id').primary().references('clips.id').onDelete('CASCADE');
    t.integer('assessment_id').notNullable().references('assessments.id').onDelete('CASCADE');
    t.integer('annotation_revision').notNullable();
    t.string('kinematics_version', 20).notNullable();
    t.text('measures').notNullable();
    t.string('computed_at').notNullable();
    t.index(['assessment_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('measure_snapshots');
}
