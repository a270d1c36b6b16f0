// The WebAssembly SIMD kernels against the plain TypeScript path (the reference) where the result is
// a decision or a selection: fixed, Otsu and adaptive-mean thresholds, the median, morphology on any
// values and on masks, the blob labelling with its pre-pass, and a rule run that stays on those
// paths; and the box mean, whose double-precision sums the SIMD kernel computes with the plain
// engine's operations in its order. These must agree bit for bit, NaN, −0 and ties included, on
// random images of odd and degenerate sizes.
import fc from 'fast-check';
import type { MorphologyOp } from '../../../shared/rules/schema';
import { createPackedMask } from '../../../shared/vision/deferrable-image';
import { labelBlobs } from '../../../shared/vision/blobs';
import { borderIndex, OUTSIDE, type BorderMode } from '../../../shared/vision/border';
import { correlate, correlateDirect } from '../../../shared/vision/convolve';
import { measurePixels, regionSpans } from '../../../shared/vision/gauges';
import { gradient } from '../../../shared/vision/gradient';
import { simdKernels } from '../../../shared/vision/engine';
import { channelImage, createImage, imageFromSamples, type RawPhoto } from '../../../shared/vision/image';
import { inputChannel, inputWithQuality } from '../../../shared/vision/photo-channel';
import { morphology, valueMorphology } from '../../../shared/vision/morphology';
import { laplacian } from '../../../shared/vision/laplacian';
import { isResident, type ResidentImage } from '../../../shared/vision/wasm/resident-image';
import { qualityFigures } from '../../../shared/vision/quality';
import { releaseRun, runRule } from '../../../shared/vision/pipeline';
import { ImageWorkspace } from '../../../shared/vision/workspace';
import { kernelFromMatrix, type Kernel } from '../../../shared/vision/kernels';
import { medianFilter } from '../../../shared/vision/median';
import { boxFilter, gaussianBlur } from '../../../shared/vision/smoothing';
import { gaussianGradient } from '../../../shared/vision/smoothed-gradient';
import { otsuHistogram, thresholdAdaptiveMean, thresholdFixed, thresholdOtsu } from '../../../shared/vision/threshold';
import type { Image } from '../../../shared/vision/image';
import { firstFloat32Where, float32Above } from '../../../shared/vision/float32';
import { bitsOf, borderMode, imageSize, onBoth, onEngine, sampleImage, seed, type SampleKind } from './engines';
import { seededRandom } from './images';

const RUNS = { numRuns: 150 };
const anyKind = fc.constantFrom<SampleKind>('8-bit', '16-bit', 'signed float', 'mask', 'awkward');
const morphologyOp = fc.constantFrom<MorphologyOp>('erode', 'dilate', 'open', 'close');
/** Box and adaptive-mean window sides: the small ones, and some wider than the images (the border reflected again and again). */
const windowSide = fc.oneof(fc.constantFrom(1, 3, 5, 7), fc.integer({ min: 0, max: 127 }).map((r) => 2 * r + 1));

/** Runs `fn` on the SIMD engine with the rule runner's input image of an 8-bit grey photo, which keeps an 8-bit copy. */
function withGreyInput(p: RawPhoto, fn: (input: ResidentImage, workspace: ImageWorkspace) => void): void {
  onEngine('simd', () => {
    const workspace = new ImageWorkspace();
    const input = inputChannel(p, 'luma', workspace.take(p.width, p.height));
    if (!isResident(input) || input.eightBit === 0) throw new Error('the input image of an 8-bit grey photo keeps an 8-bit copy');
    try {
      fn(input, workspace);
    } finally {
      workspace.dispose();
    }
  });
}

/** bitsOf with every NaN as one pattern: which NaN an arithmetic operation returns is left open by IEEE 754 (§6.2, from memory). */
function bitsOrNaN(image: Image): number[] {
  const bits = bitsOf(image);
  return Array.from(image.data, (v, i) => (Number.isNaN(v) ? NaN : bits[i]));
}

test('luma of 8-bit RGB and RGBA photos (BT.601 in double precision, rounded once): the same bits from the SIMD kernel', () => {
  fc.assert(
    fc.property(imageSize, fc.constantFrom<3 | 4>(3, 4), seed, ([w, h], channels, s) => {
      const rand = seededRandom(s);
      const samples = Uint8Array.from({ length: w * h * channels }, () => Math.floor(rand() * 256));
      const photo: RawPhoto = { width: w, height: h, channels, bitDepth: 8, samples };
      const plain = onEngine('plain', () => channelImage(photo, 'luma'));
      const simd = onEngine('simd', () => inputChannel(photo, 'luma'));
      expect(bitsOf(simd)).toEqual(bitsOf(plain));
    }),
    RUNS,
  );
});

test('luma of every one of the 2²⁴ 8-bit colours: the SIMD kernel\'s whole-number sum over 1000 has the bits of the plain engine\'s double-precision sum', () => {
  // The exhaustive check behind the kernel's argument (shared/vision/wasm/assembly/channels.ts):
  // 256 photos of 256×256 pixels, photo r holding every (r, g, b).
  const side = 256;
  const samples = new Uint8Array(side * side * 3);
  for (let red = 0; red < 256; red++) {
    for (let p = 0; p < side * side; p++) {
      samples[3 * p] = red;
      samples[3 * p + 1] = p >> 8;
      samples[3 * p + 2] = p & 255;
    }
    const photo: RawPhoto = { width: side, height: side, channels: 3, bitDepth: 8, samples };
    const plain = onEngine('plain', () => channelImage(photo, 'luma'));
    const simd = onEngine('simd', () => inputChannel(photo, 'luma'));
    const same = simd.data.every((v, i) => Object.is(v, plain.data[i]));
    if (!same) expect({ red, simd: Array.from(simd.data.slice(0, 8)) }).toEqual({ red, simd: Array.from(plain.data.slice(0, 8)) });
    expect(same).toBe(true);
  }
});

