import type { Knex } from 'knex';

/**
 * Angle gauges a coach placed on a clip's frames: three points (arm end, vertex, arm end) as frame
 * fractions, several per frame, each with the id the client gave it.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('angle_gauges', (t) => {
    t.integer('clip_id').notNullable().references('clips.id').onDelete('CASCADE');
    t.string('id', 40).notNullable();
    t.integer('frame').notNullable();
    t.double('ax').notNullable();
    t.double('ay').notNullable();
    t.double('vx').notNullable();
    t.double('vy').notNullable();
    t.double('bx').notNullable();
    t.double('by').notNullable();
    t.primary(['clip_id', 'id']);
    t.index(['clip_id', 'frame']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('angle_gauges');
}
