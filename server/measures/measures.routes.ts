import { Router } from 'express';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { idParam, parse } from '../http/validate';
import type { Db } from '../db/knex';
import { audit } from '../audit/audit-log';
import { BandBody, clinicBands, resetBand, saveBand } from './reference-bands';
import type { MeasuresService } from './measures-service';

/** Measures of clips and assessments (staff) and the clinic's reference bands (owner edits). */
export function measuresRoutes(d: { db: Db; measures: MeasuresService }): Router {
  const router = Router();
  router.get('/clips/:id/measures', permit('measure:read'), async (req, res) => {
    res.json(await d.measures.forClip(currentUser(req), idParam(req.params, 'Clip')));
  });

  router.get('/assessments/:id/measures', permit('measure:read'), async (req, res) => {
    res.json({ clips: await d.measures.forAssessment(currentUser(req), idParam(req.params, 'Assessment')) });
  });

  router.get('/reference-bands', permit('reference-band:list'), async (req, res) => {
    res.json({ bands: await clinicBands(d.db, currentUser(req).clinicId) });
  });

  router.put('/reference-bands/:key', permit('reference-band:change'), async (req, res) => {
    const user = currentUser(req);
    const body = parse(BandBody, req.body);
    const band = await saveBand(d.db, user.clinicId, String(req.params['key']), body, user.id);
    await audit(d.db, { clinicId: user.clinicId, actorId: user.id, action: 'reference_band.saved', detail: { key: band.key } });
    res.json(band);
  });

  router.delete('/reference-bands/:key', permit('reference-band:change'), async (req, res) => {
    const user = currentUser(req);
    await resetBand(d.db, user.clinicId, String(req.params['key']));
    await audit(d.db, { clinicId: user.clinicId, actorId: user.id, action: 'reference_band.reset', detail: { key: req.params['key'] } });
    res.status(204).end();
  });

  return router;
}
