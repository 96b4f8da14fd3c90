import express, { type Express, type RequestHandler } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { Logger } from 'pino';
import type { AppConfig } from '../src/contracts/api';
import type { Config } from './config';
import type { Db } from './db/knex';
import type { Mailer } from './mail/mailer';
import { AppError, apiNotFound, errorHandler } from './errors';
import { createCsrf } from './http/csrf';
import { createSessions, inProcessRevocations } from './http/sessions';
import { signedInSessions } from './http/signed-in';
import { usersRepository } from './auth/users-repository';
import { staffService } from './staff/staff-service';
import { clientAppRoutes } from './http/client-app';
import { securityHeaders } from './http/security-headers';
import { accessLog } from './http/access-log';
import { routesByPrefix } from './http/routes-by-prefix';
import { series } from './http/series';
import { useJsonAnswer } from './http/json-answer';
import { createPassport } from './auth/passport-setup';
import { signInGuard } from './auth/sign-in-guard';
import { authRoutes } from './auth/auth.routes';
import { passwordChangeService } from './auth/password-change-service';
import { invitationsService } from './auth/invitations-service';
import { passwordResetsService } from './auth/password-resets-service';
import { staffRoutes } from './staff/staff.routes';
import { athletesService } from './athletes/athletes-service';
import { athletesRoutes } from './athletes/athletes.routes';
import type { MediaStore } from './storage/media-store';
import { resumableUploadDir, uploadTempDir, uploadTemps } from './storage/upload-temps';
import type { Processing } from './processing/processing';
import { releaseDrawingMemory } from './render/fonts';
import { startWorker, type Worker } from './processing/worker';
import { processingEngine } from './processing/engine';
import { inProcessKinds } from './processing/drawing-kinds';
import { processingEventsRoutes } from './processing/processing-events.routes';
import { createMediaServices, mediaStoreFor } from './services';
import { warmUpFfmpeg } from './media/extract';
import { clipsRoutes } from './clips/clips.routes';
import { clipUploadsRoutes } from './clips/clip-uploads.routes';
import { resumableUploads } from './clips/resumable-uploads';
import { uploadClaims } from './clips/upload-claims';
import { assessmentsRoutes } from './assessments/assessments.routes';
import { annotationsRoutes } from './annotations/annotations.routes';
import { followRoutes } from './follow/follow.routes';
import { measuresRoutes } from './measures/measures.routes';
import { comparisonService } from './comparison/comparison-service';
import { comparisonRoutes } from './comparison/comparison.routes';
import { exercisesService } from './plans/exercises-service';
import { plansService } from './plans/plans-service';
import { plansRoutes } from './plans/plans.routes';
import { stillsRoutes } from './stills/stills.routes';
import { annotatedClipsRoutes } from './annotated-clips/annotated-clips.routes';
import { summariesRoutes } from './summaries/summaries.routes';
import { portalSharedRoutes } from './summaries/portal-shared.routes';
import { billingService } from './billing/billing-service';
import { billingRoutes, billingWebhookRoutes } from './billing/billing.routes';
import { clinicRoutes } from './clinic/clinic.routes';
import { clinicService } from './clinic/clinic-service';
import { clinicBrands } from './clinic/clinic-brand';
import { brandingMailer } from './mail/mailer';
import { workerPictureProcessor } from './pictures/picture-pool';
import { demonstrationsService } from './demonstrations/demonstrations-service';
import { demonstrationsRoutes } from './demonstrations/demonstrations.routes';
import { stripePayments, type Payments } from './billing/payments';
import { athleteDataService } from './privacy/athlete-data-service';
import { retentionService } from './privacy/retention-service';
import { privacyRoutes } from './privacy/privacy.routes';
import { refuseBrokenTarget, refuseBrokenText, verifyBodyText } from './http/body-text';

/** What the app needs from outside; tests pass their own. */
export interface AppDeps {
  config: Config;
  db: Db;
  mailer: Mailer;
  logger: Logger;
  /** Injected clock, so tests can expire tokens without waiting. */
  clock?: () => Date;
  /** Media storage; defaults to local folders under `config.uploadsDir`. */
  store?: MediaStore;
  /** Card payment; defaults to the provider's SDK per `config.payments` (null: not configured). */
  payments?: Payments | null;
  /** Address of the demo inbox (127.0.0.1 only), told to the app's pages in demo mode; null when none runs. */
  demoInboxUrl?: string | null;
}

