import { Router } from 'express';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { idParam, parse } from '../http/validate';
import { ComparisonQuery, TrendsQuery } from './comparison-schemas';
import type { ComparisonService } from './comparison-service';

/** Re-test comparison and measure trends of an athlete (staff). */
export function comparisonRoutes(comparison: ComparisonService): Router {
  const router = Router();
  router.get('/athletes/:id/comparison', permit('comparison:read'), async (req, res) => {
    const athleteId = idParam(req.params, 'Athlete');
    res.json(await comparison.compare(currentUser(req), athleteId, parse(ComparisonQuery, req.query, 'Query')));
  });

  router.get('/athletes/:id/measure-trends', permit('comparison:read'), async (req, res) => {
    const athleteId = idParam(req.params, 'Athlete');
    const { keys } = parse(TrendsQuery, req.query, 'Query');
    res.json(await comparison.trends(currentUser(req), athleteId, keys));
  });
  return router;
}
