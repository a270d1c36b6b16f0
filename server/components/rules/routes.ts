import { Router } from 'express';
import {
  createRuleRequestSchema,
  listRulesQuerySchema,
  newDraftRequestSchema,
  releaseRequestSchema,
  saveDraftRequestSchema,
  sendBackRequestSchema,
  submitRequestSchema,
  withdrawRequestSchema,
} from '../../../shared/api/rules';
import { idParamsSchema } from '../../../shared/api/params';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import type { RuleHistoryService } from './history';
import type { RulesService } from './service';

/** Rules and their versions. Engineers write drafts; supervisors review, release and withdraw; auditors read. */
export function ruleRoutes(rules: RulesService, history: RuleHistoryService): Router {
  const router = Router();
  const read = requireRole('engineer', 'supervisor', 'auditor', 'operator');
  const engineer = requireRole('engineer');
  const supervisor = requireRole('supervisor');

  router.get('/rules', read, async (req, res) => {
    res.json(await rules.list(parse(listRulesQuerySchema, req.query), req.user!));
  });
  router.post('/rules', engineer, async (req, res) => {
    res.status(201).json(await rules.create(req.user!, parse(createRuleRequestSchema, req.body)));
  });
  router.get('/rules/:id', read, async (req, res) => {
    res.json(await rules.detail(parse(idParamsSchema, req.params).id));
  });
  router.get('/rules/:id/history', requireRole('engineer', 'supervisor', 'auditor'), async (req, res) => {
    res.json(await history.history(parse(idParamsSchema, req.params).id));
  });
  router.post('/rules/:id/versions', engineer, async (req, res) => {
    const body = parse(newDraftRequestSchema, req.body ?? {});
    res.status(201).json(await rules.newDraft(req.user!, parse(idParamsSchema, req.params).id, body.fromVersionId));
  });
  router.get('/rule-versions/:id', read, async (req, res) => {
    res.json(await rules.version(parse(idParamsSchema, req.params).id));
  });
  router.put('/rule-versions/:id/document', engineer, async (req, res) => {
    const body = parse(saveDraftRequestSchema, req.body);
    res.json(await rules.saveDraft(req.user!, parse(idParamsSchema, req.params).id, body.document, body.authorNote));
  });
  router.post('/rule-versions/:id/submit', engineer, async (req, res) => {
    res.json(await rules.submit(req.user!, parse(idParamsSchema, req.params).id, parse(submitRequestSchema, req.body ?? {}).note));
  });
  router.post('/rule-versions/:id/release', supervisor, async (req, res) => {
    res.json(await rules.release(req.user!, parse(idParamsSchema, req.params).id, parse(releaseRequestSchema, req.body)));
  });
  router.post('/rule-versions/:id/send-back', supervisor, async (req, res) => {
    res.json(await rules.sendBack(req.user!, parse(idParamsSchema, req.params).id, parse(sendBackRequestSchema, req.body).note));
  });
  router.post('/rule-versions/:id/withdraw', supervisor, async (req, res) => {
    res.json(await rules.withdraw(req.user!, parse(idParamsSchema, req.params).id, parse(withdrawRequestSchema, req.body).reason));
  });
  return router;
}
