import type { Knex } from 'knex';

/** An athlete's staged loading plan, optionally linked to the assessment it came from. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('plans', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('athlete_id').notNullable().references('athletes.id').onDelete('CASCADE');
    t.integer('assessment_id').references('assessments.id').onDelete('SET NULL');
    t.string('title', 100).notNullable();
    t.string('status', 10).notNullable().defaultTo('draft');
    /** The stage the athlete is in (a plan_stages id of this plan; kept right by the service). */
    t.integer('current_stage_id');
    t.text('notes');
    t.string('started_at');
    t.string('finished_at');
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.index(['athlete_id', 'status']);
    t.index(['clinic_id', 'status']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('plans');
}
