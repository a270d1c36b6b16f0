import PDFDocument from 'pdfkit';
import sharp from 'sharp';
import type { Inspection } from '../../../shared/api/inspections';
import { recordReference } from '../../../shared/api/records';
import type { RuleVersion } from '../../../shared/api/rules';
import { SIGNATURE_MEANING_LABELS } from '../../../shared/api/rules';
import type { Trial } from '../../../shared/api/trials';
import { describeValue } from '../../../shared/rules/diff';
import { describeLimits, unitSymbol } from '../../../shared/rules/units';
import type { RuleDocument } from '../../../shared/rules/schema';
import type { KernelLibrary } from '../../../shared/vision/pipeline';

const SAFETY =
  'A verdict is a decision aid validated on the rule’s reference set. Released limits must follow the part’s drawing and the ' +
  'plant’s quality procedures; disputed or safety-relevant parts go to a qualified person.';

const MARGIN = 50;
const GREY = '#555555';

/** Who printed the report and when, for the footer of every page (the print is also an audit event). */
export interface PrintedBy {
  name: string;
  at: Date;
}

function collect(doc: PDFKit.PDFDocument): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.end();
  });
}

function newDocument(title: string, subtitle: string): PDFKit.PDFDocument {
  // Pages are kept until the end so that each can carry "page n of m".
  const doc = new PDFDocument({ size: 'A4', margin: MARGIN, bufferPages: true, info: { Title: title, Producer: 'Kernwright', Creator: 'Kernwright' } });
  doc.font('Helvetica-Bold').fontSize(18).text(title);
  doc.font('Helvetica').fontSize(10).fillColor(GREY).text(subtitle).fillColor('black').moveDown();
  return doc;
}

/**
 * Every page names its record, its place in the report and who printed it when, so that a page
 * separated from the others still says what it belongs to (ISO 9001:2015 §7.5.2 asks for identification).
 */
function footers(doc: PDFKit.PDFDocument, record: string, printed: PrintedBy): void {
  const { start, count } = doc.bufferedPageRange();
  for (let i = start; i < start + count; i++) {
    doc.switchToPage(i);
    const bottom = doc.page.margins.bottom;
    // Writing inside the bottom margin would start a new page; lift the margin while the footer is written.
    doc.page.margins.bottom = 0;
    const y = doc.page.height - MARGIN + 14;
    doc.moveTo(MARGIN, y - 6).lineTo(doc.page.width - MARGIN, y - 6).lineWidth(0.5).strokeColor('#999999').stroke();
    doc.font('Helvetica').fontSize(8).fillColor(GREY);
    // One line whatever the names' length: the end gives way to an ellipsis.
    doc.text(`${record} · printed ${printed.at.toISOString()} (UTC) by ${printed.name}`, MARGIN, y, { width: doc.page.width - 2 * MARGIN - 70, height: 10, ellipsis: true });
    doc.text(`page ${i - start + 1} of ${count}`, doc.page.width - MARGIN - 60, y, { width: 60, align: 'right', lineBreak: false });
    doc.fillColor('black');
    doc.page.margins.bottom = bottom;
  }
}

function heading(doc: PDFKit.PDFDocument, text: string): void {
  doc.moveDown(0.6).font('Helvetica-Bold').fontSize(12).text(text, MARGIN).font('Helvetica').fontSize(10).moveDown(0.2);
}

function field(doc: PDFKit.PDFDocument, label: string, value: string): void {
  doc.font('Helvetica-Bold').text(`${label}: `, MARGIN, undefined, { continued: true }).font('Helvetica').text(value);
}

function note(doc: PDFKit.PDFDocument, text: string): void {
  doc.fontSize(8).fillColor(GREY).text(text, MARGIN).fillColor('black').fontSize(10);
}

interface Column {
  title: string;
  width: number;
  align?: 'left' | 'right';
}

