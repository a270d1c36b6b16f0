import { Router } from 'express';
import { disputeRequestSchema, inspectRequestSchema } from '../../../shared/api/inspections';
import { idParamsSchema } from '../../../shared/api/params';
import { AppError } from '../../lib/errors';
import { photoUpload } from '../../lib/uploads';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import type { InspectionsService, InspectTimings } from './service';

/** The W3C Server-Timing header (www.w3.org/TR/server-timing): one metric per phase, then each engine step. */
export function serverTiming(receiveMs: number, timings: InspectTimings): string {
  const metric = (name: string, ms: number | undefined, desc?: string) =>
    ms === undefined ? null : `${name};${desc ? `desc="${desc}";` : ''}dur=${ms.toFixed(1)}`;
  return [
    metric('receive', receiveMs, 'photo upload read'),
    metric('lookup', timings.lookup),
    metric('decode', timings.decode),
    metric('pipeline', timings.pipeline, 'worker pool with queue and transfer'),
    metric('engine', timings.engine, 'inside the worker'),
    ...(timings.steps ?? []).map((s, i) => metric(`step-${i + 1}`, s.ms, s.op)),
    metric('store', timings.store),
    metric('evidence', timings.evidence),
    metric('database', timings.database),
    metric('reply', timings.reply),
  ]
    .filter((m) => m !== null)
    .join(', ');
}

/** Operators inspect parts and dispute verdicts; supervisors and auditors read inspections. */
export function inspectionRoutes(inspections: InspectionsService): Router {
  const router = Router();
  router.post(
    '/',
    requireRole('operator'),
    (_req, res, next) => {
      res.locals.receiveStarted = performance.now();
      next();
    },
    photoUpload.single('photo'),
    async (req, res) => {
      const receiveMs = performance.now() - (res.locals.receiveStarted as number);
      const request = parse(inspectRequestSchema, req.body ?? {});
      if (!req.file) throw new AppError('validation_failed', 'photo: take or choose a photo of the part', { issues: [{ path: 'photo', message: 'Missing' }] });
      const { inspection, created, timings } = await inspections.inspect(req.user!, request, req.file.buffer);
      res.setHeader('Server-Timing', serverTiming(receiveMs, timings));
      res.status(created ? 201 : 200).json(inspection);
    },
  );
  router.get('/:id', requireRole('operator', 'supervisor', 'auditor'), async (req, res) => {
    res.json(await inspections.get(parse(idParamsSchema, req.params).id));
  });
  router.post('/:id/dispute', requireRole('operator'), async (req, res) => {
    res.status(201).json(await inspections.dispute(req.user!, parse(idParamsSchema, req.params).id, parse(disputeRequestSchema, req.body).note));
  });
  return router;
}
