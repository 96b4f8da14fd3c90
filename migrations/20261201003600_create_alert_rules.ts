import type { Knex } from 'knex';

/** A plan's pain-monitoring rule (defaults in src/contracts/plans.ts DEFAULT_PAIN_RULE). */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('alert_rules', (t) => {
    t.integer('plan_id').primary().references('plans.id').onDelete('CASCADE');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('max_during').notNullable();
    t.boolean('morning_must_settle').notNullable();
    t.integer('settled_morning_max').notNullable();
    t.boolean('no_weekly_rise').notNullable();
    t.integer('updated_by').references('users.id').onDelete('SET NULL');
    t.string('updated_at').notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('alert_rules');
}
