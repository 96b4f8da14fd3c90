import type { Knex } from 'knex';

/**
 * The `Idempotency-Key` a browser sent with a new athlete, plan or price, and what it made: the
 * same key again (a retry after the answer was lost, a double click) answers that row instead of
 * making a second. `request_hash` (SHA-256 of the request) tells a reused key with other content.
 * No personal data: ids and a hash only.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('create_keys', (t) => {
    t.integer('clinic_id').notNullable().references('id').inTable('clinics').onDelete('CASCADE');
    t.string('kind', 32).notNullable();
    t.string('key', 64).notNullable();
    t.integer('subject_id').notNullable();
    t.string('request_hash', 64).notNullable();
    t.string('created_at').notNullable();
    t.primary(['clinic_id', 'kind', 'key']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('create_keys');
}