test('quality gate of 8-bit images: whole-number sums, so the same focus, clipped share and mean as the plain engine, exactly', () => {
  // Wide rows (over 8·64 inner columns) pass through the kernel's int32-to-int64 flush.
  const size = fc.oneof(imageSize, fc.tuple(fc.integer({ min: 513, max: 900 }), fc.integer({ min: 1, max: 4 })));
  fc.assert(
    fc.property(size, seed, fc.boolean(), ([w, h], s, clip) => {
      const rand = seededRandom(s);
      const image = createImage(w, h, Float32Array.from({ length: w * h }, () => (clip && rand() < 0.2 ? 255 : Math.floor(rand() * 256))));
      const { plain, simd } = onBoth(() => qualityFigures(image, 8));
      expect(simd).toEqual(plain);
    }),
    RUNS,
  );
});

test('input and quality gate of 8-bit grey photos in one pass: the plain engine\'s float32 samples and its focus, clipped share and mean, exactly', () => {
  // Rows of over 16·256 inner columns pass through the kernel's int32-to-int64 flush.
  const size = fc.oneof(imageSize, fc.tuple(fc.integer({ min: 4100, max: 4400 }), fc.integer({ min: 1, max: 3 })));
  fc.assert(
    fc.property(size, seed, fc.boolean(), ([w, h], s, clip) => {
      const rand = seededRandom(s);
      const samples = Uint8Array.from({ length: w * h }, () => (clip && rand() < 0.3 ? 255 : Math.floor(rand() * 256)));
      const photo: RawPhoto = { width: w, height: h, channels: 1, bitDepth: 8, samples };
      const { plain, simd } = onBoth(() => inputWithQuality(photo, 'luma'));
      expect(bitsOf(simd.input)).toEqual(bitsOf(plain.input));
      expect(simd.quality).toEqual(plain.quality);
    }),
    RUNS,
  );
});

test('input and quality gate of 8-bit colour photos in one pass: the same luma bits, and the same figures as the SIMD quality gate run after the conversion', () => {
  fc.assert(
    fc.property(imageSize, fc.constantFrom<3 | 4>(3, 4), seed, ([w, h], channels, s) => {
      const rand = seededRandom(s);
      const samples = Uint8Array.from({ length: w * h * channels }, () => (rand() < 0.1 ? 255 : Math.floor(rand() * 256)));
      const photo: RawPhoto = { width: w, height: h, channels, bitDepth: 8, samples };
      const fused = onEngine('simd', () => inputWithQuality(photo, 'luma'));
      const separate = onEngine('simd', () => qualityFigures(inputChannel(photo, 'luma'), 8));
      expect(bitsOf(fused.input)).toEqual(bitsOf(onEngine('plain', () => channelImage(photo, 'luma'))));
      expect(fused.quality).toEqual(separate);
    }),
    RUNS,
  );
});

test('fixed threshold: the same mask bits, the threshold a sample value, between two, NaN or infinite', () => {
  fc.assert(
    fc.property(imageSize, anyKind, seed, fc.boolean(), fc.nat(), fc.constantFrom('sample', 'between', 'NaN', 'Infinity', '-Infinity'), ([w, h], kind, s, invert, pick, how) => {
      const image = sampleImage(w, h, kind, s);
      const sample = image.data[pick % image.data.length];
      const value = how === 'sample' ? sample : how === 'between' ? sample + 1e-9 : Number(how);
      const { plain, simd } = onBoth(() => thresholdFixed(image, value, invert));
      expect(bitsOf(simd)).toEqual(bitsOf(plain));
    }),
    RUNS,
  );
});

/**
 * Samples from 2⁻⁴⁰ to 2⁴⁰ in size, of both signs: their double-precision sums round (float32 samples
 * of similar size sum exactly in double precision), so that only the same operations in the same
 * order give the same bits.
 */
function wideRangeImage(w: number, h: number, s: number): Image {
  const rand = seededRandom(s);
  const image = sampleImage(w, h, 'mask', s);
  for (let p = 0; p < image.data.length; p++) image.data[p] = (rand() < 0.5 ? -1 : 1) * (1 + rand()) * 2 ** Math.floor(rand() * 81 - 40);
  return image;
}

const boxKind = fc.constantFrom<SampleKind | 'wide range'>('8-bit', '16-bit', 'signed float', 'awkward', 'wide range');

test('box mean: the same bits on 8-bit, 16-bit, float, wide-range and awkward images, every border, odd and wide windows', () => {
  fc.assert(
    fc.property(imageSize, boxKind, seed, windowSide, borderMode, ([w, h], kind, s, side, border) => {
      const image = kind === 'wide range' ? wideRangeImage(w, h, s) : sampleImage(w, h, kind, s);
      const { plain, simd } = onBoth(() => boxFilter(image, side, border));
      expect(bitsOrNaN(simd)).toEqual(bitsOrNaN(plain));
    }),
    RUNS,
  );
});

test('adaptive mean: the same mask bits for any c (the local mean rounded to float32 as the plain engine rounds it), inverted or not', () => {
  const c = fc.oneof(fc.integer({ min: -20, max: 20 }), fc.double({ min: -300, max: 300, noNaN: true }));
  fc.assert(
    fc.property(imageSize, boxKind, seed, windowSide, borderMode, c, fc.boolean(), ([w, h], kind, s, side, border, offset, invert) => {
      const image = kind === 'wide range' ? wideRangeImage(w, h, s) : sampleImage(w, h, kind, s);
      const { plain, simd } = onBoth(() => thresholdAdaptiveMean(image, side, offset, border, invert));
      expect(bitsOf(simd)).toEqual(bitsOf(plain));
    }),
    RUNS,
  );
});

test('median 3×3 to 15×15: the same bits on 8-bit, 16-bit, float and 0/1 images, every border; where the SIMD kernels refuse (NaN, −0, fractions in wide windows) the plain code decides', () => {
  fc.assert(
    fc.property(imageSize, anyKind, seed, fc.constantFrom(3, 5, 3, 5, 7, 9, 11, 13, 15), borderMode, ([w, h], kind, s, size, border) => {
      const image = sampleImage(w, h, kind, s);
      const { plain, simd } = onBoth(() => medianFilter(image, size, border));
      expect(bitsOf(simd)).toEqual(bitsOf(plain));
    }),
    RUNS,
  );
});

