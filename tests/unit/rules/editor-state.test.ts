// The draft editor's working copy: every editing action must leave a document the shared schema
// accepts, and a gauge must keep measuring the step the engineer chose.
import { validateRuleDocument } from '../../../shared/rules/schema';
import {
  canonicalJson,
  documentFrom,
  editorReducer,
  editorStateFrom,
  issuesByKey,
  startingDocument,
  type EditorState,
} from '../../../components/rules/ruleEditorState';
import { STANDARD_STEPS } from '../../support/standard-steps';

const DOCUMENT = {
  format: 'kernwright-rule/1',
  name: 'Bracket slot',
  input: { channel: 'green' },
  border: 'replicate',
  steps: STANDARD_STEPS,
  gauges: [
    { name: 'Edge share', measure: 'edge-fraction', step: 3, limits: { max: 0.2 } },
    { name: 'Slot area', measure: 'largest-blob-area', unit: 'px2', limits: { min: 100, max: 900 } },
  ],
};

function valid(state: EditorState): Record<string, unknown> {
  const document = documentFrom(state);
  const result = validateRuleDocument(document);
  if (!result.ok) throw new Error(JSON.stringify(result.issues));
  return document;
}

test('a stored document comes back unchanged from the editor', () => {
  expect(canonicalJson(valid(editorStateFrom(DOCUMENT)))).toBe(canonicalJson(DOCUMENT));
  expect(validateRuleDocument(startingDocument('New rule')).ok).toBe(true);
});

test('a disabled step is left out and a gauge on it measures the nearest enabled step before it', () => {
  const state = editorStateFrom(DOCUMENT);
  const threshold = state.steps[2].key;
  const next = editorReducer(state, { type: 'toggle-step', key: threshold });
  const document = valid(next) as typeof DOCUMENT;
  expect(document.steps.map((s) => s.op)).toEqual(['gaussian', 'gradient', 'open']);
  expect(document.gauges[0].step).toBe(2);
  // Enabled again, the gauge measures the threshold once more.
  expect((valid(editorReducer(next, { type: 'toggle-step', key: threshold })) as typeof DOCUMENT).gauges[0].step).toBe(3);
});

test('moving a step keeps the gauge on the same step, wherever it moves', () => {
  const state = editorStateFrom(DOCUMENT);
  const moved = editorReducer(state, { type: 'move-step', key: state.steps[2].key, by: -1 });
  const document = valid(moved) as typeof DOCUMENT;
  expect(document.steps.map((s) => s.op)).toEqual(['gaussian', 'threshold', 'gradient', 'open']);
  expect(document.gauges[0].step).toBe(2);
  // A move past either end changes nothing.
  expect(editorReducer(state, { type: 'move-step', key: state.steps[0].key, by: -1 })).toBe(state);
});

test('duplicating copies the step after itself; removing a measured step sends its gauge to the last step', () => {
  const state = editorStateFrom(DOCUMENT);
  const duplicated = editorReducer(state, { type: 'duplicate-step', key: state.steps[0].key });
  expect((valid(duplicated) as typeof DOCUMENT).steps.map((s) => s.op)).toEqual(['gaussian', 'gaussian', 'gradient', 'threshold', 'open']);
  expect(duplicated.steps[1].step).not.toBe(duplicated.steps[0].step);
  const removed = editorReducer(state, { type: 'remove-step', key: state.steps[2].key });
  expect((valid(removed) as typeof DOCUMENT).gauges[0].step).toBeUndefined();
});

test('picking a limit from the sweep sets that bound of that gauge only', () => {
  const state = editorStateFrom(DOCUMENT);
  const document = valid(editorReducer(state, { type: 'set-limit', gaugeName: 'Slot area', bound: 'max', value: 750 })) as typeof DOCUMENT;
  expect(document.gauges[1].limits).toEqual({ min: 100, max: 750 });
  expect(document.gauges[0].limits).toEqual({ max: 0.2 });
});

test('name, channel and border are edited in the document', () => {
  const state = editorStateFrom(DOCUMENT);
  const edited = editorReducer(editorReducer(state, { type: 'set-settings', settings: { channel: 'luma', border: 'constant' } }), {
    type: 'set-settings',
    settings: { name: 'Bracket slot, green light' },
  });
  expect(valid(edited)).toMatchObject({ name: 'Bracket slot, green light', input: { channel: 'luma' }, border: 'constant' });
});

test('problems reported by path land on the step or gauge they name, counting enabled steps only', () => {
  const fresh = editorStateFrom(DOCUMENT);
  const withFirstDisabled = editorReducer(fresh, { type: 'toggle-step', key: fresh.steps[0].key });
  const { byKey, general } = issuesByKey(withFirstDisabled, [
    { path: 'document.steps[0].operator', message: 'Unknown operator' },
    { path: 'gauges[1].limits.max', message: 'Must be above min' },
    { path: 'name', message: 'Enter a name' },
  ]);
  // steps[0] of the document is the gradient, the first enabled step.
  expect(byKey.get(withFirstDisabled.steps[1].key)).toEqual([{ path: 'operator', message: 'Unknown operator' }]);
  expect(byKey.get(withFirstDisabled.gauges[1].key)).toEqual([{ path: 'limits.max', message: 'Must be above min' }]);
  expect(general).toEqual([{ path: 'name', message: 'Enter a name' }]);
});

test('adding or duplicating a step at the end keeps gauges on the step that was last', () => {
  const state = editorStateFrom(DOCUMENT);
  const added = editorReducer(state, { type: 'add-step', step: { op: 'median', size: 3 } });
  const document = valid(added) as { gauges: { name: string; step?: number }[]; steps: unknown[] };
  expect(document.steps).toHaveLength(STANDARD_STEPS.length + 1);
  // "Slot area" measured the last step (no step): it now names that step explicitly.
  expect(document.gauges.find((g) => g.name === 'Slot area')?.step).toBe(STANDARD_STEPS.length);
  expect(document.gauges.find((g) => g.name === 'Edge share')?.step).toBe(3);

  const lastKey = state.steps[state.steps.length - 1].key;
  const duplicated = valid(editorReducer(state, { type: 'duplicate-step', key: lastKey })) as { gauges: { name: string; step?: number }[] };
  expect(duplicated.gauges.find((g) => g.name === 'Slot area')?.step).toBe(STANDARD_STEPS.length);

  // The last enabled step duplicated while a disabled step follows it: the copy becomes the last step.
  const withDisabledEnd: EditorState = { ...state, steps: [...state.steps, { key: 'off', enabled: false, step: { op: 'median', size: 3 } }] };
  const beforeDisabled = valid(editorReducer(withDisabledEnd, { type: 'duplicate-step', key: lastKey })) as { gauges: { name: string; step?: number }[] };
  expect(beforeDisabled.gauges.find((g) => g.name === 'Slot area')?.step).toBe(STANDARD_STEPS.length);

  // Duplicating an earlier step changes nothing for a gauge on the last step.
  const early = valid(editorReducer(state, { type: 'duplicate-step', key: state.steps[0].key })) as { gauges: { name: string; step?: number }[] };
  expect(early.gauges.find((g) => g.name === 'Slot area')?.step).toBeUndefined();

  // With no steps yet a gauge measures the photo, and a first step is what it measures after.
  const empty = editorStateFrom({ ...DOCUMENT, steps: [], gauges: [{ name: 'Mean', measure: 'mean', limits: { max: 200 } }] });
  const first = valid(editorReducer(empty, { type: 'add-step', step: { op: 'median', size: 3 } })) as { gauges: { step?: number }[] };
  expect(first.gauges[0].step).toBeUndefined();
});
