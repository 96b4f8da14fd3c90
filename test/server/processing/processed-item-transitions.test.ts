/**
 * Every move of a processed item (server/processing/processing.ts over its repository), one test
 * each, on the real `processed_items` table with a clock the test moves: enqueue, claim
 * (queued → running), progress, ready, a failed attempt with its reason and the retry after the
 * back-off, the last attempt (attempts exhausted → failed, and the kind's subject told so), a
 * permanent error, cancel while queued and while running, a graceful release, and a lost lease
 * (the worker stops heartbeating; another claims after the lease ran out; the stale worker's late
 * heartbeat, progress, result and failure are all refused — also when the new claim is by the same
 * process, since a lease is held per attempt).
 *
 * The expected states, attempts and reasons are the life cycle documented at the top of
 * `server/processing/processed-item.ts` and in DEVELOPERS.md ("processing/"), not this module's output.
 */
import type { Knex } from 'knex';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { createDb, migrate, type Db } from '../../../server/db/knex';
import { createProcessing, type Processing } from '../../../server/processing/processing';
import { interruptedReason, type ProcessedItem, type ProcessingKind, type SubjectChange } from '../../../server/processing/processed-item';
import type { ProcessedItemRow } from '../../../server/processing/processed-items-repository';
import { inProcessProgressChannel, type ProgressChannel, type ProgressNotice } from '../../../server/processing/progress-channel';

const LEASE_MS = 30_000;
const MAX_ATTEMPTS = 3;
const T0 = Date.parse('2026-12-01T09:00:00.000Z');
const iso = (ms: number) => new Date(ms).toISOString();

let db: Db;
let clockMs = T0;
const clock = () => new Date(clockMs);

interface Recorded {
  changes: { itemId: number; attempts: number; change: SubjectChange }[];
  /** The item's state as the subject was told each change. */
  itemStates: string[];
  ready: { itemId: number; result: unknown }[];
  /** Every notice published on the channel, whatever it is. */
  notices: ProgressNotice[];
}

/** A kind that records what its subject is told, inside the moving transaction. */
function recordingKind(rec: Recorded, name = 'test_render'): ProcessingKind<string> {
  return {
    name,
    subject: 'thing',
    athleteSees: true,
    run: () => Promise.resolve('done'),
    onReady: (_trx: Knex, item: ProcessedItem, result: string) => {
      rec.ready.push({ itemId: item.id, result });
      return Promise.resolve();
    },
    onChange: (_trx: Knex, item: ProcessedItem, change: SubjectChange) => {
      rec.changes.push({ itemId: item.id, attempts: item.attempts, change });
      rec.itemStates.push(item.state);
      return Promise.resolve();
    },
  };
}

/** One process's module (its own process tag), sharing the database and the test's clock. */
function processOf(rec: Recorded, opts: { maxAttempts?: number; kinds?: boolean } = {}): Processing {
  const inner = inProcessProgressChannel();
  const channel: ProgressChannel = {
    publish: (n) => rec.notices.push(n),
    subscribe: inner.subscribe,
    subscribeClinic: inner.subscribeClinic,
  };
  const p = createProcessing({ db, channel, leaseMs: LEASE_MS, maxAttempts: opts.maxAttempts ?? MAX_ATTEMPTS, clock });
  if (opts.kinds !== false) p.register(recordingKind(rec));
  return p;
}

const fresh = (): Recorded => ({ changes: [], itemStates: [], ready: [], notices: [] });
const row = (id: number) => db<ProcessedItemRow>('processed_items').where({ id }).first() as Promise<ProcessedItemRow>;
const SCOPE = { clinicId: 3, athleteId: 7 };
/** Lets the after-commit publish (a promise continuation) run. */
const settle = () => new Promise((r) => setImmediate(r));

beforeAll(async () => {
  db = createDb(':memory:');
  await migrate(db);
});
afterAll(async () => {
  await db?.destroy();
});
beforeEach(async () => {
  clockMs = T0;
  await db('processed_items').del();
});

