// The packed-bit morphology reads float32 bit patterns; values that are 0 or 1 as numbers but not
// as the usual patterns (−0) must still count as a mask, and anything else must go the value way.
import fc from 'fast-check';
import type { BorderMode, MorphologyOp } from '../../../shared/rules/schema';
import { createPackedMask } from '../../../shared/vision/deferrable-image';
import { imageFromSamples } from '../../../shared/vision/image';
import { morphology, valueMorphology } from '../../../shared/vision/morphology';
import { thresholdOtsu } from '../../../shared/vision/threshold';
import { setKernelLoops } from '../../../shared/vision/kernel-loops';
import { ENGINES, onEngine, seed } from './engines';
import { seededRandom } from './images';

test('a mask holding −0 is opened like the same mask with +0', () => {
  const values = [1, 1, 1, -0, 1, 1, 1, 1, 0, 1, 1, 1, -0, -0, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 0];
  const withMinusZero = imageFromSamples(12, 3, values);
  const plain = valueMorphology(imageFromSamples(12, 3, values.map((v) => (v === 0 ? 0 : v))), 'open', 1, 'reflect');
  expect(Array.from(morphology(withMinusZero, 'open', 1, 'reflect').data)).toEqual(Array.from(plain.data));
});

test('a value just above 1 (same high bits as 1.0) is not taken for a mask pixel', () => {
  const img = imageFromSamples(4, 1, [1, 1.0000001, 1, 0]);
  // Dilation is the maximum over each pixel and its neighbours (replicate edge): 1.0000001 spreads.
  expect(Array.from(morphology(img, 'dilate', 1, 'replicate').data)).toEqual(Array.from(valueMorphology(img, 'dilate', 1, 'replicate').data));
  expect(morphology(img, 'dilate', 1, 'replicate').data[0]).toBeCloseTo(1.0000001, 6);
});

test('an Otsu mask handed over in packed bits gives the morphology result of the mask itself', () => {
  fc.assert(
    fc.property(
      fc.integer({ min: 1, max: 70 }).chain((w) =>
        fc.integer({ min: 1, max: 9 }).chain((h) =>
          fc.array(fc.double({ min: 0, max: 300, noNaN: true }), { minLength: w * h, maxLength: w * h }).map((v) => imageFromSamples(w, h, v)),
        ),
      ),
      fc.boolean(),
      fc.constantFrom<MorphologyOp>('erode', 'dilate', 'open', 'close'),
      fc.integer({ min: 1, max: 3 }),
      fc.constantFrom<BorderMode>('reflect', 'replicate', 'constant'),
      (img, invert, op, radius, border) => {
        const packed = createPackedMask(img.width, img.height);
        const handed = thresholdOtsu(img, invert, undefined, undefined, packed).mask;
        const plain = thresholdOtsu(img, invert).mask;
        expect(Array.from(handed.data)).toEqual(Array.from(plain.data));
        const viaBits = morphology(handed, op, radius, border, undefined, undefined, packed);
        expect(Array.from(viaBits.data)).toEqual(Array.from(valueMorphology(plain, op, radius, border).data));
      },
    ),
    { numRuns: 300 },
  );
});

test('a flat image hands over an all-0 (or, inverted, all-1) packed mask', () => {
  for (const invert of [false, true]) {
    const img = imageFromSamples(35, 2, new Array(70).fill(7));
    const packed = createPackedMask(35, 2);
    const mask = thresholdOtsu(img, invert, undefined, undefined, packed).mask;
    const dilated = morphology(mask, 'dilate', 1, 'reflect', undefined, undefined, packed);
    expect(Array.from(dilated.data)).toEqual(new Array(70).fill(invert ? 1 : 0));
  }
});

/**
 * Rows of runs (1–80 pixels) of 0 and 1, some of −0, and in some images a run of a value that is not
 * a mask's (0.5, whose pattern shares 1.0's high bits, 1.0000001, 2, NaN): whole words of zeros, of
 * ones and of mixed bits for the generated packing loop, which must hand any other pattern back.
 */
function runsOfMaskValues(width: number, height: number, s: number, stray: number | null): number[] {
  const rand = seededRandom(s);
  const samples: number[] = [];
  while (samples.length < width * height) {
    const pick = rand();
    const v = pick < 0.46 ? 0 : pick < 0.92 ? 1 : pick < 0.97 || stray === null ? -0 : stray;
    const run = 1 + Math.floor(rand() * 80);
    for (let i = 0; i < run && samples.length < width * height; i++) samples.push(v);
  }
  return samples;
}

/** ±0 as one value (the packed path writes +0 where the value path may keep −0). */
const withoutSignedZero = (data: Float32Array) => Array.from(data, (v) => (v === 0 ? 0 : v));

test('masks of long runs (whole words of 0, of 1, mixed, and −0 or other values) give the value morphology with the generated packing loop and without it', () => {
  fc.assert(
    fc.property(
      fc.tuple(fc.integer({ min: 32, max: 160 }), fc.integer({ min: 1, max: 8 })),
      seed,
      fc.constantFrom<number | null>(null, null, 0.5, 1.0000001, 2, NaN),
      fc.constantFrom<MorphologyOp>('erode', 'dilate', 'open', 'close'),
      fc.integer({ min: 1, max: 3 }),
      fc.constantFrom<BorderMode>('reflect', 'replicate', 'constant'),
      ([w, h], s, stray, op, radius, border) => {
        const samples = runsOfMaskValues(w, h, s, stray);
        const expected = withoutSignedZero(valueMorphology(imageFromSamples(w, h, samples.map((v) => (v === 0 ? 0 : v))), op, radius, border).data);
        expect(withoutSignedZero(onEngine('plain', () => morphology(imageFromSamples(w, h, samples), op, radius, border)).data)).toEqual(expected);
        setKernelLoops(false);
        try {
          expect(withoutSignedZero(onEngine('plain', () => morphology(imageFromSamples(w, h, samples), op, radius, border)).data)).toEqual(expected);
        } finally {
          setKernelLoops(true);
        }
      },
    ),
    { numRuns: 300 },
  );
});

test('a whole word of 1 and 1.0000001 (their AND is 1.0) is not taken for a word of mask pixels', () => {
  const samples = [...Array.from({ length: 32 }, (_, i) => (i % 7 === 3 ? 1.0000001 : 1)), ...new Array<number>(32).fill(0)];
  const img = imageFromSamples(64, 1, samples);
  for (const engine of ENGINES) {
    expect(Array.from(onEngine(engine, () => morphology(img, 'dilate', 1, 'replicate')).data)).toEqual(Array.from(valueMorphology(img, 'dilate', 1, 'replicate').data));
  }
});
