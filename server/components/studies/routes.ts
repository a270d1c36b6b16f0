import { Router, type RequestHandler } from 'express';
import { attributeAgreementQuerySchema, createRepeatabilityStudySchema } from '../../../shared/api/studies';
import { idParamsSchema } from '../../../shared/api/params';
import { AppError } from '../../lib/errors';
import { MAX_FILES_PER_UPLOAD, photoUpload } from '../../lib/uploads';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import type { StudiesService } from './service';

const MIN_PHOTOS = 2;
const photoCount = () =>
  new AppError('validation_failed', `photos: send ${MIN_PHOTOS} to ${MAX_FILES_PER_UPLOAD} photos of the same part`, {
    issues: [{ path: 'photos', message: `Send ${MIN_PHOTOS} to ${MAX_FILES_PER_UPLOAD} photos of the same part` }],
  });

/** The photos of a study; too many of them is said in the study's words. */
const studyPhotos: RequestHandler = (req, res, next) => {
  photoUpload.array('photos', MAX_FILES_PER_UPLOAD)(req, res, (err?: unknown) => {
    next((err as { code?: string } | undefined)?.code === 'LIMIT_FILE_COUNT' ? photoCount() : err);
  });
};

/** Measurement system analysis: engineers and supervisors run studies; auditors may read them. */
export function studyRoutes(studies: StudiesService): Router {
  const router = Router();
  const read = requireRole('engineer', 'supervisor', 'auditor');
  const write = requireRole('engineer', 'supervisor');

  router.post('/repeatability', write, studyPhotos, async (req, res) => {
    const input = parse(createRepeatabilityStudySchema, req.body ?? {});
    const files = (req.files as Express.Multer.File[] | undefined) ?? [];
    if (files.length < MIN_PHOTOS) throw photoCount();
    res.status(201).json(await studies.createRepeatability(req.user!, input, files.map((f) => f.buffer)));
  });
  router.get('/repeatability', read, async (_req, res) => {
    res.json({ items: await studies.listRepeatability() });
  });
  router.get('/repeatability/:id', read, async (req, res) => {
    res.json(await studies.getRepeatability(parse(idParamsSchema, req.params).id));
  });
  router.get('/attribute-agreement', read, async (req, res) => {
    res.json(await studies.attributeAgreement(parse(attributeAgreementQuerySchema, req.query)));
  });
  return router;
}
