import type { Knex } from 'knex';

/**
 * Processed items (server/processing/) replace the `jobs` queue: one row per piece of background
 * work about a subject (`subject_type` + `subject_id`), with its state, attempts, lease, progress
 * and the athlete it is shown to. `touched_by` names the process that last changed the row, so a
 * web process can relay what workers in other processes did. Existing jobs are carried over
 * (`done` → `ready`, a cancelled job → `cancelled`, kind `extract_clip` → `extract_frames`).
 */
const SUBJECT_TABLES: Record<string, string> = { clip: 'clips', still: 'stills', summary: 'visit_summaries' };
const KIND_NAMES: Record<string, string> = { extract_clip: 'extract_frames' };

interface JobRow {
  id: number;
  type: string;
  subject: string;
  payload: string;
  status: string;
  attempts: number;
  max_attempts: number;
  lease_until: string | null;
  run_after: string;
  error: string | null;
  created_at: string;
  updated_at: string;
}

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('processed_items', (t) => {
    t.increments('id');
    t.string('kind', 40).notNullable();
    t.string('subject_type', 20).notNullable();
    t.integer('subject_id').notNullable();
    t.integer('clinic_id');
    t.integer('athlete_id');
    t.text('payload').notNullable().defaultTo('{}');
    t.string('state', 10).notNullable();
    t.integer('attempts').notNullable().defaultTo(0);
    t.integer('max_attempts').notNullable().defaultTo(3);
    t.string('lease_until');
    t.string('run_after').notNullable();
    t.string('claimed_by', 100);
    t.string('touched_by', 100);
    t.integer('progress_done');
    t.integer('progress_total');
    t.string('error', 1000);
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.index(['state', 'run_after']);
    t.index(['subject_type', 'subject_id']);
    t.index(['updated_at']);
    t.index(['athlete_id', 'state']);
  });
  const jobs = (await knex('jobs').orderBy('id')) as JobRow[];
  for (const job of jobs) {
    const [type, id] = job.subject.split(':');
    const subjectId = Number(id);
    const table = SUBJECT_TABLES[type ?? ''];
    if (!table || !Number.isSafeInteger(subjectId)) continue;
    const owner = (await knex(table).where({ id: subjectId }).first('clinic_id', 'athlete_id')) as
      { clinic_id: number; athlete_id: number } | undefined;
    if (!owner) continue; // its subject is gone
    const cancelled = job.status === 'failed' && job.error === 'cancelled';
    await knex('processed_items').insert({
      id: job.id,
      kind: KIND_NAMES[job.type] ?? job.type,
      subject_type: type,
      subject_id: subjectId,
      clinic_id: owner.clinic_id,
      athlete_id: owner.athlete_id,
      payload: '{}',
      state: cancelled ? 'cancelled' : job.status === 'done' ? 'ready' : job.status,
      attempts: job.attempts,
      max_attempts: job.max_attempts,
      lease_until: job.lease_until,
      run_after: job.run_after,
      error: job.error,
      created_at: job.created_at,
      updated_at: job.updated_at,
    });
  }
  await knex.schema.dropTable('jobs');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.createTable('jobs', (t) => {
    t.increments('id');
    t.string('type', 40).notNullable();
    t.string('subject', 60).notNullable();
    t.text('payload').notNullable();
    t.string('status', 10).notNullable();
    t.integer('attempts').notNullable().defaultTo(0);
    t.integer('max_attempts').notNullable().defaultTo(3);
    t.string('lease_until');
    t.string('run_after').notNullable();
    t.string('error', 1000);
    t.string('created_at').notNullable();
    t.string('updated_at').notNullable();
    t.index(['status', 'run_after']);
    t.index(['subject']);
  });
  const idKey: Record<string, string> = { clip: 'clipId', still: 'stillId', summary: 'summaryId' };
  const typeOf: Record<string, string> = { extract_frames: 'extract_clip' };
  const items = await knex('processed_items').orderBy('id');
  for (const item of items) {
    await knex('jobs').insert({
      id: item.id,
      type: typeOf[item.kind] ?? item.kind,
      subject: `${item.subject_type}:${item.subject_id}`,
      payload: JSON.stringify({ [idKey[item.subject_type] ?? 'id']: item.subject_id }),
      status: item.state === 'ready' ? 'done' : item.state === 'cancelled' ? 'failed' : item.state,
      attempts: item.attempts,
      max_attempts: item.max_attempts,
      lease_until: item.lease_until,
      run_after: item.run_after,
      error: item.state === 'cancelled' ? 'cancelled' : item.error,
      created_at: item.created_at,
      updated_at: item.updated_at,
    });
  }
  await knex.schema.dropTable('processed_items');
}
