// Whole rules drawn at random (any step of the rule format in any order, gauges on any step and
// region) on random photos of every kind the decoder hands over (grey, RGB, RGBA; 8 and 16 bits).
// A pool worker keeps one workspace run after run and keeps only the gauged images, which sends
// a run through the engine's fast paths (the opening sweep straight from the photo's bytes, packed
// masks handed on, images filled only when read, buffers of earlier runs of other sizes). Those
// runs must measure exactly what a fresh run keeping every image measures, on both engines; and on
// the steps whose results are decisions or selections the two engines must agree bit for bit.
import fc from 'fast-check';
import { loadKernelLibrary } from '../../../server/vision/kernel-library';
import type { RawPhoto } from '../../../shared/vision/image';
import { releaseRun, runRule, type KernelLibrary, type Measurement } from '../../../shared/vision/pipeline';
import { ImageWorkspace } from '../../../shared/vision/workspace';
import { ENGINES, onEngine } from './engines';
import { seededRandom } from './images';

const RUNS = { numRuns: 150 };

/** Steps whose results are decisions, selections or sums the SIMD engine takes in the plain engine's order. */
const exactStep = fc.oneof(
  fc.record({ op: fc.constant('box'), size: fc.constantFrom(1, 3, 5, 9) }),
  fc.record({ op: fc.constant('median'), size: fc.constantFrom(1, 3, 5, 7, 9) }),
  fc.record({ op: fc.constant('threshold'), method: fc.constant('otsu'), invert: fc.boolean() }),
  fc.record({ op: fc.constant('threshold'), method: fc.constant('fixed'), value: fc.constantFrom(0, 0.5, 40, 128, 30000), invert: fc.boolean() }),
  fc.record({ op: fc.constant('threshold'), method: fc.constant('adaptive-mean'), size: fc.constantFrom(3, 7, 15), c: fc.constantFrom(-2, 0, 3), invert: fc.boolean() }),
  fc.record({ op: fc.constantFrom('erode', 'dilate', 'open', 'close'), radius: fc.constantFrom(1, 2, 3) }),
);

const withoutUndefined = (o: Record<string, unknown>) => Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined));

const anyStep = fc.oneof(
  exactStep,
  fc.record({ op: fc.constant('gaussian'), sigma: fc.constantFrom(0.3, 0.5, 1, 1.4, 2, 3) }),
  fc.record({ op: fc.constant('gradient'), operator: fc.constantFrom('sobel', 'scharr', 'prewitt'), output: fc.constantFrom('x', 'y', 'magnitude', 'direction') }),
  fc.record({ op: fc.constant('laplacian'), neighbours: fc.constantFrom(4, 8) }),
  fc.record({ op: fc.constant('log'), sigma: fc.constantFrom(0.5, 1.4) }),
  fc.record({ op: fc.constant('kernel'), kernel: fc.constantFrom('sharpen', 'sobel-x', 'gaussian-5', 'laplacian-8', 'box-3', 'log-9', 'line-plus-45') }),
  fc
    .record({
      op: fc.constant('kernel'),
      matrix: fc.constantFrom([[1, 2, 1]], [[1], [2], [1]], [[1, 2, 1], [2, 4, 2], [1, 2, 1]], [[0, -1, 0], [-1, 5, -1], [0, -1, 0]], [[1, 0, -1], [2, 0, -2], [1, 0, -1]]),
      divisor: fc.constantFrom(undefined, 4, 16),
      offset: fc.constantFrom(undefined, 10),
    })
    .map(withoutUndefined),
);

const region = fc.constantFrom(undefined, { shape: 'rect', x: 0.1, y: 0.2, w: 0.5, h: 0.6 }, { shape: 'circle', cx: 0.5, cy: 0.5, r: 0.4 });
const measure = fc.constantFrom('edge-fraction', 'blob-count', 'largest-blob-area', 'largest-blob-length', 'mean', 'stddev', 'min', 'max');

