// The draft editor's working copy of a rule document. Steps carry an "enabled" switch that exists
// only here: a disabled step stays in the editor and is left out of the document that is run and saved.
import { RULE_FORMAT, type BorderMode, type Gauge, type InputChannel, type QualityLimits, type Step } from '../../shared/rules/schema';
import type { FieldIssue } from '../../shared/api/errors';

export interface EditorStep {
  key: string;
  enabled: boolean;
  step: Step;
}

/** A gauge as edited: `stepKey` names the measured step (null = the last enabled step). */
export interface EditorGauge {
  key: string;
  stepKey: string | null;
  gauge: Omit<Gauge, 'step'>;
}

export interface EditorState {
  name: string;
  input: { channel: InputChannel };
  border: BorderMode;
  quality?: QualityLimits;
  steps: EditorStep[];
  gauges: EditorGauge[];
}

let keyCounter = 0;
export function newKey(prefix: string): string {
  keyCounter += 1;
  return `${prefix}-${keyCounter}`;
}

interface LooseDocument {
  name?: string;
  input?: { channel?: InputChannel };
  border?: BorderMode;
  quality?: QualityLimits;
  steps?: Step[];
  gauges?: Gauge[];
}

/** The editor's copy of a stored document (which the server has validated). */
export function editorStateFrom(document: unknown): EditorState {
  const doc = (document ?? {}) as LooseDocument;
  const steps = (doc.steps ?? []).map((step) => ({ key: newKey('step'), enabled: true, step }));
  const gauges = (doc.gauges ?? []).map(({ step, ...gauge }) => ({
    key: newKey('gauge'),
    stepKey: step !== undefined ? steps[step - 1]?.key ?? null : null,
    gauge,
  }));
  return {
    name: doc.name ?? '',
    input: { channel: doc.input?.channel ?? 'luma' },
    border: doc.border ?? 'reflect',
    quality: doc.quality,
    steps,
    gauges,
  };
}

/**
 * The rule document of the enabled steps. A gauge that measured a disabled step measures the
 * nearest enabled step before it (or the last step when there is none).
 */
export function documentFrom(state: EditorState): Record<string, unknown> {
  const enabled = state.steps.filter((s) => s.enabled);
  const gauges = state.gauges.map(({ stepKey, gauge }) => {
    if (stepKey === null) return gauge;
    const at = state.steps.findIndex((s) => s.key === stepKey);
    const before = state.steps.slice(0, at + 1).filter((s) => s.enabled);
    const measured = before.length > 0 ? enabled.indexOf(before[before.length - 1]) + 1 : 0;
    return measured > 0 && measured < enabled.length ? { ...gauge, step: measured } : gauge;
  });
  return {
    format: RULE_FORMAT,
    name: state.name,
    input: state.input,
    border: state.border,
    ...(state.quality ? { quality: state.quality } : {}),
    steps: enabled.map((s) => s.step),
    gauges,
  };
}

export type EditorAction =
  | { type: 'reset'; state: EditorState }
  | { type: 'add-step'; step: Step }
  | { type: 'change-step'; key: string; step: Step }
  | { type: 'move-step'; key: string; by: -1 | 1 }
  | { type: 'duplicate-step'; key: string }
  | { type: 'remove-step'; key: string }
  | { type: 'toggle-step'; key: string }
  | { type: 'add-gauge'; gauge: EditorGauge['gauge'] }
  | { type: 'change-gauge'; key: string; gauge: EditorGauge['gauge']; stepKey: string | null }
  | { type: 'remove-gauge'; key: string }
  | { type: 'set-limit'; gaugeName: string; bound: 'min' | 'max'; value: number }
  | { type: 'set-quality'; quality: QualityLimits | undefined }
  | { type: 'set-settings'; settings: Partial<Pick<EditorState, 'name' | 'border'>> & { channel?: InputChannel } };

