/**
 * The worker loop (server/processing/worker.ts) against a scripted queue, with fake timers: how
 * many items it runs at once, what it hands the queue when a run ends (result, failure with the
 * documented back-off 2 s × 2^(attempt−1), permanent errors), lease renewal every third of the
 * lease (at least 250 ms) and what a refused heartbeat or progress write does (the run is aborted
 * and nothing is recorded for it), a cancelled item, a graceful stop (handed back, attempt
 * unused), progress throttling, the decoder threads shared among running items, and the call when
 * a burst of work is over (memory it held can go).
 */
import pino from 'pino';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { defaultConcurrency, startWorker, type Worker } from '../../../server/processing/worker';
import {
  NotReadyError,
  PermanentError,
  type ProcessedItem,
  type ProcessingKind,
  type RunContext,
} from '../../../server/processing/processed-item';
import type { Processing, ProcessingQueue } from '../../../server/processing/processing';

/** What the worker logged in the test (level, message and fields). */
let logs: Record<string, unknown>[] = [];
const logger = pino({ level: 'info' }, { write: (line: string) => void logs.push(JSON.parse(line) as Record<string, unknown>) });

function itemOf(id: number, attempts = 1): ProcessedItem {
  return {
    id,
    kind: 'k',
    subjectType: 'thing',
    subjectId: id,
    scope: { clinicId: 1, athleteId: 1 },
    payload: {},
    state: 'running',
    attempts,
    maxAttempts: 3,
    progress: null,
    error: null,
  };
}

interface Run {
  item: ProcessedItem;
  ctx: RunContext;
  resolve: (v: string) => void;
  reject: (e: Error) => void;
}

/** A queue that hands out `items` in order and records every call; a kind whose runs the test ends. */
function scripted(items: ProcessedItem[]) {
  const calls: string[] = [];
  const runs: Run[] = [];
  let ours = true;
  let progressOurs = true;
  const broken = { claim: false, heartbeat: false, progress: false };
  /** While set, progress writes wait for the test to let them through. */
  let holdProgress: Promise<void> | null = null;
  const cancelListeners: ((ids: number[]) => void)[] = [];
  const enqueueListeners: (() => void)[] = [];
  const queue: ProcessingQueue = {
    claim: vi.fn(() => (broken.claim ? Promise.reject(new Error('database is locked')) : Promise.resolve(items.shift() ?? null))),
    heartbeat: vi.fn((item: ProcessedItem) => {
      calls.push(`heartbeat ${item.id}`);
      return broken.heartbeat ? Promise.reject(new Error('disk I/O error')) : Promise.resolve(ours);
    }),
    progress: vi.fn(async (item: ProcessedItem, done: number, total: number) => {
      calls.push(`progress ${item.id} ${done}/${total}`);
      if (holdProgress) await holdProgress;
      if (broken.progress) throw new Error('disk full');
      return progressOurs;
    }),
    complete: vi.fn((item: ProcessedItem, result: unknown) => {
      calls.push(`complete ${item.id} ${String(result)}`);
      return Promise.resolve(true);
    }),
    fail: vi.fn((item: ProcessedItem, error: string, opts: { permanent: boolean; retryInMs: number }) => {
      calls.push(`fail ${item.id} ${error} permanent=${opts.permanent} retryInMs=${opts.retryInMs}`);
      return Promise.resolve('retrying' as const);
    }),
    release: vi.fn((item: ProcessedItem, afterMs?: number) => {
      calls.push(afterMs === undefined ? `release ${item.id}` : `release ${item.id} after ${afterMs}`);
      return Promise.resolve();
    }),
  };
  const kind: ProcessingKind<string> = {
    name: 'k',
    subject: 'thing',
    athleteSees: false,
    run: (item, ctx) =>
      new Promise<string>((resolve, reject) => {
        runs.push({ item, ctx, resolve, reject });
        started.push(runs[runs.length - 1]);
      }),
    onReady: () => Promise.resolve(),
    onChange: () => Promise.resolve(),
  };
  const processing = {
    queue,
    kind: (name: string) => (name === 'k' ? kind : undefined),
    onEnqueued: (l: () => void) => {
      enqueueListeners.push(l);
      return () => undefined;
    },
    onCancelled: (l: (ids: number[]) => void) => {
      cancelListeners.push(l);
      return () => undefined;
    },
  } as unknown as Processing;
  return {
    processing,
    queue,
    calls,
    runs,
    cancel: (ids: number[]) => cancelListeners.forEach((l) => l(ids)),
    enqueued: () => enqueueListeners.forEach((l) => l()),
    hold: () => {
      let release = () => undefined as void;
      holdProgress = new Promise<void>((r) => (release = r));
      return () => {
        holdProgress = null;
        release();
      };
    },
    broken,
    loseLease: () => (ours = false),
    loseProgress: () => (progressOurs = false),
  };
}

