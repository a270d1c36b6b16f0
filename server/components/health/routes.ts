import { Router } from 'express';
import type { DataSource } from 'typeorm';
import type { Health } from '../../../shared/api/health';

/** Reports whether the API and its database answer; 503 when the database is down. */
export function healthRoutes(dataSource: DataSource, version: string): Router {
  const router = Router();
  router.get('/', async (_req, res) => {
    const started = process.hrtime.bigint();
    let up = false;
    try {
      await dataSource.query('select 1');
      up = true;
    } catch {
      up = false;
    }
    const latencyMs = up ? Number(process.hrtime.bigint() - started) / 1e6 : null;
    const body: Health = {
      status: up ? 'ok' : 'degraded',
      database: { status: up ? 'up' : 'down', latencyMs: latencyMs === null ? null : Math.round(latencyMs * 100) / 100 },
      version,
      time: new Date().toISOString(),
    };
    res.status(up ? 200 : 503).json(body);
  });
  return router;
}
