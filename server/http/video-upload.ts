import path from 'node:path';
import type { NextFunction, Request, RequestHandler, Response } from 'express';
import multer from 'multer';
import type { Logger } from 'pino';
import { AppError, ValidationError } from '../errors';
import { checkMultipartText, MULTIPART_AS_BYTES } from './body-text';
import { DEMO_LIMITS } from '../../src/contracts/demonstrations';
import type { UploadTemps } from '../storage/upload-temps';

/** What {@link videoUploadReceiver} needs. */
export interface VideoUploadDeps {
  /** Temp files of uploads being received (owned per request; swept when nobody owns them). */
  temps: UploadTemps;
  logger: Logger;
  uploadMaxBytes: number;
}

/** 413 for uploads over the configured limit. */
export function tooLarge(limitBytes: number): AppError {
  const mb = Math.round(limitBytes / 1024 / 1024);
  return new AppError(
    413,
    'file_too_large',
    `This file is larger than the ${mb >= 1024 ? `${(mb / 1024).toFixed(1)} GB` : `${mb} MB`} upload limit. Trim the clip to 10–20 seconds and try again.`,
  );
}

/**
 * 422 for a multipart text field longer than the form reader takes: longer than any such field may
 * be, so it is refused as its own schema would refuse it (the one text field is a caption).
 */
export function fieldTooLong(field: string | undefined): ValidationError {
  const name = field ?? 'field';
  const message = name === 'caption' ? `Caption: at most ${DEMO_LIMITS.caption} characters.` : `The form field "${name}" is too long.`;
  return new ValidationError(message, [{ path: [name], message }]);
}

/** Refused uploads up to this size are read to the end before answering. */
const DRAIN_LIMIT = 64 * 1024 * 1024;
const MULTIPART_HINT = 'Send the clip as multipart/form-data with one file in the field "file".';

/** Whether the request ended because the client went away (cancelled, closed the tab, lost the network). */
function clientGone(req: Request, err: unknown): boolean {
  const message = (err as Error | undefined)?.message ?? '';
  // (req.destroyed alone says nothing: a fully read request is destroyed too.)
  return req.readableAborted || Boolean(req.socket?.destroyed) || message === 'Request aborted' || message === 'Request closed';
}

/**
 * Receives one video in the multipart field `file` into a temp file the request owns (multer disk
 * storage, never the client's name; gone when the answer closes): `receive` is the middleware,
 * `refuse` answers a refusal made before the body was read.
 */
export function videoUploadReceiver(d: VideoUploadDeps): {
  receive: RequestHandler;
  refuse(req: Request, res: Response, next: NextFunction, err: unknown): void;
  /** `check` (access, limits) before the body is read, then `receive`: a refusal never waits for the file. */
  receiveAfter(check: (req: Request) => Promise<unknown>): RequestHandler[];
} {
  type WithTemp = Request & { uploadTemp?: string };
  const upload = multer({
    storage: multer.diskStorage({
      destination: (req, _file, cb) => cb(null, path.dirname((req as WithTemp).uploadTemp!)),
      // Never the client's name: it could hold "../" or odd bytes.
      filename: (req, _file, cb) => cb(null, path.basename((req as WithTemp).uploadTemp!)),
    }),
    // Field values and file names as bytes, checked as UTF-8 afterwards (http/body-text.ts).
    ...MULTIPART_AS_BYTES,
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
      if (!err) {
        try {
          checkMultipartText(req);
        } catch (refusal) {
          return next(refusal);
        }
        return next();
      }
      if (clientGone(req, err)) {
        // Normal on phones: the athlete cancelled or the network dropped. Nobody is left to answer.
        d.logger.info({ url: req.originalUrl, received: req.socket?.bytesRead }, 'upload cancelled by the client');
        res.destroy();
        return;
      }
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') return next(tooLarge(d.uploadMaxBytes));
        if (err.code === 'LIMIT_FIELD_VALUE') return next(fieldTooLong(err.field));
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

  const receiveAfter = (check: (req: Request) => Promise<unknown>): RequestHandler[] => [
    async (req, res, next) => {
      try {
        await check(req);
        next();
      } catch (err) {
        refuse(req, res, next, err);
      }
    },
    receive,
  ];

  return { receive, refuse, receiveAfter };
}

/** The received video's temp file. @throws {ValidationError} when the request carried none. */
export function receivedVideo(req: Request): Express.Multer.File {
  if (!req.file) {
    throw new ValidationError('Choose a clip to upload (multipart form field "file").', [
      { path: ['file'], message: 'A clip is required.' },
    ]);
  }
  return req.file;
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
