import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { listAuditEventsQuerySchema, type AuditEvent, type AuditEventPage } from '../../../shared/api/audit';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import { AuditEventEntity } from './entities';
import type { AuditService } from './service';

function toDto(e: AuditEventEntity): AuditEvent {
  return { ...e, seq: String(e.seq), occurredAt: e.occurredAt.toISOString() };
}

/** The audit trail, read-only: auditors and administrators. */
export function auditRoutes(dataSource: DataSource, audit: AuditService): Router {
  const router = Router();
  router.use(requireRole('auditor', 'admin'));
  router.get('/', async (req, res) => {
    const q = parse(listAuditEventsQuerySchema, req.query);
    const qb = dataSource.getRepository(AuditEventEntity).createQueryBuilder('e');
    if (q.entityType) qb.andWhere('e.entity_type = :entityType', { entityType: q.entityType });
    if (q.entityId) qb.andWhere('e.entity_id = :entityId', { entityId: q.entityId });
    if (q.action) qb.andWhere('e.action = :action', { action: q.action });
    if (q.before) qb.andWhere('e.seq < :before', { before: q.before });
    const rows = await qb.orderBy('e.seq', 'DESC').take(q.limit + 1).getMany();
    const page: AuditEventPage = {
      items: rows.slice(0, q.limit).map(toDto),
      nextBefore: rows.length > q.limit ? String(rows[q.limit - 1].seq) : null,
    };
    res.json(page);
  });
  router.get('/verify', async (_req, res) => {
    res.json(await audit.verifyChain());
  });
  router.get('/export.csv', async (req, res) => {
    res.set({
      'Content-Type': 'text/csv; charset=utf-8; header=present',
      'Content-Disposition': `attachment; filename="audit-trail-${new Date().toISOString().slice(0, 10)}.csv"`,
    });
    await audit.exportCsv(req.user!, res);
  });
  return router;
}
