// The evidence image's grey background: the SIMD kernels give the plain loops' bytes exactly (the
// plain engine is the reference, as for every kernel), for whole and fractional samples, NaN and
// infinities, odd sizes and every shrink factor. The bytes follow ECMA-262's Math.round (halves
// towards +∞) and its conversion of NaN to the byte 0 (ToUint8).
import fc from 'fast-check';
import { greyBackground } from '../../../server/vision/evidence';
import { setEngine, simdKernels } from '../../../shared/vision/engine';
import { createImage, type BitDepth } from '../../../shared/vision/image';

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
