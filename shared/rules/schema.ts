// The rule document, format "kernwright-rule/1": the interchange format of a rule version.
// One schema for the API, the app, the rule command, exports and the database (DESIGN.md,
// "Rule file format, version 1"). Every object is strict: an unknown field is refused and named.
import { z } from 'zod';
import { formatIssuePath, zodIssues, type FieldIssue } from '../api/errors';
import { documentLimitMessage, limitProblems } from './limits';

export const RULE_FORMAT = 'kernwright-rule/1';

export const BORDER_MODES = ['reflect', 'replicate', 'constant'] as const;
export type BorderMode = (typeof BORDER_MODES)[number];

export const INPUT_CHANNELS = ['luma', 'red', 'green', 'blue'] as const;
export type InputChannel = (typeof INPUT_CHANNELS)[number];

/** Largest kernel side (rows or columns) a `kernel` step accepts. */
export const MAX_KERNEL_SIDE = 31;
export const MIN_SIGMA = 0.3;
export const MAX_SIGMA = 10;
export const MAX_MEDIAN_SIZE = 15;
/** Box and adaptive-mean windows run in constant time per pixel, so they may be wide. */
export const MAX_WINDOW_SIZE = 255;
export const MAX_MORPHOLOGY_RADIUS = 25;
export const MAX_STEPS = 64;
export const MAX_GAUGES = 64;

const finite = () => z.number();

const oddSize = (label: string, min: number, max: number) =>
  z
    .number()
    .int(`${label} must be a whole number`)
    .min(min, `${label} must be between ${min} and ${max}`)
    .max(max, `${label} must be between ${min} and ${max}`)
    .refine((n) => n % 2 === 1, `${label} must be odd`);

const sigma = (label: string) =>
  z
    .number()
    .min(MIN_SIGMA, `${label} must be between ${MIN_SIGMA} and ${MAX_SIGMA}`)
    .max(MAX_SIGMA, `${label} must be between ${MIN_SIGMA} and ${MAX_SIGMA}`);

// ---------------------------------------------------------------------------------------------
// Steps

const matrixRow = z.array(finite()).min(1, 'a kernel row needs at least one value');

/** A kernel step names a kernel of the library, or gives its own matrix (never both). */
export const kernelStepSchema = z
  .strictObject({
    op: z.literal('kernel'),
    kernel: z.string().min(1).max(100).optional(),
    matrix: z.array(matrixRow).min(1, 'a kernel needs at least one row').optional(),
    divisor: finite()
      .refine((d) => d !== 0, 'divisor must not be 0')
      .optional(),
    offset: finite().optional(),
  })
  .superRefine((step, ctx) => {
    if (step.kernel === undefined && step.matrix === undefined) {
      ctx.addIssue({ code: 'custom', path: ['kernel'], message: 'give either "kernel" (a library name) or "matrix"' });
      return;
    }
    if (step.kernel !== undefined) {
      for (const field of ['matrix', 'divisor', 'offset'] as const) {
        if (step[field] !== undefined) {
          ctx.addIssue({ code: 'custom', path: [field], message: `"${field}" cannot be combined with a library "kernel"` });
        }
      }
      return;
    }
    const matrix = step.matrix!;
    const rows = matrix.length;
    const cols = matrix[0].length;
    if (rows % 2 === 0 || rows > MAX_KERNEL_SIDE) {
      ctx.addIssue({ code: 'custom', path: ['matrix'], message: `a kernel needs an odd number of rows between 1 and ${MAX_KERNEL_SIDE}, got ${rows}` });
    }
    if (cols % 2 === 0 || cols > MAX_KERNEL_SIDE) {
      ctx.addIssue({ code: 'custom', path: ['matrix', 0], message: `a kernel needs an odd number of columns between 1 and ${MAX_KERNEL_SIDE}, got ${cols}` });
    }
    matrix.forEach((row, j) => {
      if (row.length !== cols) {
        ctx.addIssue({ code: 'custom', path: ['matrix', j], message: `every kernel row needs ${cols} values (as row 0), got ${row.length}` });
      }
    });
  });

export const gaussianStepSchema = z.strictObject({ op: z.literal('gaussian'), sigma: sigma('sigma') });
export const boxStepSchema = z.strictObject({ op: z.literal('box'), size: oddSize('size', 1, MAX_WINDOW_SIZE) });
export const medianStepSchema = z.strictObject({ op: z.literal('median'), size: oddSize('size', 1, MAX_MEDIAN_SIZE) });

export const GRADIENT_OPERATORS = ['sobel', 'scharr', 'prewitt'] as const;
export type GradientOperator = (typeof GRADIENT_OPERATORS)[number];
export const GRADIENT_OUTPUTS = ['x', 'y', 'magnitude', 'direction'] as const;
export type GradientOutput = (typeof GRADIENT_OUTPUTS)[number];