describe('enqueue', () => {
  it('adds a queued item with no attempt used, due now, and tells its subject it is queued', async () => {
    const rec = fresh();
    const p = processOf(rec);
    let woken = 0;
    p.onEnqueued(() => woken++);
    const id = await p.enqueue(db, 'test_render', 41, SCOPE, { frame: 12 });
    const r = await row(id);
    expect(r).toMatchObject({
      kind: 'test_render',
      subject_type: 'thing',
      subject_id: 41,
      clinic_id: 3,
      athlete_id: 7,
      state: 'queued',
      attempts: 0,
      max_attempts: MAX_ATTEMPTS,
      run_after: iso(T0),
      touched_by: p.processTag,
      lease_until: null,
      claimed_by: null,
    });
    expect(JSON.parse(r.payload)).toEqual({ frame: 12 });
    expect(rec.changes).toEqual([{ itemId: id, attempts: 0, change: { state: 'queued' } }]);
    expect(rec.itemStates).toEqual(['queued']);
    expect(p.processTag).toMatch(/^[^:]+:\d+:[0-9a-f]{8}$/);
    expect(processOf(fresh()).processTag).not.toBe(p.processTag);
    await settle();
    expect(woken).toBe(1);
    expect(rec.notices.map((n) => [n.event.id, n.event.state, n.athleteSees])).toEqual([[41, 'queued', true]]);
  });

  it('inside a transaction: wakes workers and publishes only after commit, never after a rollback', async () => {
    const rec = fresh();
    const p = processOf(rec);
    let woken = 0;
    p.onEnqueued(() => woken++);
    await db
      .transaction(async (trx) => {
        await p.enqueue(trx, 'test_render', 42, SCOPE);
        await settle();
        expect(woken).toBe(0);
        throw new Error('caller failed');
      })
      .catch(() => undefined);
    await settle();
    expect(woken).toBe(0);
    expect(rec.notices).toEqual([]);
    expect(await db('processed_items').count({ n: '*' })).toEqual([{ n: 0 }]);
    await db.transaction((trx) => p.enqueue(trx, 'test_render', 43, SCOPE));
    await settle();
    expect(woken).toBe(1);
    expect(rec.notices.map((n) => n.event.id)).toEqual([43]);
  });

  it('refuses a kind nobody registered, and a kind registered twice', async () => {
    const p = processOf(fresh());
    await expect(p.enqueue(db, 'no_such_kind', 1, SCOPE)).rejects.toThrow('No processing kind "no_such_kind"');
    expect(() => p.register(recordingKind(fresh()))).toThrow('registered twice');
    expect(p.kind('test_render')?.subject).toBe('thing');
    expect(p.kind('no_such_kind')).toBeUndefined();
  });
});

describe('claim: queued → running', () => {
  it('takes the item, uses an attempt, leases it to this process for the lease length and tells the subject', async () => {
    const rec = fresh();
    const p = processOf(rec);
    const id = await p.enqueue(db, 'test_render', 50, SCOPE);
    clockMs = T0 + 1000;
    const item = await p.queue.claim();
    expect(item).toMatchObject({ id, state: 'running', attempts: 1, maxAttempts: MAX_ATTEMPTS, subjectId: 50, scope: SCOPE });
    expect(await row(id)).toMatchObject({
      state: 'running',
      attempts: 1,
      claimed_by: p.processTag,
      lease_until: iso(T0 + 1000 + LEASE_MS),
      updated_at: iso(T0 + 1000),
    });
    expect(rec.changes.at(-1)).toEqual({ itemId: id, attempts: 1, change: { state: 'running' } });
    expect(rec.notices.at(-1)?.event).toMatchObject({ id: 50, state: 'running', progress: null, error: null });
    expect(await p.queue.claim()).toBeNull(); // nothing else is due, and a live lease is not taken
  });

  it('takes the oldest due item first, and none before its run_after', async () => {
    const p = processOf(fresh());
    const a = await p.enqueue(db, 'test_render', 1, SCOPE);
    const b = await p.enqueue(db, 'test_render', 2, SCOPE);
    await db('processed_items')
      .where({ id: a })
      .update({ run_after: iso(T0 + 5000) });
    expect((await p.queue.claim())?.id).toBe(b);
    expect(await p.queue.claim()).toBeNull();
    clockMs = T0 + 5000; // due exactly now
    expect((await p.queue.claim())?.id).toBe(a);
  });
});

