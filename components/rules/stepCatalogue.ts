// What the pipeline editor offers for each step: a plain name, a one-line purpose, and the step a
// new one starts as. Parameter ranges come from shared/rules/schema.ts, the one definition.
import {
  MAX_MEDIAN_SIZE,
  MAX_MORPHOLOGY_RADIUS,
  MAX_SIGMA,
  MAX_WINDOW_SIZE,
  MIN_SIGMA,
  STEP_OPS,
  type Step,
} from '../../shared/rules/schema';
import { describeStepSettings, STEP_TITLES } from '../../shared/rules/words';

/** A step's settings in one line (shared/rules/words.ts). */
export const describeStep = describeStepSettings;

export type StepOp = (typeof STEP_OPS)[number];

export interface StepDescription {
  title: string;
  purpose: string;
  starting: Step;
}

export const STEP_DESCRIPTIONS: Record<StepOp, StepDescription> = {
  kernel: { title: STEP_TITLES.kernel, purpose: 'Any matrix of weights, from the kernel library or your own.', starting: { op: 'kernel', matrix: [[0, -1, 0], [-1, 5, -1], [0, -1, 0]], divisor: 1, offset: 0 } },
  gaussian: { title: STEP_TITLES.gaussian, purpose: 'Softens noise before edges are looked for.', starting: { op: 'gaussian', sigma: 1.2 } },
  box: { title: STEP_TITLES.box, purpose: 'Mean of a square neighbourhood.', starting: { op: 'box', size: 3 } },
  median: { title: STEP_TITLES.median, purpose: 'Removes specks while keeping edges sharp.', starting: { op: 'median', size: 3 } },
  gradient: { title: STEP_TITLES.gradient, purpose: 'Edge strength or direction (Sobel, Scharr, Prewitt).', starting: { op: 'gradient', operator: 'sobel', output: 'magnitude' } },
  laplacian: { title: STEP_TITLES.laplacian, purpose: 'Second derivative: fine detail and thin lines.', starting: { op: 'laplacian', neighbours: 4 } },
  log: { title: STEP_TITLES.log, purpose: 'Smoothing and second derivative in one step.', starting: { op: 'log', sigma: 1.4 } },
  threshold: { title: STEP_TITLES.threshold, purpose: 'Turns values into a mask: 1 above the threshold, else 0.', starting: { op: 'threshold', method: 'otsu' } },
  erode: { title: STEP_TITLES.erode, purpose: 'Shrinks mask regions; removes small specks.', starting: { op: 'erode', radius: 1 } },
  dilate: { title: STEP_TITLES.dilate, purpose: 'Grows mask regions; closes small gaps.', starting: { op: 'dilate', radius: 1 } },
  open: { title: STEP_TITLES.open, purpose: 'Erode then dilate: removes specks, keeps shapes.', starting: { op: 'open', radius: 1 } },
  close: { title: STEP_TITLES.close, purpose: 'Dilate then erode: fills small holes and gaps.', starting: { op: 'close', radius: 1 } },
};

export interface NumberSpec {
  label: string;
  min: number;
  max: number;
  unit: string;
  /** Whole numbers only; `odd` also refuses even ones. */
  integer?: boolean;
  odd?: boolean;
  step: number;
}

export const SIGMA_SPEC: NumberSpec = { label: 'Sigma', min: MIN_SIGMA, max: MAX_SIGMA, unit: 'px', step: 0.1 };
export const BOX_SIZE_SPEC: NumberSpec = { label: 'Size', min: 1, max: MAX_WINDOW_SIZE, unit: 'px', integer: true, odd: true, step: 2 };
export const MEDIAN_SIZE_SPEC: NumberSpec = { label: 'Size', min: 1, max: MAX_MEDIAN_SIZE, unit: 'px', integer: true, odd: true, step: 2 };
export const ADAPTIVE_SIZE_SPEC: NumberSpec = { label: 'Window size', min: 3, max: MAX_WINDOW_SIZE, unit: 'px', integer: true, odd: true, step: 2 };
export const RADIUS_SPEC: NumberSpec = { label: 'Radius', min: 1, max: MAX_MORPHOLOGY_RADIUS, unit: 'px', integer: true, step: 1 };
export const THRESHOLD_VALUE_SPEC: NumberSpec = { label: 'Threshold value', min: -1e9, max: 1e9, unit: 'grey level', step: 1 };
export const ADAPTIVE_C_SPEC: NumberSpec = { label: 'Offset below the local mean (c)', min: -1e9, max: 1e9, unit: 'grey level', step: 1 };

/**
 * "Step n: Title" for each step in order; where two steps share a title each also carries its
 * summary ("Step 2: Kernel, library kernel “gaussian-5”"), so that a choice among them is plain.
 */
export function stepNames(steps: readonly Step[]): string[] {
  const titles = steps.map((s) => STEP_DESCRIPTIONS[s.op].title);
  return steps.map((s, i) => `Step ${i + 1}: ${titles[i]}${titles.filter((t) => t === titles[i]).length > 1 ? `, ${describeStep(s)}` : ''}`);
}

/** Measures that count a mask's pixels or its blobs (DESIGN.md: edge fraction and blobs are of a mask's non-zero pixels). */
export const MASK_MEASURES = ['edge-fraction', 'blob-count', 'largest-blob-area', 'largest-blob-length'] as const;

/**
 * Whether the output after these steps (in order, the photo before the first) is a 0/1 mask: a
 * threshold makes one; morphology and the median keep one (of 0/1 values they give 0/1); every
 * other step gives values.
 */
export function outputsMask(steps: readonly Step[]): boolean {
  let mask = false;
  for (const step of steps) {
    if (step.op === 'threshold') mask = true;
    else if (!(step.op === 'erode' || step.op === 'dilate' || step.op === 'open' || step.op === 'close' || step.op === 'median')) mask = false;
  }
  return mask;
}
