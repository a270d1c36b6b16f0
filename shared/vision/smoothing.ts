// Smoothing filters: Gaussian (separable) and box (sliding-window sums, constant time per pixel).
import { borderTable, fillRowBorder, OUTSIDE, rowOffsetTable, type BorderMode } from './border';
import { correlateSeparable } from './convolve';
import { simdKernels } from './engine';
import { imageLike, type Image } from './image';
import { DeferrableImage } from './deferrable-image';
import { boxBitsLoop, boxSlidUpTo, boxWindowLoop, type BoxBitsLoop } from './kernel-loops';
import { gaussianWeights } from './kernels';

/** Gaussian blur, radius ceil(3σ), weights normalised to sum 1, two 1-D passes. */
export function gaussianBlur(src: Image, sigma: number, border: BorderMode, out?: Image): Image {
  const w = gaussianWeights(sigma);
  return correlateSeparable(src, w, w, border, out);
}

/**
 * Mean of the size × size neighbourhood (divisor always size², border pixels included).
 * Running column sums move down one row at a time; running row sums move across, two of them
 * (even and odd columns) so that each addition waits only on the one two pixels back. The SIMD
 * engine (wasm/assembly/box.ts) does the same double-precision operations in the same order.
 */
export function boxFilter(src: Image, size: number, border: BorderMode, out?: Image): Image {
  const simd = simdKernels();
  if (simd) return simd.box(src, size, border, out);
  return boxPass(src, size, border, imageLike(src, out), null);
}

/** What the adaptive-mean threshold compares each pixel with: mask = flip ^ (in > mean − c). */
export interface MeanComparison {
  readonly c: number;
  readonly flip: 0 | 1;
}

/**
 * mask = in > (mean of the size × size neighbourhood) − c, straight from the box filter's running
 * sums: the mean (rounded to float32, as the box filter stores it) never goes through memory.
 * Into a plain workspace image the mask goes as packed bits, its samples deferred until read
 * (deferrable-image.ts), as the packed-bit morphology leaves its masks: the opening, the blobs and
 * the gauges read the bits (5 MP, one CPU: adaptive mean 15 3.5–3.95 → 2.8–3.05 ns/px).
 */
export function boxMeanThreshold(src: Image, size: number, border: BorderMode, comparison: MeanComparison, out?: Image): Image {
  const simd = simdKernels();
  if (simd) return simd.box(src, size, border, out, comparison);
  const dst = imageLike(src, out === src ? undefined : out);
  if (dst instanceof DeferrableImage) {
    const bits = boxBitsLoop(size, false);
    const slidingBits = boxBitsLoop(size, true);
    if (bits && slidingBits) {
      const mask = dst.ownPackedMask();
      boxPass(src, size, border, dst, comparison, { bits, sliding: slidingBits, words: mask.words, wordsPerRow: mask.wordsPerRow });
      dst.defer(mask);
      return dst;
    }
  }
  return boxPass(src, size, border, dst, comparison);
}

/** The adaptive mean's rows written as packed bits (boxBitsLoop) instead of float32 samples. */
interface BitsOutput {
  readonly bits: BoxBitsLoop;
  readonly sliding: BoxBitsLoop;
  readonly words: Int32Array;
  readonly wordsPerRow: number;
}

function boxPass(src: Image, size: number, border: BorderMode, dst: Image, comparison: MeanComparison | null, packed?: BitsOutput): Image {
  const { width: w, height: h, data } = src;
  const r = (size - 1) >> 1;
  const o = dst.data;
  const rowOffsets = rowOffsetTable(h, w, r, r + 1, border);
  const colTable = borderTable(w, r, r, border);
  // Three spare zeros at the end: the running sums read up to three entries past the last window.
  const sums = new Float64Array(w + 2 * r + 3);
  const scale = 1 / (size * size);
  // The float loops only where the rows go to float32 samples (each is compiled on first use).
  const generated = packed ? null : boxWindowLoop(size, comparison !== null);
  const sliding = packed ? null : boxWindowLoop(size, comparison !== null, true);
  const slidUpTo = boxSlidUpTo(w, packed !== undefined);
  // Column sums for output row 0: rows −r … r.
  for (let t = 0; t < size; t++) {
    const off = rowOffsets[t];
    if (off === OUTSIDE) continue;
    for (let x = 0; x < w; x++) sums[r + x] += data[off + x];
  }
  const c = comparison?.c ?? 0;
  const flip = comparison?.flip ?? 0;
  for (let y = 0; y < h; y++) {
    fillRowBorder(sums, w, r, colTable);
    const add = y + 1 < h ? rowOffsets[y + size] : OUTSIDE;
    const drop = y + 1 < h ? rowOffsets[y] : OUTSIDE;
    // The window loop moves the column sums it loads down for the next row (add row y+r+1, drop
    // row y−r) where the entries before column 0 read samples of the rows before (add, drop ≥ r):
    // each sum is loaded once per row instead of twice (5 MP, one CPU: box 5 3.35 → 2.6 ns/px,
    // adaptive mean 15 4.3 → 3.8).
    if ((packed || sliding) && add !== OUTSIDE && drop !== OUTSIDE && add >= r && drop >= r) {
      if (packed) packed.sliding(sums, w, scale, packed.words, y * packed.wordsPerRow, y * w, data, c, flip, data, add - r, drop - r);
      else if (sliding) sliding(sums, w, scale, o, y * w, data, c, flip, data, add - r, drop - r);
      const from = Math.max(slidUpTo, r);
      slideColumns(sums, from, data, add + from - r, drop + from - r, w + r - from);
      continue;
    }
    if (packed) packed.bits(sums, w, scale, packed.words, y * packed.wordsPerRow, y * w, data, c, flip, data, 0, 0);
    else if (generated) generated(sums, w, scale, o, y * w, data, c, flip, data, 0, 0);
    else if (comparison) windowMask(sums, size, w, scale, data, c, flip, o, y * w);
    else windowMeans(sums, size, w, scale, o, y * w);
    if (y + 1 === h) break;
    // Slide the column sums down: add row y+r+1, drop row y−r (slideColumns; four windows per
    // iteration in the row sums gained nothing).
    if (add !== OUTSIDE && drop !== OUTSIDE) {
      slideColumns(sums, r, data, add, drop, w);
    } else if (add !== OUTSIDE) {
      for (let x = 0; x < w; x++) sums[r + x] += data[add + x];
    } else if (drop !== OUTSIDE) {
      for (let x = 0; x < w; x++) sums[r + x] -= data[drop + x];
    }
  }
  return dst;
}

