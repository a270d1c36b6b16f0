import { Router } from 'express';
import { pChartQuerySchema, trendFiltersSchema } from '../../../shared/api/trends';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import type { TrendsService } from './service';

/** Trend charts: supervisors watch them, engineers and auditors may look. */
export function trendRoutes(trends: TrendsService): Router {
  const router = Router();
  router.use(requireRole('supervisor', 'engineer', 'auditor'));
  router.get('/choices', async (_req, res) => {
    res.json(await trends.choices());
  });
  router.get('/p-chart', async (req, res) => {
    res.json(await trends.pChart(parse(pChartQuerySchema, req.query)));
  });
  router.get('/pareto', async (req, res) => {
    res.json(await trends.pareto(parse(trendFiltersSchema, req.query)));
  });
  return router;
}