export const gradientStepSchema = z.strictObject({
  op: z.literal('gradient'),
  operator: z.enum(GRADIENT_OPERATORS),
  output: z.enum(GRADIENT_OUTPUTS),
});

export const laplacianStepSchema = z.strictObject({
  op: z.literal('laplacian'),
  neighbours: z.union([z.literal(4), z.literal(8)], { error: 'neighbours must be 4 or 8' }),
});

export const logStepSchema = z.strictObject({ op: z.literal('log'), sigma: sigma('sigma') });

const invert = z.boolean().optional();

export const fixedThresholdSchema = z.strictObject({
  op: z.literal('threshold'),
  method: z.literal('fixed'),
  value: finite(),
  invert,
});
export const otsuThresholdSchema = z.strictObject({ op: z.literal('threshold'), method: z.literal('otsu'), invert });
export const adaptiveMeanThresholdSchema = z.strictObject({
  op: z.literal('threshold'),
  method: z.literal('adaptive-mean'),
  size: oddSize('size', 3, MAX_WINDOW_SIZE),
  c: finite(),
  invert,
});
export const thresholdStepSchema = z.discriminatedUnion('method', [
  fixedThresholdSchema,
  otsuThresholdSchema,
  adaptiveMeanThresholdSchema,
]);

export const MORPHOLOGY_OPS = ['erode', 'dilate', 'open', 'close'] as const;
export type MorphologyOp = (typeof MORPHOLOGY_OPS)[number];
const radius = z
  .number()
  .int('radius must be a whole number')
  .min(1, `radius must be between 1 and ${MAX_MORPHOLOGY_RADIUS}`)
  .max(MAX_MORPHOLOGY_RADIUS, `radius must be between 1 and ${MAX_MORPHOLOGY_RADIUS}`);
export const morphologyStepSchema = z.discriminatedUnion('op', [
  z.strictObject({ op: z.literal('erode'), radius }),
  z.strictObject({ op: z.literal('dilate'), radius }),
  z.strictObject({ op: z.literal('open'), radius }),
  z.strictObject({ op: z.literal('close'), radius }),
]);

export const stepSchema = z.discriminatedUnion('op', [
  kernelStepSchema,
  gaussianStepSchema,
  boxStepSchema,
  medianStepSchema,
  gradientStepSchema,
  laplacianStepSchema,
  logStepSchema,
  thresholdStepSchema,
  morphologyStepSchema,
]);

export const STEP_OPS = [
  'kernel', 'gaussian', 'box', 'median', 'gradient', 'laplacian', 'log', 'threshold', ...MORPHOLOGY_OPS,
] as const;

// ---------------------------------------------------------------------------------------------
// Regions and gauges

const fraction = (label: string) =>
  z.number().min(0, `${label} must be between 0 and 1`).max(1, `${label} must be between 0 and 1`);
const positiveFraction = (label: string) =>
  z.number().gt(0, `${label} must be above 0 and at most 1`).max(1, `${label} must be above 0 and at most 1`);

/** Fractions may add up to slightly over 1 through decimal rounding in a UI. */
const FRACTION_SLACK = 1e-9;

/** A rectangle in fractions of the image width (x, w) and height (y, h); a pixel belongs when its centre lies inside. */
export const rectRegionSchema = z
  .strictObject({
    shape: z.literal('rect'),
    x: fraction('x'),
    y: fraction('y'),
    w: positiveFraction('w'),
    h: positiveFraction('h'),
  })
  .superRefine((r, ctx) => {
    if (r.x + r.w > 1 + FRACTION_SLACK) ctx.addIssue({ code: 'custom', path: ['w'], message: 'x + w must not exceed 1' });
    if (r.y + r.h > 1 + FRACTION_SLACK) ctx.addIssue({ code: 'custom', path: ['h'], message: 'y + h must not exceed 1' });
  });

/** A circle centred at (cx·width, cy·height) with radius r·min(width, height), so that it stays round. */
export const circleRegionSchema = z.strictObject({
  shape: z.literal('circle'),
  cx: fraction('cx'),
  cy: fraction('cy'),
  r: positiveFraction('r'),
});

export const regionSchema = z.discriminatedUnion('shape', [rectRegionSchema, circleRegionSchema]);

export const GAUGE_MEASURES = [
  'edge-fraction',
  'blob-count',
  'largest-blob-area',
  'largest-blob-length',
  'mean',
  'stddev',
  'min',
  'max',
] as const;
export type GaugeMeasure = (typeof GAUGE_MEASURES)[number];

export const GAUGE_UNITS = ['px', 'px2', 'mm', 'mm2'] as const;
export type GaugeUnit = (typeof GAUGE_UNITS)[number];

/** Units each measure may report in; an empty list means the measure has no unit. */
export const UNITS_OF_MEASURE: Record<GaugeMeasure, readonly GaugeUnit[]> = {
  'edge-fraction': [],
  'blob-count': [],
  'largest-blob-area': ['px2', 'mm2'],
  'largest-blob-length': ['px', 'mm'],
  mean: [],
  stddev: [],
  min: [],
  max: [],
};

