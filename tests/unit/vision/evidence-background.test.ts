// A FAIL's evidence image. Its grey background: the SIMD kernels give the plain loops' bytes exactly
// (the plain engine is the reference, as for every kernel), for whole and fractional samples, NaN and
// infinities, odd sizes and every shrink factor; the bytes follow ECMA-262's Math.round (halves
// towards +∞) and its conversion of NaN to the byte 0 (ToUint8). The ringed pixel of a min or max
// gauge, and the blob outlines drawn box by box, against plain whole-image scans.
import fc from 'fast-check';
import { evidenceRaster, greyBackground } from '../../../server/vision/evidence';
import { labelBlobs } from '../../../shared/vision/blobs';
import { setEngine, simdKernels } from '../../../shared/vision/engine';
import { createImage, type BitDepth } from '../../../shared/vision/image';
import { runRule } from '../../../shared/vision/pipeline';

afterEach(() => setEngine('auto'));

function both(samples: number[], w: number, h: number, factor: number, bitDepth: BitDepth) {
  const image = createImage(w, h, Float32Array.from(samples));
  setEngine('simd');
  expect(simdKernels()).not.toBeNull();
  const simd = greyBackground(image, factor, bitDepth);
  setEngine('plain');
  const plain = greyBackground(image, factor, bitDepth);
  return { simd, plain };
}

const sample = fc.oneof(
  fc.integer({ min: 0, max: 255 }),
  fc.integer({ min: 0, max: 65535 }),
  fc.float({ min: -300, max: 70000, noNaN: true }),
  fc.constantFrom(Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY, -0, 0.5, 254.5, 255.5),
);

test('the SIMD background equals the plain one byte for byte', () => {
  fc.assert(
    fc.property(
      fc.integer({ min: 1, max: 23 }),
      fc.integer({ min: 1, max: 17 }),
      fc.integer({ min: 1, max: 5 }),
      fc.constantFrom<BitDepth>(8, 16),
      fc.array(sample, { minLength: 23 * 17, maxLength: 23 * 17 }),
      (w, h, factor, bitDepth, values) => {
        const { simd, plain } = both(values.slice(0, w * h), w, h, factor, bitDepth);
        expect([simd.width, simd.height]).toEqual([plain.width, plain.height]);
        expect(Buffer.from(simd.rgb).equals(Buffer.from(plain.rgb))).toBe(true);
      },
    ),
    { numRuns: 300 },
  );
});

test('a 2 × 2 block of 30, 70, 30, 30 shows as 40 on all three channels; a half rounds up', () => {
  const { simd, plain } = both([30, 70, 30, 30, 0.5, 0.5, 0.5, 0.5], 2, 4, 2, 8);
  expect(Array.from(simd.rgb)).toEqual([40, 40, 40, 1, 1, 1]);
  expect(Array.from(plain.rgb)).toEqual([40, 40, 40, 1, 1, 1]);
});

test('the SIMD kernels find the pixel a failing min or max gauge rings as the plain loop does (first in raster order, NaN left out)', () => {
  const kernels = simdKernels() ?? (setEngine('simd'), simdKernels());
  if (!kernels) throw new Error('no SIMD engine here');
  const value = fc.oneof(fc.integer({ min: -3, max: 3 }), fc.constantFrom(Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY, -0));
  fc.assert(
    fc.property(fc.integer({ min: 1, max: 19 }), fc.integer({ min: 1, max: 13 }), fc.array(value, { minLength: 19 * 13, maxLength: 19 * 13 }), fc.array(fc.tuple(fc.nat(19), fc.nat(19)), { minLength: 13, maxLength: 13 }), (w, h, values, cuts) => {
      const image = createImage(w, h, Float32Array.from(values.slice(0, w * h)));
      const start = Int32Array.from(cuts.slice(0, h), ([a, b]) => Math.min(a, b, w));
      const end = Int32Array.from(cuts.slice(0, h), ([a, b]) => Math.min(Math.max(a, b), w));
      for (const which of ['max', 'min'] as const) {
        let best = which === 'max' ? -Infinity : Infinity;
        let expected = -1;
        for (let y = 0; y < h; y++) {
          for (let x = start[y]; x < end[y]; x++) {
            const v = image.data[y * w + x];
            if (which === 'max' ? v > best : v < best) {
              best = v;
              expected = y * w + x;
            }
          }
        }
        expect(kernels.firstExtreme(image, start, end, which)).toBe(expected);
      }
    }),
    { numRuns: 300 },
  );
});

test('blob outlines are drawn wherever a wanted blob meets another label, however many blobs there are', () => {
  const AMBER = [255, 170, 0];
  fc.assert(
    fc.property(fc.integer({ min: 3, max: 24 }), fc.integer({ min: 3, max: 18 }), fc.array(fc.boolean(), { minLength: 24 * 18, maxLength: 24 * 18 }), fc.boolean(), (w, h, bits, largestOnly) => {
      const samples = Uint8Array.from(bits.slice(0, w * h), (b) => (b ? 200 : 20));
      const run = runRule(
        {
          format: 'kernwright-rule/1',
          name: 'outlines',
          steps: [{ op: 'threshold', method: 'fixed', value: 100 }],
          gauges: [largestOnly ? { name: 'spot', measure: 'largest-blob-area', limits: { max: 0 } } : { name: 'spots', measure: 'blob-count', limits: { max: 0 } }],
        },
        { width: w, height: h, channels: 1, bitDepth: 8, samples },
      );
      fc.pre(run.verdict === 'FAIL');
      const { rgb } = evidenceRaster(run);
      const { labels, blobs } = labelBlobs(createImage(w, h, Float32Array.from(samples, (s) => (s > 100 ? 1 : 0))));
      let largest = 0;
      blobs.forEach((b, i) => {
        if (largest === 0 || b.area > blobs[largest - 1].area) largest = i + 1;
      });
      for (let y = 0; y < h; y++) {
        for (let x = 0; x < w; x++) {
          const p = y * w + x;
          const label = labels[p];
          const wanted = label !== 0 && (!largestOnly || label === largest);
          const edge = x === 0 || y === 0 || x === w - 1 || y === h - 1 || labels[p - 1] !== label || labels[p + 1] !== label || labels[p - w] !== label || labels[p + w] !== label;
          expect(Array.from(rgb.subarray(3 * p, 3 * p + 3)).join() === AMBER.join()).toBe(wanted && edge);
        }
      }
    }),
    { numRuns: 150 },
  );
});
