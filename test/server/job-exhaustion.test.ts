/**
 * A processed item that runs out of attempts leaves its subject (clip, still, visit summary) failed
 * with a reason, wherever that happens: at claim time after the last attempt's lease ran out (the
 * server was killed), when the last attempt throws, and on a permanent error. A graceful stop
 * hands the item back without using an attempt; a cancelled item (its subject deleted) fails
 * nothing. The app runs without its own worker here, so each test drives the queue itself.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pino from 'pino';
import { makeTestApp, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { EXTRACT_FRAMES } from '../../server/clips/extract-frames-kind';
import { RENDER_STILL } from '../../server/stills/render-still-kind';
import { RENDER_SUMMARY } from '../../server/summaries/render-summary-kind';
import { startWorker } from '../../server/processing/worker';
import { PermanentError, type ProcessedItem, type RunContext } from '../../server/processing/processed-item';
import type { ProgressNotice } from '../../server/processing/progress-channel';
import { baselineVisit } from '../support/bodies';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let staff: Client;
let clinicId: number;
let adaId: number;
let assessmentId: number;
const at = () => new Date().toISOString();

beforeAll(async () => {
  t = await makeTestApp({ runWorker: false });
  staff = await signedIn(t.app, coach.email, coach.password);
  const ada = await t.db('athletes').where({ email: athlete.email }).first();
  adaId = ada.id;
  clinicId = ada.clinic_id;
  const res = await staff.post(`/api/athletes/${adaId}/assessments`, baselineVisit());
  assessmentId = res.body.id;
});
afterAll(async () => {
  await t?.close();
});

async function insertClip(status = 'extracting'): Promise<number> {
  const [row] = await t
    .db('clips')
    .insert({
      clinic_id: clinicId,
      athlete_id: adaId,
      assessment_id: assessmentId,
      uploaded_by: null,
      original_name: 'side.mp4',
      stored_name: 'original.mp4',
      size_bytes: 1000,
      container: 'mp4',
      status,
      error: null,
      near_side: 'right',
      direction: 'left_to_right',
      capture_fps: null,
      fps: 30,
      width: 320,
      height: 180,
      frame_count: 60,
      duration_s: 2,
      rotation: 0,
      codec: 'h264',
      thumb_count: 0,
      thumb_every: null,
      created_at: at(),
      updated_at: at(),
    })
    .returning('id');
  return (row as { id: number }).id;
}

const scope = () => ({ clinicId, athleteId: adaId });

/** An item whose worker died on its last attempt: running, every attempt used, lease run out. */
async function exhaustedItem(kind: string, subjectId: number): Promise<number> {
  const id = await t.processing.enqueue(t.db, kind, subjectId, scope());
  const { max_attempts } = await t.db('processed_items').where({ id }).first();
  await t
    .db('processed_items')
    .where({ id })
    .update({ state: 'running', attempts: max_attempts, lease_until: new Date(Date.now() - 1000).toISOString() });
  return id;
}

