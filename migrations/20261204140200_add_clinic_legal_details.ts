import type { Knex } from 'knex';

/** The clinic's legal details that invoices and receipts carry: legal name, address, tax number, contact line. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('clinics', (t) => {
    t.string('legal_name', 160).nullable();
    t.text('legal_address').nullable();
    t.string('tax_number', 40).nullable();
    t.string('contact_line', 160).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('clinics', (t) => {
    t.dropColumn('contact_line');
    t.dropColumn('tax_number');
    t.dropColumn('legal_address');
    t.dropColumn('legal_name');
  });
}
