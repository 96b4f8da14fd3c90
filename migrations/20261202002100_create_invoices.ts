import type { Knex } from 'knex';

/** Invoices to athletes: status, per-clinic number, totals (minor units), payment references. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('invoices', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('athlete_id').notNullable().references('athletes.id').onDelete('CASCADE');
    t.integer('assessment_id').nullable().references('assessments.id').onDelete('SET NULL');
    t.string('number').nullable();
    t.string('status').notNullable();
    t.string('currency', 3).notNullable();
    t.integer('subtotal_minor').notNullable();
    t.integer('tax_minor').notNullable();
    t.integer('total_minor').notNullable();
    t.string('due_date').notNullable();
    t.text('note').nullable();
    t.string('checkout_session_id').nullable();
    t.string('checkout_state').notNullable().defaultTo('none');
    t.string('payment_intent_id').nullable();
    t.string('refund_id').nullable();
    t.integer('created_by').nullable().references('users.id').onDelete('SET NULL');
    t.string('issued_at').nullable();
    t.string('paid_at').nullable();
    t.string('voided_at').nullable();
    t.string('refunded_at').nullable();
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.unique(['clinic_id', 'number']);
    t.index(['clinic_id', 'status']);
    t.index(['athlete_id']);
    t.index(['checkout_session_id']);
    t.index(['payment_intent_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('invoices');
}