export interface App {
  app: Express;
  /** The in-process worker, or null when `config.runWorker` is off (workers then run apart: `npm run worker`). */
  worker: Worker | null;
  /** The processing layer (its kinds registered). */
  processing: Processing;
  /** Resolves once other processes' progress reaches this one (PostgreSQL: listening; SQLite: at once). */
  processingReady: Promise<void>;
  /** Deletes expired session rows now (they are also cleared at start and every 15 minutes); answers how many. */
  clearExpiredSessions(): Promise<number>;
  /** The daily privacy check now (also run every hour): lists clips due under each clinic's retention, removes expired export zips. */
  runDailyPrivacyCheck(): Promise<void>;
  /** Stops the worker (aborting running jobs) and timers the app started. */
  close(): Promise<void>;
}

const VERSION = '0.1.0';
/** Upload temp files nobody owns go once unwritten for an hour; looked for every 10 minutes. */
const UPLOAD_TEMP_SWEEP = { everyMs: 10 * 60_000, maxAgeMs: 60 * 60_000 };
/** How often the daily privacy check looks whether a day has passed, ms. */
const PRIVACY_CHECK_EVERY_MS = 60 * 60_000;
/** How often a web process reads what workers in other processes did, while someone follows a stream, ms. */
const RELAY_EVERY_MS = 250;

