import { Router } from 'express';
import { exportFileName, listRecordsQuerySchema, recordFiltersSchema } from '../../../shared/api/records';
import { idParamsSchema } from '../../../shared/api/params';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import type { RecordsService } from './service';

/** Records and exports: auditors and supervisors, read-only. */
export function recordRoutes(records: RecordsService): Router {
  const router = Router();
  const read = requireRole('auditor', 'supervisor');
  router.get('/records/inspections', read, async (req, res) => {
    const q = parse(listRecordsQuerySchema, req.query);
    const { after, limit, ...filters } = q;
    res.json(await records.list(filters, after, limit));
  });
  router.get('/records/inspections.csv', read, async (req, res) => {
    const filters = parse(recordFiltersSchema, req.query);
    // The row count comes first so that a client can show progress while the file streams.
    res.set({
      'Content-Type': 'text/csv; charset=utf-8; header=present',
      'Content-Disposition': `attachment; filename="${exportFileName(filters, new Date())}"`,
      'X-Inspection-Count': String(await records.count(filters)),
    });
    await records.exportCsv(req.user!, filters, res);
  });
  router.get('/records/inspections/:id/report.pdf', read, async (req, res) => {
    const { id } = parse(idParamsSchema, req.params);
    res.set({ 'Content-Type': 'application/pdf', 'Content-Disposition': `attachment; filename="inspection-${id}.pdf"` });
    res.send(await records.inspectionPdf(req.user!, id));
  });
  router.get('/records/rule-versions/:id/report.pdf', read, async (req, res) => {
    const { id } = parse(idParamsSchema, req.params);
    res.set({ 'Content-Type': 'application/pdf', 'Content-Disposition': `attachment; filename="rule-version-${id}.pdf"` });
    res.send(await records.ruleVersionPdf(req.user!, id));
  });
  return router;
}
