import type { Knex } from 'knex';

/**
 * Who is making a finished resumable upload into a clip: one row per upload while it is being
 * accepted, so two server processes sharing the uploads folder never make two clips of it. The
 * holder renews `expires_at` while it works; a row past it (its process was killed) may be taken over.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('resumable_upload_claims', (t) => {
    t.string('upload_id', 32).primary();
    t.string('holder', 120).notNullable();
    t.string('expires_at', 30).notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('resumable_upload_claims');
}
