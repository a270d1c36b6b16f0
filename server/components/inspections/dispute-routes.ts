import { Router } from 'express';
import { listDisputesQuerySchema, resolveDisputeRequestSchema } from '../../../shared/api/inspections';
import { idParamsSchema } from '../../../shared/api/params';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import type { InspectionsService } from './service';

/** Disputed verdicts: supervisors judge them; auditors read them. */
export function disputeRoutes(inspections: InspectionsService): Router {
  const router = Router();
  router.get('/', requireRole('supervisor', 'auditor'), async (req, res) => {
    const q = parse(listDisputesQuerySchema, req.query);
    res.json(await inspections.listDisputes(q.state, q.limit, q.offset));
  });
  router.post('/:id/resolve', requireRole('supervisor'), async (req, res) => {
    const body = parse(resolveDisputeRequestSchema, req.body);
    res.json(await inspections.resolveDispute(req.user!, parse(idParamsSchema, req.params).id, body.judgement, body.note));
  });
  return router;
}
