import { Router } from 'express';
import { z } from 'zod';
import { disputeRequestSchema, inspectRequestSchema } from '../../../shared/api/inspections';
import { AppError } from '../../lib/errors';
import { photoUpload } from '../../lib/uploads';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import type { InspectionsService } from './service';

const idParams = z.object({ id: z.uuid('Not a valid id') });

/** Operators inspect parts and dispute verdicts; supervisors and auditors read inspections. */
export function inspectionRoutes(inspections: InspectionsService): Router {
  const router = Router();
  router.post('/', requireRole('operator'), photoUpload.single('photo'), async (req, res) => {
    const request = parse(inspectRequestSchema, req.body ?? {});
    if (!req.file) throw new AppError('validation_failed', 'photo: take or choose a photo of the part', { issues: [{ path: 'photo', message: 'Missing' }] });
    const { inspection, created } = await inspections.inspect(req.user!, request, req.file.buffer);
    res.status(created ? 201 : 200).json(inspection);
  });
  router.get('/:id', requireRole('operator', 'supervisor', 'auditor'), async (req, res) => {
    res.json(await inspections.get(parse(idParams, req.params).id));
  });
  router.post('/:id/dispute', requireRole('operator'), async (req, res) => {
    res.status(201).json(await inspections.dispute(req.user!, parse(idParams, req.params).id, parse(disputeRequestSchema, req.body).note));
  });
  return router;
}
