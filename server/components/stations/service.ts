import type { DataSource } from 'typeorm';
import type { z } from 'zod';
import type { calibrationRequestSchema, createLineRequestSchema, createStationRequestSchema, Line, Station, updateStationRequestSchema } from '../../../shared/api/stations';
import { pixelQuantisationUncertaintyMm, scaleFromReference } from '../../../shared/calibration';
import { AppError, notFound } from '../../lib/errors';
import type { AuditService } from '../audit/service';
import { UserEntity } from '../auth/entities';
import { actorOf } from '../auth/service';
import { LineEntity, StationEntity } from './entities';
import { partTypesByStation, replacePartTypes, requireKnownPartTypes } from './part-types';

const UNIQUE_VIOLATION = '23505';

/** Callers inside the server (seed, tests) may leave out the part types: none are assigned then. */
type CreateStation = Omit<z.output<typeof createStationRequestSchema>, 'partTypes'> & { partTypes?: string[] };

export class StationsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
  ) {}

  private async toDto(station: StationEntity, lineName: string, partTypes: string[]): Promise<Station> {
    const calibratedBy = station.calibratedBy ? (await this.dataSource.getRepository(UserEntity).findOneBy({ id: station.calibratedBy }))?.displayName ?? null : null;
    return {
      id: station.id,
      lineId: station.lineId,
      lineName,
      name: station.name,
      cameraNote: station.cameraNote,
      mmPerPx: station.mmPerPx,
      photoWidthPx: station.photoWidthPx,
      photoHeightPx: station.photoHeightPx,
      quantisationUncertaintyMm: station.mmPerPx === null ? null : pixelQuantisationUncertaintyMm(station.mmPerPx),
      calibratedAt: station.calibratedAt?.toISOString() ?? null,
      calibratedBy,
      active: station.active,
      partTypes,
    };
  }

  async lines(): Promise<Line[]> {
    const lines = await this.dataSource.getRepository(LineEntity).find({ order: { name: 'ASC' } });
    const stations = await this.dataSource.getRepository(StationEntity).find({ order: { name: 'ASC' } });
    const partTypes = await partTypesByStation(this.dataSource.manager, stations.map((s) => s.id));
    return Promise.all(
      lines.map(async (line) => ({
        id: line.id,
        name: line.name,
        stations: await Promise.all(stations.filter((s) => s.lineId === line.id).map((s) => this.toDto(s, line.name, partTypes.get(s.id)!))),
      })),
    );
  }

  async get(id: string): Promise<{ entity: StationEntity; dto: Station }> {
    const entity = await this.dataSource.getRepository(StationEntity).findOne({ where: { id }, relations: { line: true } });
    if (!entity) throw notFound('The station');
    const partTypes = (await partTypesByStation(this.dataSource.manager, [id])).get(id)!;
    return { entity, dto: await this.toDto(entity, entity.line!.name, partTypes) };
  }

  async createLine(actor: UserEntity, input: z.output<typeof createLineRequestSchema>): Promise<Line> {
    try {
      return await this.dataSource.transaction(async (manager) => {
        const line = await manager.save(manager.create(LineEntity, input));
        await this.audit.record(manager, { actor: actorOf(actor), action: 'line.create', entityType: 'line', entityId: line.id, after: input });
        return { id: line.id, name: line.name, stations: [] };
      });
    } catch (err) {
      if ((err as { code?: string }).code === UNIQUE_VIOLATION) throw new AppError('conflict', `A line named "${input.name}" exists`, { issues: [{ path: 'name', message: 'Already taken' }] });
      throw err;
    }
  }

  async createStation(actor: UserEntity, input: CreateStation): Promise<Station> {
    if (!(await this.dataSource.getRepository(LineEntity).existsBy({ id: input.lineId }))) throw notFound('The line');
    const { partTypes = [], ...fields } = input;
    await requireKnownPartTypes(this.dataSource.manager, partTypes);
    try {
      const id = await this.dataSource.transaction(async (manager) => {
        const station = await manager.save(manager.create(StationEntity, fields));
        await replacePartTypes(manager, station.id, partTypes);
        const after = { ...fields, partTypes: [...partTypes].sort() };
        await this.audit.record(manager, { actor: actorOf(actor), action: 'station.create', entityType: 'station', entityId: station.id, after, details: after });
        return station.id;
      });
      return (await this.get(id)).dto;
    } catch (err) {
      if ((err as { code?: string }).code === UNIQUE_VIOLATION) throw new AppError('conflict', `The line already has a station named "${input.name}"`, { issues: [{ path: 'name', message: 'Already taken' }] });
      throw err;
    }
  }

  async update(actor: UserEntity, id: string, input: z.output<typeof updateStationRequestSchema>): Promise<Station> {
    const { partTypes, ...fields } = input;
    if (partTypes) await requireKnownPartTypes(this.dataSource.manager, partTypes);
    await this.dataSource.transaction(async (manager) => {
      const station = await manager.findOne(StationEntity, { where: { id }, lock: { mode: 'pessimistic_write' } });
      if (!station) throw notFound('The station');
      const partTypesBefore = (await partTypesByStation(manager, [id])).get(id)!;
      const before = { name: station.name, cameraNote: station.cameraNote, active: station.active, partTypes: partTypesBefore };
      Object.assign(station, fields);
      await manager.save(station);
      if (partTypes) await replacePartTypes(manager, id, partTypes);
      const after = { name: station.name, cameraNote: station.cameraNote, active: station.active, partTypes: partTypes ? [...partTypes].sort() : partTypesBefore };
      await this.audit.record(manager, { actor: actorOf(actor), action: 'station.update', entityType: 'station', entityId: id, before, after, details: { before, after } });
    });
    return (await this.get(id)).dto;
  }

  /** Sets the station's scale from a target of known length, and the photo size it holds for; who and when are kept with it. */
  async calibrate(actor: UserEntity, id: string, input: z.output<typeof calibrationRequestSchema>): Promise<Station> {
    const mmPerPx = scaleFromReference(input.referenceLengthMm, input.distancePx);
    await this.dataSource.transaction(async (manager) => {
      const station = await manager.findOne(StationEntity, { where: { id }, lock: { mode: 'pessimistic_write' } });
      if (!station) throw notFound('The station');
      const before = { mmPerPx: station.mmPerPx, photoWidthPx: station.photoWidthPx, photoHeightPx: station.photoHeightPx };
      const after = { mmPerPx, photoWidthPx: input.photoWidthPx ?? null, photoHeightPx: input.photoHeightPx ?? null };
      Object.assign(station, after);
      station.calibratedAt = new Date();
      station.calibratedBy = actor.id;
      await manager.save(station);
      await this.audit.record(manager, {
        actor: actorOf(actor),
        action: 'station.calibrate',
        entityType: 'station',
        entityId: id,
        before,
        after,
        details: { ...input, mmPerPx, previousMmPerPx: before.mmPerPx, previousPhotoWidthPx: before.photoWidthPx, previousPhotoHeightPx: before.photoHeightPx },
      });
    });
    return (await this.get(id)).dto;
  }
}
