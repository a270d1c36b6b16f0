// Whether the engine's single-stream passes read ahead of their work (assembly/border.ts, readAhead):
// measured once, right after the warm-up, because which is faster depends on the processor and not on
// anything WebAssembly can ask. Both settings give the same outputs; only the speed differs.
import type { SimdKernels } from './simd-kernels';

/**
 * The probe: the two passes that follow the setting, as a rule runs them, on 2048×1024 (8 MB in,
 * 8 MB out: past the second-level caches): a Sobel magnitude, then Otsu's counts of it (about 3.5 ms
 * a sample on the AMD machine, where a browser's clock may count in steps of 0.1 ms).
 */
const PROBE_WIDTH = 2048;
const PROBE_HEIGHT = 1024;
/** Pairs of timed samples, one of each setting, in turn. */
const PAIRS = 6;
/** Most samples taken before the timed ones while the time still falls. */
const MAX_SETTLING = 12;
/**
 * How much faster off must be to be chosen: on is the setting the passes were tuned with first, and
 * a difference within the probe's noise is no reason to leave it (its median ratio varied by ±1.5 %
 * from load to load on the AMD machine, around 0.94).
 */
const MARGIN = 0.03;
/** A settling sample this much faster than the best before it means the time is still falling. */
const STILL_FALLING = 0.05;

export interface ReadAheadTiming {
  /** Best sample of each setting, in milliseconds. */
  on: number;
  off: number;
  /**
   * The median over the pairs of off's time over on's: a pair's two samples see the same moment of a
   * shared machine, whose speed drifts between moments by more than the difference sought.
   */
  ratio: number;
}

export interface ReadAheadChoice {
  readAhead: boolean;
  timing: ReadAheadTiming;
}

/** Off only when it is clearly faster. */
export function fasterReadAhead(timing: ReadAheadTiming): boolean {
  return !(timing.ratio < 1 - MARGIN);
}

/** Times both settings in turn on the probe; leaves the setting as it found it. */
export function timeReadAhead(kernels: SimdKernels, clock: () => number = () => performance.now()): ReadAheadTiming {
  const before = kernels.readAhead;
  const src = kernels.takeImage(PROBE_WIDTH, PROBE_HEIGHT);
  const dst = kernels.takeImage(PROBE_WIDTH, PROBE_HEIGHT);
  try {
    const data = src.data;
    for (let p = 0; p < PROBE_WIDTH; p++) data[p] = (p * 7919) % 251;
    for (let filled = PROBE_WIDTH; filled < data.length; filled *= 2) data.copyWithin(filled, 0, filled);
    const range = { min: NaN, max: NaN };
    kernels.gradient(src, 1, 2, 'magnitude', 'reflect', dst, range);
    const scale = 256 / (range.max - range.min);
    const sample = (on: boolean): number => {
      kernels.setReadAhead(on);
      const t0 = clock();
      kernels.gradient(src, 1, 2, 'magnitude', 'reflect', dst);
      kernels.histogram(dst, range.min, scale);
      return clock() - t0;
    };
    // Until the time stops falling: the first sample touches the destination's pages, and V8 may
    // still be compiling the kernels' optimised code in the background (seen at 3× the time).
    let settled = sample(true);
    for (let i = 0; i < MAX_SETTLING; i++) {
      const next = sample(true);
      const falling = next < (1 - STILL_FALLING) * settled;
      settled = Math.min(settled, next);
      if (!falling) break;
    }
    const on: number[] = [];
    const off: number[] = [];
    for (let i = 0; i < PAIRS; i++) {
      // Each setting first in every other pair, so that a steady drift favours neither.
      if (i % 2 === 0) on.push(sample(true));
      off.push(sample(false));
      if (i % 2 === 1) on.push(sample(true));
    }
    const ratios = off.map((t, i) => t / on[i]).sort((a, b) => a - b);
    return { on: Math.min(...on), off: Math.min(...off), ratio: (ratios[(PAIRS >> 1) - 1] + ratios[PAIRS >> 1]) / 2 };
  } finally {
    kernels.setReadAhead(before);
    for (const image of [src, dst]) {
      image.discard();
      kernels.heap.release(image.address);
    }
  }
}

/** Measures both settings and keeps the faster. */
export function chooseReadAhead(kernels: SimdKernels, clock?: () => number): ReadAheadChoice {
  const timing = timeReadAhead(kernels, clock);
  const readAhead = fasterReadAhead(timing);
  kernels.setReadAhead(readAhead);
  return { readAhead, timing };
}
