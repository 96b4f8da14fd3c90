import type { Knex } from 'knex';

/** One landmark point on one frame of one side, as a fraction of the frame (origin top-left). */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('clip_landmarks', (t) => {
    t.increments('id');
    t.integer('clip_id').notNullable().references('clips.id').onDelete('CASCADE');
    t.integer('frame').notNullable();
    t.string('side', 5).notNullable();
    t.string('landmark', 10).notNullable();
    t.double('x').notNullable();
    t.double('y').notNullable();
    // 'manual' today; 'tracked' when automatic tracking lands.
    t.string('source', 10).notNullable().defaultTo('manual');
    t.unique(['clip_id', 'frame', 'side', 'landmark']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('clip_landmarks');
}
