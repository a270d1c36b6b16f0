import crypto from 'node:crypto';
import type { RawPhoto } from '../../shared/vision/image';
import type { PooledRun, PoolRunOptions } from '../vision/pool';
import type { PipelineRunner } from '../vision/runner';
import { digestOf } from '../lib/digest';

/**
 * Runs each distinct (rule, photo, calibration) once and hands the same result to every later
 * inspection of that photo. The seed's history draws its parts from a small pool of generated
 * photos; the engine is deterministic, so a repeat would compute the same verdict again.
 */
export class MemoizingRunner implements PipelineRunner {
  private readonly runs = new Map<string, Promise<PooledRun>>();

  constructor(private readonly inner: PipelineRunner) {}

  run(rule: unknown, photo: RawPhoto, options: PoolRunOptions = {}): Promise<PooledRun> {
    const samples = Buffer.from(photo.samples.buffer, photo.samples.byteOffset, photo.samples.byteLength);
    const key = `${digestOf(rule)}:${crypto.createHash('sha256').update(samples).digest('hex')}:${photo.width}x${photo.height}x${photo.channels}:${options.mmPerPx ?? ''}:${options.retain ?? ''}:${options.images ?? ''}:${options.evidence ?? ''}`;
    let run = this.runs.get(key);
    if (!run) {
      run = this.inner.run(rule, photo, options);
      this.runs.set(key, run);
    }
    return run;
  }
}
