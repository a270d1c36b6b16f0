// A rule document in the words the screens use: step titles and settings, what a gauge measures, the
// photo channel, the border policy and a region. One set of words for the editor, the preview and the
// reviewer's comparison, so that a supervisor reads what the engineer chose, not the document's codes.
import type { BorderMode, GaugeMeasure, InputChannel, Region, Step } from './schema';

export const STEP_TITLES: Record<Step['op'], string> = {
  kernel: 'Kernel',
  gaussian: 'Gaussian smoothing',
  box: 'Box mean',
  median: 'Median',
  gradient: 'Gradient',
  laplacian: 'Laplacian',
  log: 'Laplacian of Gaussian',
  threshold: 'Threshold',
  erode: 'Erode',
  dilate: 'Dilate',
  open: 'Open',
  close: 'Close',
};

/** A one-line summary of a step's settings, for lists, the preview strip and the comparison. */
export function describeStepSettings(step: Step): string {
  switch (step.op) {
    case 'kernel':
      return step.kernel ? `library kernel “${step.kernel}”` : `${step.matrix?.length ?? 0}×${step.matrix?.[0]?.length ?? 0} matrix ÷ ${step.divisor ?? 1}${step.offset ? ` + ${step.offset}` : ''}`;
    case 'gaussian':
    case 'log':
      return `sigma ${step.sigma} px`;
    case 'box':
    case 'median':
      return `${step.size}×${step.size} px`;
    case 'gradient':
      return `${step.operator}, ${step.output}`;
    case 'laplacian':
      return `${step.neighbours} neighbours`;
    case 'threshold':
      return `${step.method === 'fixed' ? `fixed at ${step.value}` : step.method === 'otsu' ? 'Otsu' : `adaptive mean ${step.size} px, c ${step.c}`}${step.invert ? ', inverted' : ''}`;
    default:
      return `radius ${step.radius} px`;
  }
}

export const MEASURE_LABELS: Record<GaugeMeasure, string> = {
  'edge-fraction': 'Share of mask pixels',
  'blob-count': 'Blob count',
  'largest-blob-area': 'Largest blob area',
  'largest-blob-length': 'Largest blob length',
  mean: 'Mean value',
  stddev: 'Standard deviation',
  min: 'Lowest value',
  max: 'Highest value',
};

export const CHANNEL_LABELS: Record<InputChannel, string> = {
  luma: 'Grey (luma, BT.601)',
  red: 'Red only',
  green: 'Green only',
  blue: 'Blue only',
};

export const BORDER_LABELS: Record<BorderMode, { label: string; meaning: string }> = {
  reflect: { label: 'Mirror', meaning: 'Pixels beyond the edge mirror the image without repeating the edge pixel (gfedcb|abcdefgh).' },
  replicate: { label: 'Repeat edge', meaning: 'Pixels beyond the edge repeat the edge pixel (aaaa|abcd).' },
  constant: { label: 'Black', meaning: 'Pixels beyond the edge are 0; an erosion clears shapes that touch the edge.' },
};

const percent = (fraction: number) => `${Math.round(fraction * 1000) / 10} %`;

/** "Rectangle: 25 % from the left, 25 % from the top, 50 % wide, 50 % high"; no region: "Whole photo". */
export function describeRegion(region: Region | undefined): string {
  if (!region) return 'Whole photo';
  if (region.shape === 'rect') return `Rectangle: ${percent(region.x)} from the left, ${percent(region.y)} from the top, ${percent(region.w)} wide, ${percent(region.h)} high`;
  return `Circle: centre ${percent(region.cx)} across, ${percent(region.cy)} down, radius ${percent(region.r)} of the shorter side`;
}
