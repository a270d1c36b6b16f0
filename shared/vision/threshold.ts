// Thresholds: every method writes a mask, 1 where the pixel is above its threshold, else 0
// (inverted on request). Otsu and adaptive mean choose the threshold from the data.
import type { BorderMode } from './border';
import type { PackedMask } from './binary-morphology';
import { simdKernels } from './engine';
import { firstFloat32Where, float32Above } from './float32';
import { imageLike, type Image, type ValueRange } from './image';
import { boxMeanThreshold } from './smoothing';
import type { SimdKernels } from './wasm/simd-kernels';

export const HISTOGRAM_BINS = 256;

/** mask = in > value (or ≤ with invert). */
export function thresholdFixed(src: Image, value: number, invert = false, out?: Image): Image {
  const simd = simdKernels();
  // For float32 v: v > value ⇔ v ≥ the smallest float32 above value.
  if (simd) return simd.thresholdAt(src, float32Above(value), invert, out);
  const dst = imageLike(src, out);
  const s = src.data;
  const o = dst.data;
  // +(a > b) is computed without a branch; a ternary mispredicts on noisy pixels near the value.
  const flip = invert ? 1 : 0;
  for (let p = 0; p < s.length; p++) o[p] = flip ^ +(s[p] > value);
  return dst;
}

/** The histogram Otsu's method works on, and how a value maps to its bin. */
export interface OtsuHistogram {
  readonly counts: Float64Array;
  /** bin(v) = min(255, floor((v − origin) · binsPerUnit)). */
  readonly origin: number;
  readonly binsPerUnit: number;
  /** True when all values are the same (no threshold separates anything). */
  readonly flat: boolean;
  /** True for 8-bit data: the bins are the 256 integer levels. */
  readonly integerLevels: boolean;
  /** Smallest and largest value (NaN left out). */
  readonly min: number;
  readonly max: number;
}

/**
 * 256 integer levels when every value is an integer in 0–255 (8-bit data), otherwise 256 equal
 * bins over min…max (DESIGN.md, rule format v1).
 */
export function otsuHistogram(data: Float32Array, known?: ValueRange, keepBins?: Uint8Array): OtsuHistogram {
  const integral = allIntegers(data);
  const [min, max] = known && isKnown(known) ? [known.min, known.max] : valueRange(data);
  return binnedHistogram(data.length, integral && min >= 0 && max <= 255, min, max, (origin, scale) => {
    const counts = new Float64Array(HISTOGRAM_BINS);
    if (keepBins) countBinsKeeping(data, origin, scale, counts, keepBins);
    else countBins(data, origin, scale, counts);
    return counts;
  });
}

/**
 * otsuHistogram through the SIMD kernels: the same bins, counted four values at a time; with
 * keepBins, each pixel's bin also kept as a byte in the module's memory (`bins`, when counted).
 */
function otsuHistogramSimd(simd: SimdKernels, image: Image, known?: ValueRange, keepBins = false): OtsuHistogram & { bins?: number } {
  // Every value a whole number in 0–255 is the same test as whole numbers with min ≥ 0 and max ≤ 255.
  const eightBit = simd.eightBitLevels(image);
  const [min, max] = known && isKnown(known) ? [known.min, known.max] : simd.valueRange(image);
  let bins: number | undefined;
  const hist = binnedHistogram(image.width * image.height, eightBit, min, max, (origin, scale) => {
    const counted = simd.histogram(image, origin, scale, keepBins);
    bins = counted.bins;
    return counted.counts;
  });
  return bins === undefined ? hist : { ...hist, bins };
}

function binnedHistogram(n: number, eightBit: boolean, min: number, max: number, count: (origin: number, scale: number) => Float64Array): OtsuHistogram {
  const flat = !(max > min);
  const origin = eightBit ? 0 : min;
  const binsPerUnit = eightBit ? 1 : flat ? 0 : HISTOGRAM_BINS / (max - min);
  let counts: Float64Array;
  if (flat) {
    counts = new Float64Array(HISTOGRAM_BINS);
    counts[0] = n;
  } else {
    counts = count(origin, binsPerUnit);
  }
  return { counts, origin, binsPerUnit, flat, integerLevels: eightBit, min, max };
}

function isKnown(range: ValueRange): boolean {
  return !Number.isNaN(range.min) && !Number.isNaN(range.max);
}

/** True when every value is a whole number (checked only until the first fraction). */
function allIntegers(data: Float32Array): boolean {
  for (let p = 0; p < data.length; p++) {
    const v = data[p];
    if ((v | 0) !== v) return false;
  }
  return true;
}