/** Limits on their own; what the gauge's measure allows is checked with the gauge (limits.ts). */
export const limitsSchema = z.strictObject({ min: finite().optional(), max: finite().optional() });

export const gaugeSchema = z
  .strictObject({
    name: z.string().trim().min(1, 'a gauge needs a name').max(100),
    measure: z.enum(GAUGE_MEASURES),
    step: z.number().int('step must be a whole number').min(1, 'step counts from 1').optional(),
    region: regionSchema.optional(),
    unit: z.enum(GAUGE_UNITS).optional(),
    limits: limitsSchema,
  })
  .superRefine((g, ctx) => {
    for (const problem of limitProblems(g.measure, g.limits)) {
      ctx.addIssue({ code: 'custom', path: problem.bound ? ['limits', problem.bound] : ['limits'], message: documentLimitMessage(problem, g.measure) });
    }
    const allowed = UNITS_OF_MEASURE[g.measure];
    if (g.unit !== undefined && !allowed.includes(g.unit)) {
      ctx.addIssue({
        code: 'custom',
        path: ['unit'],
        message: allowed.length === 0
          ? `"${g.measure}" has no unit; leave "unit" out`
          : `"${g.measure}" is measured in ${allowed.join(' or ')}, not ${g.unit}`,
      });
    }
  });

export const qualitySchema = z.strictObject({
  minFocus: z.number().min(0, 'minFocus must be at least 0').optional(),
  maxClipped: fraction('maxClipped').optional(),
  minMean: z.number().min(0, 'minMean must be at least 0').optional(),
});

export const inputSchema = z.strictObject({ channel: z.enum(INPUT_CHANNELS) });

// ---------------------------------------------------------------------------------------------
// The document

export const ruleDocumentSchema = z
  .strictObject({
    format: z.literal(RULE_FORMAT, { error: `format must be "${RULE_FORMAT}"` }),
    name: z.string().trim().min(1, 'a rule needs a name').max(200),
    input: inputSchema.default({ channel: 'luma' }),
    border: z.enum(BORDER_MODES).default('reflect'),
    quality: qualitySchema.optional(),
    steps: z.array(stepSchema).max(MAX_STEPS, `a rule has at most ${MAX_STEPS} steps`),
    gauges: z.array(gaugeSchema).max(MAX_GAUGES, `a rule has at most ${MAX_GAUGES} gauges`),
  })
  .superRefine((doc, ctx) => {
    const seen = new Set<string>();
    doc.gauges.forEach((g, i) => {
      if (g.step !== undefined && g.step > doc.steps.length) {
        ctx.addIssue({
          code: 'custom',
          path: ['gauges', i, 'step'],
          message: `step ${g.step} does not exist: the rule has ${doc.steps.length} step(s)`,
        });
      }
      if (seen.has(g.name)) {
        ctx.addIssue({ code: 'custom', path: ['gauges', i, 'name'], message: `gauge name "${g.name}" is used twice` });
      }
      seen.add(g.name);
    });
  });

export type RuleDocument = z.infer<typeof ruleDocumentSchema>;
/** A rule document as written, before defaults (input, border) are filled in. */
export type RuleDocumentInput = z.input<typeof ruleDocumentSchema>;
export type Step = z.infer<typeof stepSchema>;
export type KernelStep = z.infer<typeof kernelStepSchema>;
export type ThresholdStep = z.infer<typeof thresholdStepSchema>;
export type MorphologyStep = z.infer<typeof morphologyStepSchema>;
export type StepOp = Step['op'];
export type Gauge = z.infer<typeof gaugeSchema>;
export type Region = z.infer<typeof regionSchema>;
export type RectRegion = z.infer<typeof rectRegionSchema>;
export type CircleRegion = z.infer<typeof circleRegionSchema>;
export type Limits = z.infer<typeof limitsSchema>;
export type QualityLimits = z.infer<typeof qualitySchema>;

export type RuleValidation = { ok: true; rule: RuleDocument } | { ok: false; issues: FieldIssue[] };

/**
 * Validates a rule document. Every problem is reported with its JSON path; an unknown field is
 * reported at its own path (`steps[0].colour`), not only at the object that holds it.
 */
export function validateRuleDocument(input: unknown): RuleValidation {
  const parsed = ruleDocumentSchema.safeParse(input);
  if (parsed.success) return { ok: true, rule: parsed.data };
  const issues: FieldIssue[] = [];
  const others: z.core.$ZodIssue[] = [];
  for (const issue of parsed.error.issues) {
    if (issue.code === 'unrecognized_keys') {
      for (const key of issue.keys) {
        issues.push({ path: formatIssuePath([...issue.path, key]), message: `unknown field "${key}"` });
      }
    } else {
      others.push(issue);
    }
  }
  issues.push(...zodIssues(new z.ZodError(others)));
  return { ok: false, issues };
}
