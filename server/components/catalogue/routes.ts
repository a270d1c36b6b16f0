import { Router } from 'express';
import { createDefectKindRequestSchema } from '../../../shared/api/catalogue';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import type { CatalogueService } from './service';

export function catalogueRoutes(catalogue: CatalogueService): Router {
  const router = Router();
  router.get('/part-types', async (_req, res) => {
    res.json({ items: await catalogue.partTypes() });
  });
  router.get('/defect-kinds', async (_req, res) => {
    res.json({ items: await catalogue.defectKinds() });
  });
  router.post('/defect-kinds', requireRole('engineer', 'supervisor'), async (req, res) => {
    res.status(201).json(await catalogue.addDefectKind(req.user!, parse(createDefectKindRequestSchema, req.body)));
  });
  return router;
}