let worker: Worker | undefined;
/** Every run started in the test: ended on stop, as a kind's run ends when its signal aborts. */
let started: Run[] = [];
beforeEach(() => {
  logs = [];
  vi.useFakeTimers();
});
afterEach(async () => {
  const w = worker;
  worker = undefined;
  if (w) {
    const stopping = w.stop();
    for (const r of started) r.reject(new Error('aborted'));
    started = [];
    await vi.runOnlyPendingTimersAsync();
    await stopping;
  }
  vi.useRealTimers();
  // The loop itself never breaks: no error-level line unless a test asked for one.
  expect(logs.filter((l) => (l['level'] as number) >= 50 && l['msg'] !== 'worker could not claim an item')).toEqual([]);
});

const tick = (ms = 0) => vi.advanceTimersByTimeAsync(ms);

describe('defaultConcurrency', () => {
  it('one item per core, at least one, at most four', () => {
    expect([0, 1, 2, 3, 4, 5, 16].map((c) => defaultConcurrency(c))).toEqual([1, 1, 2, 3, 4, 4, 4]);
  });
});

describe('the worker loop', () => {
  it('runs at most `concurrency` items at once, sharing the cores among them, and claims the next when one ends', async () => {
    const s = scripted([itemOf(1), itemOf(2), itemOf(3)]);
    worker = startWorker({ processing: s.processing, logger, concurrency: 2, pollMs: 1000, leaseMs: 30_000, cores: 4 });
    await tick();
    expect(s.runs.map((r) => r.item.id)).toEqual([1, 2]);
    // The first item started alone (4 cores), the second beside it (4 ÷ 2 running... counted when it starts).
    expect(s.runs[0].ctx.threads).toBe(4);
    expect(s.runs[1].ctx.threads).toBe(2);
    s.runs[0].resolve('one');
    await tick();
    expect(s.calls).toContain('complete 1 one');
    expect(s.runs.map((r) => r.item.id)).toEqual([1, 2, 3]);
    expect(s.runs[2].ctx.threads).toBe(2);
  });

  it('a failed attempt goes to the queue with its message and the back-off 2 s × 2^(attempt − 1)', async () => {
    const s = scripted([itemOf(1, 1), itemOf(2, 3)]);
    worker = startWorker({ processing: s.processing, logger, concurrency: 2, pollMs: 1000, leaseMs: 30_000, cores: 2 });
    await tick();
    s.runs[0].reject(new Error('decoder crashed'));
    s.runs[1].reject(new Error('decoder crashed again'));
    await tick();
    expect(s.calls).toContain('fail 1 decoder crashed permanent=false retryInMs=2000');
    expect(s.calls).toContain('fail 2 decoder crashed again permanent=false retryInMs=8000');
    expect(logs).toContainEqual(
      expect.objectContaining({ msg: 'processing failed', itemId: 1, kind: 'k', attempt: 1, outcome: 'retrying', err: 'decoder crashed' }),
    );
  });

  it('a permanent error is passed on as permanent', async () => {
    const s = scripted([itemOf(1)]);
    worker = startWorker({ processing: s.processing, logger, concurrency: 1, pollMs: 1000, leaseMs: 30_000, cores: 1 });
    await tick();
    s.runs[0].reject(new PermanentError('not a video'));
    await tick();
    expect(s.calls).toContain('fail 1 not a video permanent=true retryInMs=2000');
  });

  it('an item whose inputs are not ready goes back to the queue after its delay with the attempt unused, no failure recorded', async () => {
    const s = scripted([itemOf(1, 3)]);
    worker = startWorker({ processing: s.processing, logger, concurrency: 1, pollMs: 1000, leaseMs: 30_000, cores: 1 });
    await tick();
    s.runs[0].reject(new NotReadyError('frames not extracted yet', 1500));
    await tick();
    expect(s.calls).toContain('release 1 after 1500');
    expect(s.calls.filter((c) => c.startsWith('fail'))).toEqual([]);
  });

  it('renews the lease every third of it; a refused heartbeat (taken over) aborts the run and records nothing for it', async () => {
    const s = scripted([itemOf(1)]);
    worker = startWorker({ processing: s.processing, logger, concurrency: 1, pollMs: 60_000, leaseMs: 30_000, cores: 1 });
    await tick();
    await tick(9_999);
    expect(s.calls.filter((c) => c.startsWith('heartbeat'))).toEqual([]);
    await tick(1);
    expect(s.calls.filter((c) => c.startsWith('heartbeat'))).toEqual(['heartbeat 1']);
    await tick(10_000);
    expect(s.calls.filter((c) => c.startsWith('heartbeat'))).toHaveLength(2);
    expect(s.runs[0].ctx.signal.aborted).toBe(false);
    s.loseLease();
    await tick(10_000);
    expect(s.runs[0].ctx.signal.aborted).toBe(true);
    s.runs[0].resolve('late result');
    await tick();
    expect(s.calls.filter((c) => !c.startsWith('heartbeat'))).toEqual([]);
    await tick(10_000);
    expect(s.calls.filter((c) => c.startsWith('heartbeat'))).toHaveLength(3); // stopped beating once the run ended
  });

  it('renews a short lease no more often than every 250 ms', async () => {
    const s = scripted([itemOf(1)]);
    worker = startWorker({ processing: s.processing, logger, concurrency: 1, pollMs: 60_000, leaseMs: 300, cores: 1 });
    await tick();
    await tick(249);
    expect(s.calls).toEqual([]);
    await tick(1);
    expect(s.calls).toEqual(['heartbeat 1']);
  });

  it('a cancelled item is aborted; its end records nothing (the row says cancelled already)', async () => {
    const s = scripted([itemOf(1)]);
    worker = startWorker({ processing: s.processing, logger, concurrency: 1, pollMs: 60_000, leaseMs: 30_000, cores: 1 });
    await tick();
    s.cancel([1]);
    expect(s.runs[0].ctx.signal.aborted).toBe(true);
    s.runs[0].reject(new Error('aborted by signal'));
    await tick();
    expect(s.calls).toEqual([]);
  });

  it('stop aborts what runs and hands it back without using an attempt', async () => {
    const s = scripted([itemOf(1), itemOf(2)]);
    const w = startWorker({ processing: s.processing, logger, concurrency: 1, pollMs: 60_000, leaseMs: 30_000, cores: 1 });
    await tick();
    const stopping = w.stop();
    let stopped = false;
    void stopping.then(() => (stopped = true));
    expect(s.runs[0].ctx.signal.aborted).toBe(true);
    await tick();
    expect(stopped).toBe(false); // waits for what runs to end
    s.runs[0].reject(new Error('aborted'));
    await tick();
    await stopping;
    expect(s.calls).toEqual(['release 1']);
    expect(logs).toContainEqual(expect.objectContaining({ msg: 'processing interrupted', itemId: 1, kind: 'k', stopping: true }));
    await tick(120_000);
    expect(s.runs).toHaveLength(1); // claims nothing more
  });

  it('writes progress at once when work first becomes usable, then at most every progressEveryMs, and always the end', async () => {
    const s = scripted([itemOf(1)]);
    worker = startWorker({
      processing: s.processing,
      logger,
      concurrency: 1,
      pollMs: 60_000,
      leaseMs: 30_000,
      cores: 1,
      progressEveryMs: 200,
    });
    await tick();
    const { progress } = s.runs[0].ctx;
    progress(0, 100);
    await tick();
    expect(s.calls).toEqual(['progress 1 0/100']); // the very first call writes (nothing written before)
    progress(1, 100);
    await tick();
    expect(s.calls.at(-1)).toBe('progress 1 1/100'); // first usable work: at once
    progress(2, 100);
    await tick(100);
    expect(s.calls.at(-1)).toBe('progress 1 1/100');
    await tick(100);
    progress(3, 100);
    await tick();
    expect(s.calls.at(-1)).toBe('progress 1 3/100');
    progress(100, 100);
    await tick();
    expect(s.calls.at(-1)).toBe('progress 1 100/100');
    expect(s.runs[0].ctx.signal.aborted).toBe(false); // every write was accepted
  });

  it('a progress call while a write is under way is written right after it, the newest only', async () => {
    const s = scripted([itemOf(1)]);
    worker = startWorker({ processing: s.processing, logger, concurrency: 1, pollMs: 60_000, leaseMs: 30_000, cores: 1 });
    await tick();
    const { progress } = s.runs[0].ctx;
    const letThrough = s.hold();
    progress(1, 100);
    await tick(300);
    progress(50, 100);
    progress(60, 100);
    await tick();
    expect(s.calls).toEqual(['progress 1 1/100']);
    letThrough();
    await tick();
    expect(s.calls).toEqual(['progress 1 1/100', 'progress 1 60/100']);
  });

  it('an enqueued item is looked for at once, not at the next poll; cancelling an item not running here is harmless', async () => {
    const items: ProcessedItem[] = [];
    const s = scripted(items);
    worker = startWorker({ processing: s.processing, logger, concurrency: 1, pollMs: 60_000, leaseMs: 30_000, cores: 1 });
    await tick();
    items.push(itemOf(4));
    s.enqueued();
    await tick();
    expect(s.runs.map((r) => r.item.id)).toEqual([4]);
    expect(() => s.cancel([99])).not.toThrow();
    s.runs[0].resolve('r');
    await tick();
    items.push(itemOf(5));
    worker.wake();
    await tick();
    expect(s.runs.map((r) => r.item.id)).toEqual([4, 5]);
    expect(s.runs[0].ctx.signal.aborted).toBe(false);
  });

  it('a progress write refused (no longer ours) aborts the run', async () => {
    const s = scripted([itemOf(1)]);
    worker = startWorker({ processing: s.processing, logger, concurrency: 1, pollMs: 60_000, leaseMs: 30_000, cores: 1 });
    await tick();
    s.loseProgress();
    s.runs[0].ctx.progress(5, 10);
    await tick();
    expect(s.runs[0].ctx.signal.aborted).toBe(true);
  });

  it('idle resolves once nothing runs and nothing is due', async () => {
    const s = scripted([itemOf(1)]);
    worker = startWorker({ processing: s.processing, logger, concurrency: 1, pollMs: 60_000, leaseMs: 30_000, cores: 1 });
    await tick();
    let idle = false;
    void worker.idle().then(() => (idle = true));
    await tick();
    expect(idle).toBe(false);
    s.runs[0].resolve('r');
    await tick();
    expect(idle).toBe(true);
    let again = false;
    void worker.idle().then(() => (again = true));
    await tick();
    expect(again).toBe(true);
  });

  it('onIdle is called once when a burst of items is over, never while one runs, and not on polls that found nothing', async () => {
    const s = scripted([itemOf(1), itemOf(2)]);
    const onIdle = vi.fn();
    worker = startWorker({ processing: s.processing, logger, concurrency: 2, pollMs: 1000, leaseMs: 30_000, cores: 2, onIdle });
    await tick();
    s.runs[0].resolve('one');
    await tick();
    expect(onIdle).not.toHaveBeenCalled();
    s.runs[1].resolve('two');
    await tick();
    expect(onIdle).toHaveBeenCalledTimes(1);
    await tick(5000);
    expect(onIdle).toHaveBeenCalledTimes(1);
  });

  it('a failing lease renewal, progress write or claim is logged and the loop goes on', async () => {
    const items = [itemOf(1)];
    const s = scripted(items);
    worker = startWorker({ processing: s.processing, logger, concurrency: 2, pollMs: 1000, leaseMs: 30_000, cores: 1 });
    await tick();
    s.broken.heartbeat = true;
    s.broken.progress = true;
    await tick(10_000);
    s.runs[0].ctx.progress(1, 10);
    await tick();
    expect(logs).toContainEqual(expect.objectContaining({ msg: 'lease not renewed', itemId: 1, err: 'disk I/O error' }));
    expect(logs).toContainEqual(expect.objectContaining({ msg: 'progress not recorded', itemId: 1, err: 'disk full' }));
    expect(s.runs[0].ctx.signal.aborted).toBe(false);
    s.broken.claim = true;
    await tick(1000);
    expect(logs).toContainEqual(expect.objectContaining({ msg: 'worker could not claim an item', err: 'database is locked' }));
    s.broken.claim = false;
    items.push(itemOf(2));
    await tick(1000);
    expect(s.runs.map((r) => r.item.id)).toEqual([1, 2]);
  });
});
