// What changed between two rule documents, row by row: the reviewer's side-by-side view (released against
// in review) and the rule history (each version against the one before). Works on the JSON itself, so any
// document the API returns can be compared; plain TypeScript, so the app and the server share it. Steps,
// gauges and settings read in the editor's words (words.ts); a part the schema does not know reads as
// its JSON.
import { regionSchema, stepSchema } from './schema';
import { describeLimits, unitSymbol } from './units';
import { BORDER_LABELS, CHANNEL_LABELS, describeRegion, describeStepSettings, MEASURE_LABELS, STEP_TITLES } from './words';

export type ChangeKind = 'same' | 'changed' | 'added' | 'removed';

export interface DiffRow {
  section: 'Settings' | 'Steps' | 'Gauges';
  label: string;
  before: string | null;
  after: string | null;
  change: ChangeKind;
}

type Json = Record<string, unknown>;

function asObject(value: unknown): Json {
  return value && typeof value === 'object' && !Array.isArray(value) ? (value as Json) : {};
}

function asArray(value: unknown): unknown[] {
  return Array.isArray(value) ? value : [];
}

/** A value as a reviewer reads it: `sigma 1.2, size 5`, `x 0.1, y 0.1, w 0.8, h 0.8`. */
export function describeValue(value: unknown): string {
  if (value === undefined || value === null) return '—';
  if (Array.isArray(value)) return `[${value.map(describeValue).join(', ')}]`;
  if (typeof value === 'object') {
    return Object.entries(value as Json)
      .map(([key, inner]) => `${key} ${describeValue(inner)}`)
      .join(', ');
  }
  return String(value);
}

function describeStep(step: unknown): string {
  const known = stepSchema.safeParse(step);
  if (known.success) return `${STEP_TITLES[known.data.op]}: ${describeStepSettings(known.data)}`;
  const { op, ...parameters } = asObject(step);
  const rest = describeValue(parameters);
  return rest ? `${String(op)}: ${rest}` : String(op);
}

/** A setting's word from a table of them, or the value itself when the table does not have it. */
function wordFor(words: Record<string, string>, value: unknown): string {
  return typeof value === 'string' && Object.prototype.hasOwnProperty.call(words, value) ? words[value] : describeValue(value);
}

const CHANNEL_WORDS: Record<string, string> = CHANNEL_LABELS;
const BORDER_WORDS: Record<string, string> = Object.fromEntries(Object.entries(BORDER_LABELS).map(([mode, { label }]) => [mode, label]));
const MEASURE_WORDS: Record<string, string> = MEASURE_LABELS;

function row(section: DiffRow['section'], label: string, before: string | null, after: string | null): DiffRow {
  const change: ChangeKind = before === null ? 'added' : after === null ? 'removed' : before === after ? 'same' : 'changed';
  return { section, label, before, after, change };
}

/**
 * Pairs the steps of two pipelines so that an inserted or removed step does not make every later step
 * look changed: the longest common subsequence of the step descriptions (the dynamic programme of
 * Wagner & Fischer, "The string-to-string correction problem", JACM 21(1), 1974) stays paired, and
 * between two kept steps the remaining ones pair up in order as changed, the surplus as added or removed.
 */
export function alignSteps(before: readonly string[], after: readonly string[]): { i: number | null; j: number | null }[] {
  const n = before.length;
  const m = after.length;
  // common[i][j]: length of the longest common subsequence of before[i..] and after[j..].
  const common = Array.from({ length: n + 1 }, () => new Array<number>(m + 1).fill(0));
  for (let i = n - 1; i >= 0; i--) {
    for (let j = m - 1; j >= 0; j--) common[i][j] = before[i] === after[j] ? common[i + 1][j + 1] + 1 : Math.max(common[i + 1][j], common[i][j + 1]);
  }
  const pairs: { i: number | null; j: number | null }[] = [];
  let removed: number[] = [];
  let added: number[] = [];
  const flushGap = () => {
    for (let k = 0; k < Math.max(removed.length, added.length); k++) pairs.push({ i: removed[k] ?? null, j: added[k] ?? null });
    removed = [];
    added = [];
  };
  let i = 0;
  let j = 0;
  while (i < n || j < m) {
    if (i < n && j < m && before[i] === after[j]) {
      flushGap();
      pairs.push({ i: i++, j: j++ });
    } else if (j >= m || (i < n && common[i + 1][j] >= common[i][j + 1])) removed.push(i++);
    else added.push(j++);
  }
  flushGap();
  return pairs;
}

