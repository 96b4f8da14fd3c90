import type { Knex } from 'knex';

/** A clinic's own version of a reference band (defaults live in src/kinematics). */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('reference_bands', (t) => {
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.string('key', 40).notNullable();
    t.double('low');
    t.double('high');
    t.string('unit', 20).notNullable();
    t.string('context', 200).notNullable();
    t.string('source', 300).notNullable();
    t.string('evidence', 6).notNullable();
    t.integer('updated_by').references('users.id').onDelete('SET NULL');
    t.string('updated_at').notNullable();
    t.primary(['clinic_id', 'key']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('reference_bands');
}
