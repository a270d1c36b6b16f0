// Runs a rule document on a photo: validate, quality gate, every step in order (float32 in,
// float32 out), gauges, verdict. Pure computation: kernels of the library come from the caller.
import type { FieldIssue } from '../api/errors';
import { validateRuleDocument, type Gauge, type GaugeMeasure, type GaugeUnit, type Limits, type RuleDocument, type Step } from '../rules/schema';
import { MAX_PACKED_RADIUS, type PackedMask } from './binary-morphology';
import type { BorderMode } from './border';
import { correlate } from './convolve';
import { DeferrableImage } from './deferrable-image';
import { gaugeUnit, measurePixels, needsCalibration, regionSpans, toUnit, withinLimits } from './gauges';
import { gradient } from './gradient';
import type { BitDepth, Image, RawPhoto, ValueRange } from './image';
import { gaussianWeights, kernelFromMatrix, separate, type Kernel, type KernelDefinition } from './kernels';
import { LAPLACIAN_KERNELS, laplacian, laplacianOfGaussian } from './laplacian';
import { medianFilter } from './median';
import { morphology } from './morphology';
import { gaussianGradient } from './smoothed-gradient';
import { eightBitInputFromPhoto, inputWithQuality, separableFromPhoto, sweepFromPhoto } from './photo-channel';
import { judgeQuality, type QualityFigures, type QualityJudgement } from './quality';
import { boxFilter, gaussianBlur } from './smoothing';
import { thresholdAdaptiveMean, thresholdFixed, thresholdOtsu } from './threshold';
import { ImageWorkspace } from './workspace';

export type Verdict = 'PASS' | 'FAIL' | 'RETAKE';

/** How a step's values should be shown: masks black/white, signed values centred on grey. */
export type OutputKind = 'intensity' | 'signed' | 'mask' | 'direction';

export type KernelLibrary = ReadonlyMap<string, KernelDefinition>;

export interface RunOptions {
  /** Kernels a `{ "kernel": "<name>" }` step may name. */
  kernels?: KernelLibrary;
  /** The station's calibration; needed by gauges in mm or mm². */
  mmPerPx?: number;
  /** 'all' keeps every step's output (previews, the rule command); 'gauged' keeps only what gauges read and reuses the rest. */
  retain?: 'all' | 'gauged';
  /**
   * Buffers to reuse across runs (a batch, a worker thread). Outputs that are not retained go
   * back to it at the end of the run; hand a finished run back with `releaseRun`.
   */
  workspace?: ImageWorkspace;
}

export interface StepRun {
  /** 1-based, as gauges refer to steps. */
  readonly index: number;
  readonly op: Step['op'];
  readonly kind: OutputKind;
  /** null when not retained. */
  readonly output: Image | null;
  /** 0 for a Gaussian run inside the gradient after it (see smoothed-gradient.ts): the gradient's time includes it. */
  readonly ms: number;
}

export interface Measurement {
  readonly name: string;
  readonly measure: GaugeMeasure;
  /** Step whose output was measured (0 = the converted input). */
  readonly step: number;
  readonly value: number;
  readonly unit: GaugeUnit | null;
  readonly limits: Limits;
  readonly pass: boolean;
}

export interface RuleRun {
  readonly rule: RuleDocument;
  readonly verdict: Verdict;
  readonly quality: QualityJudgement;
  readonly measurements: Measurement[];
  readonly steps: StepRun[];
  /** The converted input (the rule's channel, float32). */
  readonly input: Image;
  readonly bitDepth: BitDepth;
  readonly ms: number;
}

export type RuleRunErrorCode = 'invalid_rule' | 'unknown_kernel' | 'missing_calibration';

/** A rule that cannot run on this photo: invalid document, unknown kernel, or mm without calibration. */
export class RuleRunError extends Error {
  constructor(
    readonly code: RuleRunErrorCode,
    message: string,
    readonly issues: FieldIssue[],
  ) {
    super(message);
    this.name = 'RuleRunError';
  }
}

/** Validates the document, then runs it on the photo. */
export function runRule(document: unknown, photo: RawPhoto, options: RunOptions = {}): RuleRun {
  const validation = validateRuleDocument(document);
  if (!validation.ok) {
    const first = validation.issues[0];
    throw new RuleRunError('invalid_rule', `invalid rule: ${first.path}: ${first.message}`, validation.issues);
  }
  return runValidatedRule(validation.rule, photo, options);
}

