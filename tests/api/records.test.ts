// Records, CSV export and PDF reports (issue 8).
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import sharp from 'sharp';
import request from 'supertest';
import { CSV_COLUMNS, recordPageSchema, recordReference } from '../../shared/api/records';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../support/app';

jest.setTimeout(180_000);

let t: TestApp;
let auditor: { Authorization: string };
let versionId: string;
let stationId: string;
let failedId: string;
const BULK = 100_000;

const RULE = {
  format: 'kernwright-rule/1',
  name: 'Bright spot',
  steps: [{ op: 'threshold', method: 'fixed', value: 200 }],
  gauges: [
    { name: 'Spot area', measure: 'largest-blob-area', unit: 'px2', limits: { max: 20 } },
    { name: 'Spot count, "bright", per part', measure: 'blob-count', limits: { max: 3 } },
  ],
};

async function photo(defect: number): Promise<Buffer> {
  const px = Buffer.alloc(48 * 32, 110);
  for (let y = 5; y < 5 + defect; y++) for (let x = 5; x < 5 + defect; x++) px[y * 48 + x] = 250;
  return sharp(px, { raw: { width: 48, height: 32, channels: 1 } }).png().toBuffer();
}

beforeAll(async () => {
  t = await createTestApp();
  const q = (sql: string, p: unknown[] = []) => t.db.dataSource.query(sql, p);
  await q(`insert into part_types (code, name, family) values ('plate', 'Plate', 'plate')`);
  const engineer = await t.createUser('ines', ['engineer']);
  const supervisor = await t.createUser('mara', ['supervisor']);
  const operator = await t.createUser('tomas', ['operator']);
  await t.createUser('kofi', ['auditor']);
  auditor = { Authorization: `Bearer ${await t.tokenFor('kofi')}` };
  const { rules, stations, inspections } = t.services;
  const line = await stations.createLine(supervisor, { name: 'Line 1, "north"' });
  stationId = (await stations.createStation(supervisor, { lineId: line.id, name: 'Press 1', cameraNote: '' })).id;
  const rule = await rules.create(engineer, { name: 'Plate spots', partType: 'plate', smallestDefectMm: null, document: RULE });
  versionId = rule.versions[0].id;
  const [set] = await q(`insert into reference_sets (name, part_type, created_by) values ('s', 'plate', $1) returning id`, [engineer.id]);
  await q(`insert into trials (rule_version_id, reference_set_id, content_hash, state, started_by, summary) values ($1, $2, $3, 'done', $4, null)`, [versionId, set.id, rule.versions[0].contentHash, engineer.id]);
  await rules.submit(engineer, versionId, '');
  await rules.release(supervisor, versionId, { password: TEST_PASSWORD, meaning: 'approval', note: '' });
  for (let i = 0; i < 6; i++) {
    const { inspection } = await inspections.inspect(operator, { stationId, ruleVersionId: versionId, idempotencyKey: `rec-${i}-abcdef` }, await photo(i === 5 ? 8 : 2), { at: new Date(Date.UTC(2026, 10, 1 + i, 8)) });
    if (inspection.verdict === 'FAIL') failedId = inspection.id;
  }
  // Bulk history by SQL: 100 000 inspections of one measurement each (inserts only: the tables are append-only).
  await q(
    `insert into inspections (idempotency_key, rule_version_id, rule_id, station_id, line_id, part_type, operator_id, image_hash, verdict, quality, duration_ms, created_at)
     select 'bulk-' || g, v.id, v.rule_id, $2, s.line_id, 'plate', $3, repeat('a', 64), case when g % 17 = 0 then 'FAIL' else 'PASS' end, '{}', 10,
            timestamptz '2026-06-01 00:00Z' + g * interval '1 minute'
     from generate_series(1, $4::int) g, rule_versions v, stations s where v.id = $1 and s.id = $2`,
    [versionId, stationId, operator.id, BULK],
  );
  await q(`insert into measurements (inspection_id, position, gauge, value, unit, limit_max, pass)
           select id, 0, 'Spot area', 4, 'px2', 20, true from inspections where idempotency_key like 'bulk-%'`);
});
afterAll(() => t.close());