test('median 3×3, 5×5 and 7×7 of an 8-bit grey photo\'s input image (3×3 and 5×5 in bytes, sixteen pixels per v128): the plain engine\'s bits, and the output keeps its 8-bit copy', () => {
  // Rows of 16 and more reach the byte networks' whole vectors and their last, partial one.
  const size = fc.oneof(imageSize, fc.tuple(fc.integer({ min: 14, max: 70 }), fc.integer({ min: 1, max: 30 })));
  fc.assert(
    fc.property(size, seed, fc.constantFrom(3, 5, 7), borderMode, ([w, h], s, side, border) => {
      const p = photo(w, h, s);
      const expected = bitsOf(onEngine('plain', () => medianFilter(channelImage(p, 'luma'), side, border)));
      withGreyInput(p, (input, workspace) => {
        const out = medianFilter(input, side, border, workspace.take(w, h));
        if (side <= 5 && isResident(out)) {
          expect(out.eightBit).not.toBe(0);
          expect(Array.from(out.heap.f32(out.address, w * h))).toEqual(Array.from(new Uint8Array(out.heap.memory.buffer, out.eightBit, w * h)));
        }
        expect(bitsOf(out)).toEqual(expected);
      });
    }),
    RUNS,
  );
});

test('median of windows with many equal values and of the largest and smallest float32: the same bits', () => {
  const levels = fc.constantFrom([0, 1, 2], [-3.5, 7, 1e30, -1e30], [3.4028234663852886e38, -3.4028234663852886e38, Infinity, -Infinity, 0]);
  fc.assert(
    fc.property(imageSize, seed, fc.constantFrom(3, 5), borderMode, levels, ([w, h], s, size, border, values) => {
      const rand = seededRandom(s);
      const image = sampleImage(w, h, 'mask', s);
      for (let p = 0; p < image.data.length; p++) image.data[p] = values[Math.floor(rand() * values.length)];
      const { plain, simd } = onBoth(() => medianFilter(image, size, border));
      expect(bitsOf(simd)).toEqual(bitsOf(plain));
    }),
    RUNS,
  );
});

/**
 * The SIMD direct correlation's float32 arithmetic, one pixel at a time: Σ over kernel rows, then
 * columns, of fround(k·x) added from +0 and rounded after each addition, then fround(fround(sum·s) + o)
 * with s = fround(1/divisor), o = fround(offset). A sum of whole numbers below 2²⁴ is exact this way.
 * The reference is IEEE 754 binary32 arithmetic, round to nearest (Math.fround in ECMA-262),
 * and the correlation's definition as OpenCV's filter2D computes it (REFERENCES.md §1; from memory).
 */
function float32DirectSums(image: Image, k: Kernel, border: BorderMode): Float32Array {
  const { width: w, height: h, data } = image;
  const out = new Float32Array(w * h);
  const [ry, rx] = [k.rows >> 1, k.cols >> 1];
  const [scale, offset] = [Math.fround(1 / k.divisor), Math.fround(k.offset)];
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      let acc = 0;
      for (let j = 0; j < k.rows; j++) {
        const sy = borderIndex(y + j - ry, h, border);
        for (let i = 0; i < k.cols; i++) {
          const sx = borderIndex(x + i - rx, w, border);
          const v = sy === OUTSIDE || sx === OUTSIDE ? 0 : data[sy * w + sx];
          acc = Math.fround(acc + Math.fround(Math.fround(k.weights[j * k.cols + i]) * v));
        }
      }
      out[y * w + x] = Math.fround(Math.fround(acc * scale) + offset);
    }
  }
  return out;
}

test('direct correlation of whole-number kernels (zero and ±1 weights among them) on whole-number images (16-bit sums on the SIMD engine), some rows not whole: the float32 sums bit for bit', () => {
  const kernel = fc
    .tuple(fc.constantFrom(3, 5, 7, 9), fc.constantFrom(3, 5, 7))
    .chain(([rows, cols]) => fc.tuple(fc.constant(rows), fc.constant(cols), fc.array(fc.integer({ min: -4, max: 4 }), { minLength: rows * cols, maxLength: rows * cols }), fc.constantFrom(1, 3, 16), fc.integer({ min: -40, max: 40 })));
  // Widths past 32 and 8 pixels reach every loop of the kernel: 32 at a time, 8 at a time, one at a time.
  const size = fc.oneof(imageSize, fc.tuple(fc.integer({ min: 30, max: 100 }), fc.integer({ min: 1, max: 12 })));
  const kind = fc.constantFrom<SampleKind>('8-bit', 'mask', '16-bit');
  fc.assert(
    fc.property(size, kind, seed, borderMode, kernel, fc.array(fc.nat(), { maxLength: 2 }), ([w, h], sampleKind, s, border, [rows, cols, flat, divisor, eighths], notWhole) => {
      const image = sampleImage(w, h, sampleKind, s);
      // A row holding a value that is not a whole number sends every output row whose window reaches it through float32.
      for (const r of notWhole) image.data[(r % h) * w + (r % w)] += 0.5;
      const k = kernelFromMatrix(Array.from({ length: rows }, (_, j) => flat.slice(j * cols, (j + 1) * cols)), divisor, eighths / 8);
      const simd = onEngine('simd', () => correlateDirect(image, k, border));
      expect(bitsOf(simd)).toEqual(Array.from(new Uint32Array(float32DirectSums(image, k, border).buffer)));
    }),
    RUNS,
  );
});

