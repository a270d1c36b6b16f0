// A pool of worker threads (piscina) that runs pipelines, so the API stays responsive while a
// 5 MP photo is inspected. Works from the build (worker.js) and from TypeScript sources
// (ts-node in the workers), as under ts-jest and `npm run rule`.
import os from 'node:os';
import path from 'node:path';
import { Piscina } from 'piscina';
import { measuredReadAhead, type EngineChoice } from '../../shared/vision/engine';
import type { RawPhoto } from '../../shared/vision/image';
import { RuleRunError, type KernelLibrary, type RuleRun, type RunOptions } from '../../shared/vision/pipeline';
import { engineSetting } from './engine-setting';
import type { EvidenceRaster } from './evidence';
import type { PipelineTask, PipelineTaskResult, PipelineWorkerData } from './worker';

export interface VisionPoolOptions {
  kernels: KernelLibrary;
  /** Default: the number of CPU cores. */
  threads?: number;
  /** The workers' engine; default: KW_ENGINE (auto). */
  engine?: EngineChoice;
}

export interface PoolRunOptions {
  mmPerPx?: number;
  retain?: RunOptions['retain'];
  /**
   * Move the photo's samples to the worker instead of copying them: the caller gives the photo up
   * (its samples are empty afterwards). Only a photo that owns its whole buffer is moved.
   */
  transferPhoto?: boolean;
  /**
   * Which images come back with the run: 'retained' (default: the input and the retained step
   * outputs), 'when-failed' (only with a FAIL verdict, for its evidence image) or 'none'. Images
   * left in the worker cost no copy and no move between threads; a run without them has an input
   * of no samples and no step outputs.
   */
  images?: PipelineTask['images'];
  /** With a FAIL verdict, the worker draws the evidence image (see server/vision/evidence.ts). */
  evidence?: boolean;
}

/** A run from the pool, with the evidence raster when it was asked for and the verdict is FAIL. */
export type PooledRun = RuleRun & { evidence?: EvidenceRaster };

/**
 * Node flags for a process that runs the pool: scripts/lib.sh (KW_POOL_NODE_FLAGS) starts the server
 * and the demo seed with them; V8 takes them only on the command line. Each photo a worker receives
 * is garbage after its run, and V8 collects a worker's heap every few photos. By default each
 * collection also runs on four helper threads, which compete with the workers for the cores: with
 * two workers on two cores they took about 4 ms of CPU per 5 MP photo (the pool at 1.27× one
 * thread's throughput in `npm run bench`). On the worker's own thread the same collections cost
 * almost nothing (small heaps): 1.67–1.75× in the machine's good moments. The price is memory:
 * about 300 MB more at the peak under load (README, "One server under load").
 */
export const POOL_PROCESS_NODE_FLAGS: readonly string[] = ['--single-threaded-gc'];

/** The flags of POOL_PROCESS_NODE_FLAGS this process was started without. */
export function missingPoolFlags(execArgv: readonly string[] = process.execArgv): string[] {
  return POOL_PROCESS_NODE_FLAGS.filter((flag) => !execArgv.includes(flag));
}

/** Spare image buffers kept for the workers at most (20 MB each at 5 MP). */
const MAX_RETURNED_BUFFERS = 8;
const BUFFERS_PER_TASK = 3;

function workerSetup(): { filename: string; execArgv: string[]; env: NodeJS.ProcessEnv } {
  const fromSource = __filename.endsWith('.ts');
  const filename = path.join(__dirname, fromSource ? 'worker.ts' : 'worker.js');
  if (!fromSource) return { filename, execArgv: [], env: process.env };
  return {
    filename,
    execArgv: ['-r', 'ts-node/register/transpile-only'],
    env: { ...process.env, TS_NODE_PROJECT: path.resolve(__dirname, '..', 'tsconfig.json') },
  };
}

/**
 * What every worker thread starts with: the engine, the kernel library and, where the SIMD kernels
 * may run, this thread's read-ahead choice (measured here, alone, before the workers start).
 */
export function poolWorkerData(options: VisionPoolOptions): PipelineWorkerData {
  const engine = options.engine ?? engineSetting();
  const readAhead = engine === 'plain' ? null : measuredReadAhead();
  return { engine, kernels: [...options.kernels.values()], ...(readAhead ? { readAhead } : {}) };
}

/** True when the array is the whole of its buffer (moving the buffer moves nothing else). */
function ownsWholeBuffer(array: ArrayBufferView): boolean {
  return array.byteOffset === 0 && array.byteLength === array.buffer.byteLength && !(array.buffer instanceof SharedArrayBuffer);
}

export class VisionPool {
  private readonly piscina: Piscina;
  /** Buffers of released runs, sent along with the next task so that a worker reuses them. */
  private returned: Float32Array[] = [];

  constructor(options: VisionPoolOptions) {
    const threads = options.threads ?? Math.max(1, os.availableParallelism?.() ?? os.cpus().length);
    const setup = workerSetup();
    const workerData = poolWorkerData(options);
    this.piscina = new Piscina({
      filename: setup.filename,
      execArgv: setup.execArgv,
      env: setup.env,
      workerData,
      minThreads: threads,
      maxThreads: threads,
      // A busy worker already holds its next task when several are waiting, so that it starts it
      // without waiting for the main thread, which shares the cores with the workers (about 1 ms of
      // idle worker per 5 MP photo at full load otherwise).
      concurrentTasksPerWorker: 2,
      idleTimeout: 60_000,
      // Nothing reads piscina's run and wait time histograms; recording them took about 7 % of the
      // main thread's task handling in a CPU profile of the pool's benchmark.
      recordTiming: false,
    });
  }

  get threads(): number {
    return this.piscina.threads.length;
  }

  /** Runs a rule on a photo in a worker; rejects with RuleRunError for a rule that cannot run. */
  async run(rule: unknown, photo: RawPhoto, options: PoolRunOptions = {}): Promise<PooledRun> {
    // A run hands back its input and its retained outputs; a few buffers per task spread them over the tasks queued.
    const spare = this.returned.splice(0, BUFFERS_PER_TASK);
    const task: PipelineTask = { rule, photo, mmPerPx: options.mmPerPx, retain: options.retain, images: options.images, evidence: options.evidence, spare };
    const transferList: ArrayBuffer[] = spare.map((b) => b.buffer as ArrayBuffer);
    if (options.transferPhoto && ownsWholeBuffer(photo.samples)) transferList.push(photo.samples.buffer as ArrayBuffer);
    const result = (await this.piscina.run(task, { transferList })) as PipelineTaskResult;
    if (!result.ok) throw new RuleRunError(result.error.code, result.error.message, result.error.issues);
    return result.evidence ? { ...result.run, evidence: result.evidence } : result.run;
  }

  /**
   * Hands a finished run's image buffers back (input and retained step outputs); they travel with
   * the next task to a worker, which computes into them instead of allocating. The run must not be
   * used afterwards.
   */
  release(run: RuleRun): void {
    const images = [run.input, ...run.steps.flatMap((s) => (s.output ? [s.output] : []))];
    for (const image of images) {
      const data = image.data;
      if (this.returned.length >= MAX_RETURNED_BUFFERS) break;
      if (data.length > 0 && ownsWholeBuffer(data) && !this.returned.includes(data)) this.returned.push(data);
    }
  }

  async destroy(): Promise<void> {
    await this.piscina.destroy();
  }
}
