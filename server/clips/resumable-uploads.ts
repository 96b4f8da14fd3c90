import fs from 'node:fs';
import type { IncomingMessage, ServerResponse } from 'node:http';
import type { Request, Response } from 'express';
import path from 'node:path';
import { FileStore } from '@tus/file-store';
import { Server, type Upload } from '@tus/server';
import type { Logger } from 'pino';
import type { Clip, SessionUser } from '../../src/contracts/api';
import { AppError } from '../errors';
import type { ClipsService } from './clips-service';
import type { UploadClaims } from './upload-claims';

/** Who may write to an upload, recorded in its details at creation (never taken from the client). */
export interface UploadOwner {
  assessmentId: number;
  userId: number;
  /** Once accepted: the clip it became and its length (kept until swept, so a lost answer is not sent twice). */
  finished: { clipId: number; size: number } | null;
}

/** What the route has checked about the request before the upload protocol takes over. */
export interface UploadRequestContext {
  user: SessionUser;
  assessmentId: number;
}

export interface ResumableUploadsDeps {
  /** Where partial files and their details live (`uploads/tmp/resumable`). */
  dir: string;
  maxBytes: number;
  clips: ClipsService;
  /** Claims across server processes sharing the folder, so a finished upload becomes one clip. */
  claims: UploadClaims;
  logger: Logger;
}

/**
 * Resumable clip uploads over the tus protocol (`@tus/server` with `@tus/file-store`): the bytes
 * stream to a partial file whose size is the offset a client resumes from, after a dropped
 * connection or a server restart. The finished file goes through the same acceptance as a
 * one-request upload ({@link ClipsService.acceptUpload}); whatever the outcome, the partial file
 * and its details are removed then.
 */
export interface ResumableUploads {
  /** Hands a request that the route has checked (access, consent, ownership) to the protocol. */
  handle(req: Request, res: Response, context: UploadRequestContext): Promise<void>;
  /** Who created the upload `id`, or null when there is no such upload (or its id is malformed). */
  owner(id: string): Promise<UploadOwner | null>;
  /**
   * Accepts an upload that holds every byte but names no clip (the server stopped while accepting
   * it) and answers what it became; null for any other upload. A refusal is thrown (the partial goes);
   * so is 423 `upload_locked` while a request (of this or another server process) is accepting it.
   */
  acceptStranded(id: string, context: UploadRequestContext): Promise<UploadOwner['finished']>;
  /** Removes partial uploads not written for `olderThanMs` (0: all not in flight), and stale claims (`UploadClaims.sweep`). Returns the uploads' ids. */
  sweep(olderThanMs: number): Promise<string[]>;
  /** Removes every partial upload (in flight or not) to one of these assessments: their bytes go with an erased athlete's clips. */
  removeForAssessments(assessmentIds: readonly number[]): Promise<void>;
  /** Sweeps by age every `everyMs`; the timer does not keep the process alive. */
  startSweeping(opts: { everyMs: number; maxAgeMs: number }): NodeJS.Timeout;
}

/** Upload ids as `@tus/server` names them: 16 random bytes in hex. */
const UPLOAD_ID = /^[0-9a-f]{32}$/;
const JSON_TYPE = 'application/json; charset=utf-8';

/** The Node request behind the web request the protocol library hands to its hooks. */
type HookRequest = { runtime?: { node?: { req: IncomingMessage; res: ServerResponse } } };
const nodeOf = (req: unknown) => (req as HookRequest).runtime?.node;

/** Our error shape for an answer the protocol sends. */
function errorBody(code: string, message: string, details?: unknown): string {
  return JSON.stringify({ error: details === undefined ? { code, message } : { code, message, details } });
}

/** Codes for the protocol's own refusals, by status. */
const PROTOCOL_CODES: Record<number, string> = {
  400: 'bad_upload',
  403: 'forbidden',
  404: 'not_found',
  409: 'upload_offset_mismatch',
  410: 'upload_gone',
  412: 'tus_version_required',
  413: 'file_too_large',
  415: 'unsupported_media_type',
  423: 'upload_locked',
  460: 'upload_checksum_mismatch',
};

/**
 * The protocol server with every refusal in our error shape and JSON content type: its own header
 * checks (a malformed Upload-Offset, Upload-Metadata or Content-Type) answer plain text otherwise,
 * and the bodies `onResponseError` maps keep the library's text/plain type.
 */
class ShapedServer extends Server {
  override write(context: Parameters<Server['write']>[0], headers: Headers, status: number, body = ''): ReturnType<Server['write']> {
    if (status >= 400) {
      if (!isErrorBody(body)) body = errorBody(PROTOCOL_CODES[status] ?? 'bad_upload', protocolMessage(status, body));
      headers.set('Content-Type', JSON_TYPE);
    }
    return super.write(context, headers, status, body);
  }
}