export function runValidatedRule(rule: RuleDocument, photo: RawPhoto, options: RunOptions = {}): RuleRun {
  const kernels = resolveKernels(rule, options.kernels);
  checkCalibration(rule, options.mmPerPx);
  const started = now();
  // Without a workspace from the caller, the run's images end in ordinary memory (detached below).
  const ownWorkspace = !options.workspace;
  const workspace = options.workspace ?? new ImageWorkspace();
  const retainAll = (options.retain ?? 'all') === 'all';
  const needed = new Set<number>(rule.gauges.map((g) => g.step ?? rule.steps.length));
  needed.add(rule.steps.length);
  const spare: Image[] = [];
  // A spare image is overwritten by the step that takes it: samples it still holds in packed bits go unwritten.
  const take = () => {
    const image = spare.pop();
    if (!image) return workspace.take(photo.width, photo.height);
    if (image instanceof DeferrableImage) image.discard();
    return image;
  };
  const handover: Handover = { range: { min: NaN, max: NaN }, packed: null, workspace, packedReady: false };

  // A rule whose first step is separable (a Gaussian and a gradient after it that nobody else reads
  // are one sweep) takes an 8-bit photo straight into that step (photo-channel.ts), unless every
  // image is kept: the input image is then filled only if something reads it. So does one whose first
  // step reads an 8-bit grey photo's bytes (a Laplacian, most direct kernels of whole numbers, a 3×3 or
  // 5×5 median): it runs in the loop below.
  let input = workspace.take(photo.width, photo.height);
  let opening: Opening | null = null;
  let figures: QualityFigures | null = null;
  if (!retainAll) {
    const out = take();
    const t0 = now();
    const opened = openFromPhoto(rule, photo, kernels[0], needed, input, out, handover.range);
    if (opened) figures = opened.figures;
    if (opened && opened.steps !== 0) opening = { output: out, ms: now() - t0, steps: opened.steps };
    else spare.push(out);
  }
  if (!figures) ({ input, quality: figures } = inputWithQuality(photo, rule.input.channel, input));
  const quality = judgeQuality(figures, rule.quality);

  const steps: StepRun[] = [];
  const outputs: (Image | null)[] = [input];
  let current = input;
  let currentKind: OutputKind = 'intensity';
  for (let i = 0; i < rule.steps.length; i++) {
    const step = rule.steps[i];
    const t0 = now();
    const opened = i === 0 ? opening : null;
    const swept = opened?.steps === 2 ? opened : null;
    const out = opened ? opened.output : take();
    const next = rule.steps[i + 1];
    const keptOutput = retainAll || needed.has(i + 1);
    if (step.op === 'gaussian' && next?.op === 'gradient' && next.output !== 'direction' && !keptOutput) {
      // Nobody reads the smoothed image: smooth and differentiate in one sweep (smoothed-gradient.ts).
      handover.packedReady = false;
      if (!swept) handover.range.min = handover.range.max = NaN;
      const result = swept ? out : gaussianGradient(current, step.sigma, next.operator, next.output, rule.border, out, handover.range);
      const ms = swept ? swept.ms : now() - t0;
      if (!retainAll && i > 0 && !needed.has(i)) {
        spare.push(current);
        outputs[i] = null;
      }
      outputs[i + 1] = null;
      outputs[i + 2] = result;
      // The pair's time goes to the gradient; the Gaussian, run inside it, shows 0.
      steps.push({ index: i + 1, op: step.op, kind: outputKind(step, null, currentKind), output: null, ms: 0 });
      const kind = outputKind(next, null, 'intensity');
      steps.push({ index: i + 2, op: next.op, kind, output: result, ms });
      current = result;
      currentKind = kind;
      i++;
      continue;
    }
    // A mask (0/1 from a threshold) is opened or closed in packed bits, which need no scratch image.
    const packedPath = currentKind === 'mask' && 'radius' in step && step.radius <= MAX_PACKED_RADIUS;
    const scratch = (step.op === 'open' || step.op === 'close') && !packedPath ? take() : undefined;
    const packNext = next !== undefined && (next.op === 'erode' || next.op === 'dilate' || next.op === 'open' || next.op === 'close');
    // A mask that only the next step reads, and only in packed bits, need not be written as float32.
    const onlyPacked = packNext && 'radius' in next && next.radius <= MAX_PACKED_RADIUS && !retainAll && !needed.has(i + 1);
    const result = opened ? out : applyStep(step, current, rule.border, out, scratch, kernels[i], options, handover, packNext, onlyPacked);
    if (scratch) spare.push(scratch);
    const ms = opened ? opened.ms : now() - t0;
    const kind = outputKind(step, kernels[i], currentKind);
    const index = i + 1;
    if (!retainAll && i > 0 && !needed.has(i)) {
      spare.push(current);
      outputs[i] = null;
    }
    outputs[index] = result;
    steps.push({ index, op: step.op, kind, output: result, ms });
    current = result;
    currentKind = kind;
  }

  const measurements = rule.gauges.map((g) => measure(g, outputs, rule.steps.length, options.mmPerPx));
  const verdict = verdictOf(quality, measurements);
  const retainedSteps = steps.map((s) => (outputs[s.index] ? s : { ...s, output: null }));
  for (const image of spare) workspace.give(image);
  if (!ownWorkspace) return { rule, verdict, quality, measurements, steps: retainedSteps, input, bitDepth: photo.bitDepth, ms: now() - started };
  const detached = retainedSteps.map((s) => (s.output ? { ...s, output: workspace.detach(s.output) } : s));
  const detachedInput = workspace.detach(input);
  workspace.dispose();
  return { rule, verdict, quality, measurements, steps: detached, input: detachedInput, bitDepth: photo.bitDepth, ms: now() - started };
}

