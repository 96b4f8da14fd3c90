import { Router } from 'express';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { idParam, parse } from '../http/validate';
import { sendStored } from '../http/send-stored';
import type { MediaStore } from '../storage/media-store';
import { SHARED_MEDIA_CACHE } from '../stills/stills.routes';
import type { AnnotatedClipsService } from './annotated-clips-service';
import { AnnotatedClipCreateBody, SideBySideClipCreateBody } from './annotated-clips-schemas';

/** Annotated clips: staff make, publish and delete them; the athlete plays their published ones. */
export function annotatedClipsRoutes(clips: AnnotatedClipsService, store: MediaStore): Router {
  const router = Router();

  router.post('/clips/:id/annotated-clips', permit('annotated-clip:create'), async (req, res) => {
    const clipId = idParam(req.params, 'Clip');
    const body = parse(AnnotatedClipCreateBody, req.body);
    res.status(202).json(await clips.create(currentUser(req), clipId, body));
  });

  router.post('/athletes/:id/side-by-side-clips', permit('annotated-clip:create'), async (req, res) => {
    const athleteId = idParam(req.params, 'Athlete');
    const body = parse(SideBySideClipCreateBody, req.body);
    res.status(202).json(await clips.createSideBySide(currentUser(req), athleteId, body));
  });

  router.get('/athletes/:id/annotated-clips', permit('annotated-clip:list'), async (req, res) => {
    res.json({ clips: await clips.list(currentUser(req), idParam(req.params, 'Athlete')) });
  });

  router.get('/annotated-clips/:id', permit('annotated-clip:read'), async (req, res) => {
    res.json(await clips.get(currentUser(req), idParam(req.params, 'Annotated clip')));
  });

  router.post('/annotated-clips/:id/publish', permit('annotated-clip:publish'), async (req, res) => {
    res.json(await clips.setPublished(currentUser(req), idParam(req.params, 'Annotated clip'), true));
  });

  router.post('/annotated-clips/:id/unpublish', permit('annotated-clip:publish'), async (req, res) => {
    res.json(await clips.setPublished(currentUser(req), idParam(req.params, 'Annotated clip'), false));
  });

  router.delete('/annotated-clips/:id', permit('annotated-clip:delete'), async (req, res) => {
    await clips.remove(currentUser(req), idParam(req.params, 'Annotated clip'));
    res.status(204).end();
  });

  // Served with byte ranges (phone players seek and start with them); a view is logged once per play, at its first bytes.
  router.get('/annotated-clips/:id/video.mp4', permit('annotated-clip:read'), async (req, res) => {
    const range = req.headers.range;
    const first = !range || /^bytes=0-/.test(range);
    const key = await clips.videoKey(currentUser(req), idParam(req.params, 'Annotated clip'), first);
    await sendStored(res, store, key, { type: 'video/mp4', cacheControl: SHARED_MEDIA_CACHE, ranges: true });
  });

  return router;
}
