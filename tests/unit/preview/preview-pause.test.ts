// When the live preview runs after a change: at the next frame for a single change when the engine
// keeps up and the draft validates, after the pause for typing otherwise (hooks/previewPause.ts).
import { PREVIEW_DEBOUNCE_MS, previewPauseMs, QUICK_RUN_MS } from '../../../hooks/previewPause';

test('a single change with a quick engine and a valid draft runs at the next frame', () => {
  expect(previewPauseMs({ sinceLastChangeMs: Infinity, lastRunMs: 0, valid: true })).toBe(0);
  expect(previewPauseMs({ sinceLastChangeMs: PREVIEW_DEBOUNCE_MS, lastRunMs: QUICK_RUN_MS, valid: true })).toBe(0);
  expect(previewPauseMs({ sinceLastChangeMs: 2000, lastRunMs: 12, valid: true })).toBe(0);
});

test('changes in quick succession, a slow engine or a draft that does not validate wait for the pause', () => {
  expect(previewPauseMs({ sinceLastChangeMs: PREVIEW_DEBOUNCE_MS - 1, lastRunMs: 5, valid: true })).toBe(PREVIEW_DEBOUNCE_MS);
  expect(previewPauseMs({ sinceLastChangeMs: Infinity, lastRunMs: QUICK_RUN_MS + 1, valid: true })).toBe(PREVIEW_DEBOUNCE_MS);
  expect(previewPauseMs({ sinceLastChangeMs: Infinity, lastRunMs: 5, valid: false })).toBe(PREVIEW_DEBOUNCE_MS);
});
