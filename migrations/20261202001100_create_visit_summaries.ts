import type { Knex } from 'knex';

/** Visit summaries: a PDF of an assessment (or a Re-test against a baseline), rendered by a job. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('visit_summaries', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('athlete_id').notNullable().references('athletes.id').onDelete('CASCADE');
    t.integer('assessment_id').notNullable().references('assessments.id').onDelete('CASCADE');
    t.integer('baseline_assessment_id').nullable().references('assessments.id').onDelete('SET NULL');
    t.string('title', 200).notNullable();
    t.text('findings').notNullable();
    t.text('plan_text').notNullable();
    // Ordered still ids (JSON); stills deleted later simply drop out of a re-render.
    t.text('still_ids').notNullable();
    t.string('status', 12).notNullable();
    t.double('progress').notNullable().defaultTo(0);
    t.text('error').nullable();
    t.integer('page_count').nullable();
    t.string('published_at').nullable();
    t.integer('published_by').nullable().references('users.id').onDelete('SET NULL');
    t.integer('created_by').nullable().references('users.id').onDelete('SET NULL');
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.index(['athlete_id', 'created_at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('visit_summaries');
}