describe('running out of attempts at claim time (the server was killed during the last attempt)', () => {
  it('leaves the clip failed with a reason, and Retry queues it again', async () => {
    const clipId = await insertClip();
    const itemId = await exhaustedItem(EXTRACT_FRAMES, clipId);
    expect(await t.processing.queue.claim()).toBeNull();
    expect(await t.db('processed_items').where({ id: itemId }).first()).toMatchObject({ state: 'failed', attempts: 3 });
    const clip = (await staff.get(`/api/clips/${clipId}`)).body;
    expect(clip.status).toBe('failed');
    expect(clip.error).toMatch(/interrupted 3 times/);
    expect(clip.error).toMatch(/Retry/);
    const retry = await staff.post(`/api/clips/${clipId}/retry`);
    expect(retry.status, JSON.stringify(retry.body)).toBe(202);
    expect(retry.body).toMatchObject({ status: 'queued', error: null });
    expect(await t.db('processed_items').where({ subject_type: 'clip', subject_id: clipId, state: 'queued' })).toHaveLength(1);
    await t.db('processed_items').where({ subject_type: 'clip', subject_id: clipId }).delete();
  });

  it('leaves a still failed with a reason', async () => {
    const clipId = await insertClip('ready');
    const [s] = await t
      .db('stills')
      .insert({
        clinic_id: clinicId,
        athlete_id: adaId,
        assessment_id: assessmentId,
        clip_id: clipId,
        kind: 'frame',
        panels: '[]',
        caption: '',
        show_angles: true,
        status: 'rendering',
        render_version: 1,
        created_at: at(),
        updated_at: at(),
      })
      .returning('id');
    const stillId = (s as { id: number }).id;
    await exhaustedItem(RENDER_STILL, stillId);
    expect(await t.processing.queue.claim()).toBeNull();
    const still = (await staff.get(`/api/stills/${stillId}`)).body;
    expect(still.status).toBe('failed');
    expect(still.error).toMatch(/could not be rendered.*interrupted 3 times/);
  });

  it('leaves a visit summary failed with a reason', async () => {
    const [s] = await t
      .db('visit_summaries')
      .insert({
        clinic_id: clinicId,
        athlete_id: adaId,
        assessment_id: assessmentId,
        title: 'Visit summary',
        findings: '',
        plan_text: '',
        still_ids: '[]',
        status: 'rendering',
        created_at: at(),
        updated_at: at(),
      })
      .returning('id');
    const summaryId = (s as { id: number }).id;
    await exhaustedItem(RENDER_SUMMARY, summaryId);
    expect(await t.processing.queue.claim()).toBeNull();
    const summary = (await staff.get(`/api/summaries/${summaryId}`)).body;
    expect(summary.status).toBe('failed');
    expect(summary.error).toMatch(/could not be made.*interrupted 3 times/);
  });

  it('goes on to hand out the next due item in the same claim', async () => {
    const dead = await insertClip();
    await exhaustedItem(EXTRACT_FRAMES, dead);
    const next = await insertClip('queued');
    const nextItem = await t.processing.enqueue(t.db, EXTRACT_FRAMES, next, scope());
    const item = await t.processing.queue.claim();
    expect(item?.id).toBe(nextItem);
    expect((await t.db('clips').where({ id: dead }).first()).status).toBe('failed');
    expect((await t.db('clips').where({ id: next }).first()).status).toBe('extracting');
    await t.processing.queue.complete(item!, null);
  });

  it('does not fail a clip that is ready already (its last attempt finished before the stop)', async () => {
    const clipId = await insertClip('ready');
    await exhaustedItem(EXTRACT_FRAMES, clipId);
    expect(await t.processing.queue.claim()).toBeNull();
    expect(await t.db('clips').where({ id: clipId }).first()).toMatchObject({ status: 'ready', error: null });
  });
});

