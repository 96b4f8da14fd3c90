import { Router, type Response } from 'express';
import type { Readable } from 'node:stream';
import { currentUser } from '../http/access';
import { idParam, parse } from '../http/validate';
import { permit } from '../policy/enforce';
import { receivePicture } from '../pictures/picture-upload';
import { sendStored } from '../http/send-stored';
import { receivedVideo, videoUploadReceiver, type VideoUploadDeps } from '../http/video-upload';
import type { MediaStore } from '../storage/media-store';
import { DemoClipUpdateBody, DemoPictureUpdateBody, PictureUploadFields } from './demonstrations-schemas';
import type { DemonstrationsService } from './demonstrations-service';
import type { DemoClipsService } from './demo-clips-service';

/** What the demonstration routes need. */
export interface DemonstrationsRoutesDeps {
  demos: DemonstrationsService;
  clips: DemoClipsService;
  /** Where the clips' MP4s and posters are read from. */
  store: MediaStore;
  /** How a clip upload is received (temp files, limit). */
  upload: VideoUploadDeps;
}

/** A picture's bytes never change under its id (a new picture gets a new id); a clip's under its versioned URL. */
const IMMUTABLE = 'private, max-age=31536000, immutable';

/** Streams a stored JPEG. */
export function sendJpeg(res: Response, stream: Readable, cache: string): void {
  res.setHeader('Content-Type', 'image/jpeg');
  res.setHeader('Cache-Control', cache);
  res.setHeader('X-Content-Type-Options', 'nosniff');
  stream.pipe(res);
}

/** Demonstration pictures and clips of exercises. Thin: parse, call, answer. */
export function demonstrationsRoutes({ demos, clips, store, upload }: DemonstrationsRoutesDeps): Router {
  const router = Router();
  const { receiveAfter } = videoUploadReceiver(upload);
  router.get('/exercises/:id/demonstrations', permit('demo:list'), async (req, res) => {
    res.json(await demos.list(currentUser(req), idParam(req.params, 'Exercise')));
  });
  router.post(
    '/exercises/:id/demo-pictures',
    permit('demo:create'),
    // Out of reach or full: answered before the picture is received.
    async (req, _res, next) => {
      await demos.beforeAdd(currentUser(req), idParam(req.params, 'Exercise'));
      next();
    },
    receivePicture(),
    async (req, res) => {
      const { caption } = parse(PictureUploadFields, req.body ?? {});
      const picture = await demos.addPicture(currentUser(req), idParam(req.params, 'Exercise'), req.file!.buffer, caption);
      res.status(201).json(picture);
    },
  );
  router.patch('/demo-pictures/:id', permit('demo:update'), async (req, res) => {
    res.json(await demos.update(currentUser(req), idParam(req.params, 'Picture'), parse(DemoPictureUpdateBody, req.body)));
  });
  router.delete('/demo-pictures/:id', permit('demo:delete'), async (req, res) => {
    await demos.remove(currentUser(req), idParam(req.params, 'Picture'));
    res.status(204).end();
  });
  router.get('/demo-pictures/:id/picture.jpg', permit('demo:read'), async (req, res) => {
    sendJpeg(res, await demos.image(currentUser(req), idParam(req.params, 'Picture'), 'full'), IMMUTABLE);
  });
  router.get('/demo-pictures/:id/thumb.jpg', permit('demo:read'), async (req, res) => {
    sendJpeg(res, await demos.image(currentUser(req), idParam(req.params, 'Picture'), 'thumb'), IMMUTABLE);
  });
  router.post(
    '/exercises/:id/demo-clip',
    permit('demo:create'),
    // Out of reach or has its clip: answered before the clip is received.
    ...receiveAfter((req) => clips.beforeAdd(currentUser(req), idParam(req.params, 'Exercise'))),
    async (req, res) => {
      const file = receivedVideo(req);
      const { caption } = parse(PictureUploadFields, req.body ?? {});
      res.status(201).json(await clips.add(currentUser(req), idParam(req.params, 'Exercise'), file, caption));
    },
  );
  router.patch('/demo-clips/:id', permit('demo:update'), async (req, res) => {
    res.json(await clips.update(currentUser(req), idParam(req.params, 'Clip'), parse(DemoClipUpdateBody, req.body)));
  });
  router.delete('/demo-clips/:id', permit('demo:delete'), async (req, res) => {
    await clips.remove(currentUser(req), idParam(req.params, 'Clip'));
    res.status(204).end();
  });
  // Versioned URLs (`?v=`): a new render is a new URL, so what one URL answers never changes.
  router.get('/demo-clips/:id/video.mp4', permit('demo:read'), async (req, res) => {
    const key = await clips.mediaKey(currentUser(req), idParam(req.params, 'Clip'), 'video');
    await sendStored(res, store, key, { type: 'video/mp4', cacheControl: IMMUTABLE, ranges: true });
  });
  router.get('/demo-clips/:id/poster.jpg', permit('demo:read'), async (req, res) => {
    const key = await clips.mediaKey(currentUser(req), idParam(req.params, 'Clip'), 'poster');
    await sendStored(res, store, key, { type: 'image/jpeg', cacheControl: IMMUTABLE });
  });
  return router;
}
