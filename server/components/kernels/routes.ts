import { Router } from 'express';
import { createKernelRequestSchema } from '../../../shared/api/kernels';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import type { KernelsService } from './service';

/** The kernel library: everyone who works with rules reads it; engineers add their own kernels. */
export function kernelRoutes(kernels: KernelsService): Router {
  const router = Router();
  router.get('/', requireRole('engineer', 'supervisor', 'auditor'), async (_req, res) => {
    res.json({ items: await kernels.list() });
  });
  router.post('/', requireRole('engineer'), async (req, res) => {
    res.status(201).json(await kernels.add(req.user!, parse(createKernelRequestSchema, req.body)));
  });
  return router;
}
