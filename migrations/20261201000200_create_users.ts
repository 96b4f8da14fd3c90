import type { Knex } from 'knex';
import { addCheck } from '../server/db/dialect';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('users', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.string('email', 254).notNullable().unique();
    t.string('name', 80).notNullable();
    t.string('role', 10).notNullable();
    t.string('password_hash');
    t.boolean('active').notNullable().defaultTo(true);
    t.string('last_sign_in_at');
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.index(['clinic_id', 'role']);
  });
  await addCheck(knex, 'users', 'users_role_check', 'role', ['owner', 'coach', 'athlete']);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('users');
}
