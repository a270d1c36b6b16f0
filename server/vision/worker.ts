// Worker-thread entry for the pipeline pool: runs one rule on one photo, off the API's main thread.
// Errors that belong to the request (invalid rule, unknown kernel, missing calibration) come back
// as data, so that their code survives the thread boundary.
import type { FieldIssue } from '../../shared/api/errors';
import type { RawPhoto } from '../../shared/vision/image';
import type { KernelDefinition } from '../../shared/vision/kernels';
import { RuleRunError, runRule, type RuleRun, type RuleRunErrorCode, type RunOptions } from '../../shared/vision/pipeline';
import { fftCorrelate } from './fft-correlate';

export interface PipelineTask {
  rule: unknown;
  photo: RawPhoto;
  kernels: KernelDefinition[];
  mmPerPx?: number;
  retain?: RunOptions['retain'];
}

export type PipelineTaskResult =
  | { ok: true; run: RuleRun }
  | { ok: false; error: { code: RuleRunErrorCode; message: string; issues: FieldIssue[] } };

export default function runPipelineTask(task: PipelineTask): PipelineTaskResult {
  try {
    const run = runRule(task.rule, task.photo, {
      kernels: new Map(task.kernels.map((k) => [k.name, k])),
      mmPerPx: task.mmPerPx,
      retain: task.retain,
      largeKernelCorrelator: fftCorrelate,
    });
    return { ok: true, run };
  } catch (e) {
    if (e instanceof RuleRunError) return { ok: false, error: { code: e.code, message: e.message, issues: e.issues } };
    throw e;
  }
}
