import type { Knex } from 'knex';

/** Messages caught by the demo/test fake SMTP receiver (never used with real SMTP). */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('mailbox_messages', (t) => {
    t.increments('id');
    t.string('to_address', 1000).notNullable();
    t.string('from_address', 1000).notNullable();
    t.string('subject', 1000).notNullable();
    t.text('text').notNullable();
    t.text('html');
    t.string('received_at').notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('mailbox_messages');
}
