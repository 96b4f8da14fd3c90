import { Router } from 'express';
import { currentUser } from '../http/access';
import { contentDisposition } from '../http/file-names';
import { sendStored } from '../http/send-stored';
import { idParam, parse } from '../http/validate';
import { permit } from '../policy/enforce';
import type { MediaStore } from '../storage/media-store';
import type { AthleteDataService } from './athlete-data-service';
import type { DataExportsService } from './data-exports-service';
import { ClipErasureBody, ErasureBody, RetentionBody } from './privacy-schemas';
import type { RetentionService } from './retention-service';

/** Athlete data: export (owner and the athlete), erasure and clip erasure (owner), clip retention (owner). */
export function privacyRoutes(d: {
  exports: DataExportsService;
  data: AthleteDataService;
  retention: RetentionService;
  store: MediaStore;
}): Router {
  const { exports, data, retention, store } = d;
  const router = Router();

  router.get('/athletes/:id/data', permit('athlete-data:read'), async (req, res) => {
    res.json(await data.overview(currentUser(req), idParam(req.params, 'Athlete')));
  });

  router.get('/athletes/:id/data-exports', permit('data-export:list'), async (req, res) => {
    res.json({ exports: await exports.list(currentUser(req), idParam(req.params, 'Athlete')) });
  });

  router.post('/athletes/:id/data-exports', permit('data-export:create'), async (req, res) => {
    res.status(202).json(await exports.start(currentUser(req), idParam(req.params, 'Athlete')));
  });

  router.get('/data-exports/:id/download', permit('data-export:download'), async (req, res) => {
    const { key, filename } = await exports.download(currentUser(req), idParam(req.params, 'Export'));
    await sendStored(res, store, key, {
      type: 'application/zip',
      cacheControl: 'private, no-store',
      disposition: contentDisposition(filename),
    });
  });

  router.post('/athletes/:id/erasure', permit('athlete:erase'), async (req, res) => {
    const athleteId = idParam(req.params, 'Athlete');
    const body = parse(ErasureBody, req.body);
    res.json(await data.erase(currentUser(req), athleteId, body.confirmName));
  });

  router.post('/athletes/:id/clips/erasure', permit('clip:erase-all'), async (req, res) => {
    const athleteId = idParam(req.params, 'Athlete');
    parse(ClipErasureBody, req.body);
    res.json(await data.eraseClips(currentUser(req), athleteId));
  });

  router.get('/clinic/retention', permit('retention:read'), async (req, res) => {
    res.json(await retention.settings(currentUser(req)));
  });

  router.put('/clinic/retention', permit('retention:update'), async (req, res) => {
    const body = parse(RetentionBody, req.body);
    res.json(await retention.setMonths(currentUser(req), body.months));
  });

  router.post('/clinic/retention/reviews', permit('retention:review'), async (req, res) => {
    res.json(await retention.review(currentUser(req)));
  });

  router.post('/clinic/retention/reviews/:id/confirm', permit('retention:confirm'), async (req, res) => {
    res.json(await retention.confirm(currentUser(req), idParam(req.params, 'Retention list')));
  });

  return router;
}
