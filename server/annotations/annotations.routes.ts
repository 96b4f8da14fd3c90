import { Router } from 'express';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { idParam, parse } from '../http/validate';
import { AnnotationsBody } from './annotations-schemas';
import type { AnnotationsService } from './annotations-service';

/** Read and replace a clip's annotations (staff). */
export function annotationsRoutes(annotations: AnnotationsService): Router {
  const router = Router();
  router.get('/clips/:id/annotations', permit('annotation:read'), async (req, res) => {
    res.json(await annotations.get(currentUser(req), idParam(req.params, 'Clip')));
  });

  router.put('/clips/:id/annotations', permit('annotation:write'), async (req, res) => {
    const clipId = idParam(req.params, 'Clip');
    const body = parse(AnnotationsBody, req.body);
    res.json(await annotations.put(currentUser(req), clipId, body));
  });

  return router;
}
