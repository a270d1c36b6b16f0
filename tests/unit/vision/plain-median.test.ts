// The plain engine's 3×3 median against its definition: the 5th smallest of the nine values of the
// neighbourhood (border positions as plain-reference.ts), bit for bit. Images without NaN or −0 take
// the sorted-columns path (integer keys, branch-free minima and maxima), including negative values,
// 8- and 16-bit samples and the constant border's zeros; awkward images (NaN, −0) keep the selection path.
import fc from 'fast-check';
import { medianFilter } from '../../../shared/vision/median';
import { imageFromSamples } from '../../../shared/vision/image';
import { borderMode, imageSize, onEngine, sampleImage, seed, type SampleKind } from './engines';
import { canonicalBits, neighbourhood } from './plain-reference';

test('plain 3×3 median is the 5th smallest of each neighbourhood, bit for bit, on images without NaN or −0', () => {
  fc.assert(
    fc.property(
      imageSize,
      fc.constantFrom<SampleKind>('8-bit', '16-bit', 'signed float', 'mask'),
      seed,
      borderMode,
      ([w, h], kind, s, border) => {
        const image = sampleImage(w, h, kind, s);
        const out = onEngine('plain', () => medianFilter(image, 3, border));
        const expected = new Float32Array(w * h);
        for (let y = 0; y < h; y++) {
          for (let x = 0; x < w; x++) expected[y * w + x] = neighbourhood(image, x, y, 3, border).sort((a, b) => a - b)[4];
        }
        expect(canonicalBits(out)).toEqual(canonicalBits({ width: w, height: h, data: expected }));
      },
    ),
    { numRuns: 300 },
  );
});

test('plain 3×3 median orders negative values, infinities and ties as numbers', () => {
  // Hand-checked: every window of this 3×3 image under `replicate` holds the listed values.
  const image = imageFromSamples(3, 3, [-5, Infinity, -Infinity, 2.5, -0.25, 7, 1e-30, -1e30, 3]);
  const out = onEngine('plain', () => medianFilter(image, 3, 'replicate'));
  const expected = Array.from({ length: 9 }, (_, p) => neighbourhood(image, p % 3, Math.floor(p / 3), 3, 'replicate').sort((a, b) => a - b)[4]);
  expect(Array.from(out.data)).toEqual(expected.map((v) => Math.fround(v)));
  // The centre window holds all nine values: sorted −∞, −1e30, −5, −0.25, 1e−30, 2.5, 3, 7, ∞.
  expect(out.data[4]).toBe(Math.fround(1e-30));
});

test('plain 3×3 median of an image holding NaN or −0 keeps the selection path (no key comparison)', () => {
  const image = sampleImage(17, 9, 'awkward', 5);
  const out = onEngine('plain', () => medianFilter(image, 3, 'reflect'));
  // Windows without NaN have a well-defined median value (±0 compare equal).
  for (let y = 0; y < 9; y++) {
    for (let x = 0; x < 17; x++) {
      const values = neighbourhood(image, x, y, 3, 'reflect');
      if (values.some(Number.isNaN)) continue;
      expect(out.data[y * 17 + x] === Math.fround(values.sort((a, b) => a - b)[4])).toBe(true);
    }
  }
});

test('plain 5×5 and 7×7 medians of whole numbers, and of whole numbers with one other value in any row, are the middle value of each neighbourhood', () => {
  // The running histogram checks each row as it converts it; one value that is not a level in
  // 0 … 65535, however late, sends the whole image to the selection path.
  fc.assert(
    fc.property(
      fc.tuple(fc.integer({ min: 1, max: 40 }), fc.integer({ min: 1, max: 24 })),
      fc.constantFrom<SampleKind>('8-bit', '16-bit', 'mask'),
      seed,
      borderMode,
      fc.constantFrom(5, 7),
      fc.constantFrom<number | null>(null, null, 2.5, -3, 65536, 1e6, Infinity),
      fc.double({ min: 0, max: 1, noNaN: true }),
      ([w, h], kind, s, border, size, stray, where) => {
        const image = sampleImage(w, h, kind, s);
        if (stray !== null) image.data[Math.min(w * h - 1, Math.floor(where * w * h))] = stray;
        const out = onEngine('plain', () => medianFilter(image, size, border));
        const expected = new Float32Array(w * h);
        const rank = (size * size - 1) >> 1;
        for (let y = 0; y < h; y++) {
          for (let x = 0; x < w; x++) expected[y * w + x] = neighbourhood(image, x, y, size, border).sort((a, b) => a - b)[rank];
        }
        expect(canonicalBits(out)).toEqual(canonicalBits({ width: w, height: h, data: expected }));
      },
    ),
    { numRuns: 400 },
  );
});

test('plain 3×3 median of non-negative samples with other values from any row on (negative runs, −0, NaN): every window without NaN gives its 5th smallest', () => {
  // The non-negative path checks each row as its columns are first sorted and hands the image back on
  // the first row holding another value. Every combination below: one to three rows of negatives of
  // different sizes make windows whose median is negative, where keys taken for non-negative ones
  // would order them backwards; the column patterns reach each place the row check reads (the first
  // column, the two of each pair, the last) on an odd and an even width.
  const columnPatterns: ((x: number, y: number, w: number) => boolean)[] = [
    () => true,
    (x, y) => (x + y) % 3 !== 0,
    (x) => x % 2 === 0 && x > 0,
    (x) => x % 2 === 1,
    (x) => x === 0,
    (x, _y, w) => x === w - 1,
  ];
  const h = 9;
  let s = 1;
  for (const w of [17, 18]) {
    for (const border of ['reflect', 'replicate', 'constant'] as const) {
      for (const stray of [-1, -0, NaN, 2.5, Infinity]) {
        for (const rows of [1, 2, 3]) {
          for (const row of [0, 3, h - rows]) {
            for (const columns of columnPatterns) {
              const image = sampleImage(w, h, '8-bit', s++);
              for (let y = row; y < row + rows; y++) {
                for (let x = 0; x < w; x++) if (columns(x, y, w)) image.data[y * w + x] = stray === -1 ? -1 - ((x * 7 + y) % 11) / 4 : stray;
              }
              const out = onEngine('plain', () => medianFilter(image, 3, border));
              for (let y = 0; y < h; y++) {
                for (let x = 0; x < w; x++) {
                  const values = neighbourhood(image, x, y, 3, border);
                  if (values.some(Number.isNaN)) continue;
                  const expected = Math.fround(values.sort((a, b) => a - b)[4]);
                  if (out.data[y * w + x] !== expected) throw new Error(`${w}×${h} ${border}, ${stray} in rows ${row}…${row + rows - 1}: (${x}, ${y}) gave ${out.data[y * w + x]}, not ${expected}`);
                }
              }
            }
          }
        }
      }
    }
  }
});