test('direct correlation from an 8-bit grey photo\'s input image (the SIMD engine reads the bytes it keeps when ‖k‖₁ ≤ 128, the float32 samples otherwise): the float32 sums bit for bit', () => {
  const kernel = fc
    .tuple(fc.constantFrom(3, 5, 7, 9), fc.constantFrom(3, 5, 7))
    .chain(([rows, cols]) => fc.tuple(fc.constant(rows), fc.constant(cols), fc.array(fc.integer({ min: -6, max: 6 }), { minLength: rows * cols, maxLength: rows * cols }), fc.constantFrom(1, 3, 16), fc.integer({ min: -40, max: 40 })));
  const size = fc.oneof(imageSize, fc.tuple(fc.integer({ min: 30, max: 100 }), fc.integer({ min: 1, max: 12 })));
  fc.assert(
    fc.property(size, seed, borderMode, kernel, ([w, h], s, border, [rows, cols, flat, divisor, eighths]) => {
      const p = photo(w, h, s);
      const k = kernelFromMatrix(Array.from({ length: rows }, (_, j) => flat.slice(j * cols, (j + 1) * cols)), divisor, eighths / 8);
      const expected = Array.from(new Uint32Array(float32DirectSums(channelImage(p, 'luma'), k, border).buffer));
      withGreyInput(p, (input, workspace) => {
        expect(bitsOf(correlateDirect(input, k, border, workspace.take(w, h)))).toEqual(expected);
      });
    }),
    RUNS,
  );
});

test('Gaussians, rank-1 kernels and the Gaussian-and-gradient sweep from an 8-bit grey photo\'s input image (its 8-bit copy, on the SIMD engine): the same bits as from its float32 samples', () => {
  const step = fc.constantFrom<(input: Image, out: Image, border: BorderMode) => Image>(
    (input, out, border) => gaussianBlur(input, 0.6, border, out),
    (input, out, border) => gaussianBlur(input, 1, border, out),
    // 19 taps: past BYTES_COLUMN_TAPS, read from the float32 samples.
    (input, out, border) => gaussianBlur(input, 3, border, out),
    (input, out, border) => correlate(input, kernelFromMatrix([[1, 2, 1], [2, 4, 2], [1, 2, 1]], 16, 3), border, out),
    (input, out, border) => gaussianGradient(input, 1, 'sobel', 'magnitude', border, out),
    (input, out, border) => gaussianGradient(input, 0.8, 'scharr', 'y', border, out),
  );
  const size = fc.oneof(imageSize, fc.tuple(fc.integer({ min: 1, max: 40 }), fc.integer({ min: 41, max: 90 })));
  fc.assert(
    fc.property(size, seed, borderMode, step, ([w, h], s, border, run) => {
      const p = photo(w, h, s);
      withGreyInput(p, (input, workspace) => {
        const fromCopy = bitsOf(run(input, workspace.take(w, h), border));
        expect(fromCopy).toEqual(bitsOf(run(channelImage(p, 'luma'), createImage(w, h), border)));
      });
    }),
    RUNS,
  );
});

test('an input image\'s 8-bit copy: read instead of the float32 samples while it stands; dropped when the samples are handed out, overwritten or given back', () => {
  const [w, h] = [45, 13];
  const p = photo(w, h, 11);
  const plainLaplacian = (image: Image) => bitsOf(onEngine('plain', () => laplacian(image, 4, 'reflect')));
  onEngine('simd', () => {
    const workspace = new ImageWorkspace();
    const input = inputChannel(p, 'luma', workspace.take(w, h));
    if (!isResident(input)) throw new Error('the SIMD engine\'s workspace image is resident');
    // Other float32 samples written behind the image's back (not through `data`): the kernel reads the bytes.
    input.heap.f32(input.address, w * h).fill(7);
    expect(bitsOf(laplacian(input, 4, 'reflect', workspace.take(w, h)))).toEqual(plainLaplacian(channelImage(p, 'luma')));
    // Whoever holds `data` may write it: handing it out drops the copy, and the samples are read again.
    expect(input.data[0]).toBe(7);
    expect(input.eightBit).toBe(0);
    expect(bitsOf(laplacian(input, 4, 'reflect', workspace.take(w, h)))).toEqual(plainLaplacian(createImage(w, h, new Float32Array(w * h).fill(7))));
    // Overwritten by a step: dropped. Given back: dropped, and its block returned to the heap.
    inputChannel(p, 'luma', input);
    expect(input.eightBit).not.toBe(0);
    boxFilter(createImage(w, h, new Float32Array(w * h).fill(3)), 3, 'reflect', input);
    expect(input.eightBit).toBe(0);
    inputChannel(p, 'luma', input);
    const copy = input.eightBit;
    workspace.give(input);
    expect(input.heap.inUse(copy)).toBe(false);
    workspace.dispose();
  });
});

test('direct correlation at the edge of 16-bit sums: a lone weight of ±1 (any sample up to 32767 could add in 16 bits) on samples around 32767, beyond 2²² and infinite: the float32 sums bit for bit', () => {
  // Values a 16-bit conversion saturates (32768 and up), the largest it keeps, and values that
  // rounding by 1.5·2²³ does not keep: each row that holds one must go through float32.
  const specials = [32766, 32767, 32768, 32769, 40000, 65535, -32767, -32768, -32769, 2 ** 22 + 2, 2 ** 23, 2 ** 24, -(2 ** 24), Infinity, -Infinity];
  const w = 70;
  const h = 6;
  for (const weight of [1, -1]) {
    for (const special of specials) {
      const image = createImage(w, h);
      for (let i = 0; i < w * h; i++) image.data[i] = (i * 37) % 200;
      // One special value in row 2 at a column of the 32-pixel loop, one in row 4 in the 8-pixel loop.
      image.data[2 * w + 17] = special;
      image.data[4 * w + 66] = special;
      const k = kernelFromMatrix([
        [0, 0, 0, 0, 0],
        [0, 0, 0, 0, 0],
        [0, 0, weight, 0, 0],
        [0, 0, 0, 0, 0],
        [0, 0, 0, 0, 0],
      ]);
      const simd = onEngine('simd', () => correlateDirect(image, k, 'reflect'));
      expect(bitsOf(simd)).toEqual(Array.from(new Uint32Array(float32DirectSums(image, k, 'reflect').buffer)));
    }
  }
});