function ruleOf(step: fc.Arbitrary<Record<string, unknown>>) {
  return fc
    .record({
      channel: fc.constantFrom('luma', 'red', 'green', 'blue'),
      border: fc.constantFrom('reflect', 'replicate', 'constant'),
      steps: fc.array(step, { maxLength: 5 }),
      gauges: fc.array(fc.record({ measure, region, onStep: fc.nat(10) }), { minLength: 1, maxLength: 3 }),
    })
    .map(({ channel, border, steps, gauges }) => ({
      format: 'kernwright-rule/1',
      name: 'Random rule',
      input: { channel },
      border,
      steps,
      gauges: gauges.map((g, i) => ({
        name: `gauge ${i + 1}`,
        measure: g.measure,
        ...(g.region ? { region: g.region } : {}),
        // A third of the gauges read the last step (no step named), the others any step.
        ...(steps.length > 0 && g.onStep % 3 !== 0 ? { step: 1 + (g.onStep % steps.length) } : {}),
        limits: g.measure === 'edge-fraction' ? { max: 0.5 } : { min: 1 },
      })),
    }));
}

/** Columns of a slow ramp per channel, with a third of the samples anywhere in the range (specks, clipped pixels). */
function photoOf(width: number, height: number, channels: 1 | 3 | 4, bitDepth: 8 | 16, seed: number): RawPhoto {
  const rand = seededRandom(seed);
  const top = bitDepth === 8 ? 255 : 65535;
  const length = width * height * channels;
  const samples = bitDepth === 8 ? new Uint8Array(length) : new Uint16Array(length);
  for (let i = 0; i < length; i++) {
    const x = Math.floor(i / channels) % width;
    samples[i] = rand() < 0.3 ? Math.floor(rand() * (top + 1)) : (x * 7 + (i % channels) * 40) % (top + 1);
  }
  return { width, height, channels, bitDepth, samples };
}

const photo = fc
  .record({
    width: fc.integer({ min: 1, max: 48 }),
    height: fc.integer({ min: 1, max: 40 }),
    channels: fc.constantFrom<1 | 3 | 4>(1, 1, 3, 4),
    bitDepth: fc.constantFrom<8 | 16>(8, 8, 16),
    seed: fc.integer({ min: 1, max: 2 ** 31 - 1 }),
  })
  .map((p) => photoOf(p.width, p.height, p.channels, p.bitDepth, p.seed));

let kernels: KernelLibrary;
beforeAll(async () => {
  kernels = await loadKernelLibrary();
});

describe.each(ENGINES)('%s engine', (engine) => {
  test('runs that reuse one workspace and keep only the gauged images measure what fresh runs keeping every image measure', () => {
    const workspace = new ImageWorkspace(6);
    fc.assert(
      fc.property(fc.array(fc.tuple(ruleOf(anyStep), photo), { minLength: 1, maxLength: 4 }), (runs) =>
        onEngine(engine, () => {
          for (const [rule, p] of runs) {
            const fresh = runRule(rule, p, { kernels, retain: 'all' });
            const reused = runRule(rule, p, { kernels, retain: 'gauged', workspace });
            expect(reused.quality).toEqual(fresh.quality);
            expect(reused.measurements).toEqual(fresh.measurements);
            expect(reused.verdict).toBe(fresh.verdict);
            releaseRun(reused, workspace);
          }
        }),
      ),
      RUNS,
    );
    workspace.dispose();
  });
});

/**
 * Means and standard deviations are double-precision sums that the SIMD engine adds in another
 * order, so they may differ in their last bits (Higham, Accuracy and Stability of Numerical
 * Algorithms, 2nd ed., §4.2: the error bound of a sum of n terms in any order; from memory); every
 * other measure is a count, an extreme or a share and must be equal.
 */
function expectSameMeasurement(simd: Measurement, plain: Measurement): void {
  if (Number.isNaN(plain.value)) expect(simd.value).toBeNaN();
  else if (plain.measure === 'mean' || plain.measure === 'stddev') expect(Math.abs(simd.value - plain.value)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(plain.value)));
  else expect(simd.value).toBe(plain.value);
}

test('rules of exact steps (box, median, thresholds, morphology): the SIMD engine measures what the plain engine measures and gives its verdict', () => {
  const workspace = new ImageWorkspace();
  fc.assert(
    fc.property(ruleOf(exactStep), photo, (rule, p) => {
      const plain = onEngine('plain', () => runRule(rule, p, { kernels, retain: 'gauged' }));
      const simd = onEngine('simd', () => runRule(rule, p, { kernels, retain: 'gauged', workspace }));
      simd.measurements.forEach((m, i) => expectSameMeasurement(m, plain.measurements[i]));
      expect(simd.verdict).toBe(plain.verdict);
      onEngine('simd', () => releaseRun(simd, workspace));
    }),
    RUNS,
  );
  workspace.dispose();
});
