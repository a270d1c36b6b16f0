// The SIMD engine's read-ahead (shared/vision/wasm/read-ahead.ts): the single-stream passes read a
// word ahead of their work or not, whichever the probe at load found faster. The setting may change
// the speed only: both give the same bits, read only inside the module's memory, and the probe keeps
// the faster setting.
import fc from 'fast-check';
import { createPackedMask } from '../../../shared/vision/deferrable-image';
import { measuredReadAhead, simdKernels } from '../../../shared/vision/engine';
import { gradient } from '../../../shared/vision/gradient';
import type { Image } from '../../../shared/vision/image';
import { gaussianGradient } from '../../../shared/vision/smoothed-gradient';
import { thresholdOtsu } from '../../../shared/vision/threshold';
import { chooseReadAhead, fasterReadAhead, timeReadAhead } from '../../../shared/vision/wasm/read-ahead';
import type { SimdKernels } from '../../../shared/vision/wasm/simd-kernels';
import { poolWorkerData } from '../../../server/vision/pool';
import { bitsOf, borderMode, onEngine, sampleImage, sampleKind, seed } from './engines';

/** Wide and tall enough that the Otsu pass reads 8 KB ahead (2,048 samples) and the gradient two rows below. */
const largeSize = fc.tuple(fc.integer({ min: 45, max: 131 }), fc.integer({ min: 47, max: 97 }));

/** The steps whose loops read ahead, on the SIMD engine with the setting given. */
function stepsWith(kernels: SimdKernels, readAhead: boolean, input: Image, border: 'reflect' | 'replicate' | 'constant') {
  const before = kernels.readAhead;
  kernels.setReadAhead(readAhead);
  try {
    const magnitude = gradient(input, 'sobel', 'magnitude', border);
    const range = { min: NaN, max: NaN };
    const smoothed = gaussianGradient(input, 1, 'sobel', 'magnitude', border, undefined, range);
    const packed = createPackedMask(input.width, input.height);
    // As the rule runner calls it when only the next step reads the mask: bins kept, bits only.
    const otsu = thresholdOtsu(smoothed, false, undefined, range, packed, false);
    const full = thresholdOtsu(magnitude, true);
    return {
      magnitude: bitsOf(magnitude),
      smoothed: bitsOf(smoothed),
      range: [range.min, range.max],
      packed: Array.from(packed.words),
      otsu: [otsu.bin, otsu.threshold],
      full: [full.bin, full.threshold, ...bitsOf(full.mask)],
    };
  } finally {
    kernels.setReadAhead(before);
  }
}

test('the gradient, the Gaussian-and-gradient sweep and Otsu give the same bits with read-ahead on and off', () => {
  onEngine('simd', () => {
    const kernels = simdKernels()!;
    fc.assert(
      fc.property(largeSize, sampleKind, borderMode, seed, ([w, h], kind, border, s) => {
        const input = sampleImage(w, h, kind, s);
        expect(stepsWith(kernels, false, input, border)).toEqual(stepsWith(kernels, true, input, border));
      }),
      { numRuns: 40 },
    );
  });
});

/**
 * A clock that charges each timed sample `on` or `off` milliseconds, as the kernels' setting is when
 * it is read, times the machine's slowness at that sample (1 unless given, by the sample's number).
 */
function chargingClock(kernels: SimdKernels, costs: { on: number; off: number }, slowness: (sample: number) => number = () => 1): () => number {
  let now = 0;
  let started = false;
  let sample = 0;
  return () => {
    if (started) now += (kernels.readAhead ? costs.on : costs.off) * slowness(sample++);
    started = !started;
    return now;
  };
}

describe('the probe at load', () => {
  const kernels = onEngine('simd', () => simdKernels()!);
  afterEach(() => kernels.setReadAhead(true));

  test('keeps on unless off is more than 3 % faster (on is the setting the passes were first tuned with)', () => {
    expect(fasterReadAhead({ on: 10, off: 9, ratio: 0.9 })).toBe(false);
    expect(fasterReadAhead({ on: 10, off: 9.6, ratio: 0.96 })).toBe(false);
    expect(fasterReadAhead({ on: 10, off: 9.8, ratio: 0.98 })).toBe(true);
    expect(fasterReadAhead({ on: 10, off: 10, ratio: 1 })).toBe(true);
    expect(fasterReadAhead({ on: 9, off: 10, ratio: 1.1 })).toBe(true);
  });

  test('times both settings and sets the faster', () => {
    expect(chooseReadAhead(kernels, chargingClock(kernels, { on: 5, off: 4 }))).toEqual({ readAhead: false, timing: { on: 5, off: 4, ratio: 0.8 } });
    expect(kernels.readAhead).toBe(false);
    expect(chooseReadAhead(kernels, chargingClock(kernels, { on: 4, off: 5 }))).toEqual({ readAhead: true, timing: { on: 4, off: 5, ratio: 1.25 } });
    expect(kernels.readAhead).toBe(true);
  });

  test('decides on the samples taken at the same moments, not on each setting\'s best', () => {
    // Off 10 % faster, but the machine twice as fast for the seventh sample (two settling, whose
    // time does not fall, then on, off, off, on, and this one, on's third): on's best alone would keep on.
    const clock = chargingClock(kernels, { on: 10, off: 9 }, (sample) => (sample === 6 ? 0.5 : 1));
    const choice = chooseReadAhead(kernels, clock);
    expect(choice.timing.on).toBe(5);
    expect(choice.timing.off).toBe(9);
    expect(choice.readAhead).toBe(false);
  });

  test('leaves the setting as it found it and every block of the memory free', () => {
    const blocks = kernels.heap.blocksInUse;
    for (const setting of [true, false]) {
      kernels.setReadAhead(setting);
      const timing = timeReadAhead(kernels);
      expect(timing.on).toBeGreaterThan(0);
      expect(timing.off).toBeGreaterThan(0);
      expect(kernels.readAhead).toBe(setting);
      expect(kernels.heap.blocksInUse).toBe(blocks);
    }
  });
});

describe('a choice made in another thread', () => {
  // Timings no probe on a real machine would give: taken as they are, they show that no probe ran.
  const preset = (readAhead: boolean) => ({ readAhead, timing: { on: 1, off: 2, ratio: 2 } });

  test('is taken at load instead of probing, and applied at once to kernels already loaded', () => {
    jest.isolateModules(() => {
      // A fresh engine module: its kernels not loaded yet, as in a new worker thread.
      // eslint-disable-next-line @typescript-eslint/no-var-requires
      const engine = require('../../../shared/vision/engine') as typeof import('../../../shared/vision/engine');
      engine.presetReadAhead(preset(false));
      expect(engine.readAheadChoice()).toBeNull();
      engine.setEngine('simd');
      const kernels = engine.simdKernels()!;
      expect(engine.readAheadChoice()).toEqual(preset(false));
      expect(kernels.readAhead).toBe(false);
      engine.presetReadAhead(preset(true));
      expect(kernels.readAhead).toBe(true);
      expect(engine.measuredReadAhead()).toEqual(preset(true));
    });
  });

  test('is what the pool hands its workers: this thread\'s probe, and none for the plain engine', () => {
    const kernels = new Map();
    const measured = measuredReadAhead();
    expect(measured).not.toBeNull();
    expect(poolWorkerData({ kernels, engine: 'simd' }).readAhead).toEqual(measured);
    expect(poolWorkerData({ kernels, engine: 'auto' }).readAhead).toEqual(measured);
    expect(poolWorkerData({ kernels, engine: 'plain' })).not.toHaveProperty('readAhead');
  });
});