test('Otsu: the same bin, threshold and mask bits on 8-bit, 16-bit, float and awkward images, with and without a known range and packed bits', () => {
  fc.assert(
    fc.property(imageSize, anyKind, seed, fc.boolean(), fc.boolean(), ([w, h], kind, s, invert, knownRange) => {
      const image = sampleImage(w, h, kind, s);
      const run = () => {
        const range = knownRange ? { min: Math.min(...image.data.filter((v) => !Number.isNaN(v))), max: Math.max(...image.data.filter((v) => !Number.isNaN(v))) } : undefined;
        const packed = createPackedMask(w, h);
        const result = thresholdOtsu(image, invert, undefined, range, packed);
        return { result, words: Array.from(packed.words) };
      };
      const { plain, simd } = onBoth(run);
      expect(simd.result.bin).toBe(plain.result.bin);
      expect(simd.result.threshold).toBe(plain.result.threshold);
      expect(bitsOf(simd.result.mask)).toEqual(bitsOf(plain.result.mask));
      expect(simd.words).toEqual(plain.words);
    }),
    RUNS,
  );
});

test('Otsu on large images, which the SIMD engine counts in pairs (from 2¹⁶ pixels): the same counts, bin and mask bits', () => {
  // The reference is the plain engine's histogram, whose bins otsu-histogram.test.ts holds to the rule
  // format's binning (DESIGN.md, "threshold"). Skewed values with repeats and NaN, like a gradient
  // magnitude: equal neighbours in most pairs.
  const skewed = (w: number, h: number, s: number): Image => {
    const rand = seededRandom(s);
    return imageFromSamples(w, h, Array.from({ length: w * h }, () => (rand() < 0.01 ? NaN : Math.floor(rand() ** 4 * 300) / 7)));
  };
  const cases: [number, number, () => Image][] = [
    // Most groups of sixteen below bin 16 (counted as quads), the others with a value above.
    [1451, 1447, () => lowBins(1451, 1447, 17)],
    // 2 099 601 pixels: one past the last group of sixteen.
    [1449, 1449, () => skewed(1449, 1449, 11)],
    [2048, 1024, () => sampleImage(2048, 1024, 'signed float', 12)],
    [1453, 1445, () => sampleImage(1453, 1445, '8-bit', 14)],
    // Either side of 2¹⁶ pixels: 65 535 counted singly, 65 792 in pairs.
    [257, 255, () => skewed(257, 255, 15)],
    [257, 256, () => skewed(257, 256, 16)],
  ];
  cases.forEach(([w, h, make], i) => {
    const image = make();
    const invert = i % 2 === 1;
    const { plain, simd } = onBoth(() => {
      const packed = createPackedMask(w, h);
      const result = thresholdOtsu(image, invert, undefined, undefined, packed, false);
      return { bin: result.bin, threshold: result.threshold, words: Array.from(packed.words) };
    });
    expect(simd.bin).toBe(plain.bin);
    expect(simd.threshold).toBe(plain.threshold);
    expect(simd.words).toEqual(plain.words);
    const hist = onEngine('plain', () => otsuHistogram(image.data));
    const simdCounts = onEngine('simd', () => simdKernels()!.histogram(image, hist.origin, hist.binsPerUnit).counts);
    expect(Array.from(simdCounts)).toEqual(Array.from(hist.counts));
  });
});

test('Otsu\'s histogram counted in pairs of neighbours (as from 2¹⁶ pixels), on small images of any kind: the plain engine\'s counts', () => {
  fc.assert(
    fc.property(imageSize, anyKind, seed, ([w, h], kind, s) => {
      const image = sampleImage(w, h, kind, s);
      const hist = onEngine('plain', () => otsuHistogram(image.data));
      fc.pre(!hist.flat);
      const paired = onEngine('simd', () => simdKernels()!.histogram(image, hist.origin, hist.binsPerUnit, false, true));
      expect(Array.from(paired.counts)).toEqual(Array.from(hist.counts));
    }),
    RUNS,
  );
});

test('Otsu\'s histogram counted in quads (groups of sixteen whose bins are all below 16, as most of a gradient magnitude\'s): the plain engine\'s counts', () => {
  // The SIMD kernel counts such a group as four quads of 4-bit bins and any other group in pairs.
  // The references: the plain engine's histogram, one pixel at a time (otsu-histogram.test.ts holds
  // its bins to the rule format's binning, DESIGN.md "threshold"), and that binning written out here
  // for the stored bins.
  fc.assert(
    fc.property(imageSize, seed, fc.constantFrom(0, 0.002, 0.05), fc.boolean(), ([w, h], s, highShare, keepBins) => {
      const image = lowBins(w, h, s, highShare);
      const hist = onEngine('plain', () => otsuHistogram(image.data));
      fc.pre(!hist.flat);
      const simd = simdKernels()!;
      const paired = onEngine('simd', () => simd.histogram(image, hist.origin, hist.binsPerUnit, keepBins, true));
      expect(Array.from(paired.counts)).toEqual(Array.from(hist.counts));
      if (keepBins) {
        const bins = Array.from(new Uint8Array(simd.heap.memory.buffer, paired.bins!, image.data.length));
        simd.releaseBlock(paired.bins!);
        const expected = Array.from(image.data, (v) => (Number.isNaN(v) ? 0 : Math.min(255, Math.trunc((v - hist.origin) * hist.binsPerUnit))));
        expect(bins).toEqual(expected);
      }
    }),
    RUNS,
  );
});

/**
 * Samples from 0 to 300 (both present) whose bins (300/256 wide) are mostly below 16: values in
 * bins 0–15, at the edges of bins 15 and 16 and either side of them, and a share `highShare` of
 * values anywhere up to 300 and NaN.
 */
function lowBins(w: number, h: number, s: number, highShare = 0.004): Image {
  const rand = seededRandom(s);
  const unit = 300 / 256;
  const edge16 = 16 * unit;
  const near = [edge16, float32Above(edge16), -float32Above(-edge16), 15 * unit, 0];
  const values = Array.from({ length: w * h }, () => {
    const r = rand();
    if (r < highShare / 4) return NaN;
    if (r < highShare) return rand() * 300;
    if (r < highShare + 0.01) return near[Math.floor(rand() * near.length)];
    return Math.fround(rand() * 16 * unit);
  });
  values[0] = 0;
  values[values.length - 1] = 300;
  return imageFromSamples(w, h, values);
}

/**
 * Values at every bin edge of a range: for k = 1 … 255 the first float32 whose double-precision bin
 * is k (firstFloat32Where, the plain engine's own search for its cut) and its two neighbours, with the
 * range's ends, NaN and values between, shuffled.
 */
