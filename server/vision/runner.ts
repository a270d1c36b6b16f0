import type { RawPhoto } from '../../shared/vision/image';
import type { PooledRun, PoolRunOptions } from './pool';

/** Runs a rule on a photo somewhere (the worker-thread pool in the server). */
export interface PipelineRunner {
  run(rule: unknown, photo: RawPhoto, options?: PoolRunOptions): Promise<PooledRun>;
}
