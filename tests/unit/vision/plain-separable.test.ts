// The plain engine's separable correlation against the definition it implements, written out here
// term by term: out(x, y) = Σⱼ Σᵢ col[j]·row[i]·in(x+i−rx, y+j−ry) + offset, with the border
// positions of plain-reference.ts (OpenCV's border types).
// Symmetric kernels of radius 0 to 12 cover the unrolled passes (radius ≤ 3), the folded ones
// (wider: rows at equal distance added first, four pairs per pass) and their remainders.
// The engine sums in double precision in its own order and rounds once to float32, so it may differ
// from the exact sum by the float32 rounding of the result plus the double-precision error of a sum
// of n products, n·2⁻⁵³·Σ|wᵢ·xᵢ| (Higham, Accuracy and Stability of Numerical Algorithms, §3.1).
import fc from 'fast-check';
import type { BorderMode } from '../../../shared/rules/schema';
import { correlateSeparable } from '../../../shared/vision/convolve';
import type { Image } from '../../../shared/vision/image';
import { borderMode, onEngine, sampleImage, sampleKind, seed } from './engines';
import { sourcePosition } from './plain-reference';

/** The exact double-precision sum for one output pixel, and Σ|wᵢ·xᵢ| for the error bound. */
function definition(image: Image, column: number[], row: number[], border: BorderMode, offset: number, x: number, y: number): [number, number] {
  const ry = (column.length - 1) / 2;
  const rx = (row.length - 1) / 2;
  let sum = offset;
  let scale = Math.abs(offset);
  for (let j = 0; j < column.length; j++) {
    const sy = sourcePosition(y + j - ry, image.height, border);
    for (let i = 0; i < row.length; i++) {
      const sx = sourcePosition(x + i - rx, image.width, border);
      const v = sy < 0 || sx < 0 ? 0 : image.data[sy * image.width + sx];
      sum += column[j] * row[i] * v;
      scale += Math.abs(column[j] * row[i] * v);
    }
  }
  return [sum, scale];
}

const symmetric = (radius: number) =>
  fc.array(fc.integer({ min: -30, max: 30 }).map((v) => v / 16), { minLength: radius + 1, maxLength: radius + 1 }).map((half) => [...half.slice(1).reverse(), ...half]);

test('plain separable correlation equals the definition within the rounding of one float32 store, symmetric kernels of radius 0 to 12', () => {
  fc.assert(
    fc.property(
      fc.tuple(fc.integer({ min: 1, max: 36 }), fc.integer({ min: 1, max: 36 })),
      sampleKind,
      seed,
      borderMode,
      fc.integer({ min: 0, max: 12 }).chain(symmetric),
      fc.integer({ min: 0, max: 12 }).chain(symmetric),
      fc.integer({ min: -8, max: 8 }).map((v) => v / 4),
      ([w, h], kind, s, border, column, row, offset) => {
        const image = sampleImage(w, h, kind, s);
        const out = onEngine('plain', () => correlateSeparable(image, column, row, border, undefined, offset));
        const taps = column.length * row.length + 1;
        for (let y = 0; y < h; y++) {
          for (let x = 0; x < w; x++) {
            const [exact, scale] = definition(image, column, row, border, offset, x, y);
            const got = out.data[y * w + x];
            const tolerance = Math.abs(exact) * 2 ** -24 + 2 * taps * 2 ** -53 * scale;
            expect(Math.abs(got - exact)).toBeLessThanOrEqual(tolerance);
          }
        }
      },
    ),
    { numRuns: 200 },
  );
});