function binEdgeImage(min: number, max: number, s: number): { image: Image; origin: number; scale: number } {
  const scale = 256 / (max - min);
  const bin = (v: number) => Math.min(255, Math.trunc((v - min) * scale));
  const values: number[] = [min, max, NaN];
  for (let k = 1; k < 256; k++) {
    const edge = firstFloat32Where(min, max, (v) => bin(v) >= k);
    values.push(edge, float32Above(edge), -float32Above(-edge));
  }
  const rand = seededRandom(s);
  while (values.length % 16 !== 5) values.push(Math.fround(min + rand() * (max - min)));
  for (let i = values.length - 1; i > 0; i--) {
    const j = Math.floor(rand() * (i + 1));
    [values[i], values[j]] = [values[j], values[i]];
  }
  const clamped = values.map((v) => (Number.isNaN(v) ? v : Math.min(max, Math.max(min, v))));
  return { image: imageFromSamples(clamped.length, 1, clamped), origin: min, scale };
}

test('Otsu\'s histogram at every bin edge (the SIMD kernel bins in float32 and checks the values near a whole bin): the double-precision bins, for ranges of every kind', () => {
  // The reference is the rule format's bin min(255, trunc((v − min)·256 / (max − min))) in double
  // precision (DESIGN.md, "threshold"), as the plain engine computes it. The ranges take the float32
  // product's cases: origin 0 or not, a power-of-two scale (exact), tiny and huge ranges, and ranges
  // whose difference or scale is no float32 number (double precision throughout).
  const ranges: [number, number][] = [
    [0, Math.fround(356.0207824707031)], [0, 256], [0, 255], [0, 1], [Math.fround(0.25), 100], [-3, 4], [1000, 1001],
    [Math.fround(1e-30), Math.fround(3e-30)], [0, Math.fround(1e-36)], [-3e38, 3e38], [0, 2 ** -140], [-(2 ** 100), 2 ** 100],
  ];
  const simd = onEngine('simd', () => simdKernels()!);
  ranges.forEach(([min, max], i) => {
    const { image, origin, scale } = binEdgeImage(min, max, 40 + i);
    const expected = Array.from(image.data, (v) => (Number.isNaN(v) ? 0 : Math.min(255, Math.trunc((v - origin) * scale)) + 0));
    const counts = new Array<number>(256).fill(0);
    expected.forEach((b) => counts[b]++);
    for (const pairs of [true, false]) {
      const counted = onEngine('simd', () => simd.histogram(image, origin, scale, true, pairs));
      const bins = Array.from(new Uint8Array(simd.heap.memory.buffer, counted.bins!, image.data.length));
      simd.releaseBlock(counted.bins!);
      expect({ range: [min, max], pairs, bins }).toEqual({ range: [min, max], pairs, bins: expected });
      expect(Array.from(counted.counts)).toEqual(counts);
    }
  });
});

test('Otsu on a gradient magnitude handed its range by the gradient (the rule runner does this): same mask on both engines', () => {
  fc.assert(
    fc.property(imageSize, fc.constantFrom<SampleKind>('8-bit', '16-bit'), seed, ([w, h], kind, s) => {
      const magnitude = onEngine('plain', () => gradient(sampleImage(w, h, kind, s), 'sobel', 'magnitude', 'reflect'));
      const { plain, simd } = onBoth(() => {
        const range = { min: Math.min(...magnitude.data), max: Math.max(...magnitude.data) };
        return thresholdOtsu(magnitude, false, undefined, range);
      });
      expect(simd.bin).toBe(plain.bin);
      expect(bitsOf(simd.mask)).toEqual(bitsOf(plain.mask));
    }),
    RUNS,
  );
});

test('morphology on any values (minimum and maximum, NaN and −0 included): identical bits', () => {
  fc.assert(
    fc.property(imageSize, anyKind, seed, morphologyOp, fc.integer({ min: 1, max: 4 }), borderMode, ([w, h], kind, s, op, radius, border) => {
      const image = sampleImage(w, h, kind, s);
      const { plain, simd } = onBoth(() => valueMorphology(image, op, radius, border));
      expect(bitsOf(simd)).toEqual(bitsOf(plain));
    }),
    RUNS,
  );
});

test('morphology on any values from an 8-bit grey photo\'s input image (minima and maxima of its bytes, sixteen to an instruction): the plain engine\'s bits; the output keeps its own 8-bit copy and a scratch pass\'s samples come when read', () => {
  const size = fc.oneof(imageSize, fc.tuple(fc.integer({ min: 30, max: 90 }), fc.integer({ min: 1, max: 40 })));
  fc.assert(
    fc.property(size, seed, morphologyOp, fc.integer({ min: 1, max: 6 }), borderMode, ([w, h], s, op, radius, border) => {
      const p = photo(w, h, s);
      const expected = bitsOf(onEngine('plain', () => valueMorphology(channelImage(p, 'luma'), op, radius, border)));
      const firstPass = bitsOf(onEngine('plain', () => valueMorphology(channelImage(p, 'luma'), op === 'close' ? 'dilate' : 'erode', radius, border)));
      withGreyInput(p, (input, workspace) => {
        const out = valueMorphology(input, op, radius, border, workspace.take(w, h), workspace.take(w, h));
        if (!isResident(out)) throw new Error('the output is the workspace image given');
        const copy = out.eightBit;
        expect(copy).not.toBe(0);
        expect(Array.from(out.heap.f32(out.address, w * h))).toEqual(Array.from(new Uint8Array(out.heap.memory.buffer, copy, w * h)));
        expect(bitsOf(out)).toEqual(expected);
        // A first pass into a scratch: its float32 samples are written when something reads them.
        const scratch = simdKernels()!.extreme(input, radius, border, op === 'close', workspace.take(w, h), true);
        expect(bitsOf(scratch)).toEqual(firstPass);
      });
    }),
    RUNS,
  );
});

