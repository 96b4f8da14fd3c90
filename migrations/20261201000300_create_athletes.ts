import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('athletes', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('user_id').unique().references('users.id').onDelete('SET NULL');
    t.integer('coach_id').references('users.id').onDelete('SET NULL');
    t.string('first_name', 80).notNullable();
    t.string('last_name', 80).notNullable();
    t.string('email', 254);
    t.string('date_of_birth');
    t.double('height_cm');
    t.string('distance_unit', 2).notNullable().defaultTo('km');
    t.double('weekly_km');
    t.double('longest_run_km');
    t.string('goal_event', 120);
    t.string('goal_date');
    t.text('surfaces').notNullable().defaultTo('[]');
    t.text('notes');
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.index(['clinic_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('athletes');
}
