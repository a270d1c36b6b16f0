// A version is "sent back" while it is a draft with a review on it: the rules list (from the
// server) and the rule page (from the full version) decide it with the same function.
// Source: the version lifecycle in DESIGN.md (draft → in review → released, or back to draft).
import { isSentBack } from '../../../shared/api/rules';

const reviewed = '2026-12-01T09:00:00.000Z';

test('a draft with a review on it was sent back; a fresh draft was not', () => {
  expect(isSentBack({ state: 'draft', reviewedAt: reviewed })).toBe(true);
  expect(isSentBack({ state: 'draft', reviewedAt: new Date(reviewed) })).toBe(true);
  expect(isSentBack({ state: 'draft', reviewedAt: null })).toBe(false);
});

test('a resubmitted or released version is no longer sent back, though its review stays on record', () => {
  for (const state of ['in-review', 'released', 'superseded', 'withdrawn'] as const) expect(isSentBack({ state, reviewedAt: reviewed })).toBe(false);
});