test('morphology on masks (packed bits, radius 1 to 31, or handed over by Otsu): identical bits', () => {
  fc.assert(
    fc.property(imageSize, seed, morphologyOp, fc.oneof(fc.integer({ min: 1, max: 3 }), fc.integer({ min: 4, max: 31 })), borderMode, fc.boolean(), ([w, h], s, op, radius, border, handed) => {
      const mask = sampleImage(w, h, 'mask', s);
      const { plain, simd } = onBoth(() => {
        if (!handed) return morphology(mask, op, radius, border);
        const packed = createPackedMask(w, h);
        const otsu = thresholdOtsu(sampleImage(w, h, '8-bit', s), false, undefined, undefined, packed).mask;
        return morphology(otsu, op, radius, border, undefined, undefined, packed);
      });
      expect(bitsOf(simd)).toEqual(bitsOf(plain));
    }),
    RUNS,
  );
});

test('Otsu writing packed bits only (the rule runner when the next step alone reads the mask): the same bits, the mask image untouched, the same opening', () => {
  fc.assert(
    // 'awkward' holds NaN, ±0 and the extremes; the SIMD engine compares each pixel's bin kept as a byte (the maximum's bin 256 as 255).
    fc.property(imageSize, fc.constantFrom<SampleKind>('8-bit', '16-bit', 'signed float', 'awkward'), seed, fc.boolean(), borderMode, ([w, h], kind, s, invert, border) => {
      const image = sampleImage(w, h, kind, s);
      const { plain, simd } = onBoth(() => {
        const both = createPackedMask(w, h);
        const mask = thresholdOtsu(image, invert, undefined, undefined, both).mask;
        const only = createPackedMask(w, h);
        const untouched = sampleImage(w, h, 'awkward', s);
        const before = bitsOf(untouched);
        thresholdOtsu(image, invert, untouched, undefined, only, false);
        const opened = morphology(untouched, 'open', 1, border, undefined, undefined, only);
        return { same: Array.from(only.words).join() === Array.from(both.words).join(), kept: bitsOf(untouched).join() === before.join(), opened: bitsOf(opened), expected: bitsOf(morphology(mask, 'open', 1, border)) };
      });
      for (const r of [plain, simd]) {
        expect(r.same).toBe(true);
        expect(r.kept).toBe(true);
        expect(r.opened).toEqual(r.expected);
      }
      expect(simd.opened).toEqual(plain.opened);
    }),
    RUNS,
  );
});

test('blobs (SIMD pre-pass and run labelling against the pixel scan): the same labels, areas and boxes, in the whole image and in regions', () => {
  const region = fc.oneof(
    fc.constant(undefined),
    fc.record({ shape: fc.constant('rect' as const), x: fc.double({ min: 0, max: 0.6, noNaN: true }), y: fc.double({ min: 0, max: 0.6, noNaN: true }), w: fc.double({ min: 0.05, max: 0.6, noNaN: true }), h: fc.double({ min: 0.05, max: 0.6, noNaN: true }) }),
    fc.record({ shape: fc.constant('circle' as const), cx: fc.double({ min: 0, max: 1, noNaN: true }), cy: fc.double({ min: 0, max: 1, noNaN: true }), r: fc.double({ min: 0.05, max: 0.7, noNaN: true }) }),
  );
  fc.assert(
    fc.property(imageSize, fc.constantFrom<SampleKind>('mask', 'awkward', '8-bit'), seed, region, ([w, h], kind, s, shape) => {
      const image = sampleImage(w, h, kind, s);
      const spans = regionSpans(w, h, shape);
      const { plain, simd } = onBoth(() => labelBlobs(image, spans));
      expect(simd.blobs).toEqual(plain.blobs);
      expect(Array.from(simd.labels)).toEqual(Array.from(plain.labels));
    }),
    RUNS,
  );
});

test('edge fraction (SIMD count of non-zero pixels in the region): the same share', () => {
  fc.assert(
    fc.property(imageSize, fc.constantFrom<SampleKind>('mask', 'awkward'), seed, fc.double({ min: 0.05, max: 0.7, noNaN: true }), ([w, h], kind, s, r) => {
      const image = sampleImage(w, h, kind, s);
      const spans = regionSpans(w, h, { shape: 'circle', cx: 0.4, cy: 0.6, r });
      const { plain, simd } = onBoth(() => [measurePixels(image, 'edge-fraction', spans), measurePixels(image, 'edge-fraction', regionSpans(w, h))]);
      expect(simd).toEqual(plain);
    }),
    RUNS,
  );
});

test('blobs of long runs across word boundaries and of a full image: the same on both engines', () => {
  const rand = seededRandom(99);
  const w = 131;
  const h = 37;
  // Rows of long runs with a few gaps, so that runs cross the 32-pixel words of the pre-pass.
  const image = sampleImage(w, h, 'mask', 5);
  for (let p = 0; p < w * h; p++) image.data[p] = rand() < 0.93 ? 1 : 0;
  const full = sampleImage(w, h, 'mask', 6);
  full.data.fill(1);
  for (const input of [image, full]) {
    const { plain, simd } = onBoth(() => labelBlobs(input));
    expect(simd.blobs).toEqual(plain.blobs);
    expect(Array.from(simd.labels)).toEqual(Array.from(plain.labels));
  }
});

function photo(w: number, h: number, s: number): RawPhoto {
  const rand = seededRandom(s);
  const samples = new Uint8Array(w * h);
  for (let p = 0; p < w * h; p++) samples[p] = (p % w) * 3 > w && rand() < 0.6 ? 200 + Math.floor(rand() * 40) : Math.floor(rand() * 90);
  return { width: w, height: h, channels: 1, bitDepth: 8, samples };
}

