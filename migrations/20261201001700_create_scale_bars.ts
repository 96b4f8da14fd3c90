import type { Knex } from 'knex';

/** The calibration line of a clip: two points (frame fractions) over a known length. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('scale_bars', (t) => {
    t.integer('clip_id').primary().references('clips.id').onDelete('CASCADE');
    t.integer('frame').notNullable();
    t.float('ax').notNullable();
    t.float('ay').notNullable();
    t.float('bx').notNullable();
    t.float('by').notNullable();
    t.float('length_m').notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('scale_bars');
}