/** A ruled table; a row in `strong` is set in bold (a gauge outside its limits). */
function table(doc: PDFKit.PDFDocument, columns: Column[], rows: { cells: string[]; strong?: boolean }[]): void {
  const gap = 6;
  const rowHeight = (cells: string[], font: string) => {
    doc.font(font).fontSize(9);
    return Math.max(...cells.map((c, i) => doc.heightOfString(c, { width: columns[i].width - gap }))) + 6;
  };
  const draw = (cells: string[], font: string) => {
    const height = rowHeight(cells, font);
    if (doc.y + height > doc.page.height - doc.page.margins.bottom) doc.addPage();
    const top = doc.y;
    let x = MARGIN;
    doc.font(font).fontSize(9);
    cells.forEach((cell, i) => {
      doc.text(cell, x, top + 3, { width: columns[i].width - gap, align: columns[i].align ?? 'left' });
      x += columns[i].width;
    });
    doc.moveTo(MARGIN, top + height).lineTo(x, top + height).lineWidth(0.5).strokeColor('#999999').stroke();
    doc.x = MARGIN;
    doc.y = top + height;
  };
  draw(
    columns.map((c) => c.title),
    'Helvetica-Bold',
  );
  for (const row of rows) draw(row.cells, row.strong ? 'Helvetica-Bold' : 'Helvetica');
  doc.font('Helvetica').fontSize(10).moveDown(0.3);
}

const meaningOf = (meaning: string) => SIGNATURE_MEANING_LABELS[meaning as keyof typeof SIGNATURE_MEANING_LABELS] ?? meaning;

/** Signatures printed as 21 CFR 11.50 describes: printed name, date and time, meaning. */
function signatures(doc: PDFKit.PDFDocument, version: RuleVersion): void {
  heading(doc, 'Signatures');
  if (version.signatures.length === 0) doc.text('None: this version has not been released.');
  for (const s of version.signatures) {
    doc.text(`${s.signerName} — ${meaningOf(s.meaning)} — ${s.signedAt} (UTC)${s.valid ? '' : ' — DOES NOT MATCH THE CONTENT'}`);
    note(doc, `bound to content SHA-256 ${s.contentHash}; signature ${s.signatureHash}`);
  }
}

async function printable(image: Buffer): Promise<Buffer> {
  return sharp(image).rotate().resize({ width: 900, height: 700, fit: 'inside', withoutEnlargement: true }).toColourspace('srgb').jpeg({ quality: 85 }).toBuffer();
}

const VERDICT_WORDS: Record<Inspection['verdict'], string> = {
  PASS: 'Every gauge is within its limits.',
  FAIL: 'A gauge is outside its limits.',
  RETAKE: 'The photo could not be judged; the part was to be photographed again.',
};

/** The verdict's shape, in black so that it reads on any printer: PASS a circle with a tick, FAIL a square with a cross, RETAKE a diamond with a turning arrow. */
function verdictMark(doc: PDFKit.PDFDocument, verdict: Inspection['verdict'], x: number, y: number, size: number): void {
  const c = { x: x + size / 2, y: y + size / 2 };
  const r = size / 2;
  doc.save().lineWidth(2.5).strokeColor('black');
  if (verdict === 'PASS') {
    doc.circle(c.x, c.y, r).stroke();
    doc.moveTo(c.x - r * 0.45, c.y).lineTo(c.x - r * 0.1, c.y + r * 0.35).lineTo(c.x + r * 0.5, c.y - r * 0.35).stroke();
  } else if (verdict === 'FAIL') {
    doc.rect(x, y, size, size).stroke();
    doc.moveTo(x + size * 0.25, y + size * 0.25).lineTo(x + size * 0.75, y + size * 0.75).stroke();
    doc.moveTo(x + size * 0.75, y + size * 0.25).lineTo(x + size * 0.25, y + size * 0.75).stroke();
  } else {
    doc.polygon([c.x, y], [x + size, c.y], [c.x, y + size], [x, c.y]).stroke();
    const a = r * 0.38;
    doc.path(`M ${c.x + a} ${c.y} A ${a} ${a} 0 1 1 ${c.x} ${c.y - a}`).stroke();
    doc.polygon([c.x, c.y - a - 4], [c.x + 5, c.y - a], [c.x, c.y - a + 4]).fill('black');
  }
  doc.restore();
}

function verdictBox(doc: PDFKit.PDFDocument, inspection: Inspection): void {
  const top = doc.y;
  const height = 62;
  const width = doc.page.width - 2 * MARGIN;
  doc.save().lineWidth(1).strokeColor('black').rect(MARGIN, top, width, height).stroke().restore();
  verdictMark(doc, inspection.verdict, MARGIN + 12, top + 12, 38);
  doc.font('Helvetica-Bold').fontSize(26).text(inspection.verdict, MARGIN + 64, top + 20, { lineBreak: false });
  doc.font('Helvetica').fontSize(10).text(`Verdict: ${inspection.verdict}${inspection.cause ? ` (${inspection.cause})` : ''}`, MARGIN + 190, top + 14, { width: width - 200 });
  doc.fillColor(GREY).text(VERDICT_WORDS[inspection.verdict], MARGIN + 190, undefined, { width: width - 200 }).fillColor('black');
  doc.x = MARGIN;
  doc.y = top + height + 10;
}

