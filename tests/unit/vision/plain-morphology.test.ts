// The plain engine's erosion and dilation of any values against their definition: the minimum and
// the maximum over the (2r+1)×(2r+1) square, border positions as plain-reference.ts (OpenCV erode and
// dilate with a rectangular element; with BORDER_CONSTANT the outside is 0), bit for bit. Images
// without NaN or −0 take the integer-key path (shared rows folded once per pair of rows, runs of
// powers of two along the row); radii 1 to 9 cover runs of 2, 4, 8 and 16.
import fc from 'fast-check';
import type { MorphologyOp } from '../../../shared/rules/schema';
import type { Image } from '../../../shared/vision/image';
import { valueMorphology } from '../../../shared/vision/morphology';
import type { BorderMode } from '../../../shared/vision/border';
import { borderMode, imageSize, onEngine, sampleImage, seed, type SampleKind } from './engines';
import { canonicalBits, neighbourhood } from './plain-reference';

function extremes(image: Image, r: number, border: BorderMode, takeMax: boolean): Image {
  const { width: w, height: h } = image;
  const data = new Float32Array(w * h);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const values = neighbourhood(image, x, y, 2 * r + 1, border);
      data[y * w + x] = takeMax ? Math.max(...values) : Math.min(...values);
    }
  }
  return { width: w, height: h, data };
}

function definition(image: Image, op: MorphologyOp, r: number, border: BorderMode): Image {
  switch (op) {
    case 'erode':
      return extremes(image, r, border, false);
    case 'dilate':
      return extremes(image, r, border, true);
    case 'open':
      return extremes(extremes(image, r, border, false), r, border, true);
    case 'close':
      return extremes(extremes(image, r, border, true), r, border, false);
  }
}

test('plain erosion, dilation, opening and closing of any values equal the minimum and maximum over the square, bit for bit', () => {
  fc.assert(
    fc.property(
      imageSize,
      fc.constantFrom<SampleKind>('8-bit', '16-bit', 'signed float'),
      seed,
      borderMode,
      fc.integer({ min: 1, max: 9 }),
      fc.constantFrom<MorphologyOp>('erode', 'dilate', 'open', 'close'),
      ([w, h], kind, s, border, r, op) => {
        const image = sampleImage(w, h, kind, s);
        const out = onEngine('plain', () => valueMorphology(image, op, r, border));
        expect(canonicalBits(out)).toEqual(canonicalBits(definition(image, op, r, border)));
      },
    ),
    { numRuns: 250 },
  );
});

test('plain erosion orders infinities and negative values as numbers (keys reversed for negative samples)', () => {
  const image: Image = { width: 4, height: 2, data: Float32Array.from([-Infinity, 3, -7.5, Infinity, 0, -1e-30, 1e30, -2]) };
  // Hand-checked with r = 1 and replicate: every window of a 4×2 image with r = 1 spans both rows.
  const eroded = onEngine('plain', () => valueMorphology(image, 'erode', 1, 'replicate'));
  expect(Array.from(eroded.data)).toEqual([-Infinity, -Infinity, -7.5, -7.5, -Infinity, -Infinity, -7.5, -7.5]);
  const dilated = onEngine('plain', () => valueMorphology(image, 'dilate', 1, 'replicate'));
  expect(Array.from(dilated.data)).toEqual([3, Math.fround(1e30), Infinity, Infinity, 3, Math.fround(1e30), Infinity, Infinity]);
});

test('plain opening and closing with the source itself offered as scratch, or written in place: the same result', () => {
  fc.assert(
    fc.property(imageSize, fc.constantFrom<SampleKind>('8-bit', 'signed float'), seed, borderMode, fc.integer({ min: 1, max: 4 }), fc.constantFrom<MorphologyOp>('open', 'close'), ([w, h], kind, s, border, r, op) => {
      const expected = canonicalBits(definition(sampleImage(w, h, kind, s), op, r, border));
      const image = sampleImage(w, h, kind, s);
      expect(canonicalBits(onEngine('plain', () => valueMorphology(image, op, r, border, undefined, image)))).toEqual(expected);
      const inPlace = sampleImage(w, h, kind, s);
      expect(canonicalBits(onEngine('plain', () => valueMorphology(inPlace, op, r, border, inPlace)))).toEqual(expected);
    }),
    { numRuns: 100 },
  );
});
