import { Router } from 'express';
import { currentUser, requireRole } from '../http/access';
import { NotFoundError } from '../errors';
import { IdParam, parse } from '../http/validate';
import { AnnotationsBody } from './annotations-schemas';
import type { AnnotationsService } from './annotations-service';

/** Read and replace a clip's annotations (staff). */
export function annotationsRoutes(annotations: AnnotationsService): Router {
  const router = Router();
  const id = (params: unknown) => {
    const r = IdParam.safeParse(params);
    if (!r.success) throw new NotFoundError('Clip');
    return r.data.id;
  };

  router.get('/clips/:id/annotations', requireRole('owner', 'coach'), async (req, res) => {
    res.json(await annotations.get(currentUser(req), id(req.params)));
  });

  router.put('/clips/:id/annotations', requireRole('owner', 'coach'), async (req, res) => {
    const clipId = id(req.params);
    const body = parse(AnnotationsBody, req.body);
    res.json(await annotations.put(currentUser(req), clipId, body));
  });

  return router;
}
