import type { UserEntity } from '../../server/components/auth/entities';
import { TEST_PASSWORD, type TestApp } from './app';

export interface ReleasedRuleSetup {
  engineer: UserEntity;
  supervisor: UserEntity;
  stationId: string;
  releasedId: string;
}

/**
 * A part type, a calibrated station and a rule released by a second person, as an operator finds
 * them at the line. The trial is recorded directly: the trial runner is tested on its own.
 */
export async function releasedRule(t: TestApp, document: unknown, options: { partType?: string; mmPerPx?: { lengthMm: number; px: number } } = {}): Promise<ReleasedRuleSetup> {
  const q = (sql: string, p: unknown[] = []) => t.db.dataSource.query(sql, p);
  const partType = options.partType ?? 'plate';
  await q(`insert into part_types (code, name, family) values ($1, $1, $1) on conflict do nothing`, [partType]);
  const engineer = await t.createUser(`eng-${partType}`, ['engineer']);
  const supervisor = await t.createUser(`sup-${partType}`, ['supervisor']);
  const { rules, stations } = t.services;
  const line = await stations.createLine(supervisor, { name: `Line ${partType}` });
  const station = await stations.createStation(supervisor, { lineId: line.id, name: `Press ${partType}`, cameraNote: '' });
  const calibration = options.mmPerPx ?? { lengthMm: 10, px: 200 };
  const stationId = (await stations.calibrate(supervisor, station.id, { referenceLengthMm: calibration.lengthMm, distancePx: calibration.px })).id;
  const rule = await rules.create(engineer, { name: `Rule for ${partType}`, partType, smallestDefectMm: null, document });
  const releasedId = rule.versions[0].id;
  const [v] = await q('select content_hash from rule_versions where id = $1', [releasedId]);
  const [set] = await q(`insert into reference_sets (name, part_type, created_by) values ($1, $2, $3) returning id`, [`Set ${partType}`, partType, engineer.id]);
  await q(`insert into trials (rule_version_id, reference_set_id, content_hash, state, started_by) values ($1, $2, $3, 'done', $4)`, [releasedId, set.id, v.content_hash, engineer.id]);
  await rules.submit(engineer, releasedId, '');
  await rules.release(supervisor, releasedId, { password: TEST_PASSWORD, meaning: 'approval', note: '' });
  return { engineer, supervisor, stationId, releasedId };
}
