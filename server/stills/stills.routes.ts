import { Router } from 'express';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { idParam, parse } from '../http/validate';
import { sendStored } from '../http/send-stored';
import type { MediaStore } from '../storage/media-store';
import type { StillsService } from './stills-service';
import { StillCreateBody, StillUpdateBody } from './stills-schemas';

/** Shared media are revalidated: a re-captioned still keeps its id. */
export const SHARED_MEDIA_CACHE = 'private, no-cache';

/** Annotated stills: staff save, caption, publish and delete; the athlete sees published ones. */
export function stillsRoutes(stills: StillsService, store: MediaStore): Router {
  const router = Router();

  router.post('/clips/:id/stills', permit('still:create'), async (req, res) => {
    const user = currentUser(req);
    const clipId = idParam(req.params, 'Clip');
    const body = parse(StillCreateBody, req.body);
    res.status(202).json(await stills.create(user, clipId, body));
  });

  router.get('/athletes/:id/stills', permit('still:list'), async (req, res) => {
    res.json(await stills.list(currentUser(req), idParam(req.params, 'Athlete')));
  });

  router.get('/stills/:id', permit('still:read'), async (req, res) => {
    res.json(await stills.get(currentUser(req), idParam(req.params, 'Still')));
  });

  router.patch('/stills/:id', permit('still:update'), async (req, res) => {
    const id = idParam(req.params, 'Still');
    const body = parse(StillUpdateBody, req.body);
    res.json(await stills.updateCaption(currentUser(req), id, body.caption));
  });

  router.post('/stills/:id/publish', permit('still:publish'), async (req, res) => {
    res.json(await stills.setPublished(currentUser(req), idParam(req.params, 'Still'), true));
  });

  router.post('/stills/:id/unpublish', permit('still:publish'), async (req, res) => {
    res.json(await stills.setPublished(currentUser(req), idParam(req.params, 'Still'), false));
  });

  router.delete('/stills/:id', permit('still:delete'), async (req, res) => {
    await stills.remove(currentUser(req), idParam(req.params, 'Still'));
    res.status(204).end();
  });

  router.get('/stills/:id/image.png', permit('still:read'), async (req, res) => {
    const { key, type } = await stills.image(currentUser(req), idParam(req.params, 'Still'), 'png');
    await sendStored(res, store, key, { type, cacheControl: SHARED_MEDIA_CACHE });
  });

  router.get('/stills/:id/image.jpg', permit('still:read'), async (req, res) => {
    const { key, type } = await stills.image(currentUser(req), idParam(req.params, 'Still'), 'jpeg');
    await sendStored(res, store, key, { type, cacheControl: SHARED_MEDIA_CACHE });
  });

  return router;
}
