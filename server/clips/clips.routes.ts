import { Router, type Request, type RequestHandler } from 'express';
import type { SessionUser } from '../../src/contracts/api';
import type { Db } from '../db/knex';
import { NotFoundError } from '../errors';
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
import type { ClipsService } from './clips-service';
import { receivedVideo, videoUploadReceiver } from '../http/video-upload';
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
/** Upload, settings and authorised media of clips (their processing is followed on the one progress stream). */
export function clipsRoutes(d: ClipsRoutesDeps): Router {
  const router = Router();
  const { receiveAfter } = videoUploadReceiver(d);

  router.post(
    '/assessments/:id/clips',
    permit('clip:upload'),
    ...receiveAfter((req) => d.clips.beforeUpload(currentUser(req), idParam(req.params, 'Assessment'))),
    async (req, res) => {
      const clip = await d.clips.acceptUpload(currentUser(req), idParam(req.params, 'Assessment'), receivedVideo(req));
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
