import os from 'node:os';
import type { Logger } from 'pino';
import { NotReadyError, PermanentError, type ProcessedItem, type RunContext } from './processed-item';
import type { Processing } from './processing';
import type { KindFilter } from './processed-items-repository';

/** Runs processed items: in the web process (`npm start`) or in its own (`npm run worker`, server/worker.ts). */
export interface Worker {
  /** Looks for work now instead of at the next poll. */
  wake(): void;
  /** Stops claiming; running items are aborted and handed back without using an attempt. */
  stop(): Promise<void>;
  /** Resolves when nothing is running and nothing is due (tests). */
  idle(): Promise<void>;
}

export interface WorkerOptions {
  processing: Processing;
  logger: Logger;
  /** Items run at once. */
  concurrency: number;
  /** How often an idle worker looks for work, ms. */
  pollMs: number;
  /** Lease length, ms (renewed every third of it). */
  leaseMs: number;
  /** Cores shared among running items for their decoder threads (default: this machine's). */
  cores?: number;
  /** Least time between two progress writes of one item, ms (default 200). */
  progressEveryMs?: number;
  /** The kinds this worker takes (default: every kind); items of other kinds wait queued for other workers (SQLite). */
  kinds?: KindFilter | undefined;
  /** Called when the worker falls idle after running items (nothing running, nothing due): memory a burst of work held can go. */
  onIdle?: () => void;
}

/** Items run at once by default: one per core, at most four (each ffmpeg gets its share of the cores). */
export function defaultConcurrency(cores = os.availableParallelism()): number {
  return Math.max(1, Math.min(4, cores));
}

/**
 * The worker loop over the processing queue: claims up to `concurrency` items, runs each with its
 * kind, renews leases, passes progress on (throttled), retries with back-off and hands items back
 * on stop. A heartbeat that finds the item no longer ours (cancelled by its subject's deletion,
 * in whatever process) aborts the run.
 */
export function startWorker(o: WorkerOptions): Worker {
  const { processing, logger } = o;
  const queue = processing.queue;
  const cores = o.cores ?? os.availableParallelism();
  const running = new Map<number, { controller: AbortController; done: Promise<void> }>();
  let stopped = false;
  let timer: NodeJS.Timeout | undefined;
  let pumping = false;
  let again = false;
  let idleWaiters: (() => void)[] = [];
  /** Whether items ran since the worker was last idle. */
  let busy = false;

  const schedule = (ms: number) => {
    if (stopped) return;
    clearTimeout(timer);
    timer = setTimeout(() => void pump(), ms);
  };
  const unEnqueued = processing.onEnqueued(() => schedule(0));
  const unCancelled = processing.onCancelled((ids) => {
    for (const id of ids) running.get(id)?.controller.abort();
  });

  /** Progress of one item: written at once when work first becomes usable, then at most every `progressEveryMs`. */
  function progressOf(item: ProcessedItem, controller: AbortController): RunContext['progress'] {
    const every = o.progressEveryMs ?? 200;
    let last = 0;
    let lastDone = 0;
    let writing: Promise<void> | null = null;
    let pending: [number, number] | null = null;
    const write = (done: number, total: number) => {
      last = Date.now();
      lastDone = done;
      writing = queue
        .progress(item, done, total)
        .then((ours) => {
          if (!ours) controller.abort();
        })
        .catch((err: Error) => logger.warn({ err: err.message, itemId: item.id }, 'progress not recorded'))
        .finally(() => {
          writing = null;
          if (pending) {
            const [d, t] = pending;
            pending = null;
            write(d, t);
          }
        });
    };
    return (done, total) => {
      const first = lastDone === 0 && done > 0;
      if (!first && Date.now() - last < every && done < total) return;
      if (writing) pending = [done, total];
      else write(done, total);
    };
  }

  async function runItem(item: ProcessedItem, controller: AbortController): Promise<void> {
    const kind = processing.kind(item.kind)!;
    const beat = setInterval(
      () => {
        queue
          .heartbeat(item)
          .then((ours) => {
            if (!ours) controller.abort(); // cancelled, or taken over after a stall
          })
          .catch((err: Error) => logger.warn({ err: err.message, itemId: item.id }, 'lease not renewed'));
      },
      Math.max(250, o.leaseMs / 3),
    );
    const ctx: RunContext = {
      signal: controller.signal,
      progress: progressOf(item, controller),
      threads: Math.max(1, Math.floor(cores / Math.max(1, running.size))),
      logger,
    };
    try {
      const result = await kind.run(item, ctx);
      if (controller.signal.aborted) throw new Error('aborted');
      await queue.complete(item, result);
    } catch (err) {
      const message = (err as Error).message || String(err);
      if (controller.signal.aborted) {
        // Stopping: back to the queue with the attempt unused. Cancelled: the row says so already.
        if (stopped) await queue.release(item);
        logger.info({ itemId: item.id, kind: item.kind, stopping: stopped }, 'processing interrupted');
        return;
      }
      if (err instanceof NotReadyError) {
        // Waiting on other work (a clip's frames): back to the queue, the attempt unused (logged at debug: it repeats until then).
        await queue.release(item, err.retryInMs);
        logger.debug({ itemId: item.id, kind: item.kind, err: message }, 'processing waits');
        return;
      }
      const outcome = await queue.fail(item, message, {
        permanent: err instanceof PermanentError,
        retryInMs: 2_000 * 2 ** (item.attempts - 1),
      });
      logger.warn({ itemId: item.id, kind: item.kind, attempt: item.attempts, outcome, err: message }, 'processing failed');
    } finally {
      clearInterval(beat);
    }
  }

  async function pump(): Promise<void> {
    if (stopped) return;
    if (pumping) {
      again = true;
      return;
    }
    pumping = true;
    try {
      do {
        again = false;
        while (!stopped && running.size < o.concurrency) {
          const item = await queue.claim(o.kinds);
          if (!item) break;
          busy = true;
          const controller = new AbortController();
          const entry = { controller, done: Promise.resolve() };
          running.set(item.id, entry);
          entry.done = runItem(item, controller)
            .catch((err: Error) => logger.error({ err: err.message, itemId: item.id }, 'could not record the end of an item'))
            .finally(() => {
              running.delete(item.id);
              void pump();
            });
        }
      } while (again && !stopped);
    } catch (err) {
      logger.error({ err: (err as Error).message }, 'worker could not claim an item');
    } finally {
      pumping = false;
    }
    if (running.size === 0) {
      if (busy && !stopped) {
        busy = false;
        o.onIdle?.();
      }
      const waiters = idleWaiters;
      idleWaiters = [];
      waiters.forEach((w) => w());
    }
    schedule(o.pollMs);
  }

  schedule(0);
  return {
    wake: () => schedule(0),
    async stop() {
      stopped = true;
      clearTimeout(timer);
      unEnqueued();
      unCancelled();
      for (const r of running.values()) r.controller.abort();
      await Promise.all([...running.values()].map((r) => r.done));
    },
    idle() {
      return new Promise((resolve) => {
        idleWaiters.push(resolve);
        schedule(0);
      });
    },
  };
}
