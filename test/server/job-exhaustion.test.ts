/**
 * A job that runs out of attempts leaves its subject (clip, still, visit summary) failed with a
 * reason, wherever that happens: at claim time after the last attempt's lease ran out (the server
 * was killed), when the last attempt throws, and on a permanent error. A graceful stop hands the
 * job back without using an attempt; a cancelled job (its subject deleted) fails nothing.
 * The app runs without its own worker here, so each test drives the queue itself.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pino from 'pino';
import { makeTestApp, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { EXTRACT_JOB } from '../../server/clips/clips-service';
import { RENDER_STILL_JOB } from '../../server/stills/stills-service';
import { RENDER_SUMMARY_JOB } from '../../server/summaries/summaries-service';
import { PermanentJobError, startWorker, type JobHandler } from '../../server/jobs/worker';
import type { Job } from '../../server/jobs/job-queue';

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
  const res = await staff.post(`/api/athletes/${adaId}/assessments`, {
    date: '2026-11-30',
    kind: 'baseline',
    surface: 'treadmill',
    speed: null,
    inclinePercent: null,
    shoes: null,
    cameraNotes: null,
    notes: null,
  });
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
      progress_done: 40,
      progress_total: 60,
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

/** A job whose worker died on its last attempt: running, every attempt used, lease run out. */
async function exhaustedJob(type: string, subject: string, payload: Record<string, unknown>): Promise<number> {
  const id = await t.queue.enqueue(t.db, type, subject, payload);
  const { max_attempts } = await t.db('jobs').where({ id }).first();
  await t
    .db('jobs')
    .where({ id })
    .update({ status: 'running', attempts: max_attempts, lease_until: new Date(Date.now() - 1000).toISOString() });
  return id;
}

describe('running out of attempts at claim time (the server was killed during the last attempt)', () => {
  it('leaves the clip failed with a reason, and Retry queues it again', async () => {
    const clipId = await insertClip();
    const jobId = await exhaustedJob(EXTRACT_JOB, `clip:${clipId}`, { clipId });
    expect(await t.queue.claim()).toBeNull();
    expect(await t.db('jobs').where({ id: jobId }).first()).toMatchObject({ status: 'failed' });
    const clip = (await staff.get(`/api/clips/${clipId}`)).body;
    expect(clip.status).toBe('failed');
    expect(clip.error).toMatch(/interrupted 3 times/);
    expect(clip.error).toMatch(/Retry/);
    const retry = await staff.post(`/api/clips/${clipId}/retry`);
    expect(retry.status, JSON.stringify(retry.body)).toBe(202);
    expect(retry.body).toMatchObject({ status: 'queued', error: null });
    expect(await t.db('jobs').where({ subject: `clip:${clipId}`, status: 'queued' })).toHaveLength(1);
    await t
      .db('jobs')
      .where({ subject: `clip:${clipId}` })
      .delete();
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
        progress: 0.3,
        render_version: 1,
        created_at: at(),
        updated_at: at(),
      })
      .returning('id');
    const stillId = (s as { id: number }).id;
    await exhaustedJob(RENDER_STILL_JOB, `still:${stillId}`, { stillId });
    expect(await t.queue.claim()).toBeNull();
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
        progress: 0.5,
        created_at: at(),
        updated_at: at(),
      })
      .returning('id');
    const summaryId = (s as { id: number }).id;
    await exhaustedJob(RENDER_SUMMARY_JOB, `summary:${summaryId}`, { summaryId });
    expect(await t.queue.claim()).toBeNull();
    const summary = (await staff.get(`/api/summaries/${summaryId}`)).body;
    expect(summary.status).toBe('failed');
    expect(summary.error).toMatch(/could not be made.*interrupted 3 times/);
  });

  it('goes on to hand out the next due job in the same claim', async () => {
    const dead = await insertClip();
    await exhaustedJob(EXTRACT_JOB, `clip:${dead}`, { clipId: dead });
    const next = await insertClip('queued');
    const nextJob = await t.queue.enqueue(t.db, EXTRACT_JOB, `clip:${next}`, { clipId: next });
    const job = await t.queue.claim();
    expect(job?.id).toBe(nextJob);
    expect((await t.db('clips').where({ id: dead }).first()).status).toBe('failed');
    await t.queue.complete(job!);
  });

  it('does not fail a clip that is ready already (its last attempt finished before the stop)', async () => {
    const clipId = await insertClip('ready');
    await exhaustedJob(EXTRACT_JOB, `clip:${clipId}`, { clipId });
    expect(await t.queue.claim()).toBeNull();
    expect(await t.db('clips').where({ id: clipId }).first()).toMatchObject({ status: 'ready', error: null });
  });
});

