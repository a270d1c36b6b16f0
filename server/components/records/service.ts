import type { Writable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { stringify } from 'csv-stringify';
import QueryStream from 'pg-query-stream';
import type { DataSource } from 'typeorm';
import { CSV_COLUMNS, type RecordFilters, type RecordPage } from '../../../shared/api/records';
import { notFound } from '../../lib/errors';
import type { ImageStore } from '../../lib/storage/image-store';
import type { AuditService } from '../audit/service';
import type { UserEntity } from '../auth/entities';
import { actorOf } from '../auth/service';
import type { InspectionsService } from '../inspections/service';
import type { KernelsService } from '../kernels/service';
import type { RulesService } from '../rules/service';
import type { TrialsService } from '../trials/service';
import { inspectionReport, ruleVersionReport } from './pdf';
import { decodeCursor, encodeCursor, RECORD_SELECT, whereClause } from './query';

interface RecordDbRow {
  id: string;
  created_at: Date;
  line_name: string;
  station_name: string;
  rule_name: string;
  rule_version_number: number;
  rule_version_id: string;
  content_hash: string;
  part_type: string;
  operator_name: string;
  verdict: 'PASS' | 'FAIL' | 'RETAKE';
  cause: string | null;
  image_hash: string;
  mm_per_px: number | null;
  disputed: boolean;
}

/** Inspection records for auditors and supervisors: a filtered table, CSV exports and PDF reports. */
export class RecordsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly store: ImageStore,
    private readonly audit: AuditService,
    private readonly inspections: InspectionsService,
    private readonly rules: RulesService,
    private readonly trials: TrialsService,
    private readonly kernels: KernelsService,
  ) {}

  /** One page, newest or oldest first, continued by a keyset cursor (stays fast on millions of rows). */
  async list(filters: RecordFilters, after: string | undefined, limit: number): Promise<RecordPage> {
    const params: unknown[] = [];
    let where = whereClause(filters, params);
    const newest = filters.order === 'newest';
    if (after) {
      const cursor = decodeCursor(after);
      params.push(cursor.createdAt, cursor.id);
      where += ` and (i.created_at, i.id) ${newest ? '<' : '>'} ($${params.length - 1}::timestamptz, $${params.length}::uuid)`;
    }
    params.push(limit + 1);
    const direction = newest ? 'desc' : 'asc';
    const rows: RecordDbRow[] = await this.dataSource.query(`${RECORD_SELECT} where ${where} order by i.created_at ${direction}, i.id ${direction} limit $${params.length}`, params);
    const page = rows.slice(0, limit);
    return {
      items: page.map((r) => ({
        id: r.id,
        createdAt: r.created_at.toISOString(),
        lineName: r.line_name,
        stationName: r.station_name,
        ruleName: r.rule_name,
        ruleVersionNumber: r.rule_version_number,
        ruleVersionId: r.rule_version_id,
        partType: r.part_type,
        verdict: r.verdict,
        cause: r.cause,
        operatorName: r.operator_name,
        disputed: r.disputed,
      })),
      next: rows.length > limit ? encodeCursor(page[page.length - 1].created_at, page[page.length - 1].id) : null,
    };
  }

  async count(filters: RecordFilters): Promise<number> {
    const params: unknown[] = [];
    const [{ n }] = await this.dataSource.query(`select count(*)::bigint as n from inspections i where ${whereClause(filters, params)}`, params);
    return Number(n);
  }

  /**
   * Streams the inspections matching the filters, one CSV row per measurement, from a database
   * cursor: memory stays flat whatever the number of rows. RFC 4180 dialect (CRLF line ends,
   * fields with commas, quotes or line breaks quoted, quotes doubled); times in ISO 8601 UTC.
   */
  async exportCsv(actor: UserEntity, filters: RecordFilters, out: Writable): Promise<void> {
    const rows = await this.count(filters);
    await this.audit.recordAlone({ actor: actorOf(actor), action: 'export.inspections-csv', entityType: 'inspection', details: { filters, inspections: rows } });
    const params: unknown[] = [];
    const where = whereClause(filters, params);
    const direction = filters.order === 'newest' ? 'desc' : 'asc';
    // record_reference is recordReference(id) (shared/api/records.ts): a uuid's text starts with its first eight hex digits.
    const sql = `select i.id as inspection_id, upper(substr(i.id::text, 1, 4) || '-' || substr(i.id::text, 5, 4)) as record_reference, to_char(i.created_at at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') as created_at_utc,
        l.name as line, s.name as station, r.name as rule, v.number as rule_version, v.content_hash as rule_content_sha256, i.part_type, p.name as part_type_name,
        u.display_name as operator, i.verdict, i.cause, i.image_hash as image_sha256, i.mm_per_px,
        m.gauge, m.value, m.unit, m.limit_min, m.limit_max, m.pass as gauge_pass,
        exists (select 1 from disputes d where d.inspection_id = i.id) as disputed
      from inspections i
      join lines l on l.id = i.line_id join stations s on s.id = i.station_id join rules r on r.id = i.rule_id
      join rule_versions v on v.id = i.rule_version_id join users u on u.id = i.operator_id
      left join part_types p on p.code = i.part_type
      left join measurements m on m.inspection_id = i.id
      where ${where}
      order by i.created_at ${direction}, i.id ${direction}, m.position`;
    const runner = this.dataSource.createQueryRunner('slave');
    const client = (await runner.connect()) as { query: (q: QueryStream) => NodeJS.ReadableStream };
    try {
      const source = client.query(new QueryStream(sql, params, { batchSize: 2000 }));
      const csv = stringify({
        header: true,
        columns: [...CSV_COLUMNS],
        record_delimiter: 'windows',
        cast: { boolean: (b) => (b ? 'true' : 'false'), number: (n) => String(n) },
      });
      await pipeline(source, csv, out);
    } finally {
      await runner.release();
    }
  }

  async inspectionPdf(actor: UserEntity, id: string): Promise<Buffer> {
    const inspection = await this.inspections.get(id);
    const version = await this.rules.version(inspection.ruleVersionId);
    const [row] = await this.dataSource.query('select i.image_hash, i.evidence_hash, p.name as part_type_name from inspections i left join part_types p on p.code = i.part_type where i.id = $1', [id]);
    if (!row) throw notFound('The inspection');
    const partType = row.part_type_name ? `${row.part_type_name} (${inspection.partType})` : inspection.partType;
    const pdf = await inspectionReport(inspection, version, await this.store.get(row.image_hash), row.evidence_hash ? await this.store.get(row.evidence_hash) : null, {
      name: actor.displayName,
      at: new Date(),
    }, partType);
    await this.audit.recordAlone({ actor: actorOf(actor), action: 'export.inspection-pdf', entityType: 'inspection', entityId: id });
    return pdf;
  }

  async ruleVersionPdf(actor: UserEntity, versionId: string): Promise<Buffer> {
    const version = await this.rules.version(versionId);
    const trialId = version.submittedTrialId ?? (await this.trials.listForVersion(versionId)).find((t) => t.state === 'done')?.id ?? null;
    const pdf = await ruleVersionReport(version, trialId ? await this.trials.get(trialId) : null, await this.kernels.library(), { name: actor.displayName, at: new Date() });
    await this.audit.recordAlone({ actor: actorOf(actor), action: 'export.rule-version-pdf', entityType: 'rule-version', entityId: versionId });
    return pdf;
  }
}
