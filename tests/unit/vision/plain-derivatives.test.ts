// The plain engine's Sobel x, y and magnitude and its 4-neighbour Laplacian against their
// definitions written out term by term, bit for bit: each output summed in the order the
// definition states it, in double precision, rounded once to float32. The engine makes most rows
// two at a time (rows y and y+1 from one load of the four rows around them) and the rows next to a
// border one at a time; images of every height from 1 up take both paths and their seams.
// Sobel: Gonzalez & Woods, Digital Image Processing, 3rd ed., §3.6.4 (x kernel [−1 0 1; −2 0 2;
// −1 0 1], smoothing [1 2 1]ᵀ ⊗ difference [−1 0 1]); Laplacian: the same book, §3.6.2 (sections
// from memory; the kernels are common practice). Border positions: plain-reference.ts (OpenCV's
// border types).
import fc from 'fast-check';
import type { BorderMode, GradientOutput } from '../../../shared/rules/schema';
import { gradient } from '../../../shared/vision/gradient';
import type { Image } from '../../../shared/vision/image';
import { laplacian } from '../../../shared/vision/laplacian';
import { borderMode, onEngine, sampleImage, seed, type SampleKind } from './engines';
import { cancellingImage } from './images';
import { canonicalBits, sourcePosition } from './plain-reference';

/** The sample at (x, y) with the border's value outside the image (0 under the constant border). */
function sampleAt(image: Image, x: number, y: number, border: BorderMode): number {
  const sx = sourcePosition(x, image.width, border);
  const sy = sourcePosition(y, image.height, border);
  return sx < 0 || sy < 0 ? 0 : image.data[sy * image.width + sx];
}

/** Each output pixel of fn(x, y), rounded to float32. */
function imageOf(like: Image, fn: (x: number, y: number) => number): number[] {
  const out = new Float32Array(like.width * like.height);
  for (let y = 0; y < like.height; y++) for (let x = 0; x < like.width; x++) out[y * like.width + x] = fn(x, y);
  return canonicalBits({ width: like.width, height: like.height, data: out });
}

/** Sobel by its definition: column smoothing s = (up + down) + 2·centre, difference t = down − up; gx = s(x+1) − s(x−1), gy = (t(x−1) + t(x+1)) + 2·t(x). */
function sobelDefinition(image: Image, output: GradientOutput, border: BorderMode): number[] {
  const at = (x: number, y: number) => sampleAt(image, x, y, border);
  // A column outside the image under the constant border contributes zeros.
  const outside = (x: number) => sourcePosition(x, image.width, border) < 0;
  const s = (x: number, y: number) => (outside(x) ? 0 : at(x, y - 1) + at(x, y + 1) + 2 * at(x, y));
  const t = (x: number, y: number) => (outside(x) ? 0 : at(x, y + 1) - at(x, y - 1));
  return imageOf(image, (x, y) => {
    const gx = s(x + 1, y) - s(x - 1, y);
    const gy = t(x - 1, y) + t(x + 1, y) + 2 * t(x, y);
    return output === 'x' ? gx : output === 'y' ? gy : Math.sqrt(gx * gx + gy * gy);
  });
}

/** The 4-neighbour Laplacian by its definition, summed as up + down + left + right − 4·centre. */
function laplacian4Definition(image: Image, border: BorderMode): number[] {
  const at = (x: number, y: number) => sampleAt(image, x, y, border);
  return imageOf(image, (x, y) => at(x, y - 1) + at(x, y + 1) + at(x - 1, y) + at(x + 1, y) - 4 * at(x, y));
}

type Kind = SampleKind | 'cancelling';
const kind = fc.constantFrom<Kind>('8-bit', '16-bit', 'signed float', 'awkward', 'cancelling', 'cancelling');
/** Every height from 1 (pairs of rows, a last row alone, rows beside the border) and widths across the loops' four-pixel steps. */
const size = fc.tuple(fc.integer({ min: 1, max: 19 }), fc.integer({ min: 1, max: 12 }));
const image = fc.tuple(size, kind, seed).map(([[w, h], k, s]) => (k === 'cancelling' ? cancellingImage(w, h, s) : sampleImage(w, h, k, s)));

test('plain Sobel x, y and magnitude: the definition term by term, bit for bit, every border', () => {
  fc.assert(
    fc.property(image, borderMode, fc.constantFrom<GradientOutput>('x', 'y', 'magnitude'), (img, border, output) => {
      const ours = onEngine('plain', () => gradient(img, 'sobel', output, border));
      expect(canonicalBits(ours)).toEqual(sobelDefinition(img, output, border));
    }),
    { numRuns: 300 },
  );
});

test('plain 4-neighbour Laplacian: the definition term by term, bit for bit, every border', () => {
  fc.assert(
    fc.property(image, borderMode, (img, border) => {
      const ours = onEngine('plain', () => laplacian(img, 4, border));
      expect(canonicalBits(ours)).toEqual(laplacian4Definition(img, border));
    }),
    { numRuns: 300 },
  );
});
