import { Router } from 'express';
import { currentUser } from '../http/access';
import { idParam, parse } from '../http/validate';
import { permit } from '../policy/enforce';
import { FollowMarkersBody } from './follow-schemas';
import type { FollowService } from './follow-service';

/** Start or cancel marker following on a clip (staff); progress comes on the athlete's processing stream. */
export function followRoutes(follow: FollowService): Router {
  const router = Router();
  router.post('/clips/:id/follow', permit('landmark:follow'), async (req, res) => {
    const clipId = idParam(req.params, 'Clip');
    const body = parse(FollowMarkersBody, req.body);
    res.status(202).json(await follow.start(currentUser(req), clipId, body));
  });
  router.post('/clips/:id/follow/cancel', permit('landmark:follow'), async (req, res) => {
    res.json(await follow.cancel(currentUser(req), idParam(req.params, 'Clip')));
  });
  return router;
}
