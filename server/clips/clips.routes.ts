import path from 'node:path';
import { Router, type NextFunction, type Request, type RequestHandler, type Response } from 'express';
import multer from 'multer';
import type { SessionUser } from '../../src/contracts/api';
import type { Db } from '../db/knex';
import { AppError, NotFoundError, ValidationError } from '../errors';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { idParam, parse } from '../http/validate';
import { audit } from '../audit/audit-log';
import type { Logger } from 'pino';
import type { UploadTemps } from '../storage/upload-temps';
import { contentDisposition } from '../http/file-names';
import { sendStored } from '../http/send-stored';
import type { MediaStore } from '../storage/media-store';
import { ClipPatchBody, MediaIndexParams } from './clips-schemas';
import { tooLarge, type ClipsService } from './clips-service';
import type { ClipMediaWhat } from './clip-media';

declare module 'express-session' {
  interface SessionData {
    /** Clips whose media this session has opened (audited once per session). */
    viewedClips?: number[];
  }
}

export interface ClipsRoutesDeps {
  db: Db;
  clips: ClipsService;
  /** Where the media the routes send lives. */
  store: MediaStore;
  /** Temp files of uploads being received (owned per request; swept when nobody owns them). */
  temps: UploadTemps;
  logger: Logger;
  uploadMaxBytes: number;
}

const IMMUTABLE = 'private, max-age=31536000, immutable';
/** Refused uploads up to this size are read to the end before answering. */
const DRAIN_LIMIT = 64 * 1024 * 1024;
const MULTIPART_HINT = 'Send the clip as multipart/form-data with one file in the field "file".';

/** Whether the request ended because the client went away (cancelled, closed the tab, lost the network). */
function clientGone(req: Request, err: unknown): boolean {
  const message = (err as Error | undefined)?.message ?? '';
  // (req.destroyed alone says nothing: a fully read request is destroyed too.)
  return req.readableAborted || Boolean(req.socket?.destroyed) || message === 'Request aborted' || message === 'Request closed';
}