const number = (value: number) => String(Number(value.toPrecision(6)));

/** One inspection: verdict, measurements against limits, the rule version and its release signature, the photo and the evidence. */
/** `partType`: the part type's name with its code, as the catalogue gives it. */
export async function inspectionReport(inspection: Inspection, version: RuleVersion, photo: Buffer, evidence: Buffer | null, printed: PrintedBy, partType: string): Promise<Buffer> {
  const doc = newDocument(`Inspection record ${recordReference(inspection.id)}`, `Inspection ${inspection.id}`);
  verdictBox(doc, inspection);
  field(doc, 'When', `${inspection.createdAt} (UTC)`);
  field(doc, 'Where', `${inspection.lineName}, ${inspection.stationName}`);
  field(doc, 'Operator', inspection.operator.name);
  field(doc, 'Part type', partType);
  field(doc, 'Rule', `${inspection.ruleName}, version ${inspection.ruleVersionNumber} (${version.state})`);
  field(doc, 'Rule content SHA-256', version.contentHash);
  field(doc, 'Calibration', inspection.mmPerPx ? `${inspection.mmPerPx.toPrecision(6)} mm/px` : 'none');
  if (inspection.dispute) field(doc, 'Disputed', `${inspection.dispute.note}${inspection.dispute.resolvedAt ? ` — judged ${inspection.dispute.judgement}: ${inspection.dispute.resolutionNote}` : ' — open'}`);

  heading(doc, 'Measurements');
  if (inspection.measurements.length === 0) doc.text('The rule has no gauges.');
  else
    table(
      doc,
      [
        { title: 'Gauge', width: 175 },
        { title: 'Value', width: 80, align: 'right' },
        { title: 'Unit', width: 45 },
        { title: 'Limits (inclusive)', width: 110 },
        { title: 'Result', width: 85 },
      ],
      inspection.measurements.map((m) => ({
        cells: [
          m.gauge,
          number(m.value),
          unitSymbol(m.unit) || '—',
          describeLimits(m.limitMin, m.limitMax, null),
          m.pass ? 'within limits' : 'OUTSIDE LIMITS',
        ],
        strong: !m.pass,
      })),
    );
  heading(doc, 'Quality of the photo');
  const q = inspection.quality as { focus?: number; clipped?: number; mean?: number; problems?: string[] };
  // A photo sent back before the rule ran (wrong size) has its problem and no figures.
  if (q.focus !== undefined || q.clipped !== undefined || q.mean !== undefined)
    doc.text(`focus ${q.focus?.toFixed(1) ?? '?'}, clipped share ${q.clipped !== undefined ? (q.clipped * 100).toFixed(2) + ' %' : '?'}, mean ${q.mean?.toFixed(1) ?? '?'}`);
  for (const problem of q.problems ?? []) doc.text(`Retake: ${problem}`);
  signatures(doc, version);
  doc.moveDown();
  note(doc, SAFETY);

  doc.addPage();
  heading(doc, 'Photo as taken');
  doc.image(await printable(photo), { fit: [495, 310] });
  if (evidence) {
    doc.moveDown(0.5);
    heading(doc, 'Evidence (failing regions and blobs outlined)');
    doc.image(await printable(evidence), { fit: [495, 310] });
  }
  footers(doc, `Inspection ${inspection.id}`, printed);
  return collect(doc);
}

function stepText(step: RuleDocument['steps'][number]): string {
  const { op, ...params } = step as { op: string } & Record<string, unknown>;
  if (op === 'kernel' && typeof params.kernel === 'string') return `kernel — “${params.kernel}” from the kernel library`;
  const shown = Object.entries(params)
    .filter(([key]) => key !== 'matrix')
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([key, value]) => `${key} ${describeValue(value)}`)
    .join(', ');
  if (op === 'kernel') return `kernel — own ${(params.matrix as number[][]).length}×${(params.matrix as number[][])[0]?.length ?? 0} matrix${shown ? `, ${shown}` : ''}`;
  return `${op}${shown ? ` — ${shown}` : ''}`;
}

function qualityGate(quality: RuleDocument['quality']): string {
  if (!quality) return 'none';
  const parts = [
    quality.minFocus !== undefined ? `focus at least ${quality.minFocus}` : '',
    quality.maxClipped !== undefined ? `clipped share at most ${quality.maxClipped}` : '',
    quality.minMean !== undefined ? `mean at least ${quality.minMean}` : '',
  ].filter(Boolean);
  return parts.length ? parts.join('; ') : 'none';
}

