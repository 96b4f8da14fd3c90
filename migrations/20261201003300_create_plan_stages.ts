import type { Knex } from 'knex';

/** Ordered stages of a plan, with target duration and progression criteria. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('plan_stages', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('plan_id').notNullable().references('plans.id').onDelete('CASCADE');
    t.integer('position').notNullable();
    t.string('name', 80).notNullable();
    t.string('goal', 400).notNullable();
    t.integer('target_weeks').notNullable();
    t.text('progression_text').notNullable();
    /** JSON array of checkable criteria (src/contracts/plans.ts ProgressionCriterion). */
    t.text('criteria').notNullable();
    t.string('started_at');
    t.string('completed_at');
    t.index(['plan_id', 'position']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('plan_stages');
}