/** Upload, settings and authorised media of clips (their processing is followed on the one progress stream). */
export function clipsRoutes(d: ClipsRoutesDeps): Router {
  const router = Router();
  type WithTemp = Request & { uploadTemp?: string };
  const upload = multer({
    storage: multer.diskStorage({
      destination: (req, _file, cb) => cb(null, path.dirname((req as WithTemp).uploadTemp!)),
      // Never the client's name: it could hold "../" or odd bytes.
      filename: (req, _file, cb) => cb(null, path.basename((req as WithTemp).uploadTemp!)),
    }),
    // File names arrive as UTF-8 from every current browser; busboy's default would read latin1.
    defParamCharset: 'utf8',
    limits: { fileSize: d.uploadMaxBytes, files: 1, fields: 10, parts: 11, fieldNameSize: 100, fieldSize: 10_000 },
  }).single('file');

  const receive: RequestHandler = (req, res, next) => {
    // The request owns its temp file; whatever happens (refusal, cancel, crash) it does not outlive it.
    const temp = d.temps.create();
    (req as WithTemp).uploadTemp = temp;
    res.on('close', () => void d.temps.discard(temp));
    const declared = Number(req.headers['content-length'] ?? 0);
    if (declared > d.uploadMaxBytes + 64 * 1024) return refuse(req, res, next, tooLarge(d.uploadMaxBytes));
    upload(req, res, (err: unknown) => {
      if (!err) return next();
      if (clientGone(req, err)) {
        // Normal on phones: the athlete cancelled or the network dropped. Nobody is left to answer.
        d.logger.info({ url: req.originalUrl, received: req.socket?.bytesRead }, 'upload cancelled by the client');
        res.destroy();
        return;
      }
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') return next(tooLarge(d.uploadMaxBytes));
        if (err.code === 'LIMIT_FILE_COUNT' || err.code === 'LIMIT_UNEXPECTED_FILE') {
          return next(
            new ValidationError('Upload one clip per request, in the form field "file".', [
              { path: ['file'], message: 'One clip per request.' },
            ]),
          );
        }
        return next(new AppError(400, 'bad_upload', `The upload could not be read (${err.message}). ${MULTIPART_HINT}`));
      }
      // A disk or system error (it has a syscall) is ours; anything else is the body's form.
      if ((err as NodeJS.ErrnoException).syscall) return next(err);
      next(new AppError(400, 'bad_upload', `The upload could not be read: ${describeMultipartError(err)} ${MULTIPART_HINT}`));
    });
  };

  /**
   * Answers a refusal made before the body was read. A small body is read and dropped first, so
   * the browser gets the answer instead of a reset connection; a large one is cut off
   * (`Connection: close`) rather than received for nothing.
   */
  function refuse(req: Request, res: Response, next: NextFunction, err: unknown): void {
    if (req.readableEnded) return next(err);
    const declared = Number(req.headers['content-length'] ?? 0);
    if (declared > 0 && declared <= DRAIN_LIMIT) {
      req.on('end', () => next(err));
      req.on('error', () => next(err));
      req.resume();
      return;
    }
    res.setHeader('Connection', 'close');
    next(err);
  }

  router.post(
    '/assessments/:id/clips',
    permit('clip:upload'),
    async (req, res, next) => {
      try {
        await d.clips.beforeUpload(currentUser(req), idParam(req.params, 'Assessment'));
        next();
      } catch (err) {
        refuse(req, res, next, err);
      }
    },
    receive,
    async (req, res) => {
      if (!req.file) {
        throw new ValidationError('Choose a clip to upload (multipart form field "file").', [
          { path: ['file'], message: 'A clip is required.' },
        ]);
      }
      const clip = await d.clips.acceptUpload(currentUser(req), idParam(req.params, 'Assessment'), req.file);
      res.status(201).json(clip);
    },
  );

  router.get('/clips/:id', permit('clip:read'), async (req, res) => {
    res.json(await d.clips.get(currentUser(req), idParam(req.params, 'Clip')));
  });

  router.patch('/clips/:id', permit('clip:update-settings'), async (req, res) => {
    const clipId = idParam(req.params, 'Clip');
    const body = parse(ClipPatchBody, req.body);
    res.json(await d.clips.update(currentUser(req), clipId, body));
  });

  router.delete('/clips/:id', permit('clip:delete'), async (req, res) => {
    await d.clips.remove(currentUser(req), idParam(req.params, 'Clip'));
    res.status(204).end();
  });

  router.post('/clips/:id/retry', permit('clip:retry'), async (req, res) => {
    res.status(202).json(await d.clips.retry(currentUser(req), idParam(req.params, 'Clip')));
  });

  async function auditView(req: Request, user: SessionUser, clipId: number, athleteId: number): Promise<void> {
    const seen = req.session.viewedClips ?? [];
    if (seen.includes(clipId)) return;
    req.session.viewedClips = [...seen.slice(-199), clipId];
    // Saved before the answer streams: a client holding every byte (Content-Length) may ask again
    // before the session would otherwise be saved at the end of this response.
    await new Promise<void>((resolve, reject) => req.session.save((err) => (err ? reject(err) : resolve())));
    await audit(d.db, { clinicId: user.clinicId, actorId: user.id, athleteId, action: 'media.viewed', detail: { clipId } });
  }

  const sendMedia =
    (what: ClipMediaWhat): RequestHandler =>
    async (req, res) => {
      const params = MediaIndexParams.safeParse({ n: 0, ...req.params });
      if (!params.success) throw new NotFoundError('File');
      const user = currentUser(req);
      const { key, type, row } = await d.clips.media(user, params.data.id, what, params.data.n);
      await auditView(req, user, row.id, row.athlete_id);
      await sendStored(res, d.store, key, {
        type,
        // A frame's bytes never change once it is served (frames are only served when complete).
        cacheControl: what === 'original' || what === 'manifest' ? 'private, no-cache' : IMMUTABLE,
        disposition: what === 'original' ? contentDisposition(row.original_name) : undefined,
      });
    };

  router.get('/clips/:id/poster', permit('clip:read-media'), sendMedia('poster'));
  router.get('/clips/:id/thumbs/:n', permit('clip:read-media'), sendMedia('thumb'));
  router.get('/clips/:id/frames/:n', permit('clip:read-media'), sendMedia('frame'));
  router.get('/clips/:id/manifest', permit('clip:read-media'), sendMedia('manifest'));
  router.get('/clips/:id/original', permit('clip:read-media'), sendMedia('original'));

  return router;
}

/** Says in words what was wrong with a multipart body the upload library could not read. */
function describeMultipartError(err: unknown): string {
  const message = (err as Error | undefined)?.message ?? '';
  if (/boundary not found/i.test(message)) return 'the Content-Type names no multipart boundary.';
  if (/unexpected end of form/i.test(message))
    return 'the body ended before the file was complete (empty, cut short, or a boundary that does not match the Content-Type).';
  if (/malformed part header/i.test(message)) return 'a part header of the body is malformed.';
  if (/unsupported content type/i.test(message)) return 'the Content-Type is not multipart/form-data.';
  return 'the multipart body is malformed.';
}