describe('running: progress, ready', () => {
  it('records progress on the row and publishes it while running', async () => {
    const rec = fresh();
    const p = processOf(rec);
    await p.enqueue(db, 'test_render', 60, SCOPE);
    const item = (await p.queue.claim())!;
    clockMs += 700;
    expect(await p.queue.progress(item, 12, 48)).toBe(true);
    expect(await row(item.id)).toMatchObject({ progress_done: 12, progress_total: 48, state: 'running', updated_at: iso(clockMs) });
    expect(rec.notices.at(-1)?.event).toMatchObject({ state: 'running', progress: { done: 12, total: 48 }, error: null });
    expect((await p.latest('thing', 60))?.progress).toEqual({ done: 12, total: 48 });
    expect((await p.unfinishedFor(7)).map((n) => n.event.progress)).toEqual([{ done: 12, total: 48 }]);
  });

  it('ready: the kind records the result in the same move, progress shows complete, lease gone', async () => {
    const rec = fresh();
    const p = processOf(rec);
    await p.enqueue(db, 'test_render', 61, SCOPE);
    const item = (await p.queue.claim())!;
    await p.queue.progress(item, 30, 48);
    expect(await p.queue.complete(item, 'still-61.png')).toBe(true);
    expect(await row(item.id)).toMatchObject({ state: 'ready', progress_done: 48, progress_total: 48, lease_until: null, error: null });
    expect(rec.ready).toEqual([{ itemId: item.id, result: 'still-61.png' }]);
    expect(rec.notices.at(-1)?.event).toMatchObject({ state: 'ready', progress: null, error: null });
    expect(await p.unfinishedFor(7)).toEqual([]);
    // Over: no more moves apply.
    expect(await p.queue.progress(item, 1, 2)).toBe(false);
    expect(await p.queue.complete(item, 'again')).toBe(false);
    expect(rec.ready).toHaveLength(1);
  });
});