/** One rule version: its life, steps with their kernels, gauges and limits, trial summary, signatures. */
export async function ruleVersionReport(version: RuleVersion, trial: Trial | null, kernels: KernelLibrary, printed: PrintedBy): Promise<Buffer> {
  const doc = newDocument(`${version.ruleName}, version ${version.number}`, `Rule version ${version.id}`);
  const rule = version.document as RuleDocument;
  field(doc, 'State', version.state);
  field(doc, 'Author', `${version.author.name}; last edited ${version.editedAt} (UTC)`);
  if (version.authorNote) field(doc, 'Author’s note', version.authorNote);
  if (version.submittedAt) field(doc, 'Submitted for review', `${version.submittedAt} (UTC)`);
  if (version.reviewer) field(doc, 'Reviewer', `${version.reviewer.name}; ${version.reviewedAt} (UTC)${version.reviewNote ? ` — ${version.reviewNote}` : ''}`);
  if (version.releasedAt) field(doc, 'Released', `${version.releasedAt} (UTC)`);
  if (version.endedAt) field(doc, version.state === 'withdrawn' ? 'Withdrawn' : 'In force until', `${version.endedAt} (UTC)${version.withdrawReason ? ` — ${version.withdrawReason}` : ''}`);
  field(doc, 'Content SHA-256', version.contentHash);
  field(doc, 'Input', `${rule.input?.channel ?? 'luma'} channel, border ${rule.border ?? 'reflect'}`);
  field(doc, 'Quality gate', qualityGate(rule.quality));

  heading(doc, 'Steps');
  rule.steps.forEach((step, i) => {
    doc.text(`${i + 1}. ${stepText(step)}`, MARGIN);
    if (step.op === 'kernel') {
      const named = step.kernel ? kernels.get(step.kernel) : undefined;
      const matrix = step.matrix ?? named?.matrix;
      if (named) note(doc, `    ${named.description} Divisor ${named.divisor}, offset ${named.offset}. Source: ${named.source}`);
      doc.font('Courier').fontSize(8);
      for (const row of matrix ?? []) doc.text('      ' + row.map((v) => String(v).padStart(6)).join(' '), MARGIN);
      doc.font('Helvetica').fontSize(10);
    }
  });
  heading(doc, 'Gauges and limits');
  for (const g of rule.gauges) {
    doc.text(`${g.name}: ${g.measure}${g.step ? ` of step ${g.step}` : ''}${g.unit ? ` in ${unitSymbol(g.unit)}` : ''} — ${describeLimits(g.limits?.min, g.limits?.max, null)}`, MARGIN);
    note(doc, `    region: ${g.region ? describeValue(g.region) : 'the whole photo'} (fractions of the photo’s width and height)`);
  }
  heading(doc, 'Trial');
  if (!trial?.summary) doc.text('No finished trial is attached.');
  else {
    const s = trial.summary;
    const pct = (p: { rate: number | null; low: number | null; high: number | null }) =>
      p.rate === null ? 'n/a' : `${(p.rate * 100).toFixed(1)} % (95 % interval ${(p.low! * 100).toFixed(1)}–${(p.high! * 100).toFixed(1)} %)`;
    doc.text(`${trial.referenceSetName}: ${s.images} labelled photos, finished ${trial.finishedAt} (UTC)`);
    table(
      doc,
      [
        { title: 'Label \\ verdict', width: 130 },
        { title: 'PASS', width: 60, align: 'right' },
        { title: 'FAIL', width: 60, align: 'right' },
        { title: 'RETAKE', width: 60, align: 'right' },
      ],
      [
        { cells: ['known good', String(s.table.good.PASS), String(s.table.good.FAIL), String(s.table.good.RETAKE)] },
        { cells: ['known defective', String(s.table.defective.PASS), String(s.table.defective.FAIL), String(s.table.defective.RETAKE)] },
        { cells: ['labelled retake', String(s.table.retake.PASS), String(s.table.retake.FAIL), String(s.table.retake.RETAKE)] },
      ],
    );
    doc.text(`false reject rate ${pct(s.falseRejectRate)}; escape rate ${pct(s.escapeRate)}; agreement ${pct(s.agreement)}; kappa ${s.kappa?.toFixed(3) ?? 'n/a'}`, MARGIN);
  }
  signatures(doc, version);
  doc.moveDown();
  note(doc, SAFETY);
  footers(doc, `${version.ruleName}, version ${version.number}`, printed);
  return collect(doc);
}
