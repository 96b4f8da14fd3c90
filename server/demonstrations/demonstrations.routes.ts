import { Router, type Response } from 'express';
import type { Readable } from 'node:stream';
import { currentUser } from '../http/access';
import { idParam, parse } from '../http/validate';
import { permit } from '../policy/enforce';
import { receivePicture } from '../pictures/picture-upload';
import { DemoPictureUpdateBody, PictureUploadFields } from './demonstrations-schemas';
import type { DemonstrationsService } from './demonstrations-service';

/** A picture's bytes never change under its id (a new picture gets a new id). */
const IMMUTABLE = 'private, max-age=31536000, immutable';

/** Streams a stored JPEG. */
export function sendJpeg(res: Response, stream: Readable, cache: string): void {
  res.setHeader('Content-Type', 'image/jpeg');
  res.setHeader('Cache-Control', cache);
  res.setHeader('X-Content-Type-Options', 'nosniff');
  stream.pipe(res);
}

/** Demonstration pictures of exercises. Thin: parse, call, answer. */
export function demonstrationsRoutes(demos: DemonstrationsService): Router {
  const router = Router();
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
  return router;
}
