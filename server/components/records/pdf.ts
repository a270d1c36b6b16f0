import PDFDocument from 'pdfkit';
import sharp from 'sharp';
import type { Inspection } from '../../../shared/api/inspections';
import type { RuleVersion } from '../../../shared/api/rules';
import { SIGNATURE_MEANING_LABELS } from '../../../shared/api/rules';
import type { Trial } from '../../../shared/api/trials';
import type { RuleDocument } from '../../../shared/rules/schema';
import type { KernelLibrary } from '../../../shared/vision/pipeline';

const SAFETY =
  'A verdict is a decision aid validated on the rule’s reference set. Released limits must follow the part’s drawing and the ' +
  'plant’s quality procedures; disputed or safety-relevant parts go to a qualified person.';

function collect(doc: PDFKit.PDFDocument): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.end();
  });
}

function newDocument(title: string): PDFKit.PDFDocument {
  const doc = new PDFDocument({ size: 'A4', margin: 50, info: { Title: title, Producer: 'Kernwright', Creator: 'Kernwright' } });
  doc.font('Helvetica-Bold').fontSize(18).text(title);
  doc.font('Helvetica').fontSize(9).fillColor('#555').text(`Printed ${new Date().toISOString()} (UTC) by Kernwright`).fillColor('black').moveDown();
  return doc;
}

function heading(doc: PDFKit.PDFDocument, text: string): void {
  doc.moveDown(0.6).font('Helvetica-Bold').fontSize(12).text(text).font('Helvetica').fontSize(10).moveDown(0.2);
}

function field(doc: PDFKit.PDFDocument, label: string, value: string): void {
  doc.font('Helvetica-Bold').text(`${label}: `, { continued: true }).font('Helvetica').text(value);
}

/** Signatures printed as 21 CFR 11.50 describes: printed name, date and time, meaning. */
function signatures(doc: PDFKit.PDFDocument, version: RuleVersion): void {
  heading(doc, 'Signatures');
  if (version.signatures.length === 0) doc.text('None: this version has not been released.');
  for (const s of version.signatures) {
    const meaning = SIGNATURE_MEANING_LABELS[s.meaning as keyof typeof SIGNATURE_MEANING_LABELS] ?? s.meaning;
    doc.text(`${s.signerName} — ${meaning} — ${s.signedAt} (UTC)${s.valid ? '' : ' — DOES NOT MATCH THE CONTENT'}`);
    doc.fontSize(8).fillColor('#555').text(`bound to content SHA-256 ${s.contentHash}; signature ${s.signatureHash}`).fillColor('black').fontSize(10);
  }
}

async function printable(image: Buffer): Promise<Buffer> {
  return sharp(image).rotate().resize({ width: 900, height: 700, fit: 'inside', withoutEnlargement: true }).toColourspace('srgb').jpeg({ quality: 85 }).toBuffer();
}

/** One inspection: photo, evidence, measurements against limits, verdict, the rule version and its release signature. */
export async function inspectionReport(inspection: Inspection, version: RuleVersion, photo: Buffer, evidence: Buffer | null): Promise<Buffer> {
  const doc = newDocument(`Inspection ${inspection.id}`);
  field(doc, 'Verdict', inspection.verdict + (inspection.cause ? ` (${inspection.cause})` : ''));
  field(doc, 'When', `${inspection.createdAt} (UTC)`);
  field(doc, 'Where', `${inspection.lineName}, ${inspection.stationName}`);
  field(doc, 'Operator', inspection.operator.name);
  field(doc, 'Part type', inspection.partType);
  field(doc, 'Rule', `${inspection.ruleName}, version ${inspection.ruleVersionNumber} (content SHA-256 ${version.contentHash})`);
  field(doc, 'Calibration', inspection.mmPerPx ? `${inspection.mmPerPx.toPrecision(6)} mm/px` : 'none');
  if (inspection.dispute) field(doc, 'Disputed', `${inspection.dispute.note}${inspection.dispute.resolvedAt ? ` — judged ${inspection.dispute.judgement}: ${inspection.dispute.resolutionNote}` : ' — open'}`);

  heading(doc, 'Measurements');
  if (inspection.measurements.length === 0) doc.text('The rule has no gauges.');
  for (const m of inspection.measurements) {
    const limits = [m.limitMin !== null ? `min ${m.limitMin}` : '', m.limitMax !== null ? `max ${m.limitMax}` : ''].filter(Boolean).join(', ');
    doc.text(`${m.pass ? 'within limits' : 'OUTSIDE LIMITS'} — ${m.gauge}: ${Number(m.value.toPrecision(6))} ${m.unit} (${limits || 'no limits'})`);
  }
  heading(doc, 'Quality of the photo');
  const q = inspection.quality as { focus?: number; clipped?: number; mean?: number };
  doc.text(`focus ${q.focus?.toFixed(1) ?? '?'}, clipped share ${q.clipped !== undefined ? (q.clipped * 100).toFixed(2) + ' %' : '?'}, mean ${q.mean?.toFixed(1) ?? '?'}`);
  signatures(doc, version);
  doc.moveDown().fontSize(8).fillColor('#555').text(SAFETY).fillColor('black').fontSize(10);

  doc.addPage();
  heading(doc, 'Photo');
  doc.image(await printable(photo), { fit: [495, 310] });
  if (evidence) {
    doc.moveDown(0.5);
    heading(doc, 'Evidence (failing regions and blobs outlined)');
    doc.image(await printable(evidence), { fit: [495, 310] });
  }
  return collect(doc);
}