export function editorReducer(state: EditorState, action: EditorAction): EditorState {
  switch (action.type) {
    case 'reset':
      return action.state;
    case 'add-step': {
      const pinned = pinGaugesOnLastStep(state);
      return { ...pinned, steps: [...pinned.steps, { key: newKey('step'), enabled: true, step: action.step }] };
    }
    case 'change-step':
      return { ...state, steps: state.steps.map((s) => (s.key === action.key ? { ...s, step: action.step } : s)) };
    case 'move-step': {
      const from = state.steps.findIndex((s) => s.key === action.key);
      const to = from + action.by;
      if (from < 0 || to < 0 || to >= state.steps.length) return state;
      const steps = [...state.steps];
      [steps[from], steps[to]] = [steps[to], steps[from]];
      return { ...state, steps };
    }
    case 'duplicate-step': {
      const at = state.steps.findIndex((s) => s.key === action.key);
      if (at < 0) return state;
      const copy: EditorStep = { ...state.steps[at], key: newKey('step'), step: structuredClone(state.steps[at].step) };
      // An enabled copy with no enabled step after it becomes the last step.
      const becomesLast = copy.enabled && !state.steps.slice(at + 1).some((s) => s.enabled);
      const pinned = becomesLast ? pinGaugesOnLastStep(state) : state;
      return { ...pinned, steps: [...state.steps.slice(0, at + 1), copy, ...state.steps.slice(at + 1)] };
    }
    case 'remove-step':
      return {
        ...state,
        steps: state.steps.filter((s) => s.key !== action.key),
        gauges: state.gauges.map((g) => (g.stepKey === action.key ? { ...g, stepKey: null } : g)),
      };
    case 'toggle-step':
      return { ...state, steps: state.steps.map((s) => (s.key === action.key ? { ...s, enabled: !s.enabled } : s)) };
    case 'add-gauge':
      return { ...state, gauges: [...state.gauges, { key: newKey('gauge'), stepKey: null, gauge: action.gauge }] };
    case 'change-gauge':
      return { ...state, gauges: state.gauges.map((g) => (g.key === action.key ? { ...g, gauge: action.gauge, stepKey: action.stepKey } : g)) };
    case 'remove-gauge':
      return { ...state, gauges: state.gauges.filter((g) => g.key !== action.key) };
    case 'set-quality':
      return { ...state, quality: action.quality };
    case 'set-settings': {
      const { channel, ...rest } = action.settings;
      return { ...state, ...rest, input: channel ? { channel } : state.input };
    }
    case 'set-limit':
      return {
        ...state,
        gauges: state.gauges.map((g) =>
          g.gauge.name === action.gaugeName ? { ...g, gauge: { ...g.gauge, limits: { ...g.gauge.limits, [action.bound]: action.value } } } : g,
        ),
      };
  }
}

/**
 * Gauges on "the last step" pinned to the step that is last now, before a step is added after it:
 * a new step at the end must not silently change what a gauge measures (a blob area would read a
 * grey image). The engineer can choose "the last step" again.
 */
function pinGaugesOnLastStep(state: EditorState): EditorState {
  const enabled = state.steps.filter((s) => s.enabled);
  const last = enabled[enabled.length - 1];
  if (!last || !state.gauges.some((g) => g.stepKey === null)) return state;
  return { ...state, gauges: state.gauges.map((g) => (g.stepKey === null ? { ...g, stepKey: last.key } : g)) };
}

/**
 * Issues of the document (paths like `steps[2].sigma`, `gauges[0].limits.max`, optionally
 * prefixed `document.` by the server) sorted to the editor's step and gauge keys.
 */
export function issuesByKey(state: EditorState, issues: readonly FieldIssue[]): { byKey: Map<string, FieldIssue[]>; general: FieldIssue[] } {
  const enabled = state.steps.filter((s) => s.enabled);
  const byKey = new Map<string, FieldIssue[]>();
  const general: FieldIssue[] = [];
  for (const issue of issues) {
    const path = issue.path.replace(/^document\.?/, '');
    const match = /^(steps|gauges)\[(\d+)\]\.?(.*)$/.exec(path);
    const key = match ? (match[1] === 'steps' ? enabled[Number(match[2])]?.key : state.gauges[Number(match[2])]?.key) : undefined;
    if (!key) {
      general.push({ path: path || '(root)', message: issue.message });
      continue;
    }
    const list = byKey.get(key) ?? [];
    list.push({ path: match![3] || '(step)', message: issue.message });
    byKey.set(key, list);
  }
  return { byKey, general };
}

/** A simple pipeline a new rule starts from: smooth, edges, threshold, clean up, one gauge. */
export function startingDocument(name: string): Record<string, unknown> {
  return {
    format: RULE_FORMAT,
    name,
    input: { channel: 'luma' },
    border: 'reflect',
    quality: { minFocus: 20, maxClipped: 0.05, minMean: 20 },
    steps: [
      { op: 'gaussian', sigma: 1.2 },
      { op: 'gradient', operator: 'sobel', output: 'magnitude' },
      { op: 'threshold', method: 'otsu' },
      { op: 'open', radius: 1 },
    ],
    gauges: [{ name: 'Edge share', measure: 'edge-fraction', region: { shape: 'rect', x: 0.1, y: 0.1, w: 0.8, h: 0.8 }, limits: { max: 0.2 } }],
  };
}

/** JSON with object keys sorted, so that two documents with the same content compare equal whatever their key order. */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(value, (_key, v: unknown) =>
    v && typeof v === 'object' && !Array.isArray(v) ? Object.fromEntries(Object.entries(v as Record<string, unknown>).sort(([a], [b]) => a.localeCompare(b))) : v,
  );
}