/** Builds the Express app; `server/main.ts` listens, tests call this directly. */
export function createApp(deps: AppDeps): App {
  const { config, db, logger } = deps;
  const clock = deps.clock ?? (() => new Date());
  const store = deps.store ?? mediaStoreFor(config);
  const pictures = workerPictureProcessor();
  const brands = clinicBrands({ db, store });
  // Every message that names its clinic goes out on the clinic's letterhead.
  const mailer = brandingMailer(deps.mailer, (clinicId) => brands.forDocuments(clinicId));
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', config.trustProxy);
  app.set('query parser', 'simple');
  // Answers of `res.send` are API JSON (no-store) or pages with a fresh nonce: an ETag (a hash of
  // each body) could never match. Stored files set their own validators (send-stored, static).
  app.set('etag', false);

  // One leaner `res.json` (one write per answer; http/json-answer.ts) and the per-request headers and log line as one layer.
  useJsonAnswer(app);
  app.use(series([securityHeaders(config.secureCookies), accessLog(logger)]));

  const api = express.Router();
  const billing = billingService({
    db,
    mailer,
    config,
    logger,
    clock,
    brands,
    payments: deps.payments !== undefined ? deps.payments : config.payments ? stripePayments(config.payments) : null,
  });
  // Annotations of a long clip can be large; every other body is small.
  // Text must arrive as UTF-8 without NULs or half surrogate pairs (http/body-text.ts), or the request is refused.
  const smallJson = express.json({ limit: '200kb', strict: true, verify: verifyBodyText });
  const largeJson = express.json({ limit: '8mb', strict: true, verify: verifyBodyText });
  const parseBody: RequestHandler = (req, res, next) => {
    // Reads carry no body: skip the parsers' checks on the busiest requests.
    if (req.method === 'GET' || req.method === 'HEAD') return next();
    (/^\/clips\/\d+\/annotations$/.test(req.path) ? largeJson : smallJson)(req, res, (err?: unknown) =>
      next(err ?? refuseBrokenText(req, req.body)),
    );
  };
  // A body that is not JSON at all is a client error too, not an empty object.
  const refuseOtherBodies: RequestHandler = (req, _res, next) => {
    const method = req.method;
    if (
      (method === 'POST' || method === 'PUT' || method === 'PATCH') &&
      req.headers['content-length'] !== '0' &&
      req.body === undefined &&
      req.headers['content-type'] &&
      !req.is('application/json') &&
      !req.is('multipart/form-data') &&
      // A resumable upload's bytes (tus PATCH), streamed by its own route.
      !req.is('application/offset+octet-stream')
    ) {
      return next(
        new AppError(
          415,
          'unsupported_media_type',
          /\/clip-uploads\/[^/]+$/.test(req.path)
            ? 'Send the upload’s bytes with Content-Type: application/offset+octet-stream.'
            : 'Send the request body as JSON (Content-Type: application/json).',
        ),
      );
    }
    next();
  };

  const sessions = createSessions({ db, secret: config.sessionSecret, secureCookies: config.secureCookies, clock, logger });
  const passport = createPassport(db);
  // express-session, passport.session() and the extension, with a short way for signed-in reads. No
  // passport.initialize(): passport.session() sets the same request helpers (req.login, req.logout…),
  // and we need no `req._passport` for passport 0.4 strategies.
  const signedIn = signedInSessions({
    sessions,
    passportSession: passport.session(),
    passport,
    sessionUser: usersRepository.sessionUserReader(db),
    logger,
  });
  const csrf = createCsrf(config.secureCookies, config.sessionSecret);
  // What every API request passes before its route, as one layer (http/series.ts). The payment
  // webhook reads its RAW body (signature) and is CSRF-exempt: it comes before the parsers and CSRF.
  api.use(
    series([
      refuseBrokenTarget,
      routesByPrefix([billingWebhookRoutes(billing)]),
      parseBody,
      refuseOtherBodies,
      signedIn,
      csrf.ensureCookie,
      csrf.protect,
    ]),
  );

  const limiter = (limit: number, message: string) =>
    rateLimit({
      windowMs: config.rateLimit.windowMs,
      limit,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      handler: (_req, _res, next) => next(new AppError(429, 'too_many_attempts', message)),
    });
  const guard = signInGuard({
    secret: config.sessionSecret,
    accountAttempts: config.rateLimit.accountAttempts,
    windowMs: config.rateLimit.windowMs,
    secureCookies: config.secureCookies,
    clock,
  });
  const signInLimiter = rateLimit({
    windowMs: config.rateLimit.windowMs,
    limit: config.rateLimit.signInAttempts,
    skipSuccessfulRequests: true,
    // A browser that signed in to this account before is not held up by others at its address.
    skip: (req) => typeof req.body?.email === 'string' && guard.knownDevice(req, req.body.email),
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, _res, next) =>
      next(new AppError(429, 'too_many_attempts', 'Too many sign-in attempts from your network. Wait 15 minutes, or reset your password.')),
  });
  const resetLimiter = limiter(config.rateLimit.resetRequests, 'Too many password-reset requests. Wait 15 minutes and try again.');

  const invitations = invitationsService({ db, mailer, config, clock });
  const revocations = inProcessRevocations();
  const resets = passwordResetsService({ db, mailer, config, clock, logger, revocations, onPasswordSet: (email) => guard.clear(email) });
  const athletes = athletesService({ db, clock, invitations, notices: { mailer, logger, publicUrl: config.publicUrl } });
  // Start-up removes temp files of uploads a killed server left; then a sweep by age (unref'd).
  const temps = uploadTemps(uploadTempDir(config.uploadsDir), (err) => logger.warn({ err: err.message }, 'upload temp sweep failed'));
  const tempSweep = temps.startSweeping(UPLOAD_TEMP_SWEEP);
  // SQLite: in-process channel and table relay; PostgreSQL: pg-boss and LISTEN/NOTIFY (processing/engine.ts).
  const engine = processingEngine({ db, config, logger });
  const media = createMediaServices({
    config,
    db,
    mailer,
    logger,
    clock,
    store,
    brands,
    channel: engine.channel,
    dispatch: engine.dispatch,
  });
  const { processing, clips, assessments, measures, annotations, follow, stills, summaries, annotatedClips, dataExports, demoClips } =
    media;
  const retention = retentionService({ db, clips, clock });
  const runDailyPrivacyCheck = async () => {
    await retention.runDaily();
    await dataExports.sweepExpired();
  };
  const privacyCheck = setInterval(
    () => void runDailyPrivacyCheck().catch((err: Error) => logger.warn({ err: err.message }, 'daily privacy check failed')),
    PRIVACY_CHECK_EVERY_MS,
  );
  privacyCheck.unref();
  // Partial resumable uploads survive restarts; those left unwritten past the configured age go.
  const resumable = resumableUploads({
    dir: resumableUploadDir(config.uploadsDir),
    maxBytes: config.uploadMaxBytes,
    clips,
    claims: uploadClaims(db),
    logger,
  });
  void resumable
    .sweep(config.resumableUploadMaxAgeMs)
    .catch((err: Error) => logger.warn({ err: err.message }, 'resumable upload sweep failed'));
  const resumableSweep = resumable.startSweeping({ everyMs: UPLOAD_TEMP_SWEEP.everyMs, maxAgeMs: config.resumableUploadMaxAgeMs });
  const exercises = exercisesService({ db, clock });
  const plans = plansService({ db, clock });
  const worker = config.runWorker
    ? startWorker({
        processing,
        logger,
        concurrency: config.jobs.concurrency,
        pollMs: config.jobs.pollMs,
        leaseMs: config.jobs.leaseMs,
        // With DRAW_APART the drawing kinds wait queued for the drawing worker (`npm start` runs it).
        kinds: inProcessKinds(config),
        // The web process draws stills and summaries now and then: what the drawing held goes once the queue is done.
        onIdle: () =>
          void releaseDrawingMemory().catch((err: Error) => logger.warn({ err: err.message }, 'releasing drawing memory failed')),
      })
    : null;
  if (worker) void warmUpFfmpeg();
  // Workers in other processes (`npm run worker`) report through the database; relayed here (SQLite).
  const relay = engine.startRelay(processing, RELAY_EVERY_MS);

  const system = express.Router();
  system.get('/health', (_req, res) => {
    res.json({ ok: true });
  });
  system.get('/config', (_req, res) => {
    const body: AppConfig = {
      demoMode: config.demoMode,
      version: VERSION,
      uploadMaxBytes: config.uploadMaxBytes,
      demoInboxUrl: (config.demoMode && deps.demoInboxUrl) || null,
    };
    res.json(body);
  });
  // Each request walks only the routers with routes under its first path segment (http/routes-by-prefix.ts).
  api.use(
    routesByPrefix([
      system,
      authRoutes({
        db,
        passport,
        csrf,
        invitations,
        resets,
        passwordChange: passwordChangeService({ db, mailer, config, clock, logger, revocations }),
        signInLimiter,
        signInGuard: guard,
        resetLimiter,
        clock,
      }),
      staffRoutes({ db, invitations, staff: staffService({ db, clock, revocations }) }),
      athletesRoutes(athletes),
      assessmentsRoutes(assessments),
      processingEventsRoutes({ db, processing, relay, revocations }),
      clipsRoutes({ db, clips, store, temps, logger, uploadMaxBytes: config.uploadMaxBytes }),
      clipUploadsRoutes({ clips, uploads: resumable, uploadMaxBytes: config.uploadMaxBytes }),
      annotationsRoutes(annotations),
      followRoutes(follow),
      measuresRoutes({ db, measures }),
      comparisonRoutes(comparisonService({ db, measures })),
      plansRoutes({ exercises, plans }),
      stillsRoutes(stills, store),
      summariesRoutes(summaries, store),
      annotatedClipsRoutes(annotatedClips, store),
      privacyRoutes({
        exports: dataExports,
        data: athleteDataService({ db, store, processing, clips, revocations, clock, partialUploads: resumable }),
        retention,
        store,
      }),
      portalSharedRoutes({ stills, summaries }),
      billingRoutes(billing),
      clinicRoutes(clinicService({ db, clock, store, pictures })),
      demonstrationsRoutes({
        demos: demonstrationsService({ db, store, pictures, clips: demoClips, clock }),
        clips: demoClips,
        store,
        upload: { temps, logger, uploadMaxBytes: config.uploadMaxBytes },
      }),
    ]),
  );
  api.use(apiNotFound);

  // API answers are never cached: `Cache-Control: no-store` comes with the security headers.
  app.use('/api', api);
  if (config.clientDir) app.use(clientAppRoutes(config.clientDir));
  app.use(errorHandler(logger));

  return {
    app,
    worker,
    processing,
    processingReady: engine.ready,
    clearExpiredSessions: sessions.clearExpired,
    runDailyPrivacyCheck,
    async close() {
      clearInterval(tempSweep);
      clearInterval(resumableSweep);
      clearInterval(privacyCheck);
      relay.stop();
      await worker?.stop();
      await sessions.close();
      await engine.close();
    },
  };
}
