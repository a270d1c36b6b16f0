// A pool of worker threads (piscina) that runs pipelines, so the API stays responsive while a
// 5 MP photo is inspected. Works from the build (worker.js) and from TypeScript sources
// (ts-node in the workers), as under ts-jest and `npm run rule`.
import os from 'node:os';
import path from 'node:path';
import { Piscina } from 'piscina';
import type { RawPhoto } from '../../shared/vision/image';
import { RuleRunError, type KernelLibrary, type RuleRun, type RunOptions } from '../../shared/vision/pipeline';
import type { PipelineTask, PipelineTaskResult } from './worker';

export interface VisionPoolOptions {
  kernels: KernelLibrary;
  /** Default: the number of CPU cores. */
  threads?: number;
}

export interface PoolRunOptions {
  mmPerPx?: number;
  retain?: RunOptions['retain'];
}

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

export class VisionPool {
  private readonly piscina: Piscina;
  private readonly kernels: PipelineTask['kernels'];

  constructor(options: VisionPoolOptions) {
    const threads = options.threads ?? Math.max(1, os.availableParallelism?.() ?? os.cpus().length);
    const setup = workerSetup();
    this.kernels = [...options.kernels.values()];
    this.piscina = new Piscina({
      filename: setup.filename,
      execArgv: setup.execArgv,
      env: setup.env,
      minThreads: threads,
      maxThreads: threads,
      idleTimeout: 60_000,
    });
  }

  get threads(): number {
    return this.piscina.threads.length;
  }

  /** Runs a rule on a photo in a worker; rejects with RuleRunError for a rule that cannot run. */
  async run(rule: unknown, photo: RawPhoto, options: PoolRunOptions = {}): Promise<RuleRun> {
    const task: PipelineTask = { rule, photo, kernels: this.kernels, mmPerPx: options.mmPerPx, retain: options.retain };
    const result = (await this.piscina.run(task)) as PipelineTaskResult;
    if (!result.ok) throw new RuleRunError(result.error.code, result.error.message, result.error.issues);
    return result.run;
  }

  async destroy(): Promise<void> {
    await this.piscina.destroy();
  }
}
