import type { Knex } from 'knex';

/** An uploaded side-view video of an assessment, and what processing learnt about it. */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('clips', (t) => {
    t.increments('id');
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.integer('athlete_id').notNullable().references('athletes.id').onDelete('CASCADE');
    t.integer('assessment_id').notNullable().references('assessments.id').onDelete('CASCADE');
    t.integer('uploaded_by').references('users.id').onDelete('SET NULL');
    t.string('original_name', 255).notNullable();
    t.string('stored_name', 40).notNullable();
    t.bigInteger('size_bytes').notNullable();
    t.string('container', 8).notNullable();
    t.string('status', 12).notNullable();
    t.integer('progress_done');
    t.integer('progress_total');
    t.string('error', 500);
    t.string('near_side', 5).notNullable().defaultTo('right');
    t.string('direction', 14).notNullable().defaultTo('left_to_right');
    t.double('capture_fps');
    t.double('fps');
    t.integer('width');
    t.integer('height');
    t.integer('frame_count');
    t.double('duration_s');
    t.integer('rotation');
    t.string('codec', 30);
    t.integer('thumb_count').notNullable().defaultTo(0);
    t.integer('thumb_every');
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.index(['assessment_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('clips');
}
