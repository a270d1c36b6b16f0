// Worker-thread entry for the pipeline pool: runs one rule on one photo, off the API's main thread.
// Errors that belong to the request (invalid rule, unknown kernel, missing calibration) come back
// as data, so that their code survives the thread boundary.
// Each thread owns its engine memory and reuses it run after run: with the SIMD engine a run
// computes in the thread's WebAssembly memory and only the images it returns are copied out, into
// buffers the caller released earlier when there are; with the plain engine the step buffers
// themselves are moved to the caller (transferred, not copied: a 5 MP float32 image is 20 MB).
import { workerData } from 'node:worker_threads';
import { move, transferableSymbol, valueSymbol } from 'piscina';
import type { FieldIssue } from '../../shared/api/errors';
import { presetReadAhead, setEngine, simdKernels, type EngineChoice } from '../../shared/vision/engine';
import { createImage, type Image, type RawPhoto } from '../../shared/vision/image';
import type { KernelDefinition } from '../../shared/vision/kernels';
import { RuleRunError, runRule, type KernelLibrary, type RuleRun, type RuleRunErrorCode, type RunOptions } from '../../shared/vision/pipeline';
import type { ReadAheadChoice } from '../../shared/vision/wasm/read-ahead';
import { isResident } from '../../shared/vision/wasm/resident-image';
import { ImageWorkspace } from '../../shared/vision/workspace';
import { evidenceRaster, type EvidenceRaster } from './evidence';

export interface PipelineWorkerData {
  engine: EngineChoice;
  /** The pool's thread's read-ahead choice (shared/vision/wasm/read-ahead.ts), taken instead of each thread probing. */
  readAhead?: ReadAheadChoice;
  /** The pool's kernel library, sent once to each thread instead of with every task. */
  kernels: KernelDefinition[];
}

export interface PipelineTask {
  rule: unknown;
  photo: RawPhoto;
  mmPerPx?: number;
  retain?: RunOptions['retain'];
  /** Images sent back with the run (see PoolRunOptions.images). */
  images?: 'retained' | 'when-failed' | 'none';
  /** Buffers of runs the caller released, moved here for reuse. */
  spare?: Float32Array[];
  /** Draw the evidence image of a FAIL here, where the run's images are. */
  evidence?: boolean;
}

export type PipelineTaskResult =
  | { ok: true; run: RuleRun; evidence?: EvidenceRaster }
  | { ok: false; error: { code: RuleRunErrorCode; message: string; issues: FieldIssue[] } };

const setup = workerData as PipelineWorkerData | undefined;
if (setup?.readAhead) presetReadAhead(setup.readAhead);
setEngine(setup?.engine ?? 'auto');
const kernels: KernelLibrary = new Map((setup?.kernels ?? []).map((k) => [k.name, k]));

/**
 * Step buffers of this thread, reused by its next runs. A run of the standard pipeline uses three
 * image buffers (input and two step outputs in turn).
 */
const workspace = new ImageWorkspace(6);
/** Ordinary buffers for images leaving the thread (SIMD engine), from runs the caller released. */
const outgoing: Float32Array[] = [];
const MAX_OUTGOING = 8;

export default function runPipelineTask(task: PipelineTask): PipelineTaskResult {
  const simd = simdKernels() !== null;
  for (const data of task.spare ?? []) {
    if (!simd) workspace.give(createImage(1, data.length, data));
    else if (outgoing.length < MAX_OUTGOING) outgoing.push(data);
  }
  try {
    const run = runRule(task.rule, task.photo, {
      kernels,
      mmPerPx: task.mmPerPx,
      retain: task.retain,
      workspace,
    });
    const evidence = task.evidence && run.verdict === 'FAIL' ? evidenceRaster(run) : undefined;
    const images = task.images ?? 'retained';
    if (images === 'retained' || (images === 'when-failed' && run.verdict === 'FAIL')) return movingBuffers(inOrdinaryMemory(run), evidence);
    return movingBuffers(withoutImages(run), evidence);
  } catch (e) {
    if (e instanceof RuleRunError) return { ok: false, error: { code: e.code, message: e.message, issues: e.issues } };
    throw e;
  }
}

/** The run with every image in ordinary memory: an image in the engine's memory is copied out and its buffer kept for the next run. */
function inOrdinaryMemory(run: RuleRun): RuleRun {
  const copyOut = (image: Image): Image => {
    // A plain workspace image becomes an ordinary one (samples written) on its own buffer.
    if (!isResident(image)) return workspace.detach(image);
    const pixels = image.data.length;
    const index = outgoing.findIndex((b) => b.length === pixels);
    const buffer = index >= 0 ? outgoing.splice(index, 1)[0] : new Float32Array(pixels);
    buffer.set(image.data);
    workspace.give(image);
    return createImage(image.width, image.height, buffer);
  };
  return { ...run, input: copyOut(run.input), steps: run.steps.map((s) => (s.output ? { ...s, output: copyOut(s.output) } : s)) };
}

/** The run's numbers only: its images stay in this thread's workspace for the next runs. */
function withoutImages(run: RuleRun): RuleRun {
  workspace.give(run.input);
  for (const step of run.steps) if (step.output) workspace.give(step.output);
  const input: Image = { width: run.input.width, height: run.input.height, data: new Float32Array(0) };
  return { ...run, input, steps: run.steps.map((s) => ({ ...s, output: null })) };
}

/**
 * The result, with the buffers of the input and of every retained step output in the transfer list.
 * The evidence raster (a few MB) is copied instead: moving a buffer detaches it here, and the first
 * detached ArrayBuffer of a thread makes V8 drop an assumption its compiled code makes for every
 * typed-array access (the "ArrayBufferDetaching" protector), after which the plain engine ran
 * 15–70 % slower in this thread for good. Numbers-only runs, what every server caller asks for, then
 * detach nothing here.
 */
function movingBuffers(run: RuleRun, evidence: EvidenceRaster | undefined): PipelineTaskResult {
  const buffers = new Set<ArrayBuffer>();
  if (run.input.data.length > 0) buffers.add(run.input.data.buffer as ArrayBuffer);
  for (const step of run.steps) if (step.output) buffers.add(step.output.data.buffer as ArrayBuffer);
  const result: PipelineTaskResult = evidence ? { ok: true, run, evidence } : { ok: true, run };
  if (buffers.size === 0) return result;
  // piscina sends a value marked movable with its transfer list instead of cloning the buffers.
  return move({ [transferableSymbol]: [...buffers], [valueSymbol]: result }) as unknown as PipelineTaskResult;
}