describe('running out of attempts in the worker', () => {
  const subjects: { subject: number; reason: string }[] = [];
  const notified: ProgressNotice[] = [];
  const KIND = 'test_exhaustion';
  let handler: (item: ProcessedItem, ctx: RunContext) => Promise<void> = async () => undefined;
  let nextSubject = 1;
  beforeAll(() => {
    t.processing.register({
      name: KIND,
      subject: 'test',
      athleteSees: false,
      run: (item, ctx) => handler(item, ctx),
      onReady: async () => undefined,
      async onChange(trx, item, change) {
        await trx('processed_items').where({ id: item.id }).first(); // runs inside the module's transaction
        if (change.state === 'failed') subjects.push({ subject: item.subjectId, reason: change.reason });
      },
    });
    t.processing.channel.subscribe(adaId, (n) => notified.push(n));
  });

  async function run(fn: typeof handler, setup: (id: number) => Promise<void> = async () => undefined) {
    handler = fn;
    const subject = nextSubject++;
    const id = await t.processing.enqueue(t.db, KIND, subject, scope());
    await setup(id);
    const worker = startWorker({
      processing: t.processing,
      logger: pino({ level: 'silent' }),
      concurrency: 1,
      pollMs: 50,
      leaseMs: 30_000,
    });
    await worker.idle();
    await worker.stop();
    return { id, subject, row: await t.db('processed_items').where({ id }).first() };
  }

  it('a last attempt that throws fails the subject with the error', async () => {
    const { subject, row } = await run(
      async () => {
        throw new Error('ffmpeg exited with code 1');
      },
      (itemId) =>
        t
          .db('processed_items')
          .where({ id: itemId })
          .update({ attempts: 2 })
          .then(() => undefined),
    );
    expect(row).toMatchObject({ state: 'failed', attempts: 3, error: 'ffmpeg exited with code 1' });
    expect(subjects.find((s) => s.subject === subject)?.reason).toBe('ffmpeg exited with code 1');
    // Told on the one progress channel, after commit.
    expect(notified.find((n) => n.event.id === subject && n.event.state === 'failed')?.event.error).toBe('ffmpeg exited with code 1');
  });

  it('a permanent error on the first attempt fails the subject at once', async () => {
    const { subject, row } = await run(async () => {
      throw new PermanentError('This file is not a video we can read.');
    });
    expect(row).toMatchObject({ state: 'failed', attempts: 1 });
    expect(subjects.find((s) => s.subject === subject)?.reason).toBe('This file is not a video we can read.');
  });

  it('an attempt that fails with attempts left queues the item again and fails nothing', async () => {
    const before = subjects.length;
    const { row } = await run(async () => {
      throw new Error('busy');
    });
    expect(row).toMatchObject({ state: 'queued', attempts: 1, claimed_by: null });
    expect(subjects).toHaveLength(before);
    await t.db('processed_items').where({ id: row.id }).delete();
  });

  it('progress reaches the channel while the item runs, and the item ends ready', async () => {
    const { subject, row } = await run(async (_item, ctx) => {
      ctx.progress(1, 4);
      await new Promise((r) => setTimeout(r, 50));
      ctx.progress(4, 4);
      await new Promise((r) => setTimeout(r, 50));
    });
    expect(row).toMatchObject({ state: 'ready', progress_done: 4, progress_total: 4 });
    const states = notified.filter((n) => n.event.id === subject).map((n) => n.event);
    expect(states[0]).toMatchObject({ state: 'queued' });
    expect(states.some((e) => e.state === 'running' && e.progress?.done === 1)).toBe(true);
    expect(states.at(-1)).toMatchObject({ state: 'ready', progress: null });
  });

  /** A worker whose item runs until aborted; resolves once the item has started. */
  async function workerOnBlockingItem() {
    let started!: () => void;
    const running = new Promise<void>((r) => (started = r));
    handler = (_item, { signal }) =>
      new Promise((_resolve, reject) => {
        started();
        signal.addEventListener('abort', () => reject(new Error('aborted')));
      });
    const subject = nextSubject++;
    const id = await t.processing.enqueue(t.db, KIND, subject, scope());
    const worker = startWorker({
      processing: t.processing,
      logger: pino({ level: 'silent' }),
      concurrency: 1,
      pollMs: 50,
      leaseMs: 30_000,
    });
    await running;
    return { id, subject, worker };
  }

  it('a graceful stop hands the running item back without using an attempt', async () => {
    const before = subjects.length;
    const { id, worker } = await workerOnBlockingItem();
    await worker.stop();
    expect(await t.db('processed_items').where({ id }).first()).toMatchObject({ state: 'queued', attempts: 0, lease_until: null });
    expect(subjects).toHaveLength(before);
    await t.db('processed_items').where({ id }).delete();
  });

  it('a cancelled item (its subject is being deleted) is aborted and fails nothing', async () => {
    const before = subjects.length;
    const { id, subject, worker } = await workerOnBlockingItem();
    await t.processing.cancel('test', subject);
    await worker.idle();
    await worker.stop();
    expect(await t.db('processed_items').where({ id }).first()).toMatchObject({ state: 'cancelled', error: null });
    expect(subjects).toHaveLength(before);
  });
});
