/**
 * `npm run worker`: runs processed items (frame extraction, stills, visit summaries) in a process
 * of its own, against the same database and media folder as the web server. Start the web server
 * with `RUN_WORKER=false` to leave all processing to such workers, or keep its in-process worker
 * and add these beside it; start as many as the machine has room for. Progress reaches browsers
 * through the database: on SQLite the web process relays it (server/processing/progress-relay.ts),
 * on PostgreSQL it travels with NOTIFY and items come through pg-boss (server/processing/engine.ts).
 *
 * SIGTERM / SIGINT stop it gracefully: running items go back to the queue with their attempt
 * unused. A worker killed outright leaves its items to be taken over once their lease runs out.
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig, type Config } from './config';
import { createDb, dbTarget, migrate } from './db/knex';
import { createLogger } from './logger';
import { createSmtpMailer } from './mail/mailer';
import { warmUpFfmpeg } from './media/extract';
import { createMediaServices } from './services';
import { startWorker } from './processing/worker';
import { releaseDrawingMemory } from './render/fonts';
import { processingEngine } from './processing/engine';
import { workerProcessKinds } from './processing/drawing-kinds';

export interface WorkerProcess {
  stop(): Promise<void>;
}

/** Opens the database and media store, registers every kind, and starts the worker loop. */
export async function startWorkerProcess(config: Config = loadConfig()): Promise<WorkerProcess> {
  const logger = createLogger(config.logLevel);
  const db = createDb(dbTarget(config));
  await migrate(db);
  // Kinds never send e-mail (publishing is a web request); services only need one to be built.
  const mailer = createSmtpMailer(config.mail);
  const engine = processingEngine({ db, config, logger });
  const { processing } = createMediaServices({
    config,
    db,
    mailer,
    logger,
    clock: () => new Date(),
    channel: engine.channel,
    dispatch: engine.dispatch,
  });
  await engine.ready;
  await warmUpFfmpeg();
  const worker = startWorker({
    processing,
    logger,
    concurrency: config.jobs.concurrency,
    pollMs: config.jobs.pollMs,
    leaseMs: config.jobs.leaseMs,
    kinds: workerProcessKinds(config),
    onIdle: () => void releaseDrawingMemory().catch((err: Error) => logger.warn({ err: err.message }, 'releasing drawing memory failed')),
  });
  logger.info({ concurrency: config.jobs.concurrency, kinds: config.workerKinds, tag: processing.processTag }, 'worker started');
  return {
    async stop() {
      await worker.stop();
      await engine.close();
      mailer.close();
      await db.destroy();
    },
  };
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  startWorkerProcess()
    .then((w) => {
      console.log('Trailframe worker running (stop with Ctrl+C)');
      let stopping = false;
      const stop = () => {
        if (stopping) return;
        stopping = true;
        void w.stop().then(() => process.exit(0));
      };
      process.on('SIGTERM', stop);
      process.on('SIGINT', stop);
    })
    .catch((err: Error) => {
      console.error(err.message);
      process.exit(1);
    });
}