/**
 * sums[r + x] += data[add + x] − data[drop + x], eight columns per iteration, in a function of its own
 * (not inside boxPass's long loop, which V8 compiles on-stack): box 5 at 5 MP 3.1 → 2.9 ns/px, four
 * columns per iteration inline before (2.70 → 2.45 against one, on another day).
 */
function slideColumns(sums: Float64Array, r: number, data: Float32Array, add: number, drop: number, w: number): void {
  let x = 0;
  for (; x + 7 < w; x += 8) {
    const q = r + x, p = add + x, d = drop + x;
    sums[q] += data[p] - data[d];
    sums[q + 1] += data[p + 1] - data[d + 1];
    sums[q + 2] += data[p + 2] - data[d + 2];
    sums[q + 3] += data[p + 3] - data[d + 3];
    sums[q + 4] += data[p + 4] - data[d + 4];
    sums[q + 5] += data[p + 5] - data[d + 5];
    sums[q + 6] += data[p + 6] - data[d + 6];
    sums[q + 7] += data[p + 7] - data[d + 7];
  }
  for (; x < w; x++) sums[r + x] += data[add + x] - data[drop + x];
}

/** o[base + x] = scale · Σ_{i<size} sums[x + i] for x = 0 … w−1, as two interleaved running sums. */
function windowMeans(sums: Float64Array, size: number, w: number, scale: number, o: Float32Array, base: number): void {
  let even = 0;
  for (let i = 0; i < size; i++) even += sums[i];
  let odd = even + sums[size] - sums[0];
  // The four sums entering and leaving each pair of windows rotate through locals: each entry is read twice, not four times.
  let a0 = sums[0], a1 = sums[1], b0 = sums[size], b1 = sums[size + 1];
  let x = 0;
  for (; x + 1 < w; x += 2) {
    o[base + x] = even * scale;
    o[base + x + 1] = odd * scale;
    const a2 = sums[x + 2];
    const b2 = sums[x + size + 2];
    even += b0 + b1 - (a0 + a1);
    odd += b1 + b2 - (a1 + a2);
    a0 = a2;
    a1 = sums[x + 3];
    b0 = b2;
    b1 = sums[x + size + 3];
  }
  if (x < w) o[base + x] = even * scale;
}

/** windowMeans, then o = flip ^ (in > mean − c) with the mean rounded to float32 (+(a > b) has no branch). */
function windowMask(sums: Float64Array, size: number, w: number, scale: number, s: Float32Array, c: number, flip: number, o: Float32Array, base: number): void {
  let even = 0;
  for (let i = 0; i < size; i++) even += sums[i];
  let odd = even + sums[size] - sums[0];
  let a0 = sums[0], a1 = sums[1], b0 = sums[size], b1 = sums[size + 1];
  let x = 0;
  for (; x + 1 < w; x += 2) {
    o[base + x] = flip ^ +(s[base + x] > Math.fround(even * scale) - c);
    o[base + x + 1] = flip ^ +(s[base + x + 1] > Math.fround(odd * scale) - c);
    const a2 = sums[x + 2];
    const b2 = sums[x + size + 2];
    even += b0 + b1 - (a0 + a1);
    odd += b1 + b2 - (a1 + a2);
    a0 = a2;
    a1 = sums[x + 3];
    b0 = b2;
    b1 = sums[x + size + 3];
  }
  if (x < w) o[base + x] = flip ^ +(s[base + x] > Math.fround(even * scale) - c);
}
