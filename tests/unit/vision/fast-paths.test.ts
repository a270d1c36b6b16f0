// The engine's fast paths give the same results as its plain reference paths, on random images of
// odd and awkward sizes (narrower and wider than a 32-bit word, a single row or column) and with
// every border mode. The plain paths themselves are checked against OpenCV.js in
// opencv-reference.test.ts.
import fc from 'fast-check';
import type { BorderMode, MorphologyOp } from '../../../shared/rules/schema';
import { correlateDirect, correlateSeparable } from '../../../shared/vision/convolve';
import { imageFromSamples } from '../../../shared/vision/image';
import { kernelFromMatrix, outerProduct } from '../../../shared/vision/kernels';
import { morphology, valueMorphology } from '../../../shared/vision/morphology';

const border = fc.constantFrom<BorderMode>('reflect', 'replicate', 'constant');
const size = fc.record({ w: fc.integer({ min: 1, max: 70 }), h: fc.integer({ min: 1, max: 12 }) });

const mask = size.chain(({ w, h }) =>
  fc.array(fc.constantFrom(0, 1, 1), { minLength: w * h, maxLength: w * h }).map((v) => imageFromSamples(w, h, v)),
);

test('morphology of a 0/1 mask through packed bits equals the value path, every operation, radius and border', () => {
  fc.assert(
    fc.property(
      mask,
      fc.constantFrom<MorphologyOp>('erode', 'dilate', 'open', 'close'),
      fc.integer({ min: 1, max: 33 }),
      border,
      (img, op, radius, b) => {
        const fast = morphology(img, op, radius, b);
        const plain = valueMorphology(img, op, radius, b);
        expect(Array.from(fast.data)).toEqual(Array.from(plain.data));
      },
    ),
    { numRuns: 300 },
  );
});

test('an image with a value other than 0 and 1 is filtered by value, not as a mask', () => {
  const img = imageFromSamples(5, 1, [1, 0.5, 1, 1, 0]);
  // Erosion by a 3-wide square: minimum over each pixel and its two neighbours (replicate edge).
  expect(Array.from(morphology(img, 'erode', 1, 'replicate').data)).toEqual([0.5, 0.5, 0.5, 0, 0]);
});

const greyImage = size.chain(({ w, h }) =>
  fc.array(fc.integer({ min: 0, max: 65535 }), { minLength: w * h, maxLength: w * h }).map((v) => imageFromSamples(w, h, v)),
);

/** A symmetric 1-D kernel of radius 0 to 3 (the unrolled, two-rows-at-once path). */
const symmetricTaps = fc
  .integer({ min: 0, max: 3 })
  .chain((r) => fc.array(fc.integer({ min: -9, max: 9 }), { minLength: r + 1, maxLength: r + 1 }))
  .map((half) => [...half.slice(1).reverse(), ...half]);

test('symmetric separable kernels (two output rows per vertical pass) equal the direct 2-D path', () => {
  fc.assert(
    fc.property(greyImage, border, symmetricTaps, symmetricTaps, (img, b, column, row) => {
      const separable = correlateSeparable(img, column, row, b);
      const direct = correlateDirect(img, kernelFromMatrix(outerProduct(column, row)), b);
      const scale = direct.data.reduce((m, v) => Math.max(m, Math.abs(v)), 1);
      // Float32 storage of double sums: agreement to a few float32 ulps of the largest value.
      direct.data.forEach((v, i) => expect(Math.abs(separable.data[i] - v)).toBeLessThanOrEqual(1e-6 * scale));
    }),
    { numRuns: 200 },
  );
});
