import { Router } from 'express';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { idParam, parse } from '../http/validate';
import { AnnotationsBody, EventProposalsBody } from './annotations-schemas';
import type { AnnotationsService } from './annotations-service';
import { fitsAnnotationsBody } from './annotations-body-check';

/** Read and replace a clip's annotations, and ask for proposed gait events (staff). */
export function annotationsRoutes(annotations: AnnotationsService): Router {
  const router = Router();
  router.get('/clips/:id/annotations', permit('annotation:read'), async (req, res) => {
    res.json(await annotations.get(currentUser(req), idParam(req.params, 'Clip')));
  });

  router.put('/clips/:id/annotations', permit('annotation:write'), async (req, res) => {
    const clipId = idParam(req.params, 'Clip');
    // An autosave sends the whole document every few seconds: a quick check passes the usual body, zod decides the rest.
    const body = fitsAnnotationsBody(req.body) ?? parse(AnnotationsBody, req.body);
    res.json(await annotations.put(currentUser(req), clipId, body));
  });

  router.post('/clips/:id/events/proposals', permit('event:propose'), async (req, res) => {
    const clipId = idParam(req.params, 'Clip');
    const body = parse(EventProposalsBody, req.body);
    res.json(await annotations.proposeEvents(currentUser(req), clipId, body.baseRevision));
  });

  return router;
}
