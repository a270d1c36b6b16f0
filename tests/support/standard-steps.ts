// The standard pipeline's steps (Gaussian σ = 1 → Sobel magnitude → Otsu → open r = 1), as many tests
// build rules from them.
import type { RuleDocumentInput } from '../../shared/rules/schema';

export const STANDARD_STEPS: RuleDocumentInput['steps'] = [
  { op: 'gaussian', sigma: 1 },
  { op: 'gradient', operator: 'sobel', output: 'magnitude' },
  { op: 'threshold', method: 'otsu' },
  { op: 'open', radius: 1 },
];