describe('failed attempts, retry, last attempt', () => {
  it('a failed attempt with attempts left: queued again after the back-off, with its reason, subject told which attempt failed', async () => {
    const rec = fresh();
    const p = processOf(rec);
    await p.enqueue(db, 'test_render', 70, SCOPE);
    const item = (await p.queue.claim())!;
    expect(await p.queue.fail(item, 'ffmpeg exited with code 1', { permanent: false, retryInMs: 2000 })).toBe('retrying');
    expect(await row(item.id)).toMatchObject({
      state: 'queued',
      attempts: 1,
      error: 'ffmpeg exited with code 1',
      lease_until: null,
      claimed_by: null,
      run_after: iso(T0 + 2000),
    });
    expect(rec.changes.at(-1)).toEqual({
      itemId: item.id,
      attempts: 1,
      change: { state: 'queued', retry: { attempt: 1, reason: 'ffmpeg exited with code 1' } },
    });
    // Retry: not before the back-off, then the second attempt.
    clockMs = T0 + 1999;
    expect(await p.queue.claim()).toBeNull();
    clockMs = T0 + 2000;
    expect(await p.queue.claim()).toMatchObject({ id: item.id, attempts: 2, state: 'running' });
  });

  it('keeps at most 1000 characters of a reason', async () => {
    const rec = fresh();
    const p = processOf(rec, { maxAttempts: 1 });
    await p.enqueue(db, 'test_render', 71, SCOPE);
    const item = (await p.queue.claim())!;
    expect(await p.queue.fail(item, 'x'.repeat(1500), { permanent: false, retryInMs: 0 })).toBe('failed');
    expect((await row(item.id)).error).toHaveLength(1000);
    expect(rec.changes.at(-1)?.change).toEqual({ state: 'failed', reason: 'x'.repeat(1000) });
  });

  it('the last attempt failing: failed for good with its reason, the kind told (onFailed), no retry', async () => {
    const rec = fresh();
    const p = processOf(rec);
    await p.enqueue(db, 'test_render', 72, SCOPE);
    for (let attempt = 1; attempt <= MAX_ATTEMPTS; attempt++) {
      const item = (await p.queue.claim())!;
      expect(item.attempts).toBe(attempt);
      const outcome = await p.queue.fail(item, `attempt ${attempt} broke`, { permanent: false, retryInMs: 0 });
      // The second-to-last attempt still retries; only the third (= max) is the last.
      expect(outcome).toBe(attempt < MAX_ATTEMPTS ? 'retrying' : 'failed');
    }
    const r = await row((await p.latest('thing', 72))!.id);
    expect(r).toMatchObject({ state: 'failed', attempts: MAX_ATTEMPTS, error: 'attempt 3 broke', lease_until: null });
    expect(rec.changes.at(-1)).toMatchObject({ attempts: MAX_ATTEMPTS, change: { state: 'failed', reason: 'attempt 3 broke' } });
    expect(rec.changes.filter((c) => c.change.state === 'failed')).toHaveLength(1);
    expect(rec.notices.at(-1)?.event).toMatchObject({ state: 'failed', error: 'attempt 3 broke', progress: null });
    clockMs += 3_600_000;
    expect(await p.queue.claim()).toBeNull();
  });

  it('a permanent error fails at once, on the first attempt', async () => {
    const rec = fresh();
    const p = processOf(rec);
    await p.enqueue(db, 'test_render', 73, SCOPE);
    const item = (await p.queue.claim())!;
    expect(await p.queue.fail(item, 'not a video', { permanent: true, retryInMs: 0 })).toBe('failed');
    expect(await row(item.id)).toMatchObject({ state: 'failed', attempts: 1, error: 'not a video' });
    expect(rec.changes.at(-1)?.change).toEqual({ state: 'failed', reason: 'not a video' });
  });

  it('a worker that died in the last attempt: the next claim fails the item with the interrupted reason and looks further', async () => {
    const rec = fresh();
    const p = processOf(rec, { maxAttempts: 2 });
    const dead = await p.enqueue(db, 'test_render', 74, SCOPE);
    const next = await p.enqueue(db, 'test_render', 75, SCOPE);
    await db('processed_items')
      .where({ id: next })
      .update({ run_after: iso(T0 + 10 * LEASE_MS) });
    for (let attempt = 1; attempt <= 2; attempt++) {
      expect((await p.queue.claim())?.id).toBe(dead); // then the worker dies: no heartbeat, no result
      clockMs += LEASE_MS + 1;
    }
    clockMs = T0 + 10 * LEASE_MS;
    const claimed = await p.queue.claim();
    expect(claimed?.id).toBe(next);
    expect(await row(dead)).toMatchObject({ state: 'failed', attempts: 2, error: interruptedReason(2), lease_until: null });
    expect(rec.notices.filter((n) => n.event.id === 74).at(-1)?.event).toMatchObject({ state: 'failed', error: interruptedReason(2) });
    expect(rec.changes.find((c) => c.itemId === dead && c.change.state === 'failed')).toEqual({
      itemId: dead,
      attempts: 2,
      change: { state: 'failed', reason: interruptedReason(2) },
    });
  });

  it('the reason counts the interruptions in words a clinician reads (JOB_MAX_ATTEMPTS=1: "once", not "1 times")', () => {
    expect(interruptedReason(1)).toBe('Processing was interrupted once (the server stopped while working on it). Retry to try again.');
    expect(interruptedReason(3)).toMatch(/^Processing was interrupted 3 times \(/);
  });

  it('the last attempt interrupted after earlier attempts failed: fails with the last recorded reason', async () => {
    const rec = fresh();
    const p = processOf(rec, { maxAttempts: 2 });
    const id = await p.enqueue(db, 'test_render', 76, SCOPE);
    await p.queue.fail((await p.queue.claim())!, 'decoder ran out of memory', { permanent: false, retryInMs: 0 });
    await p.queue.claim(); // attempt 2, and the worker dies
    clockMs += LEASE_MS + 1;
    expect(await p.queue.claim()).toBeNull();
    expect(await row(id)).toMatchObject({ state: 'failed', attempts: 2, error: 'decoder ran out of memory' });
  });

  it('an item of a kind no process here knows fails at claim with a reason naming it', async () => {
    const rec = fresh();
    const p = processOf(rec);
    const id = await p.enqueue(db, 'test_render', 77, SCOPE);
    const other = processOf(fresh(), { kinds: false });
    expect(await other.queue.claim()).toBeNull();
    expect(await row(id)).toMatchObject({ state: 'failed', attempts: 0, error: 'Nothing here can make "test_render".' });
  });
});

describe('cancel', () => {
  it('a queued item: cancelled, listeners told its id, the change published, never claimed', async () => {
    const rec = fresh();
    const p = processOf(rec);
    const cancelledIds: number[][] = [];
    p.onCancelled((ids) => cancelledIds.push(ids));
    const id = await p.enqueue(db, 'test_render', 80, SCOPE);
    const other = await p.enqueue(db, 'test_render', 81, SCOPE);
    clockMs += 500;
    await p.cancel('thing', 80);
    expect(await row(id)).toMatchObject({ state: 'cancelled', error: null, lease_until: null, updated_at: iso(clockMs) });
    expect(cancelledIds).toEqual([[id]]);
    expect(rec.notices.at(-1)?.event).toMatchObject({ id: 80, state: 'cancelled' });
    expect((await p.queue.claim())?.id).toBe(other);
    expect(await p.queue.claim()).toBeNull();
    await p.cancel('thing', 80); // nothing left to cancel: no listener call
    expect(cancelledIds).toHaveLength(1);
  });

  it('a running item: cancelled; the worker’s heartbeat, progress, result and failure are refused', async () => {
    const rec = fresh();
    const p = processOf(rec);
    await p.enqueue(db, 'test_render', 82, SCOPE);
    const item = (await p.queue.claim())!;
    await p.cancel('thing', 82);
    expect(await p.queue.heartbeat(item)).toBe(false);
    expect(await p.queue.progress(item, 5, 10)).toBe(false);
    expect(await p.queue.complete(item, 'late')).toBe(false);
    expect(await p.queue.fail(item, 'aborted', { permanent: false, retryInMs: 0 })).toBe('gone');
    expect(await row(item.id)).toMatchObject({ state: 'cancelled', progress_done: null, error: null });
    expect(rec.ready).toEqual([]);
    expect(rec.changes.map((c) => c.change.state)).toEqual(['queued', 'running']);
  });
});

describe('release (the worker stops)', () => {
  it('an item not ready yet is handed back due after the delay asked for, the attempt unused, and not claimed before', async () => {
    const rec = fresh();
    const p = processOf(rec);
    await p.enqueue(db, 'test_render', 95, SCOPE);
    const item = (await p.queue.claim())!;
    await p.queue.release(item, 1500);
    expect(await row(item.id)).toMatchObject({ state: 'queued', attempts: 0, claimed_by: null, run_after: iso(clockMs + 1500) });
    expect(await p.queue.claim()).toBeNull();
    clockMs += 1500;
    expect(await p.queue.claim()).toMatchObject({ id: item.id, attempts: 1 });
  });

  it('hands the item back due now, without using the attempt', async () => {
    const rec = fresh();
    const p = processOf(rec);
    await p.enqueue(db, 'test_render', 90, SCOPE);
    const item = (await p.queue.claim())!;
    clockMs += 4000;
    await p.queue.release(item);
    expect(await row(item.id)).toMatchObject({
      state: 'queued',
      attempts: 0,
      lease_until: null,
      claimed_by: null,
      run_after: iso(clockMs),
    });
    expect(rec.changes.at(-1)).toEqual({ itemId: item.id, attempts: 1, change: { state: 'queued' } });
    expect(rec.notices.at(-1)?.event).toMatchObject({ id: 90, state: 'queued' });
    const again = (await p.queue.claim())!;
    expect(again).toMatchObject({ attempts: 1 });
    // After a failed attempt, a release gives back only the attempt in hand.
    await p.queue.fail(again, 'broke', { permanent: false, retryInMs: 0 });
    const second = (await p.queue.claim())!;
    expect(second.attempts).toBe(2);
    await p.queue.release(second);
    expect(await row(item.id)).toMatchObject({ state: 'queued', attempts: 1 });
  });
});

describe('a lost lease', () => {
  it('the heartbeat extends the lease while the worker lives', async () => {
    const p = processOf(fresh());
    await p.enqueue(db, 'test_render', 100, SCOPE);
    const item = (await p.queue.claim())!;
    clockMs += LEASE_MS - 1;
    expect(await p.queue.heartbeat(item)).toBe(true);
    expect((await row(item.id)).lease_until).toBe(iso(clockMs + LEASE_MS));
    clockMs += LEASE_MS - 1; // past the first lease, within the renewed one
    expect(await processOf(fresh()).queue.claim()).toBeNull();
  });

  it('another process claims after the lease ran out (not at its last instant); the stale worker is refused', async () => {
    const recA = fresh();
    const recB = fresh();
    const a = processOf(recA);
    const b = processOf(recB);
    await a.enqueue(db, 'test_render', 101, SCOPE);
    const stale = (await a.queue.claim())!; // then A stops heartbeating
    clockMs = T0 + LEASE_MS;
    expect(await b.queue.claim()).toBeNull(); // the lease still holds at its last instant
    clockMs = T0 + LEASE_MS + 1;
    const taken = (await b.queue.claim())!;
    expect(taken).toMatchObject({ id: stale.id, attempts: 2 });
    expect(await row(stale.id)).toMatchObject({ claimed_by: b.processTag, attempts: 2 });
    const seenA = { notices: recA.notices.length, changes: recA.changes.length };
    expect(await a.queue.heartbeat(stale)).toBe(false);
    expect(await a.queue.progress(stale, 40, 48)).toBe(false);
    expect(await a.queue.complete(stale, 'stale')).toBe(false);
    expect(await a.queue.fail(stale, 'stale failure', { permanent: true, retryInMs: 0 })).toBe('gone');
    await a.queue.release(stale);
    expect(await row(stale.id)).toMatchObject({
      state: 'running',
      claimed_by: b.processTag,
      attempts: 2,
      progress_done: null,
      error: null,
    });
    expect(recA.ready).toEqual([]);
    // Refused moves tell nobody anything.
    expect({ notices: recA.notices.length, changes: recA.changes.length }).toEqual(seenA);
    expect(await b.queue.complete(taken, 'fresh')).toBe(true);
    expect(recB.ready).toEqual([{ itemId: stale.id, result: 'fresh' }]);
  });

  it('taken over by another worker of the same process: the lease is per attempt, so the stale run is still refused', async () => {
    const rec = fresh();
    const p = processOf(rec);
    await p.enqueue(db, 'test_render', 102, SCOPE);
    const stale = (await p.queue.claim())!;
    clockMs = T0 + LEASE_MS + 1;
    const taken = (await p.queue.claim())!;
    expect(taken.attempts).toBe(2);
    expect(await p.queue.heartbeat(stale)).toBe(false);
    expect(await p.queue.progress(stale, 47, 48)).toBe(false);
    expect(await p.queue.complete(stale, 'stale')).toBe(false);
    expect(await p.queue.fail(stale, 'stale failure', { permanent: true, retryInMs: 0 })).toBe('gone');
    expect(await row(taken.id)).toMatchObject({ state: 'running', attempts: 2, progress_done: null, error: null });
    expect(rec.ready).toEqual([]);
    expect(await p.queue.progress(taken, 10, 48)).toBe(true);
    expect(await p.queue.complete(taken, 'fresh')).toBe(true);
    expect(rec.ready).toEqual([{ itemId: taken.id, result: 'fresh' }]);
  });
});

describe('notices', () => {
  it("carry progress only while running and the error only when failed; a row without an athlete goes to its clinic's staff, one without a clinic nowhere", async () => {
    const p = processOf(fresh());
    const base = {
      id: 1,
      kind: 'test_render',
      subject_type: 'thing',
      subject_id: 5,
      clinic_id: 3,
      athlete_id: 7,
      payload: '{}',
      attempts: 1,
      max_attempts: 3,
      lease_until: null,
      run_after: iso(T0),
      claimed_by: null,
      touched_by: null,
      progress_done: 2,
      progress_total: 4,
      error: 'old reason',
      created_at: iso(T0),
      updated_at: iso(T0),
    };
    expect(p.noticeOf({ ...base, state: 'running' })).toEqual({
      athleteId: 7,
      clinicId: 3,
      athleteSees: true,
      event: { subject: 'thing', id: 5, kind: 'test_render', state: 'running', progress: { done: 2, total: 4 }, error: null },
    });
    expect(p.noticeOf({ ...base, state: 'queued' })?.event).toMatchObject({ progress: null, error: null });
    expect(p.noticeOf({ ...base, state: 'failed' })?.event).toMatchObject({ progress: null, error: 'old reason' });
    expect(p.noticeOf({ ...base, state: 'running', kind: 'unknown' })?.athleteSees).toBe(false);
    expect(p.noticeOf({ ...base, state: 'running', athlete_id: null })).toMatchObject({ athleteId: null, clinicId: 3 });
    expect(p.noticeOf({ ...base, state: 'running', clinic_id: null })).toBeNull();
  });
});

describe('reading and listening', () => {
  it('latest and unfinished are per subject and per athlete; progress and notices name the right item', async () => {
    const rec = fresh();
    const p = processOf(rec);
    const mine = await p.enqueue(db, 'test_render', 110, SCOPE);
    const otherAthlete = await p.enqueue(db, 'test_render', 111, { clinicId: 3, athleteId: 8 });
    expect((await p.latest('thing', 110))?.id).toBe(mine);
    expect((await p.latest('thing', 111))?.id).toBe(otherAthlete);
    expect(await p.latest('other_subject', 110)).toBeNull();
    expect((await p.unfinishedFor(7)).map((n) => n.event.id)).toEqual([110]);
    const first = (await p.queue.claim())!;
    const second = (await p.queue.claim())!;
    expect([first.id, second.id]).toEqual([mine, otherAthlete]);
    await p.queue.progress(second, 3, 9);
    expect(rec.notices.at(-1)?.event).toMatchObject({ id: 111, progress: { done: 3, total: 9 } });
    expect(rec.notices.at(-1)?.athleteId).toBe(8);
  });

  it("an item with no athlete (the clinic's own) is published to the clinic on every move, never to an athlete", async () => {
    const rec = fresh();
    const p = processOf(rec);
    const id = await p.enqueue(db, 'test_render', 120, SCOPE);
    await settle();
    await db('processed_items').where({ id }).update({ athlete_id: null });
    const before = rec.notices.length;
    const item = (await p.queue.claim())!;
    await p.queue.progress(item, 1, 2);
    expect((await p.unfinishedForClinic(3)).map((n) => n.event.id)).toEqual([120]);
    await p.cancel('thing', 120);
    const after = rec.notices.slice(before);
    expect(after.map((n) => n.event.state)).toEqual(['running', 'running', 'cancelled']);
    expect(after.every((n) => n.athleteId === null && n.clinicId === 3)).toBe(true);
    expect(await p.unfinishedFor(7)).toEqual([]);
    expect(await p.unfinishedForClinic(3)).toEqual([]);
  });

  it('listeners stop hearing once they unsubscribe', async () => {
    const p = processOf(fresh());
    let woken = 0;
    const cancelled: number[][] = [];
    p.onEnqueued(() => woken++)();
    p.onCancelled((ids) => cancelled.push(ids))();
    await p.enqueue(db, 'test_render', 130, SCOPE);
    await p.cancel('thing', 130);
    await settle();
    expect(woken).toBe(0);
    expect(cancelled).toEqual([]);
  });

  it('without a clock given, times are the machine’s', async () => {
    const p = createProcessing({ db, channel: inProcessProgressChannel(), leaseMs: LEASE_MS, maxAttempts: 1 });
    p.register(recordingKind(fresh()));
    const before = new Date().toISOString();
    const id = await p.enqueue(db, 'test_render', 140, SCOPE);
    const after = new Date().toISOString();
    const r = await row(id);
    expect(r.run_after >= before && r.run_after <= after).toBe(true);
  });
});

describe('claims limited to kinds (a drawing worker apart)', () => {
  it('a worker limited to kinds never takes, nor fails, the others: queued or with a lease run out, they wait for their own worker', async () => {
    const rec = fresh();
    const web = processOf(rec);
    web.register(recordingKind(rec, 'test_draw'));
    const drawer = processOf(fresh(), { kinds: false });
    drawer.register(recordingKind(fresh()));
    drawer.register(recordingKind(fresh(), 'test_draw'));
    const draw = await web.enqueue(db, 'test_draw', 150, SCOPE);
    const other = await web.enqueue(db, 'test_render', 151, SCOPE);

    // The web worker takes every kind but the drawing one; the drawing item stays queued, untouched.
    const noDrawing = { except: ['test_draw'] };
    const taken = await web.queue.claim(noDrawing);
    expect(taken?.id).toBe(other);
    expect(await web.queue.claim(noDrawing)).toBeNull();
    expect(await web.queue.complete(taken!, 'done')).toBe(true);
    expect(await row(draw)).toMatchObject({ state: 'queued', attempts: 0, error: null, claimed_by: null });

    // The drawing worker takes only its kind; its item's lease runs out (the process died).
    const onlyDrawing = { only: ['test_draw'] };
    expect((await drawer.queue.claim(onlyDrawing))?.id).toBe(draw);
    clockMs += LEASE_MS + 1;
    // Not taken over by the web worker (which could not draw it), but by the next drawing worker.
    expect(await web.queue.claim(noDrawing)).toBeNull();
    expect(await row(draw)).toMatchObject({ state: 'running', attempts: 1, claimed_by: drawer.processTag });
    const next = processOf(fresh(), { kinds: false });
    next.register(recordingKind(fresh(), 'test_draw'));
    expect(await next.queue.claim(onlyDrawing)).toMatchObject({ id: draw, attempts: 2 });
    expect(await row(draw)).toMatchObject({ state: 'running', claimed_by: next.processTag });
  });
});
