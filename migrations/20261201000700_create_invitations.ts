import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('invitations', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.string('email', 254).notNullable();
    t.string('name', 80).notNullable();
    t.string('role', 10).notNullable();
    t.integer('athlete_id').references('athletes.id').onDelete('CASCADE');
    t.string('token_hash', 64).notNullable().unique();
    t.integer('invited_by').references('users.id').onDelete('SET NULL');
    t.string('expires_at').notNullable();
    t.string('used_at');
    t.string('revoked_at');
    t.string('created_at').notNullable();
    t.index(['clinic_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('invitations');
}