const GAUGE_FIELDS = ['measure', 'step', 'region', 'unit', 'limits'] as const;
/** A gauge's fields as its rows are labelled. */
const GAUGE_FIELD_WORDS: Record<(typeof GAUGE_FIELDS)[number], string> = { measure: 'measures', step: 'measured on', region: 'region', unit: 'unit', limits: 'limits' };

/** The quality gate's settings under the names the rule editor gives them. */
const QUALITY_LABELS: Record<string, string> = { minFocus: 'lowest focus', maxClipped: 'largest clipped share', minMean: 'lowest mean brightness' };

/** A gauge field as a reviewer reads it: limits in words ("at most 0.07"; the unit has its own row), the measure and region as the editor names them, a step by its number. */
function describeGaugeField(gauge: Json, field: (typeof GAUGE_FIELDS)[number]): string {
  const value = gauge[field];
  switch (field) {
    case 'measure':
      return wordFor(MEASURE_WORDS, value);
    case 'step':
      return value === undefined ? 'the last step' : `Step ${describeValue(value)}`;
    case 'region': {
      if (value === undefined) return describeRegion(undefined);
      const region = regionSchema.safeParse(value);
      return region.success ? describeRegion(region.data) : describeValue(value);
    }
    case 'unit':
      return typeof value === 'string' ? unitSymbol(value) : describeValue(value);
    case 'limits': {
      if (value === undefined) return describeValue(value);
      const { min, max } = asObject(value);
      const number = (v: unknown) => (typeof v === 'number' ? v : null);
      return describeLimits(number(min), number(max), null);
    }
  }
}

/** Rows for every setting, step and gauge field of either document; `before` may be absent (a first version). */
export function diffRuleDocuments(beforeDocument: unknown | null, afterDocument: unknown): DiffRow[] {
  const before = beforeDocument === null ? null : asObject(beforeDocument);
  const after = asObject(afterDocument);
  const rows: DiffRow[] = [];
  const text = (doc: Json | null, read: (d: Json) => unknown) => (doc === null ? null : describeValue(read(doc)));

  rows.push(row('Settings', 'Name', text(before, (d) => d.name), text(after, (d) => d.name)));
  const words = (doc: Json | null, read: (d: Json) => unknown, table: Record<string, string>) => (doc === null ? null : wordFor(table, read(doc)));
  const channel = (d: Json) => asObject(d.input).channel ?? 'luma';
  const border = (d: Json) => d.border ?? 'reflect';
  rows.push(row('Settings', 'Photo channel', words(before, channel, CHANNEL_WORDS), words(after, channel, CHANNEL_WORDS)));
  rows.push(row('Settings', 'Beyond the edge', words(before, border, BORDER_WORDS), words(after, border, BORDER_WORDS)));
  for (const field of Object.keys(QUALITY_LABELS)) {
    rows.push(row('Settings', `Quality gate: ${QUALITY_LABELS[field]}`, text(before, (d) => asObject(d.quality)[field]), text(after, (d) => asObject(d.quality)[field])));
  }

  const stepsBefore = (before === null ? [] : asArray(before.steps)).map(describeStep);
  const stepsAfter = asArray(after.steps).map(describeStep);
  for (const { i, j } of alignSteps(stepsBefore, stepsAfter)) {
    const label = j === null ? `Former step ${i! + 1}` : i === null || i === j ? `Step ${j + 1}` : `Step ${j + 1} (was ${i + 1})`;
    rows.push(row('Steps', label, i === null ? null : stepsBefore[i], j === null ? null : stepsAfter[j]));
  }

  const gaugesBefore = new Map((before === null ? [] : asArray(before.gauges)).map((g) => [String(asObject(g).name), asObject(g)]));
  const gaugesAfter = new Map(asArray(after.gauges).map((g) => [String(asObject(g).name), asObject(g)]));
  const names = [...new Set([...gaugesAfter.keys(), ...gaugesBefore.keys()])];
  for (const name of names) {
    const b = gaugesBefore.get(name) ?? null;
    const a = gaugesAfter.get(name) ?? null;
    if (!a || !b) {
      const whole = (g: Json | null) => (g === null ? null : GAUGE_FIELDS.filter((f) => g[f] !== undefined).map((f) => `${GAUGE_FIELD_WORDS[f]}: ${describeGaugeField(g, f)}`).join('; '));
      rows.push(row('Gauges', name, whole(b), whole(a)));
      continue;
    }
    for (const field of GAUGE_FIELDS) {
      if (a[field] === undefined && b[field] === undefined) continue;
      rows.push(row('Gauges', `${name} · ${GAUGE_FIELD_WORDS[field]}`, describeGaugeField(b, field), describeGaugeField(a, field)));
    }
  }
  return rows;
}