describe('running out of attempts in the worker', () => {
  const subjects: { subject: string; reason: string }[] = [];
  const notified: string[] = [];
  const TYPE = 'test_exhaustion';
  beforeAll(() => {
    t.queue.onFinalFailure(TYPE, {
      async fail(trx, job: Job, reason: string) {
        await trx('jobs').where({ id: job.id }).first(); // runs inside the queue's transaction
        subjects.push({ subject: job.subject, reason });
      },
      failed: (job) => notified.push(job.subject),
    });
  });

  async function run(handler: JobHandler, setup: (id: number) => Promise<void> = async () => undefined) {
    const id = await t.queue.enqueue(t.db, TYPE, `test:${Math.random()}`, {});
    await setup(id);
    const worker = startWorker({
      queue: t.queue,
      handlers: { [TYPE]: handler },
      logger: pino({ level: 'silent' }),
      concurrency: 1,
      pollMs: 50,
      leaseMs: 30_000,
    });
    await worker.idle();
    await worker.stop();
    return { id, row: await t.db('jobs').where({ id }).first() };
  }

  it('a last attempt that throws fails the subject with the error', async () => {
    const { id, row } = await run(
      async () => {
        throw new Error('ffmpeg exited with code 1');
      },
      (jobId) =>
        t
          .db('jobs')
          .where({ id: jobId })
          .update({ attempts: 2 })
          .then(() => undefined),
    );
    expect(row).toMatchObject({ status: 'failed', attempts: 3 });
    const job = await t.db('jobs').where({ id }).first();
    expect(subjects.find((s) => s.subject === job.subject)?.reason).toBe('ffmpeg exited with code 1');
    expect(notified).toContain(job.subject);
  });

  it('a permanent error on the first attempt fails the subject at once', async () => {
    const { id, row } = await run(async () => {
      throw new PermanentJobError('This file is not a video we can read.');
    });
    expect(row).toMatchObject({ status: 'failed', attempts: 1 });
    const job = await t.db('jobs').where({ id }).first();
    expect(subjects.find((s) => s.subject === job.subject)?.reason).toBe('This file is not a video we can read.');
  });

  it('an attempt that fails with attempts left queues the job again and fails nothing', async () => {
    const before = subjects.length;
    const { row } = await run(async () => {
      throw new Error('busy');
    });
    expect(row).toMatchObject({ status: 'queued', attempts: 1 });
    expect(subjects).toHaveLength(before);
    await t.db('jobs').where({ id: row.id }).delete();
  });

  /** A worker whose handler runs until aborted; resolves once the job has started. */
  async function workerOnBlockingJob(subject: string) {
    let started!: () => void;
    const running = new Promise<void>((r) => (started = r));
    const id = await t.queue.enqueue(t.db, TYPE, subject, {});
    const worker = startWorker({
      queue: t.queue,
      handlers: {
        [TYPE]: (_job, { signal }) =>
          new Promise((_resolve, reject) => {
            started();
            signal.addEventListener('abort', () => reject(new Error('aborted')));
          }),
      },
      logger: pino({ level: 'silent' }),
      concurrency: 1,
      pollMs: 50,
      leaseMs: 30_000,
    });
    await running;
    return { id, worker };
  }

  it('a graceful stop hands the running job back without using an attempt', async () => {
    const before = subjects.length;
    const { id, worker } = await workerOnBlockingJob('test:stop');
    await worker.stop();
    expect(await t.db('jobs').where({ id }).first()).toMatchObject({ status: 'queued', attempts: 0, lease_until: null });
    expect(subjects).toHaveLength(before);
    await t.db('jobs').where({ id }).delete();
  });

  it('a cancelled job (its subject is being deleted) fails nothing', async () => {
    const before = subjects.length;
    const { id, worker } = await workerOnBlockingJob('test:cancel');
    await t.queue.cancelSubject('test:cancel');
    worker.cancel('test:cancel');
    await worker.idle();
    await worker.stop();
    expect(await t.db('jobs').where({ id }).first()).toMatchObject({ status: 'failed', error: 'cancelled' });
    expect(subjects).toHaveLength(before);
  });
});