function stepText(step: RuleDocument['steps'][number]): string {
  const { op, ...params } = step as { op: string } & Record<string, unknown>;
  const shown = Object.entries(params)
    .filter(([key]) => key !== 'matrix')
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([key, value]) => `${key} ${typeof value === 'string' ? value : JSON.stringify(value)}`)
    .join(', ');
  return `${op}${shown ? ` — ${shown}` : ''}`;
}

/** One rule version: steps, kernels, gauges and limits, trial summary, signatures. */
export async function ruleVersionReport(version: RuleVersion, trial: Trial | null, kernels: KernelLibrary): Promise<Buffer> {
  const doc = newDocument(`${version.ruleName}, version ${version.number}`);
  const rule = version.document as RuleDocument;
  field(doc, 'State', version.state);
  field(doc, 'Author', `${version.author.name}; last edited ${version.editedAt} (UTC)`);
  if (version.reviewer) field(doc, 'Reviewer', `${version.reviewer.name}; ${version.reviewedAt} (UTC)${version.reviewNote ? ` — ${version.reviewNote}` : ''}`);
  if (version.withdrawReason) field(doc, 'Withdrawn', version.withdrawReason);
  field(doc, 'Content SHA-256', version.contentHash);
  field(doc, 'Input', `${rule.input.channel}, border ${rule.border}`);
  if (rule.quality) field(doc, 'Quality gate', JSON.stringify(rule.quality));

  heading(doc, 'Steps');
  rule.steps.forEach((step, i) => {
    doc.text(`${i + 1}. ${stepText(step)}`);
    if (step.op === 'kernel') {
      const named = step.kernel ? kernels.get(step.kernel) : undefined;
      const matrix = step.matrix ?? named?.matrix;
      if (named) doc.fontSize(8).fillColor('#555').text(`   ${named.description} Divisor ${named.divisor}, offset ${named.offset}. Source: ${named.source}`).fillColor('black');
      doc.font('Courier').fontSize(8);
      for (const row of matrix ?? []) doc.text('   ' + row.map((v) => String(v).padStart(6)).join(' '));
      doc.font('Helvetica').fontSize(10);
    }
  });
  heading(doc, 'Gauges and limits');
  for (const g of rule.gauges) {
    const limits = [g.limits?.min !== undefined ? `min ${g.limits.min}` : '', g.limits?.max !== undefined ? `max ${g.limits.max}` : ''].filter(Boolean).join(', ');
    doc.text(`${g.name}: ${g.measure}${g.step ? ` of step ${g.step}` : ''}${g.unit ? ` in ${g.unit}` : ''}${g.region ? `, region ${JSON.stringify(g.region)}` : ''} — ${limits || 'no limits'}`);
  }
  heading(doc, 'Trial');
  if (!trial?.summary) doc.text('No finished trial is attached.');
  else {
    const s = trial.summary;
    const pct = (p: { rate: number | null; low: number | null; high: number | null }) =>
      p.rate === null ? 'n/a' : `${(p.rate * 100).toFixed(1)} % (95 % interval ${(p.low! * 100).toFixed(1)}–${(p.high! * 100).toFixed(1)} %)`;
    doc.text(`${trial.referenceSetName}: ${s.images} labelled photos, finished ${trial.finishedAt} (UTC)`);
    doc.text(`agreement ${pct(s.agreement)}; false reject rate ${pct(s.falseRejectRate)}; escape rate ${pct(s.escapeRate)}; kappa ${s.kappa?.toFixed(3) ?? 'n/a'}`);
  }
  signatures(doc, version);
  doc.moveDown().fontSize(8).fillColor('#555').text(SAFETY);
  return collect(doc);
}