/**
 * The run's measurements and verdict for another version of its rule whose input channel, border and
 * steps are the same (only the gauges, their limits and regions, or the quality gate's limits differ),
 * from the images the run kept: a gauge edit in the preview needs no new pass over the photo. The new
 * run shares the images (hand back only one of the two). null when the document does not validate,
 * its pipeline differs, or an image a gauge reads was not kept: run it instead. Throws RuleRunError
 * for mm gauges without calibration, as runRule does.
 */
export function remeasureRun(run: RuleRun, document: unknown, options: Pick<RunOptions, 'mmPerPx'> = {}): RuleRun | null {
  const started = now();
  const validation = validateRuleDocument(document);
  if (!validation.ok) return null;
  const rule = validation.rule;
  if (pipelineKey(rule) !== pipelineKey(run.rule)) return null;
  const outputs = [run.input, ...run.steps.map((s) => s.output)];
  if (rule.gauges.some((g) => !outputs[g.step ?? rule.steps.length])) return null;
  checkCalibration(rule, options.mmPerPx);
  const quality = judgeQuality(run.quality, rule.quality);
  const measurements = rule.gauges.map((g) => measure(g, outputs, rule.steps.length, options.mmPerPx));
  return { ...run, rule, quality, measurements, verdict: verdictOf(quality, measurements), ms: now() - started };
}

/** What decides a run's images: the input channel, the border and the steps. */
function pipelineKey(rule: RuleDocument): string {
  return JSON.stringify([rule.input, rule.border, rule.steps]);
}

function verdictOf(quality: QualityJudgement, measurements: Measurement[]): Verdict {
  return !quality.pass ? 'RETAKE' : measurements.every((m) => m.pass) ? 'PASS' : 'FAIL';
}

/** Hands the buffers of a finished run (input and retained outputs) to the workspace; the run must not be used afterwards. */
export function releaseRun(run: RuleRun, workspace: ImageWorkspace): void {
  workspace.give(run.input);
  for (const step of run.steps) if (step.output) workspace.give(step.output);
}

function now(): number {
  return typeof performance !== 'undefined' ? performance.now() : Date.now();
}

function resolveKernels(rule: RuleDocument, library?: KernelLibrary): (Kernel | null)[] {
  const issues: FieldIssue[] = [];
  const kernels = rule.steps.map((step, i) => {
    if (step.op !== 'kernel') return null;
    if (step.matrix) return kernelFromMatrix(step.matrix, step.divisor ?? 1, step.offset ?? 0);
    const def = library?.get(step.kernel!);
    if (!def) {
      issues.push({ path: `steps[${i}].kernel`, message: `no kernel named "${step.kernel}" in the kernel library` });
      return null;
    }
    return kernelFromMatrix(def.matrix, def.divisor, def.offset);
  });
  if (issues.length > 0) throw new RuleRunError('unknown_kernel', `${issues[0].path}: ${issues[0].message}`, issues);
  return kernels;
}

function checkCalibration(rule: RuleDocument, mmPerPx?: number): void {
  if (mmPerPx !== undefined && mmPerPx > 0 && Number.isFinite(mmPerPx)) return;
  const issues = rule.gauges.flatMap((g, i) =>
    needsCalibration(g) ? [{ path: `gauges[${i}].unit`, message: `"${g.name}" is in ${g.unit}: the station's calibration (mm per pixel) is needed` }] : [],
  );
  if (issues.length > 0) throw new RuleRunError('missing_calibration', issues[0].message, issues);
}

/** The first step (or the Gaussian-and-gradient pair) already computed from the photo's bytes. */
interface Opening {
  output: Image;
  ms: number;
  steps: 1 | 2;
}

/**
 * The rule's opening step run straight from the photo (see runValidatedRule): the quality figures and
 * how many steps `out` holds (0: the input image waits for its samples, the first step runs as usual),
 * or null when the photo or the step does not allow it.
 */