test('a rule run on a decision path (threshold, opening, closing, blob gauges) gives identical outputs, measurements and verdict', () => {
  const rule = {
    format: 'kernwright-rule/1',
    name: 'Bright specks',
    border: 'constant',
    steps: [
      { op: 'threshold', method: 'otsu' },
      { op: 'open', radius: 1 },
      { op: 'close', radius: 2 },
      { op: 'dilate', radius: 1 },
    ],
    gauges: [
      { name: 'count', measure: 'blob-count', limits: { max: 40 } },
      { name: 'largest', measure: 'largest-blob-area', region: { shape: 'circle', cx: 0.5, cy: 0.5, r: 0.4 }, limits: { max: 900 } },
      { name: 'length', measure: 'largest-blob-length', limits: { max: 30 } },
      { name: 'share', measure: 'edge-fraction', step: 2, limits: { max: 0.5 } },
    ],
  };
  fc.assert(
    fc.property(imageSize, seed, ([w, h], s) => {
      const { plain, simd } = onBoth(() => runRule(rule, photo(w, h, s), { retain: 'all' }));
      expect(simd.verdict).toBe(plain.verdict);
      expect(simd.measurements).toEqual(plain.measurements);
      simd.steps.forEach((step, i) => expect(bitsOf(step.output!)).toEqual(bitsOf(plain.steps[i].output!)));
    }),
    { numRuns: 60 },
  );
});

/** The test photo in one channel, or in colour: the grey samples in the first channel, shifted copies in the others. */
function photoIn(w: number, h: number, s: number, channels: 1 | 3 | 4): RawPhoto {
  const grey = photo(w, h, s);
  if (channels === 1) return grey;
  return { ...grey, channels, samples: Uint8Array.from({ length: w * h * channels }, (_, i) => (grey.samples[Math.floor(i / channels)] + 37 * (i % channels)) & 255) };
}

/** A run straight from the photo (rules kept as `gauged`) against the run through the float32 input (every image kept): the same bits for the outputs of `steps`. */
function expectSameAsThroughInput(rule: Record<string, unknown>, p: RawPhoto, steps: number[]): void {
  onEngine('simd', () => {
    const workspace = new ImageWorkspace();
    const through = runRule(rule, p, { retain: 'all' });
    const direct = runRule(rule, p, { retain: 'gauged', workspace });
    for (const i of steps) expect(bitsOf(direct.steps[i].output!)).toEqual(bitsOf(through.steps[i].output!));
    expect(direct.quality).toEqual(through.quality);
    expect(direct.measurements).toEqual(through.measurements);
    expect(direct.verdict).toBe(through.verdict);
    // Read now, the input is filled: channelImage's samples.
    expect(bitsOf(direct.input)).toEqual(bitsOf(onEngine('plain', () => channelImage(p, 'luma'))));
    releaseRun(direct, workspace);
  });
}

test('a rule opening with a Gaussian and a gradient, run straight from an 8-bit grey or colour photo: the same gradient, quality, measurements and verdict as the run through the float32 input, and the input filled when read', () => {
  const operator = fc.constantFrom('sobel', 'scharr', 'prewitt');
  const output = fc.constantFrom('x', 'y', 'magnitude');
  const sigma = fc.constantFrom(0.5, 1, 1.4, 2.5);
  const border = fc.constantFrom('reflect', 'replicate', 'constant');
  // Tall images pass the sweep's ring of source rows many times over.
  const size = fc.oneof(imageSize, fc.tuple(fc.integer({ min: 1, max: 40 }), fc.integer({ min: 41, max: 90 })));
  fc.assert(
    fc.property(size, seed, operator, output, sigma, border, fc.constantFrom<1 | 3 | 4>(1, 3, 4), ([w, h], s, op, out, sg, b, channels) => {
      const rule = {
        format: 'kernwright-rule/1',
        name: 'Gradient first',
        border: b,
        steps: [{ op: 'gaussian', sigma: sg }, { op: 'gradient', operator: op, output: out }, { op: 'threshold', method: 'otsu' }, { op: 'open', radius: 1 }],
        gauges: [
          { name: 'mean gradient', measure: 'mean', step: 2, limits: { max: 1e6 } },
          { name: 'edges', measure: 'edge-fraction', limits: { max: 0.5 } },
        ],
      };
      expectSameAsThroughInput(rule, photoIn(w, h, s, channels), [1, 3]);
    }),
    { numRuns: 80 },
  );
});

test('a rule opening with a separable step (a Gaussian, a rank-1 kernel with divisor and offset) or a step that reads an 8-bit copy (a Laplacian, a sharpening kernel, a median), run straight from an 8-bit photo: the same outputs, quality, measurements and verdict as through the float32 input', () => {
  const opening = fc.constantFrom<Record<string, unknown>>(
    { op: 'gaussian', sigma: 0.8 },
    { op: 'gaussian', sigma: 2.2 },
    { op: 'kernel', matrix: [[1, 2, 1], [2, 4, 2], [1, 2, 1]], divisor: 16, offset: 3 },
    { op: 'kernel', matrix: [[1, 4, 6, 4, 1], [2, 8, 12, 8, 2], [1, 4, 6, 4, 1]], divisor: 64 },
    // Not separable: a grey photo's input waits for its samples, the kernel reads its bytes.
    { op: 'kernel', matrix: [[0, -1, 0], [-1, 5, -1], [0, -1, 0]] },
    { op: 'laplacian', neighbours: 4 },
    { op: 'laplacian', neighbours: 8 },
    // A median of bytes: the same.
    { op: 'median', size: 3 },
    { op: 'median', size: 5 },
    // Past the bytes' bound (‖k‖₁ 150 > 128): the input converted as before.
    { op: 'kernel', matrix: [[10, -20, 10], [-20, 30, -20], [10, -20, 10]], divisor: 30 },
  );
  const border = fc.constantFrom('reflect', 'replicate', 'constant');
  const size = fc.oneof(imageSize, fc.tuple(fc.integer({ min: 1, max: 40 }), fc.integer({ min: 41, max: 90 })));
  fc.assert(
    fc.property(size, seed, opening, border, fc.constantFrom<1 | 3 | 4>(1, 3, 4), ([w, h], s, first, b, channels) => {
      const rule = {
        format: 'kernwright-rule/1',
        name: 'Separable first',
        border: b,
        steps: [first, { op: 'threshold', method: 'otsu' }, { op: 'open', radius: 1 }],
        gauges: [
          { name: 'mean smoothed', measure: 'mean', step: 1, limits: { max: 1e6 } },
          { name: 'edges', measure: 'edge-fraction', limits: { max: 0.5 } },
        ],
      };
      expectSameAsThroughInput(rule, photoIn(w, h, s, channels), [0, 2]);
    }),
    { numRuns: 80 },
  );
});