/** Whether `body` is already `{ error: { code, message } }`. */
function isErrorBody(body: string): boolean {
  try {
    const parsed = JSON.parse(body) as { error?: { code?: unknown; message?: unknown } } | null;
    return typeof parsed?.error?.code === 'string' && typeof parsed.error.message === 'string';
  } catch {
    return false;
  }
}

export function resumableUploads(d: ResumableUploadsDeps): ResumableUploads {
  const contexts = new WeakMap<IncomingMessage, UploadRequestContext>();
  /** Uploads with a request in progress (never swept). */
  const inFlight = new Map<string, number>();
  let server: Server | null = null;
  let datastore: FileStore | null = null;

  const partPath = (id: string) => path.join(d.dir, id);
  const detailsPath = (id: string) => path.join(d.dir, `${id}.json`);
  async function removeParts(id: string): Promise<void> {
    await fs.promises.rm(partPath(id), { force: true });
    await fs.promises.rm(detailsPath(id), { force: true });
  }

  const contextOf = (req: unknown): UploadRequestContext => {
    const node = nodeOf(req);
    const context = node && contexts.get(node.req);
    if (!context) throw new Error('resumable upload request without a checked context');
    return context;
  };

  /** Acceptances running in this process, by upload id: what each made (null when refused). */
  const accepting = new Map<string, Promise<UploadOwner['finished']>>();

  /** The details the upload has on disk (null when it has none). */
  async function readDetails(id: string) {
    return JSON.parse(await fs.promises.readFile(detailsPath(id), 'utf8').catch(() => 'null')) as
      (Pick<Upload, 'metadata' | 'size'> & { finished?: UploadOwner['finished'] }) | null;
  }

  /**
   * Accepts an upload's finished bytes as a clip (the same acceptance as a one-request upload), then
   * keeps in its details the clip it became; a refusal removes the partial and its details. Holds the
   * upload's claim meanwhile: 423 while another server process holds it; when that process made the
   * clip already, answers that clip's id (`clip` null).
   */
  async function accept(
    id: string,
    metadata: Upload['metadata'],
    size: number,
    context: UploadRequestContext,
  ): Promise<{ clip: Clip | null; finished: NonNullable<UploadOwner['finished']> }> {
    const release = await d.claims.take(id);
    if (!release) throw beingAccepted();
    let settle: (finished: UploadOwner['finished']) => void = () => undefined;
    accepting.set(id, new Promise((resolve) => (settle = resolve)));
    let finished: UploadOwner['finished'] = null;
    try {
      const earlier = (await readDetails(id))?.finished;
      if (earlier) return { clip: null, finished: (finished = earlier) };
      const clip = await d.clips.acceptUpload(context.user, context.assessmentId, {
        path: partPath(id),
        originalname: uploadName(metadata),
        size,
      });
      // What stays until the sweep: who it was for and the clip it became, so a client whose
      // answer was lost learns from HEAD that it is complete instead of sending it again. Written
      // before the part goes, so HEAD never finds neither the bytes nor the clip.
      finished = { size, clipId: clip.id };
      // Replaced whole (a HEAD reading it meanwhile must not find it half-written: that answers 404).
      const temp = `${detailsPath(id)}.${process.pid}.tmp`;
      await fs.promises.writeFile(temp, JSON.stringify({ id, metadata, finished }));
      await fs.promises.rename(temp, detailsPath(id));
      await fs.promises.rm(partPath(id), { force: true });
      return { clip, finished };
    } catch (err) {
      await removeParts(id);
      throw err;
    } finally {
      accepting.delete(id);
      settle(finished);
      await release();
    }
  }

  /** Acceptances of stranded uploads running in this process, by upload id (one at a time each). */
  const recovering = new Map<string, Promise<UploadOwner['finished']>>();

  /**
   * An upload whose part holds every declared byte but whose details name no clip was being
   * accepted when the server stopped (SIGKILL during the last PATCH). A tus client that hears
   * "complete" from HEAD never sends it again, so it is accepted now; null for any other upload.
   */
  async function acceptStranded(id: string, context: UploadRequestContext): Promise<UploadOwner['finished']> {
    const running = recovering.get(id);
    if (running) return running;
    if (!UPLOAD_ID.test(id)) return null;
    // A request of this process is writing it or making it into a clip (the protocol's HEAD answers
    // that with 423, see `tus()`); it may have finished since the route looked.
    if (inFlight.has(id)) return (await readDetails(id))?.finished ?? null;
    const attempt = (async () => {
      const details = await readDetails(id);
      if (!details || details.finished || typeof details.size !== 'number') return details?.finished ?? null;
      const held = await fs.promises.stat(partPath(id)).catch(() => null);
      if (!held || held.size !== details.size) return null;
      return (await accept(id, details.metadata, details.size, context)).finished;
    })();
    recovering.set(id, attempt);
    inFlight.set(id, (inFlight.get(id) ?? 0) + 1);
    try {
      return await attempt;
    } finally {
      recovering.delete(id);
      const n = (inFlight.get(id) ?? 1) - 1;
      if (n > 0) inFlight.set(id, n);
      else inFlight.delete(id);
    }
  }

  /** Made on first use, so the folder exists only once someone uploads this way. */
  function tus(): Server {
    if (server) return server;
    fs.mkdirSync(d.dir, { recursive: true });
    datastore = new FileStore({ directory: d.dir });
    server = new ShapedServer({
      // Routes pass requests with the /api prefix stripped; the Location header is built below.
      path: '/assessments',
      datastore,
      maxSize: d.maxBytes,
      // Same origin only: no CORS headers beyond the protocol's own.
      allowedOrigins: [],
      generateUrl: (req, { id }) => `/api/assessments/${contextOf(req).assessmentId}/clip-uploads/${id}`,
      getFileIdFromRequest: (_req, lastPath) => (lastPath && UPLOAD_ID.test(lastPath) ? lastPath : undefined),
      async onUploadCreate(req, upload) {
        const { user, assessmentId } = contextOf(req);
        const metadata = { ...(upload.metadata ?? {}), assessmentId: String(assessmentId), userId: String(user.id) };
        return { metadata };
      },
      async onUploadFinish(req, upload) {
        try {
          const context = contextOf(req);
          const accepted = await accept(upload.id, upload.metadata, upload.size ?? upload.offset, context);
          // Made into a clip by another server process meanwhile: that clip.
          const clip = accepted.clip ?? (await d.clips.get(context.user, accepted.finished.clipId));
          return { status_code: 200, headers: { 'Content-Type': JSON_TYPE }, body: JSON.stringify(clip) };
        } catch (err) {
          // Answered here rather than thrown, so the refusal carries our JSON content type.
          if (!(err instanceof AppError) || err.status >= 500) throw err;
          return { status_code: err.status, headers: { 'Content-Type': JSON_TYPE }, body: errorBody(err.code, err.message, err.details) };
        }
      },
      /** The protocol's refusals keep their status, with a body in our error shape. */
      async onResponseError(req, err) {
        if (err instanceof AppError) return { status_code: err.status, body: errorBody(err.code, err.message, err.details) };
        if ('status_code' in err && err.status_code < 500) {
          const code = PROTOCOL_CODES[err.status_code] ?? 'bad_upload';
          return { status_code: err.status_code, body: errorBody(code, protocolMessage(err.status_code, err.body)) };
        }
        d.logger.error({ err, url: nodeOf(req)?.req.url }, 'resumable upload failed');
        return { status_code: 500, body: errorBody('internal', 'Something went wrong on our side. The upload can be resumed.') };
      },
    });
    // The protocol's HEAD answers only uploads that name no clip yet. "Complete" from it means a
    // request is making the clip now: 423 instead, so the client asks again and then hears the clip
    // (a tus client takes "complete" as done, with nothing to show). An upload that became its clip
    // while the protocol looked (the part removed: 404/410) answers that clip.
    const head = server.handlers.HEAD;
    const send = head.send.bind(head);
    head.send = async (req, context, headers) => {
      try {
        const res = await send(req, context, headers);
        if (res.status === 200 && res.headers.get('Upload-Offset') === res.headers.get('Upload-Length')) throw beingAccepted();
        return res;
      } catch (err) {
        const id = /([0-9a-f]{32})$/.exec(new URL(req.url, 'http://upload').pathname)?.[1];
        // Its bytes may have gone to the clip already, before its details name it: wait for those.
        const finished = id ? ((await accepting.get(id)) ?? (await readDetails(id))?.finished) : null;
        if (!finished) throw err;
        return new Response('', { status: 200, headers: { 'Tus-Resumable': '1.0.0', ...completeHeaders(finished) } }) as unknown as Awaited<
          ReturnType<typeof send>
        >;
      }
    };
    return server;
  }

  async function sweep(olderThanMs: number): Promise<string[]> {
    // Claims left by a server killed while it made an upload into a clip go first (never a live one).
    const claims = await d.claims.sweep().catch((err: Error) => {
      d.logger.warn({ err: err.message }, 'resumable upload claims sweep failed');
      return 0;
    });
    if (claims) d.logger.info({ claims }, 'stale resumable upload claims removed');
    const names = await fs.promises.readdir(d.dir).catch(() => [] as string[]);
    const ids = new Set(names.map((n) => n.replace(/\.json$/, '')).filter((id) => UPLOAD_ID.test(id)));
    const removed: string[] = [];
    const now = Date.now();
    for (const id of ids) {
      if (inFlight.has(id)) continue;
      // The last write to the part (or, before any byte, the creation of its details).
      const stats = await Promise.all([partPath(id), detailsPath(id)].map((f) => fs.promises.stat(f).catch(() => null)));
      const lastWritten = Math.max(...stats.map((s) => s?.mtimeMs ?? 0));
      if (now - lastWritten < olderThanMs) continue;
      await removeParts(id);
      removed.push(id);
    }
    return removed;
  }

  async function owner(id: string): Promise<UploadOwner | null> {
    if (!UPLOAD_ID.test(id)) return null;
    try {
      const details = JSON.parse(await fs.promises.readFile(detailsPath(id), 'utf8')) as Pick<Upload, 'metadata'> & {
        finished?: UploadOwner['finished'];
      };
      const assessmentId = Number(details.metadata?.['assessmentId']);
      const userId = Number(details.metadata?.['userId']);
      if (!Number.isInteger(assessmentId) || !Number.isInteger(userId)) return null;
      return { assessmentId, userId, finished: details.finished ?? null };
    } catch {
      return null;
    }
  }

  return {
    async handle(req, res, context) {
      contexts.set(req, context);
      const id = /\/clip-uploads\/([0-9a-f]{32})$/.exec(req.path)?.[1];
      if (id) inFlight.set(id, (inFlight.get(id) ?? 0) + 1);
      try {
        await tus().handle(req, res);
      } finally {
        if (id) {
          const n = (inFlight.get(id) ?? 1) - 1;
          if (n > 0) inFlight.set(id, n);
          else inFlight.delete(id);
        }
      }
    },

    owner,
    acceptStranded,
    sweep,
    async removeForAssessments(assessmentIds) {
      const wanted = new Set(assessmentIds);
      const names = await fs.promises.readdir(d.dir).catch(() => [] as string[]);
      for (const id of names.filter((n) => UPLOAD_ID.test(n))) {
        const who = await owner(id);
        if (who && wanted.has(who.assessmentId)) await removeParts(id);
      }
    },
    startSweeping({ everyMs, maxAgeMs }) {
      const timer = setInterval(() => {
        sweep(maxAgeMs)
          .then((ids) => ids.length && d.logger.info({ ids }, 'abandoned resumable uploads removed'))
          .catch((err: Error) => d.logger.warn({ err: err.message }, 'resumable upload sweep failed'));
      }, everyMs);
      timer.unref();
      return timer;
    },
  };
}

