import { Router } from 'express';
import { previewRequestSchema } from '../../../shared/api/preview';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import type { PreviewService } from './service';

export function previewRoutes(preview: PreviewService): Router {
  const router = Router();
  router.post('/', requireRole('engineer', 'supervisor'), async (req, res) => {
    const body = parse(previewRequestSchema, req.body);
    res.json(await preview.run(body.document, body.referenceImageId, body.stationId));
  });
  return router;
}
