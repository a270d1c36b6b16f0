import { Router } from 'express';
import { acknowledgeAlertSchema, alertSubscriptionSchema, createAlertLimitSchema, listAlertsQuerySchema } from '../../../shared/api/alerts';
import { idParamsSchema } from '../../../shared/api/params';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import type { AlertsService } from './service';

/** Alerts, their limits and who hears of them: supervisors act on them, auditors may read. */
export function alertRoutes(alerts: AlertsService): Router {
  const router = Router();
  const read = requireRole('supervisor', 'auditor');
  const write = requireRole('supervisor');

  router.get('/alerts', read, async (req, res) => {
    const { state, after, limit } = parse(listAlertsQuerySchema, req.query);
    res.json(await alerts.list(state, after, limit));
  });
  router.get('/alerts/subscription', read, async (req, res) => {
    res.json(await alerts.subscription(req.user!));
  });
  router.put('/alerts/subscription', write, async (req, res) => {
    res.json(await alerts.setSubscription(req.user!, parse(alertSubscriptionSchema, req.body).subscribed));
  });
  router.get('/alerts/:id', read, async (req, res) => {
    res.json(await alerts.get(parse(idParamsSchema, req.params).id));
  });
  router.post('/alerts/:id/acknowledge', write, async (req, res) => {
    res.json(await alerts.acknowledge(req.user!, parse(idParamsSchema, req.params).id, parse(acknowledgeAlertSchema, req.body).note));
  });

  router.get('/alert-limits', read, async (_req, res) => {
    res.json({ items: await alerts.listLimits() });
  });
  router.post('/alert-limits', write, async (req, res) => {
    res.status(201).json(await alerts.createLimit(req.user!, parse(createAlertLimitSchema, req.body)));
  });
  router.delete('/alert-limits/:id', write, async (req, res) => {
    await alerts.deleteLimit(req.user!, parse(idParamsSchema, req.params).id);
    res.status(204).end();
  });
  return router;
}