/** [min, max] of the values, NaN ignored ([Infinity, −Infinity] when there is no number). */
function valueRange(data: Float32Array): [number, number] {
  // Math.min/max compile to branch-free min/max instructions; a NaN anywhere makes them NaN,
  // and then the slower loop that skips NaN decides.
  let min = Infinity;
  let max = -Infinity;
  for (let p = 0; p < data.length; p++) {
    const v = data[p];
    min = Math.min(min, v);
    max = Math.max(max, v);
  }
  if (min === min && max === max) return [min, max];
  min = Infinity;
  max = -Infinity;
  for (let p = 0; p < data.length; p++) {
    const v = data[p];
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return [min, max];
}

/** Stride of each partial histogram: bins 0…256 (a value at the maximum may land on 256 by rounding). */
const PARTIAL_STRIDE = HISTOGRAM_BINS + 1;

/**
 * counts[min(255, floor((v − origin)·scale))]++ for every v ≥ origin. Four partial histograms
 * filled in turn, so that runs of equal bins (smooth regions) do not wait on the same counter.
 */
function countBins(data: Float32Array, origin: number, scale: number, counts: Float64Array): void {
  const n = data.length;
  const partial = new Int32Array(4 * PARTIAL_STRIDE);
  const s1 = PARTIAL_STRIDE, s2 = 2 * PARTIAL_STRIDE, s3 = 3 * PARTIAL_STRIDE;
  let p = 0;
  // Values are ≥ origin, so truncation is the floor.
  for (; p + 3 < n; p += 4) {
    partial[((data[p] - origin) * scale) | 0]++;
    partial[s1 + (((data[p + 1] - origin) * scale) | 0)]++;
    partial[s2 + (((data[p + 2] - origin) * scale) | 0)]++;
    partial[s3 + (((data[p + 3] - origin) * scale) | 0)]++;
  }
  for (; p < n; p++) partial[((data[p] - origin) * scale) | 0]++;
  addPartials(partial, counts);
}

/** The four partial histograms into counts, bin 256 (a value at the maximum) into bin 255. */
function addPartials(partial: Int32Array, counts: Float64Array): void {
  const s1 = PARTIAL_STRIDE, s2 = 2 * PARTIAL_STRIDE, s3 = 3 * PARTIAL_STRIDE;
  for (let bin = 0; bin < PARTIAL_STRIDE; bin++) {
    const total = partial[bin] + partial[s1 + bin] + partial[s2 + bin] + partial[s3 + bin];
    counts[bin < HISTOGRAM_BINS ? bin : HISTOGRAM_BINS - 1] += total;
  }
}

/**
 * countBins, also keeping each pixel's bin as a byte (the maximum's bin 256 as 255; Otsu's bin is at
 * most 254), as the SIMD histogram keeps them for a mask written in packed bits only.
 */
function countBinsKeeping(data: Float32Array, origin: number, scale: number, counts: Float64Array, bins: Uint8Array): void {
  const n = data.length;
  const partial = new Int32Array(4 * PARTIAL_STRIDE);
  const s1 = PARTIAL_STRIDE, s2 = 2 * PARTIAL_STRIDE, s3 = 3 * PARTIAL_STRIDE;
  let p = 0;
  for (; p + 3 < n; p += 4) {
    const a = ((data[p] - origin) * scale) | 0;
    const b = ((data[p + 1] - origin) * scale) | 0;
    const c = ((data[p + 2] - origin) * scale) | 0;
    const d = ((data[p + 3] - origin) * scale) | 0;
    partial[a]++;
    partial[s1 + b]++;
    partial[s2 + c]++;
    partial[s3 + d]++;
    bins[p] = a - (a >>> 8);
    bins[p + 1] = b - (b >>> 8);
    bins[p + 2] = c - (c >>> 8);
    bins[p + 3] = d - (d >>> 8);
  }
  for (; p < n; p++) {
    const a = ((data[p] - origin) * scale) | 0;
    partial[a]++;
    bins[p] = a - (a >>> 8);
  }
  addPartials(partial, counts);
}

/**
 * Otsu's threshold bin k: the smallest k maximising the between-class variance
 * ω₀ω₁(μ₀ − μ₁)² with class 0 = bins ≤ k (N. Otsu, IEEE Trans. SMC-9(1):62–66, 1979),
 * or −1 when no k separates two non-empty classes.
 */
export function otsuBin(counts: ArrayLike<number>): number {
  let total = 0;
  let weighted = 0;
  for (let i = 0; i < counts.length; i++) {
    total += counts[i];
    weighted += i * counts[i];
  }
  if (total === 0) return -1;
  const muT = weighted / total;
  let best = -1;
  let bestVariance = 0;
  let w0 = 0;
  let sum0 = 0;
  for (let k = 0; k < counts.length - 1; k++) {
    w0 += counts[k] / total;
    sum0 += (k * counts[k]) / total;
    const w1 = 1 - w0;
    if (w0 < 1e-12 || w1 < 1e-12) continue;
    const mu0 = sum0 / w0;
    const mu1 = (muT - sum0) / w1;
    const variance = w0 * w1 * (mu0 - mu1) * (mu0 - mu1);
    if (variance > bestVariance * (1 + 1e-12)) {
      bestVariance = variance;
      best = k;
    }
  }
  return best;
}

/**
 * Otsu's method: mask = 1 where the pixel's bin is above the chosen bin k; a flat image gives an empty mask.
 * `range`, when the previous step measured it (see `gradient`), saves a pass over the image.
 * `packed` (of the image's size) receives the mask in packed bits as well, for a following morphology step;
 * with `writeMask` false it receives it only, and the mask image's contents are left undefined.
 */
export function thresholdOtsu(
  src: Image,
  invert = false,
  out?: Image,
  range?: ValueRange,
  packed?: PackedMask,
  writeMask = true,
): { mask: Image; bin: number; threshold: number } {
  const simd = simdKernels();
  const bits = packed && packed.width === src.width && packed.height === src.height ? packed : null;
  if (bits && !writeMask) return simd ? otsuPackedOnly(simd, src, invert, bits, out, range) : otsuPackedOnlyPlain(src, invert, bits, out, range);
  // From here on the mask's samples are written (and its bits too when given).
  const hist = simd ? otsuHistogramSimd(simd, src, range) : otsuHistogram(src.data, range);
  const k = hist.flat ? -1 : otsuBin(hist.counts);
  const above = invert ? 0 : 1;
  const below = 1 - above;
  if (k < 0) {
    const dst = imageLike(src, out);
    dst.data.fill(below);
    if (bits) fillPacked(bits, below);
    return { mask: dst, bin: -1, threshold: NaN };
  }
  // bin(v) > k  ⇔  (v − origin)·binsPerUnit ≥ k + 1  (the top bin only collects values at max).
  const cut = hist.origin + (k + 1) / hist.binsPerUnit;
  const threshold = hist.integerLevels ? k : cut;
  // bin(v) never falls as v grows, so "bin above k" is "v at least the first float32 whose bin is above k";
  // both engines compare each sample with that float32 (a NaN is below every cut, as its bin 0 is).
  const edge = k + 1;
  const first = firstFloat32Where(hist.min, hist.max, (v) => (((v - hist.origin) * hist.binsPerUnit) | 0) >= edge);
  if (simd) return { mask: simd.thresholdAt(src, first, invert, out, bits ?? undefined), bin: k, threshold };
  const dst = imageLike(src, out);
  if (bits) writeAtLeastPacked(src.data, first, invert, dst.data, bits);
  else writeAtLeast(src.data, first, invert, dst.data);
  return { mask: dst, bin: k, threshold };
}

/**
 * Otsu writing packed bits only, on the SIMD engine: the histogram pass keeps every pixel's bin as a
 * byte, and the mask compares those bytes with the chosen bin, 16 at a time (a quarter of the bytes
 * a pass over the float32 samples reads). The same bins, so the same mask as comparing the samples.
 */
function otsuPackedOnly(simd: SimdKernels, src: Image, invert: boolean, bits: PackedMask, out: Image | undefined, range: ValueRange | undefined): { mask: Image; bin: number; threshold: number } {
  const hist = otsuHistogramSimd(simd, src, range, true);
  try {
    const k = hist.flat ? -1 : otsuBin(hist.counts);
    const dst = imageLike(src, out);
    if (k < 0) {
      fillPacked(bits, invert ? 1 : 0);
      return { mask: dst, bin: -1, threshold: NaN };
    }
    simd.thresholdBins(hist.bins!, src.width, src.height, k, invert, bits, dst);
    return { mask: dst, bin: k, threshold: hist.integerLevels ? k : hist.origin + (k + 1) / hist.binsPerUnit };
  } finally {
    if (hist.bins !== undefined) simd.releaseBlock(hist.bins);
  }
}

/**
 * otsuPackedOnly on the plain engine: the bins kept as bytes while counting, then compared with the
 * chosen bin, so the mask reads 5 MB instead of the 20 MB of float32 samples at 5 MP (5 MP, one
 * CPU: counting 3.4 → 3.7–3.9 ns/px, the mask 2.2–2.5 → 0.85). The same bins, so the same mask.
 */
function otsuPackedOnlyPlain(src: Image, invert: boolean, bits: PackedMask, out: Image | undefined, range: ValueRange | undefined): { mask: Image; bin: number; threshold: number } {
  const bins = binBytes(src.data.length);
  const hist = otsuHistogram(src.data, range, bins);
  const k = hist.flat ? -1 : otsuBin(hist.counts);
  const dst = imageLike(src, out);
  if (k < 0) {
    fillPacked(bits, invert ? 1 : 0);
    return { mask: dst, bin: -1, threshold: NaN };
  }
  packBinsAbove(bins, k, invert, bits);
  return { mask: dst, bin: k, threshold: hist.integerLevels ? k : hist.origin + (k + 1) / hist.binsPerUnit };
}

/** The kept bins' bytes, grown as needed and kept (a new 5 MB array per photo brought the collector in: medians 1–3 ns/px slower). */
let keptBins = new Uint8Array(0);
function binBytes(n: number): Uint8Array {
  if (keptBins.length < n) keptBins = new Uint8Array(n);
  return keptBins.subarray(0, n);
}

/** Bit i of each word set where the pixel's bin is above k (cleared with invert); bits past the last column stay 0. */
function packBinsAbove(bins: Uint8Array, k: number, invert: boolean, packed: PackedMask): void {
  const { width: w, height: h, wordsPerRow, words } = packed;
  const full = w >>> 5;
  const flip = invert ? -1 : 0;
  for (let y = 0; y < h; y++) {
    const row = y * w;
    const line = y * wordsPerRow;
    for (let word = 0; word < full; word++) {
      const x0 = row + (word << 5);
      // k − bin is negative exactly when the bin is above k: its sign bit is the pixel's bit.
      let a = 0, b = 0, c = 0, d = 0;
      for (let i = 0; i < 32; i += 4) {
        a |= ((k - bins[x0 + i]) >>> 31) << i;
        b |= ((k - bins[x0 + i + 1]) >>> 31) << (i + 1);
        c |= ((k - bins[x0 + i + 2]) >>> 31) << (i + 2);
        d |= ((k - bins[x0 + i + 3]) >>> 31) << (i + 3);
      }
      words[line + word] = (a | b | c | d) ^ flip;
    }
    if (full < wordsPerRow) {
      const x0 = row + (full << 5);
      const n = w - (full << 5);
      let acc = 0;
      for (let i = 0; i < n; i++) acc |= ((k - bins[x0 + i]) >>> 31) << i;
      words[line + full] = invert ? acc ^ ((1 << n) - 1) : acc;
    }
  }
}

/** o = 1 where v ≥ cut, else 0 (swapped with invert; NaN is below every cut), without branches: noisy data near the cut would mispredict them. */
function writeAtLeast(s: Float32Array, cut: number, invert: boolean, o: Float32Array): void {
  const flip = invert ? 1 : 0;
  for (let p = 0; p < s.length; p++) o[p] = flip ^ +(s[p] >= cut);
}

/** writeAtLeast, also setting bit i of each word for the pixel's 1 (bits past the last column stay 0); a mask written in bits only takes otsuPackedOnlyPlain. */
function writeAtLeastPacked(s: Float32Array, cut: number, invert: boolean, o: Float32Array, packed: PackedMask): void {
  const { width: w, height: h, wordsPerRow, words } = packed;
  const flip = invert ? 1 : 0;
  for (let y = 0; y < h; y++) {
    const row = y * w;
    for (let word = 0; word < wordsPerRow; word++) {
      const x0 = row + (word << 5);
      const n = Math.min(32, w - (word << 5));
      let acc = 0;
      for (let i = 0; i < n; i++) {
        const bit = flip ^ +(s[x0 + i] >= cut);
        o[x0 + i] = bit;
        acc |= bit << i;
      }
      words[y * wordsPerRow + word] = acc;
    }
  }
}

/** Every pixel set to `value` (0 or 1) in packed form. */
function fillPacked(packed: PackedMask, value: number): void {
  const { width: w, wordsPerRow, words } = packed;
  const lastBits = w - ((wordsPerRow - 1) << 5);
  const lastWord = value === 0 ? 0 : lastBits === 32 ? -1 : (1 << lastBits) - 1;
  for (let p = 0; p < words.length; p++) words[p] = value === 0 ? 0 : (p + 1) % wordsPerRow === 0 ? lastWord : -1;
}

/** mask = in > (mean of the size × size neighbourhood) − c, the neighbourhood using the rule's border. */
export function thresholdAdaptiveMean(src: Image, size: number, c: number, border: BorderMode, invert = false, out?: Image): Image {
  return boxMeanThreshold(src, size, border, { c, flip: invert ? 1 : 0 }, out);
}
