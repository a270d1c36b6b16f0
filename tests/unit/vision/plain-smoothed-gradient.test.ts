// The plain engine's Gaussian-and-gradient sweep (smoothed-gradient.ts: smoothed rows in a ring that
// the gradient reads) against the same engine's two steps in turn: the same values, bit for bit, and
// the same magnitude range, on odd and degenerate sizes, every border, σ with radius 1 to 12 (the
// unrolled vertical passes of radius 1–3 and the general one), every operator and output.
// NaN compares equal to NaN: IEEE 754 leaves the payload of an operation's NaN result open.
import fc from 'fast-check';
import { gradient } from '../../../shared/vision/gradient';
import { gaussianBlur } from '../../../shared/vision/smoothing';
import { gaussianGradient } from '../../../shared/vision/smoothed-gradient';
import { borderMode, imageSize, onEngine, sampleImage, seed, type SampleKind } from './engines';
import { canonicalBits } from './plain-reference';

const tallOrWide = fc.oneof(imageSize, fc.constantFrom([3, 70], [70, 3], [9, 41], [1, 30]));

test('plain engine: the Gaussian and the gradient in one sweep give the bits and the magnitude range of the two steps in turn', () => {
  fc.assert(
    fc.property(
      tallOrWide,
      fc.constantFrom<SampleKind>('8-bit', '16-bit', 'signed float', 'awkward'),
      seed,
      borderMode,
      fc.oneof(fc.constantFrom(0.3, 0.5, 1, 1.2), fc.double({ min: 0.3, max: 4, noNaN: true })),
      fc.constantFrom('sobel', 'scharr', 'prewitt' as const),
      fc.constantFrom('x', 'y', 'magnitude', 'direction' as const),
      ([w, h], kind, s, border, sigma, operator, output) => {
        const image = sampleImage(w, h, kind, s);
        const stepRange = { min: NaN, max: NaN };
        const sweptRange = { min: NaN, max: NaN };
        const { steps, swept } = onEngine('plain', () => ({
          steps: gradient(gaussianBlur(image, sigma, border), operator, output, border, undefined, stepRange),
          swept: gaussianGradient(image, sigma, operator, output, border, undefined, sweptRange),
        }));
        expect(canonicalBits(swept)).toEqual(canonicalBits(steps));
        expect(sweptRange).toEqual(stepRange);
      },
    ),
    { numRuns: 300 },
  );
});

test('plain engine: the sweep writes into the given image and leaves the source alone', () => {
  const image = sampleImage(37, 23, 'signed float', 7);
  const before = canonicalBits(image);
  const out = sampleImage(37, 23, '8-bit', 8);
  const result = onEngine('plain', () => gaussianGradient(image, 1, 'sobel', 'magnitude', 'reflect', out));
  expect(result).toBe(out);
  expect(canonicalBits(image)).toEqual(before);
  const steps = onEngine('plain', () => gradient(gaussianBlur(image, 1, 'reflect'), 'sobel', 'magnitude', 'reflect'));
  expect(canonicalBits(result)).toEqual(canonicalBits(steps));
});
