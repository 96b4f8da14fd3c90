import type { Knex } from 'knex';

/**
 * Clip retention: how many months clips of athletes with no activity are kept (null: kept, the
 * default). A daily check lists the clips it would remove (`clip_retention_reviews`); they are
 * removed only when the owner confirms that list.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('clinics', (t) => {
    t.integer('clip_retention_months').nullable();
  });
  await knex.schema.createTable('clip_retention_reviews', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    // The clips listed, with their athlete and size when listed (JSON: [{ clipId, athleteId, sizeBytes }]).
    t.text('items').notNullable();
    t.bigInteger('total_bytes').notNullable();
    t.string('listed_at').notNullable();
    t.string('confirmed_at').nullable();
    t.integer('confirmed_by').nullable().references('users.id').onDelete('SET NULL');
    t.integer('removed_count').nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('clip_retention_reviews');
  await knex.schema.alterTable('clinics', (t) => {
    t.dropColumn('clip_retention_months');
  });
}