function openFromPhoto(rule: RuleDocument, photo: RawPhoto, kernel: Kernel | null, needed: Set<number>, input: Image, out: Image, range: ValueRange): { figures: QualityFigures; steps: 0 | 1 | 2 } | null {
  const [first, second] = rule.steps;
  const channel = rule.input.channel;
  const opened = (figures: QualityFigures | null, steps: 0 | 1 | 2) => (figures ? { figures, steps } : null);
  if (first?.op === 'gaussian' && second?.op === 'gradient' && second.output !== 'direction' && !needed.has(1)) {
    return opened(sweepFromPhoto(photo, channel, first.sigma, second.operator, second.output, rule.border, input, out, range), 2);
  }
  if (first?.op === 'gaussian') {
    const g = gaussianWeights(first.sigma);
    return opened(separableFromPhoto(photo, channel, g, g, 0, rule.border, input, out), 1);
  }
  if (first?.op === 'laplacian') return opened(eightBitInputFromPhoto(photo, channel, input, { kernel: LAPLACIAN_KERNELS[first.neighbours] }), 0);
  if (first?.op === 'median') return opened(eightBitInputFromPhoto(photo, channel, input, { medianSize: first.size }), 0);
  if (first?.op !== 'kernel' || !kernel) return null;
  const pair = separate(kernel);
  if (pair) return opened(separableFromPhoto(photo, channel, pair.column, pair.row, kernel.offset, rule.border, input, out), 1);
  return opened(eightBitInputFromPhoto(photo, channel, input, { kernel }), 0);
}

/**
 * What a step measured or wrote on the way that the next step would otherwise compute again:
 * the range of a gradient magnitude (for Otsu), a threshold's mask in packed bits (for morphology).
 */
interface Handover {
  range: ValueRange;
  /** The workspace's packed mask, once a step has asked for it. */
  packed: PackedMask | null;
  workspace: ImageWorkspace;
  /** True when `packed` holds the current image. */
  packedReady: boolean;
}

function applyStep(
  step: Step,
  src: Image,
  border: BorderMode,
  out: Image,
  scratch: Image | undefined,
  kernel: Kernel | null,
  options: RunOptions,
  handover: Handover,
  packNext: boolean,
  onlyPacked: boolean,
): Image {
  const range = handover.range;
  const known = { min: range.min, max: range.max };
  range.min = range.max = NaN;
  const packedIn = handover.packedReady && handover.packed ? handover.packed : undefined;
  handover.packedReady = false;
  switch (step.op) {
    case 'kernel':
      return correlate(src, kernel!, border, out);
    case 'gaussian':
      return gaussianBlur(src, step.sigma, border, out);
    case 'box':
      return boxFilter(src, step.size, border, out);
    case 'median':
      return medianFilter(src, step.size, border, out);
    case 'gradient':
      return gradient(src, step.operator, step.output, border, out, range);
    case 'laplacian':
      return laplacian(src, step.neighbours, border, out);
    case 'log':
      return laplacianOfGaussian(src, step.sigma, border, out);
    case 'threshold':
      if (step.method === 'fixed') return thresholdFixed(src, step.value, step.invert, out);
      if (step.method === 'otsu') {
        if (!packNext) return thresholdOtsu(src, step.invert, out, known).mask;
        handover.packed ??= handover.workspace.packedMask(src.width, src.height);
        handover.packedReady = true;
        return thresholdOtsu(src, step.invert, out, known, handover.packed, !onlyPacked).mask;
      }
      return thresholdAdaptiveMean(src, step.size, step.c, border, step.invert, out);
    case 'erode':
    case 'dilate':
    case 'open':
    case 'close':
      return morphology(src, step.op, step.radius, border, out, scratch, packedIn);
  }
}

function outputKind(step: Step, kernel: Kernel | null, previous: OutputKind): OutputKind {
  switch (step.op) {
    case 'threshold':
      return 'mask';
    case 'erode':
    case 'dilate':
    case 'open':
    case 'close':
      return previous === 'mask' ? 'mask' : 'intensity';
    case 'gradient':
      return step.output === 'magnitude' ? 'intensity' : step.output === 'direction' ? 'direction' : 'signed';
    case 'laplacian':
    case 'log':
      return 'signed';
    case 'kernel':
      return kernel && (kernel.weights.some((w) => w < 0) || kernel.offset < 0) ? 'signed' : 'intensity';
    default:
      return 'intensity';
  }
}

function measure(gauge: Gauge, outputs: (Image | null)[], lastStep: number, mmPerPx?: number): Measurement {
  const step = gauge.step ?? lastStep;
  const image = outputs[step]!;
  const spans = regionSpans(image.width, image.height, gauge.region);
  const unit = gaugeUnit(gauge);
  const value = toUnit(measurePixels(image, gauge.measure, spans), unit, mmPerPx);
  return { name: gauge.name, measure: gauge.measure, step, value, unit, limits: gauge.limits, pass: withinLimits(value, gauge.limits) };
}
