import { createServer, type RequestListener } from 'node:http';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig, type Config } from './config';
import { createDb, dbTarget, migrate, type Db } from './db/knex';
import { createLogger } from './logger';
import { createApp } from './app';
import { createSmtpMailer } from './mail/mailer';
import { startFakeSmtp, type FakeSmtp } from './mail/fake-smtp';
import { startDemoInbox, type DemoInbox } from './mail/demo-inbox';
import { startFakePayments, type FakePayments } from './billing/fake-payments/fake-payments';

export interface RunningServer {
  url: string;
  config: Config;
  db: Db;
  /** The local fake payment service (demo mode without real payment keys), else null. */
  fakePayments: FakePayments | null;
  /** Address of the demo inbox (127.0.0.1 only; demo mode with the fake SMTP receiver), else null. */
  inboxUrl: string | null;
  stop(): Promise<void>;
}

/**
 * Starts everything `npm start` runs on one machine: database (migrated), fake SMTP in demo
 * mode, the HTTP server. Used by `scripts/start.ts` and by the browser tests.
 */
export async function startServer(config: Config = loadConfig()): Promise<RunningServer> {
  const logger = createLogger(config.logLevel);
  const db = createDb(dbTarget(config));
  await migrate(db);
  let fakeSmtp: FakeSmtp | null = null;
  let inbox: DemoInbox | null = null;
  let mailConfig = config.mail;
  if (config.demoMode && config.demoInboxPort !== null) {
    fakeSmtp = await startFakeSmtp(db, config.fakeSmtpPort);
    mailConfig = { ...config.mail, host: '127.0.0.1', port: fakeSmtp.port };
    inbox = await startDemoInbox(db, config.demoInboxPort);
  }
  const mailer = createSmtpMailer(mailConfig);
  let fakePayments: FakePayments | null = null;
  if (config.payments && config.fakePaymentsPort !== null) {
    fakePayments = await startFakePayments({
      port: config.fakePaymentsPort,
      secretKey: config.payments.secretKey,
      webhookSecret: config.payments.webhookSecret,
    });
    config = { ...config, payments: { ...config.payments, apiPort: fakePayments.port } };
  }
  // PORT=0 (any free port): take the port first, so links in e-mails and payment returns name it
  // rather than port 0. The app is attached once it is ready; nobody knows the port before that.
  let handler: RequestListener | null = null;
  const server = createServer((req, res) => (handler ? handler(req, res) : res.writeHead(503, { 'retry-after': '1' }).end()));
  const listening = () =>
    new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(config.port, () => {
        server.off('error', reject);
        resolve();
      });
    });
  if (config.port === 0) await listening();
  const boundPort = () => {
    const a = server.address();
    return typeof a === 'object' && a ? a.port : config.port;
  };
  if (config.port === 0 && config.publicUrl === 'http://localhost:0') config = { ...config, publicUrl: `http://localhost:${boundPort()}` };
  const { app, close, processingReady } = createApp({ config, db, mailer, logger, demoInboxUrl: inbox?.url ?? null });
  await processingReady;
  handler = app;
  if (config.port !== 0) await listening();
  const port = boundPort();
  fakePayments?.setWebhookUrl(`http://127.0.0.1:${port}/api/billing/webhook`);
  return {
    url: `http://localhost:${port}`,
    config,
    db,
    fakePayments,
    inboxUrl: inbox?.url ?? null,
    async stop() {
      await close();
      const closed = new Promise<void>((resolve) => server.close(() => resolve()));
      // Open progress streams never end by themselves: close every connection, then wait.
      server.closeAllConnections();
      await closed;
      mailer.close();
      await fakeSmtp?.close();
      await inbox?.close();
      await fakePayments?.close();
      await db.destroy();
    },
  };
}

// Run directly (`tsx server/main.ts`, as `npm run dev:server` does): serve with the environment's config.
if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  startServer()
    .then((s) => {
      console.log(`Trailframe API listening on ${s.url}`);
      if (s.inboxUrl) console.log(`Demo inbox (e-mail the demo sent; this machine only): ${s.inboxUrl}`);
    })
    .catch((err: NodeJS.ErrnoException) => {
      const port = (err as { port?: number }).port ?? process.env['PORT'] ?? 3000;
      console.error(
        err.code === 'EADDRINUSE'
          ? `Port ${port} is in use: stop the other program or choose other ports (PORT, FAKE_SMTP_PORT, DEMO_INBOX_PORT, FAKE_PAYMENTS_PORT; e.g. PORT=3001 npm start)`
          : err.message,
      );
      process.exit(1);
    });
}
