import type { Knex } from 'knex';

/**
 * An erased athlete keeps only a row that invoices the law requires to keep can point at: the name
 * becomes "Erased athlete" and a reference (`E-7F3A`), everything else about them is gone. Every
 * route and list treats a row with `erased_at` as absent.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('athletes', (t) => {
    t.string('erased_at').nullable();
    t.string('erasure_ref', 12).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('athletes', (t) => {
    t.dropColumn('erasure_ref');
    t.dropColumn('erased_at');
  });
}
