// Worker-thread entry for the pipeline pool: runs one rule on one photo, off the API's main thread.
// Errors that belong to the request (invalid rule, unknown kernel, missing calibration) come back
// as data, so that their code survives the thread boundary. Image buffers are moved back to the
// caller (transferred, not copied): a 5 MP float32 image is 20 MB. Buffers the caller releases
// come back with a later task and join this thread's workspace.
import { move, transferableSymbol, valueSymbol } from 'piscina';
import type { FieldIssue } from '../../shared/api/errors';
import { createImage, type RawPhoto } from '../../shared/vision/image';
import type { KernelDefinition } from '../../shared/vision/kernels';
import { RuleRunError, runRule, type RuleRun, type RuleRunErrorCode, type RunOptions } from '../../shared/vision/pipeline';
import { ImageWorkspace } from '../../shared/vision/workspace';
import { fftCorrelate } from './fft-correlate';

export interface PipelineTask {
  rule: unknown;
  photo: RawPhoto;
  kernels: KernelDefinition[];
  mmPerPx?: number;
  retain?: RunOptions['retain'];
  /** Buffers of runs the caller released, moved here for reuse. */
  spare?: Float32Array[];
}

export type PipelineTaskResult =
  | { ok: true; run: RuleRun }
  | { ok: false; error: { code: RuleRunErrorCode; message: string; issues: FieldIssue[] } };

/**
 * Step buffers of this thread, reused by its next runs (returned images are moved out). A run of
 * the standard pipeline uses five image buffers (input, three step outputs, a scratch image).
 */
const workspace = new ImageWorkspace(6);

export default function runPipelineTask(task: PipelineTask): PipelineTaskResult {
  for (const data of task.spare ?? []) workspace.give(createImage(1, data.length, data));
  try {
    return movingImageBuffers(runRule(task.rule, task.photo, {
      kernels: new Map(task.kernels.map((k) => [k.name, k])),
      mmPerPx: task.mmPerPx,
      retain: task.retain,
      largeKernelCorrelator: fftCorrelate,
      workspace,
    }));
  } catch (e) {
    if (e instanceof RuleRunError) return { ok: false, error: { code: e.code, message: e.message, issues: e.issues } };
    throw e;
  }
}

/** The result, with the buffers of the input and of every retained step output in the transfer list. */
function movingImageBuffers(run: RuleRun): PipelineTaskResult {
  const buffers = new Set<ArrayBuffer>();
  buffers.add(run.input.data.buffer as ArrayBuffer);
  for (const step of run.steps) if (step.output) buffers.add(step.output.data.buffer as ArrayBuffer);
  const result: PipelineTaskResult = { ok: true, run };
  // piscina sends a value marked movable with its transfer list instead of cloning the buffers.
  return move({ [transferableSymbol]: [...buffers], [valueSymbol]: result }) as unknown as PipelineTaskResult;
}
