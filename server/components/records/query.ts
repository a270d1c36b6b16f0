import type { RecordFilters } from '../../../shared/api/records';
import { AppError } from '../../lib/errors';

/** SQL text and parameters for the filters (every value is a bound parameter, never text in the SQL). */
export function whereClause(filters: RecordFilters, params: unknown[]): string {
  const parts: string[] = [];
  const bind = (value: unknown) => {
    params.push(value);
    return `$${params.length}`;
  };
  if (filters.from) parts.push(`i.created_at >= ${bind(filters.from)}`);
  if (filters.to) parts.push(`i.created_at < ${bind(filters.to)}`);
  if (filters.lineId) parts.push(`i.line_id = ${bind(filters.lineId)}`);
  if (filters.stationId) parts.push(`i.station_id = ${bind(filters.stationId)}`);
  if (filters.ruleId) parts.push(`i.rule_id = ${bind(filters.ruleId)}`);
  if (filters.ruleVersionId) parts.push(`i.rule_version_id = ${bind(filters.ruleVersionId)}`);
  if (filters.verdict) parts.push(`i.verdict = ${bind(filters.verdict)}`);
  if (filters.operatorId) parts.push(`i.operator_id = ${bind(filters.operatorId)}`);
  if (filters.partType) parts.push(`i.part_type = ${bind(filters.partType)}`);
  if (filters.cause) parts.push(`i.cause = ${bind(filters.cause)}`);
  // A reference is the id's first eight hex digits: a range of the id's index, not a text match.
  if (filters.ref) parts.push(`i.id between ${bind(`${filters.ref}-0000-0000-0000-000000000000`)}::uuid and ${bind(`${filters.ref}-ffff-ffff-ffff-ffffffffffff`)}::uuid`);
  // Disputed inspections are few: starting from the disputes keeps the page fast on millions of
  // inspections (a correlated exists made the planner walk the time index instead).
  if (filters.disputed === 'true') parts.push(`i.id = any(array(select d.inspection_id from disputes d))`);
  if (filters.disputed === 'false') parts.push(`not exists (select 1 from disputes d where d.inspection_id = i.id)`);
  return parts.length ? parts.join(' and ') : 'true';
}

/** Keyset cursor: the last row's time and id, so the next page starts after it however many rows there are. */
export function encodeCursor(createdAt: Date, id: string): string {
  return Buffer.from(JSON.stringify([createdAt.toISOString(), id])).toString('base64url');
}

export function decodeCursor(cursor: string): { createdAt: string; id: string } {
  try {
    const [createdAt, id] = JSON.parse(Buffer.from(cursor, 'base64url').toString('utf8')) as [string, string];
    if (Number.isNaN(Date.parse(createdAt)) || !/^[0-9a-f-]{36}$/.test(id)) throw new Error('bad cursor');
    return { createdAt, id };
  } catch {
    throw new AppError('validation_failed', 'after: not a page cursor from this list', { issues: [{ path: 'after', message: 'Not a page cursor' }] });
  }
}

export const RECORD_SELECT = `
  select i.id, i.created_at, l.name as line_name, s.name as station_name, r.name as rule_name, v.number as rule_version_number,
         i.rule_version_id, v.content_hash, i.part_type, u.display_name as operator_name, i.verdict, i.cause, i.image_hash, i.mm_per_px,
         exists (select 1 from disputes d where d.inspection_id = i.id) as disputed
  from inspections i
  join lines l on l.id = i.line_id
  join stations s on s.id = i.station_id
  join rules r on r.id = i.rule_id
  join rule_versions v on v.id = i.rule_version_id
  join users u on u.id = i.operator_id`;
