import type { RawPhoto } from '../../shared/vision/image';
import type { RuleRun } from '../../shared/vision/pipeline';
import type { PoolRunOptions } from './pool';

/** Runs a rule on a photo somewhere (the worker-thread pool in the server). */
export interface PipelineRunner {
  run(rule: unknown, photo: RawPhoto, options?: PoolRunOptions): Promise<RuleRun>;
}
