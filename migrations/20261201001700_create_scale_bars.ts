import type { Knex } from 'knex';

/** The calibration line of a clip: two points (frame fractions) over a known length. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('scale_bars', (t) => {
    t.integer('clip_id').primary().references('clips.id').onDelete('CASCADE');
    t.integer('frame').notNullable();
    t.double('ax').notNullable();
    t.double('ay').notNullable();
    t.double('bx').notNullable();
    t.double('by').notNullable();
    t.double('length_m').notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('scale_bars');
}
