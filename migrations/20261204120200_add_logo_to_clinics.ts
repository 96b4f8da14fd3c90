import type { Knex } from 'knex';

/** The clinic's logo: its stored version (null = none) and size, for documents, e-mails and the portal. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('clinics', (t) => {
    t.integer('logo_version').nullable();
    t.integer('logo_width').nullable();
    t.integer('logo_height').nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('clinics', (t) => {
    t.dropColumn('logo_height');
    t.dropColumn('logo_width');
    t.dropColumn('logo_version');
  });
}
