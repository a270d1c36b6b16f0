import { In, type DataSource, type EntityManager } from 'typeorm';
import { AppError } from '../../lib/errors';
import { PartTypeEntity } from '../catalogue/entities';
import { StationPartTypeEntity, type StationEntity } from './entities';

/** The part type codes each station inspects, sorted; a station with none assigned maps to []. */
export async function partTypesByStation(manager: EntityManager, stationIds: string[]): Promise<Map<string, string[]>> {
  const rows = stationIds.length ? await manager.find(StationPartTypeEntity, { where: { stationId: In(stationIds) }, order: { partType: 'ASC' } }) : [];
  const byStation = new Map<string, string[]>(stationIds.map((id) => [id, []]));
  for (const row of rows) byStation.get(row.stationId)!.push(row.partType);
  return byStation;
}

/** Refuses codes missing from the catalogue, naming the path of the first one (e.g. `partTypes[1]`). */
export async function requireKnownPartTypes(manager: EntityManager, codes: string[]): Promise<void> {
  if (codes.length === 0) return;
  const known = new Set((await manager.find(PartTypeEntity, { where: { code: In(codes) }, select: { code: true } })).map((p) => p.code));
  const issues = codes.flatMap((code, i) => (known.has(code) ? [] : [{ path: `partTypes[${i}]`, message: `Unknown part type "${code}"` }]));
  if (issues.length) throw new AppError('validation_failed', `${issues[0].path}: ${issues[0].message}`, { issues });
}

/** Makes the station inspect exactly these part types. */
export async function replacePartTypes(manager: EntityManager, stationId: string, codes: string[]): Promise<void> {
  await manager.delete(StationPartTypeEntity, { stationId });
  if (codes.length) await manager.insert(StationPartTypeEntity, codes.map((partType) => ({ stationId, partType })));
}

/**
 * Refuses a rule for a part type the station does not inspect. A station with no part types
 * assigned (set up before stations named them) still accepts every released rule.
 */
export async function requireStationInspects(dataSource: DataSource, station: StationEntity, partType: string): Promise<void> {
  const inspected = (await partTypesByStation(dataSource.manager, [station.id])).get(station.id)!;
  if (inspected.length === 0 || inspected.includes(partType)) return;
  throw new AppError(
    'conflict',
    `${station.name} does not inspect part type "${partType}" (it inspects ${inspected.map((code) => `"${code}"`).join(', ')}); choose one of the station's rules`,
    { stationPartTypes: inspected, rulePartType: partType },
  );
}
