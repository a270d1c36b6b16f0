import { Router } from 'express';
import { z } from 'zod';
import {
  bulkLabelRequestSchema,
  createReferenceSetRequestSchema,
  imageLabelSchema,
  labelChangeSchema,
  listReferenceImagesQuerySchema,
} from '../../../shared/api/references';
import { codeSchema } from '../../../shared/api/catalogue';
import { idParamsSchema } from '../../../shared/api/params';
import { AppError } from '../../lib/errors';
import { photoUpload } from '../../lib/uploads';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import type { ReferencesService } from './service';

const uploadFields = z.strictObject({
  label: imageLabelSchema.optional(),
  defectKind: codeSchema.optional(),
  note: z.string().trim().max(2000).optional(),
});

/** Reference sets and their labelled photos: engineers manage them; supervisors and auditors may look. */
export function referenceRoutes(references: ReferencesService): Router {
  const router = Router();
  const read = requireRole('engineer', 'supervisor', 'auditor');
  const write = requireRole('engineer');

  router.get('/', read, async (_req, res) => {
    res.json({ items: await references.listSets() });
  });
  router.post('/', write, async (req, res) => {
    res.status(201).json(await references.createSet(req.user!, parse(createReferenceSetRequestSchema, req.body)));
  });
  router.get('/:id', read, async (req, res) => {
    res.json(await references.getSet(parse(idParamsSchema, req.params).id));
  });
  router.get('/:id/images', read, async (req, res) => {
    res.json(await references.listImages(parse(idParamsSchema, req.params).id, parse(listReferenceImagesQuerySchema, req.query)));
  });
  router.post('/:id/images', write, photoUpload.array('photos'), async (req, res) => {
    const { id } = parse(idParamsSchema, req.params);
    const labels = parse(uploadFields, req.body ?? {});
    const files = (req.files as Express.Multer.File[] | undefined) ?? [];
    if (files.length === 0) throw new AppError('validation_failed', 'photos: choose at least one photo', { issues: [{ path: 'photos', message: 'Choose at least one photo' }] });
    const outcomes = await references.addImages(req.user!, id, files.map((f) => ({ fileName: Buffer.from(f.originalname, 'latin1').toString('utf8'), bytes: f.buffer })), labels);
    const stored = outcomes.filter((o) => o.status === 'stored').length;
    res.status(stored > 0 ? 201 : 200).json({ outcomes });
  });
  router.post('/:id/labels', write, async (req, res) => {
    const { id } = parse(idParamsSchema, req.params);
    const body = parse(bulkLabelRequestSchema, req.body);
    res.json({ items: await references.relabel(req.user!, body.imageIds, body.change, id) });
  });
  router.patch('/images/:id', write, async (req, res) => {
    const { id } = parse(idParamsSchema, req.params);
    const [image] = await references.relabel(req.user!, [id], parse(labelChangeSchema, req.body));
    res.json(image);
  });
  return router;
}