/** HEAD's answer for an upload made into a clip: complete, naming the clip (`Trailframe-Clip-Id`). */
export function completeHeaders(finished: NonNullable<UploadOwner['finished']>): Record<string, string> {
  return {
    'Cache-Control': 'no-store',
    'Upload-Offset': String(finished.size),
    'Upload-Length': String(finished.size),
    'Trailframe-Clip-Id': String(finished.clipId),
  };
}

/** 423 while an upload is being made into a clip: the client asks again (tus clients retry a 423). */
function beingAccepted(): AppError {
  return new AppError(423, 'upload_locked', 'This upload is being made into a clip; ask again in a moment.');
}

/** The client's file name from the upload's details (cleaned where the clip is made). */
function uploadName(metadata: Upload['metadata']): string {
  const name = metadata?.['filename'];
  return typeof name === 'string' && name.trim() ? name : 'clip';
}

/** The protocol's refusals in words. */
function protocolMessage(status: number, body: string): string {
  switch (status) {
    case 409:
      return 'The upload is at another offset than this request continues from: ask for the offset (HEAD) and continue from there.';
    case 410:
      return 'This upload is no longer kept. Start the upload again.';
    case 412:
      return 'Send the Tus-Resumable header (1.0.0).';
    case 413:
      return 'The bytes sent go past the upload’s declared length.';
    case 415:
      return 'Send the bytes as application/offset+octet-stream.';
    case 423:
      return 'Another request is writing to this upload; try again in a moment.';
    case 400:
      // The library names the headers it refused ("Invalid upload-offset upload-metadata").
      return /^Invalid [\w -]+$/.test(body.trim())
        ? `Malformed upload header: ${body.trim().slice('Invalid '.length).split(' ').join(', ')}.`
        : body.trim() || 'The upload request could not be read.';
    default:
      return body.trim() || 'The upload request could not be read.';
  }
}