test('the records table pages by keyset, newest first, and filters by verdict and date', async () => {
  const first = recordPageSchema.parse((await request(t.app).get('/api/records/inspections?limit=4').set(auditor)).body);
  expect(first.items.map((r) => r.createdAt)).toEqual([...first.items.map((r) => r.createdAt)].sort().reverse());
  const second = recordPageSchema.parse((await request(t.app).get(`/api/records/inspections?limit=4&after=${first.next}`).set(auditor)).body);
  expect(second.items[0].createdAt <= first.items[3].createdAt).toBe(true);
  expect(new Set([...first.items, ...second.items].map((r) => r.id)).size).toBe(8);
  const november = recordPageSchema.parse((await request(t.app).get('/api/records/inspections?from=2026-11-01T00:00:00Z&to=2026-11-30T00:00:00Z&verdict=FAIL').set(auditor)).body);
  expect(november.items.map((r) => r.id)).toEqual([failedId]);
  expect(november.items[0]).toMatchObject({ stationName: 'Press 1', ruleName: 'Plate spots', ruleVersionNumber: 1, verdict: 'FAIL', cause: 'Spot area' });
});

test('a record reference (the id\'s first eight hex digits, as written on a part\'s tag) finds its inspection', async () => {
  const reference = recordReference(failedId);
  expect(reference).toMatch(/^[0-9A-F]{4}-[0-9A-F]{4}$/);
  expect(reference.replace('-', '').toLowerCase()).toBe(failedId.slice(0, 8));
  // As printed, without the dash, in lower case and with spaces around: the same inspection.
  for (const typed of [reference, reference.replace('-', ''), ` ${reference.toLowerCase()} `]) {
    const found = recordPageSchema.parse((await request(t.app).get('/api/records/inspections').query({ ref: typed }).set(auditor)).body);
    expect(found.items.map((r) => r.id)).toEqual([failedId]);
  }
  // Another reference finds none of it; text that is no reference is refused by name.
  const other = failedId.startsWith('0') ? 'FFFF-FFFF' : '0000-0000';
  const none = recordPageSchema.parse((await request(t.app).get('/api/records/inspections').query({ ref: other }).set(auditor)).body);
  expect(none.items.some((r) => r.id === failedId)).toBe(false);
  const refused = await request(t.app).get('/api/records/inspections').query({ ref: "7F3A' or '1'='1" }).set(auditor);
  expect(refused.status).toBe(400);
  expect(refused.body.error.details.issues[0]).toMatchObject({ path: 'ref' });
});

test('the disputed filter lists exactly the disputed inspections, and its opposite all the others', async () => {
  const operator = { Authorization: `Bearer ${await t.tokenFor('tomas')}` };
  expect((await request(t.app).post(`/api/inspections/${failedId}/dispute`).set(operator).send({ note: 'The spot wipes off' })).status).toBe(201);
  const november = 'from=2026-11-01T00:00:00Z&to=2026-11-30T00:00:00Z';
  const disputed = recordPageSchema.parse((await request(t.app).get(`/api/records/inspections?${november}&disputed=true`).set(auditor)).body);
  expect(disputed.items.map((r) => [r.id, r.disputed])).toEqual([[failedId, true]]);
  const others = recordPageSchema.parse((await request(t.app).get(`/api/records/inspections?${november}&disputed=false`).set(auditor)).body);
  expect(others.items).toHaveLength(5);
  expect(others.items.some((r) => r.id === failedId || r.disputed)).toBe(false);
});

test('filters refuse anything that is not their type, so no text reaches the SQL', async () => {
  for (const query of ["stationId=1' or '1'='1", 'verdict=PASS;drop table inspections', "from=2026-01-01'--", 'after=not-a-cursor', 'order=random()']) {
    const res = await request(t.app).get(`/api/records/inspections?${query}`).set(auditor);
    expect(res.status).toBe(400);
  }
  const [{ n }] = await t.db.dataSource.query('select count(*)::int as n from inspections');
  expect(n).toBe(BULK + 6);
});

test('the CSV export parses back with a general CSV parser to the same values (RFC 4180)', async () => {
  const res = await request(t.app).get('/api/records/inspections.csv?from=2026-11-01T00:00:00Z&order=oldest').set(auditor);
  expect(res.status).toBe(200);
  expect(res.headers['x-inspection-count']).toBe('6');
  // The file's name says what it holds and when it was made.
  expect(res.headers['content-disposition']).toMatch(/^attachment; filename="inspections_2026-11-01_to_now_exported-20\d\d-\d\d-\d\d\.csv"$/);
  expect(res.text.includes('\r\n')).toBe(true);
  const rows: Record<string, string>[] = parseCsv(res.text, { columns: true });
  expect(Object.keys(rows[0])).toEqual([...CSV_COLUMNS]);
  expect(rows).toHaveLength(12); // 6 inspections × 2 gauges
  const failed = rows.filter((r) => r.inspection_id === failedId);
  expect(failed.map((r) => r.gauge)).toEqual(['Spot area', 'Spot count, "bright", per part']);
  expect(failed[0]).toMatchObject({ line: 'Line 1, "north"', verdict: 'FAIL', value: '64', limit_max: '20', gauge_pass: 'false', created_at_utc: '2026-11-06T08:00:00.000Z' });
  // The reference written on the part's tag, and the part type as the catalogue names it.
  expect(failed[0]).toMatchObject({ record_reference: recordReference(failedId), part_type: 'plate', part_type_name: 'Plate' });
  const [db] = await t.db.dataSource.query('select v.content_hash from rule_versions v where v.id = $1', [versionId]);
  expect(failed[0].rule_content_sha256).toBe(db.content_hash);
});

