import { Metadata } from '@tus/server';
import { Router, type NextFunction, type Request, type RequestHandler, type Response } from 'express';
import { AppError, NotFoundError, ValidationError } from '../errors';
import { currentUser } from '../http/access';
import { textOfBytes } from '../http/body-text';
import { idParam } from '../http/validate';
import { permit } from '../policy/enforce';
import type { ClipsService } from './clips-service';
import { tooLarge } from '../http/video-upload';
import { completeHeaders, type ResumableUploads, type UploadOwner, type UploadRequestContext } from './resumable-uploads';

export interface ClipUploadsRoutesDeps {
  clips: ClipsService;
  uploads: ResumableUploads;
  uploadMaxBytes: number;
}

const COLLECTION = '/assessments/:id/clip-uploads';
const ONE = '/assessments/:id/clip-uploads/:uploadId';

/** Whole bytes as the protocol writes them (no sign, no leading zero). */
const BYTES = /^(0|[1-9]\d{0,15})$/;

/**
 * The protocol headers `@tus/server` checks itself, where it would answer a plain-text 400; checked
 * first here so the refusal is in our error shape (Upload-Length is checked where an upload is made).
 */
const PROTOCOL_HEADERS: Record<string, { name: string; valid: (value: string, method: string) => boolean }> = {
  'upload-offset': { name: 'Upload-Offset', valid: (v) => BYTES.test(v) },
  'upload-defer-length': { name: 'Upload-Defer-Length', valid: (v) => v === '1' },
  'upload-metadata': { name: 'Upload-Metadata', valid: validMetadata },
  'upload-concat': { name: 'Upload-Concat', valid: (v) => v === 'partial' || v.startsWith('final;') },
  'tus-version': { name: 'Tus-Version', valid: (v) => v === '1.0.0' },
  'x-forwarded-proto': { name: 'X-Forwarded-Proto', valid: (v) => v === 'http' || v === 'https' },
  'content-type': { name: 'Content-Type', valid: (v, method) => method !== 'PATCH' || v === 'application/offset+octet-stream' },
};

function validMetadata(value: string): boolean {
  try {
    Metadata.parse(value);
    return true;
  } catch {
    return false;
  }
}

/** 400 `bad_upload` naming the first malformed protocol header, before the protocol library answers in plain text. */
function checkProtocolHeaders(req: Request): void {
  for (const [header, rule] of Object.entries(PROTOCOL_HEADERS)) {
    const value = req.headers[header];
    if (typeof value === 'string' && !rule.valid(value, req.method)) {
      throw new AppError(400, 'bad_upload', `The ${rule.name} header of this resumable upload request is malformed.`);
    }
  }
  const metadata = req.headers['upload-metadata'];
  // Its values (the file name…) are base64 of text: UTF-8 without a NUL, or 400 invalid_text like any other text.
  if (typeof metadata === 'string') {
    for (const pair of metadata.split(',')) {
      const value = pair.trim().split(' ')[1];
      if (value) textOfBytes(Buffer.from(value, 'base64'));
    }
  }
}

/**
 * Resumable clip uploads (tus 1.0.0): POST creates an upload of a declared length, HEAD answers
 * its offset, PATCH continues from it, DELETE abandons it. Every request passes the same gate as
 * a one-request upload (sign-in, CSRF, the access policy's `clip:upload`, video consent); HEAD,
 * PATCH and DELETE also reach only uploads this user created for this assessment (404 otherwise).
 */
export function clipUploadsRoutes(d: ClipUploadsRoutesDeps): Router {
  const router = Router();

  /** Access and consent, then the protocol version. */
  async function checked(req: Request): Promise<UploadRequestContext> {
    const user = currentUser(req);
    const assessmentId = idParam(req.params, 'Assessment');
    await d.clips.beforeUpload(user, assessmentId);
    if (req.headers['tus-resumable'] !== '1.0.0') {
      throw new AppError(412, 'tus_version_required', 'Resumable uploads speak tus 1.0.0: send the header Tus-Resumable: 1.0.0.');
    }
    checkProtocolHeaders(req);
    return { user, assessmentId };
  }

  /** The upload named in the path, when this user created it for this assessment; 404 otherwise. */
  async function owned(req: Request): Promise<UploadRequestContext & { owner: UploadOwner }> {
    const context = await checked(req);
    const owner = await d.uploads.owner(String(req.params['uploadId']));
    if (!owner || owner.assessmentId !== context.assessmentId || owner.userId !== context.user.id) throw new NotFoundError('Upload');
    return { ...context, owner };
  }

  /** Runs the checks, then the protocol; a refusal made before the bytes are read closes the connection. */
  const gate =
    (check: (req: Request) => Promise<UploadRequestContext>): RequestHandler =>
    async (req: Request, res: Response, next: NextFunction) => {
      let context: UploadRequestContext;
      try {
        context = await check(req);
      } catch (err) {
        if (Number(req.headers['content-length'] ?? 0) > 0 && !req.readableEnded) res.setHeader('Connection', 'close');
        return next(err);
      }
      await d.uploads.handle(req, res, context);
    };

  router.post(
    COLLECTION,
    permit('clip:upload'),
    gate(async (req) => {
      const context = await checked(req);
      const declared = req.headers['upload-length'];
      if (typeof declared !== 'string' || !/^\d{1,16}$/.test(declared)) {
        throw new ValidationError('Declare the clip’s size in bytes in the Upload-Length header.', [
          { path: ['Upload-Length'], message: 'A whole number of bytes is required.' },
        ]);
      }
      const length = Number(declared);
      if (length === 0) {
        throw new ValidationError('This file is empty (0 bytes). Choose the video file itself.', [
          { path: ['Upload-Length'], message: 'The clip is empty.' },
        ]);
      }
      if (length > d.uploadMaxBytes) throw tooLarge(d.uploadMaxBytes);
      return context;
    }),
  );
  router.head(ONE, permit('clip:upload'), async (req, res, next) => {
    const context = await owned(req);
    // All bytes held but no clip: the server stopped while accepting it; accepted now.
    const finished = context.owner.finished ?? (await d.uploads.acceptStranded(String(req.params['uploadId']), context));
    if (!finished) {
      await gate(async () => context)(req, res, next);
      return;
    }
    // Accepted already (its answer may have been lost): complete, so the client does not send it again.
    res.set({ 'Tus-Resumable': '1.0.0', ...completeHeaders(finished) });
    res.status(200).end();
  });
  router.patch(ONE, permit('clip:upload'), gate(owned));
  router.delete(ONE, permit('clip:upload'), gate(owned));

  return router;
}
