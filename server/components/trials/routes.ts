import { Router } from 'express';
import { listTrialResultsQuerySchema, startTrialRequestSchema, sweepQuerySchema } from '../../../shared/api/trials';
import { idParamsSchema } from '../../../shared/api/params';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import type { TrialsService } from './service';

/** Trials: engineers start them; engineers, supervisors and auditors read them. */
export function trialRoutes(trials: TrialsService): Router {
  const router = Router();
  const read = requireRole('engineer', 'supervisor', 'auditor');
  router.post('/trials', requireRole('engineer'), async (req, res) => {
    res.status(202).json(await trials.start(req.user!, parse(startTrialRequestSchema, req.body)));
  });
  router.get('/trials/:id', read, async (req, res) => {
    res.json(await trials.get(parse(idParamsSchema, req.params).id));
  });
  router.get('/trials/:id/results', read, async (req, res) => {
    res.json(await trials.results(parse(idParamsSchema, req.params).id, parse(listTrialResultsQuerySchema, req.query)));
  });
  router.get('/trials/:id/sweep', read, async (req, res) => {
    const q = parse(sweepQuerySchema, req.query);
    res.json(await trials.sweep(parse(idParamsSchema, req.params).id, q.gauge, q.bound));
  });
  router.get('/rule-versions/:id/trials', read, async (req, res) => {
    res.json({ items: await trials.listForVersion(parse(idParamsSchema, req.params).id) });
  });
  return router;
}