test('exporting 100 000 inspections streams within a hard 96 MB heap ceiling', () => {
  // A process of its own with --max-old-space-size=96: an export that held 100 000 rows of 20 fields
  // (well over 150 MB as objects, plus ~30 MB of text) would run out of heap and crash.
  const out = execFileSync(
    process.execPath,
    ['--max-old-space-size=96', '-r', 'ts-node/register/transpile-only', path.join(__dirname, '..', 'support', 'export-csv-child.ts'), t.db.url, 'kofi', '2026-10-01T00:00:00Z'],
    { env: { ...process.env, TS_NODE_PROJECT: path.join(__dirname, '..', '..', 'server', 'tsconfig.json') }, encoding: 'utf8', maxBuffer: 1e6 },
  );
  const result = JSON.parse(out.trim().split('\n').pop()!) as { bytes: number; lines: number; peakHeap: number };
  expect(result.lines).toBe(BULK + 1);
  expect(result.bytes).toBeGreaterThan(20e6);
  console.log(`CSV export: ${BULK} inspections, ${(result.bytes / 1e6).toFixed(1)} MB of CSV, peak heap ${(result.peakHeap / 1e6).toFixed(1)} MB`);
});

function pdfText(pdf: Buffer): string {
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'kw-pdf-')), 'r.pdf');
  fs.writeFileSync(file, pdf);
  return execFileSync('pdftotext', ['-layout', file, '-']).toString('utf8');
}

test('the inspection report carries the verdict, measurements, rule version and its signature', async () => {
  const res = await request(t.app).get(`/api/records/inspections/${failedId}/report.pdf`).set(auditor).buffer(true).parse((r, done) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => done(null, Buffer.concat(chunks)));
  });
  expect(res.headers['content-type']).toBe('application/pdf');
  const text = pdfText(res.body as Buffer);
  expect(text).toMatch(/Verdict: FAIL \(Spot area\)/);
  expect(text).toContain(`Inspection record ${recordReference(failedId)}`);
  // The part type by its catalogue name, with the code the CSV and the API keep.
  expect(text).toContain('Part type: Plate (plate)');
  // The unit as its symbol (px²), not the document's code (px2).
  expect(text).toMatch(/Spot area\s+64 px²\s+at most 20\s+OUTSIDE LIMITS/);
  expect(text).toMatch(/Spot count, "bright", per part\s+1 —\s+at most 3\s+within limits/);
  // Every page names the record and who printed it, so a page on its own still says what it belongs to.
  expect(text).toMatch(new RegExp(`Inspection ${failedId} · printed 20\\d\\d-.* by Test kofi\\s+page 1 of 2`));
  expect(text).toMatch(/page 2 of 2/);
  expect(text).toMatch(/Plate spots, version 1/);
  expect(text).toMatch(/Test mara — Approved for production — 20\d\d-/);
  expect(text).toMatch(/decision aid/);
});

test('the rule version report lists steps, gauges with limits and signatures', async () => {
  const res = await request(t.app).get(`/api/records/rule-versions/${versionId}/report.pdf`).set(auditor).buffer(true).parse((r, done) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => done(null, Buffer.concat(chunks)));
  });
  const text = pdfText(res.body as Buffer);
  expect(text).toMatch(/1\. threshold — method fixed, value 200/);
  expect(text).toMatch(/Spot area: largest-blob-area in px² — at most 20/);
  expect(text).toMatch(/Test mara — Approved for production/);
});

test('every export is an audit event; records are read-only and closed to other roles', async () => {
  const actions = await t.db.dataSource.query(`select action from audit_events where action like 'export.%' order by seq`);
  expect(actions.map((a: { action: string }) => a.action)).toEqual(expect.arrayContaining(['export.inspections-csv', 'export.inspection-pdf', 'export.rule-version-pdf']));
  const operator = { Authorization: `Bearer ${await t.tokenFor('tomas')}` };
  expect((await request(t.app).get('/api/records/inspections').set(operator)).status).toBe(403);
  expect((await request(t.app).get('/api/records/inspections.csv').set(operator)).status).toBe(403);
  expect((await request(t.app).get('/api/records/inspections')).status).toBe(401);
});
