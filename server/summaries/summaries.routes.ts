import { Router } from 'express';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { idParam, parse } from '../http/validate';
import { sendStored } from '../http/send-stored';
import type { MediaStore } from '../storage/media-store';
import { SHARED_MEDIA_CACHE } from '../stills/stills.routes';
import type { SummariesService } from './summaries-service';
import { SummaryCreateBody } from './summaries-schemas';
import { contentDisposition } from './summary-file-name';

/** Visit summaries: staff create, publish and delete; the athlete reads published ones. */
export function summariesRoutes(summaries: SummariesService, store: MediaStore): Router {
  const router = Router();

  router.post('/assessments/:id/summaries', permit('summary:create'), async (req, res) => {
    const assessmentId = idParam(req.params, 'Assessment');
    const body = parse(SummaryCreateBody, req.body);
    res.status(202).json(await summaries.create(currentUser(req), assessmentId, body));
  });

  router.get('/athletes/:id/summaries', permit('summary:list'), async (req, res) => {
    res.json(await summaries.list(currentUser(req), idParam(req.params, 'Athlete')));
  });

  router.get('/summaries/:id', permit('summary:read'), async (req, res) => {
    res.json(await summaries.get(currentUser(req), idParam(req.params, 'Visit summary')));
  });

  router.post('/summaries/:id/publish', permit('summary:publish'), async (req, res) => {
    res.json(await summaries.setPublished(currentUser(req), idParam(req.params, 'Visit summary'), true));
  });

  router.post('/summaries/:id/unpublish', permit('summary:publish'), async (req, res) => {
    res.json(await summaries.setPublished(currentUser(req), idParam(req.params, 'Visit summary'), false));
  });

  router.delete('/summaries/:id', permit('summary:delete'), async (req, res) => {
    await summaries.remove(currentUser(req), idParam(req.params, 'Visit summary'));
    res.status(204).end();
  });

  router.get('/summaries/:id/pdf', permit('summary:read'), async (req, res) => {
    const id = idParam(req.params, 'Visit summary');
    const { key, fileName } = await summaries.pdf(currentUser(req), id);
    const download = req.query['download'] === '1';
    // Opened in a tab of our own origin (the preview); never framed elsewhere.
    res.setHeader('Content-Security-Policy', "default-src 'none'; frame-ancestors 'self'");
    await sendStored(res, store, key, {
      type: 'application/pdf',
      cacheControl: SHARED_MEDIA_CACHE,
      disposition: contentDisposition(download ? 'attachment' : 'inline', fileName),
    });
  });

  return router;
}
