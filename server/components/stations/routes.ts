import { Router } from 'express';
import { calibrationRequestSchema, createLineRequestSchema, createStationRequestSchema, updateStationRequestSchema } from '../../../shared/api/stations';
import { idParamsSchema } from '../../../shared/api/params';
import { parse } from '../../lib/validate';
import { requireRole } from '../auth/require-role';
import type { StationsService } from './service';

/** Lines and stations: everyone signed in may list them (operators choose one); supervisors and admins manage them. */
export function stationRoutes(stations: StationsService): Router {
  const router = Router();
  const manage = requireRole('supervisor', 'admin');
  router.get('/lines', async (_req, res) => {
    res.json({ items: await stations.lines() });
  });
  router.post('/lines', manage, async (req, res) => {
    res.status(201).json(await stations.createLine(req.user!, parse(createLineRequestSchema, req.body)));
  });
  router.post('/', manage, async (req, res) => {
    res.status(201).json(await stations.createStation(req.user!, parse(createStationRequestSchema, req.body)));
  });
  router.get('/:id', async (req, res) => {
    res.json((await stations.get(parse(idParamsSchema, req.params).id)).dto);
  });
  router.patch('/:id', manage, async (req, res) => {
    res.json(await stations.update(req.user!, parse(idParamsSchema, req.params).id, parse(updateStationRequestSchema, req.body)));
  });
  router.post('/:id/calibration', manage, async (req, res) => {
    res.json(await stations.calibrate(req.user!, parse(idParamsSchema, req.params).id, parse(calibrationRequestSchema, req.body)));
  });
  return router;
}
