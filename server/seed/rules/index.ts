/**
 * The demo plant's inspection rules, one set per part family: the released version, a draft in review
 * and a draft in progress. Limits come from scripts/tune-demo-rules.ts (see the comments there).
 */
import type { FamilyName } from '../../demo/types';
import type { RuleDocument } from '../../../shared/rules/schema';
import bracketReleased from './bracket-hole-and-edge-check.json';
import washerReleased from './washer-rim-and-bore-check.json';
import gasketReleased from './gasket-ring-defects.json';
import bracketTighter from './bracket-tighter-edge-limits.json';
import washerTighter from './washer-tighter-edge-limits.json';
import gasketTighter from './gasket-tighter-edge-limits.json';
import bracketMedian from './bracket-median-prefilter.json';
import washerMedian from './washer-median-prefilter.json';
import gasketMedian from './gasket-median-prefilter.json';

export interface FamilyRules {
  released: RuleDocument;
  /** Submitted for review: the released rule with tighter notch and lump limits. */
  inReview: RuleDocument;
  /** Still being edited: a 3x3 median added before the smoothing, to try against JPEG artefacts. */
  inProgress: RuleDocument;
}

const asRule = (document: unknown) => document as RuleDocument;

export const DEMO_RULES: Readonly<Record<FamilyName, FamilyRules>> = {
  bracket: { released: asRule(bracketReleased), inReview: asRule(bracketTighter), inProgress: asRule(bracketMedian) },
  washer: { released: asRule(washerReleased), inReview: asRule(washerTighter), inProgress: asRule(washerMedian) },
  gasket: { released: asRule(gasketReleased), inReview: asRule(gasketTighter), inProgress: asRule(gasketMedian) },
};

export function releasedDemoRules(): Record<FamilyName, RuleDocument> {
  return { bracket: DEMO_RULES.bracket.released, washer: DEMO_RULES.washer.released, gasket: DEMO_RULES.gasket.released };
}
