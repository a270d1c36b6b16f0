// The WebAssembly SIMD kernels as engine operations on images. Images the engine's workspace hands
// out live in the module's memory (ResidentImage) and are read and written in place; any other
// image is copied in for the call, and an output that is not resident is copied out.
import type { MorphologyOp } from '../../rules/schema';
import type { PackedMask } from '../binary-morphology';
import type { BorderMode } from '../border';
import { fftZeroFloor } from '../fft-correlate';
import type { MeanComparison } from '../smoothing';
import { imageLike, type Image, type ValueRange } from '../image';
import type { Kernel } from '../kernels';
import type { QualitySums } from '../quality';
import { WasmHeap } from './heap';
import { ResidentImage } from './resident-image';
import type { WasmMemory } from './webassembly';

/** The module's exports (shared/vision/wasm/assembly/index.ts); addresses are byte offsets in `memory`. */
export interface EngineExports {
  readonly memory: WasmMemory;
  heapBase(): number;
  setReadAhead(on: number): void;
  separable(src: number, dst: number, w: number, h: number, colK: number, colLen: number, rowK: number, rowLen: number, mode: number, offset: number, scratch: number): void;
  separableScratchBytes(w: number, colLen: number, rowLen: number): number;
  separableBytes(src: number, channels: number, kr: number, kg: number, kb: number, quality: number, dst: number, w: number, h: number, colK: number, colLen: number, rowK: number, rowLen: number, mode: number, offset: number, scratch: number): void;
  separableBytesScratchBytes(w: number, colLen: number, rowLen: number): number;
  laplacianOfGaussian(src: number, dst: number, w: number, h: number, g: number, g2: number, r: number, mode: number, scratch: number): void;
  correlate2d(src: number, src8: number, dst: number, w: number, h: number, weights: number, rows: number, cols: number, mode: number, scale: number, offset: number, scratch: number): void;
  directScratchBytes(w: number, rows: number, cols: number): number;
  correlateFft(src: number, dst: number, w: number, h: number, weights: number, rows: number, cols: number, mode: number, scale: number, offset: number, floor: number, scratch: number): void;
  fftScratchBytes(w: number, cols: number): number;
  largestFiniteMagnitude(src: number, n: number): number;
  gradient(src: number, dst: number, w: number, h: number, a: number, b: number, output: number, mode: number, range: number, scratch: number): void;
  gradientScratchBytes(w: number): number;
  smoothedGradient(src: number, dst: number, w: number, h: number, colK: number, colLen: number, rowK: number, rowLen: number, a: number, b: number, output: number, mode: number, range: number, scratch: number): void;
  smoothedGradientScratchBytes(w: number, colLen: number, rowLen: number): number;
  smoothedGradientBytes(src: number, channels: number, kr: number, kg: number, kb: number, quality: number, dst: number, w: number, h: number, colK: number, colLen: number, rowK: number, rowLen: number, a: number, b: number, output: number, mode: number, range: number, scratch: number): void;
  smoothedGradientBytesScratchBytes(w: number, colLen: number, rowLen: number): number;
  eightBitLevels(src: number, n: number): number;
  valueRange(src: number, n: number, out: number): void;
  histogram(src: number, n: number, origin: number, scale: number, scratch: number, bins: number, counts: number, pairs: number): void;
  histogramScratchBytes(pairs: number): number;
  thresholdBinsPacked(bins: number, w: number, h: number, k: number, invert: number, words: number): void;
  thresholdAt(src: number, dst: number, n: number, cut: number, invert: number): void;
  thresholdAtPacked(src: number, dst: number, w: number, h: number, cut: number, invert: number, words: number): void;
  extreme(src: number, dst: number, w: number, h: number, r: number, mode: number, takeMax: number, scratch: number): void;
  extremeScratchBytes(w: number, r: number): number;
  extremeBytes(src: number, dst: number, w: number, h: number, r: number, mode: number, takeMax: number, scratch: number): void;
  extremeBytesScratchBytes(w: number, r: number): number;
  packMask(src: number, w: number, h: number, words: number): number;
  unpackMask(words: number, dst: number, w: number, h: number): void;
  packedExtreme(src: number, dst: number, w: number, h: number, r: number, takeMax: number, outside: number, scratch: number): void;
  packedScratchBytes(w: number): number;
  packNonZero(src: number, w: number, h: number, words: number): void;
  qualitySums(src: number, w: number, h: number, top: number, out: number, scratch: number): void;
  qualitySumsWhole8(src: number, w: number, h: number, out: number): void;
  countNonZero(src: number, w: number, h: number, starts: number, ends: number): number;
  countSetBits(words: number, wordsPerRow: number, w: number, h: number, starts: number, ends: number): number;
  regionSums(src: number, w: number, h: number, starts: number, ends: number, out: number): void;
  regionSquares(src: number, w: number, h: number, starts: number, ends: number, mean: number): number;
  lumaRgb8(src: number, channels: number, n: number, dst: number, kr: number, kg: number, kb: number): void;
  bytesToFloats(src: number, n: number, dst: number): void;
  lumaRgb8Quality(src: number, channels: number, w: number, h: number, dst: number, kr: number, kg: number, kb: number, top: number, out: number, scratch: number): void;
  wideRingBytes(w: number): number;
  grey8Quality(src: number, w: number, h: number, dst: number, out: number): void;
  box(src: number, dst: number, w: number, h: number, size: number, mode: number, compare: number, c: number, flip: number, scratch: number): void;
  shrinkMeans(src: number, w: number, h: number, factor: number, dst: number, range: number): void;
  greyRgb(src: number, n: number, scale: number, shift: number, dst: number): void;
  firstExtreme(src: number, w: number, h: number, starts: number, ends: number, takeMax: number): number;
  boxScratchBytes(w: number, size: number): number;
  median(src: number, dst: number, w: number, h: number, size: number, mode: number, scratch: number, ordered: number): number;
  medianBytes(src: number, dst: number, w: number, h: number, size: number, mode: number, scratch: number): void;
  medianBytesScratchBytes(w: number, size: number): number;
  medianScratchBytes(w: number, size: number): number;
  medianHistogram(src: number, dst: number, w: number, h: number, size: number, mode: number, scratch: number): number;
  medianHistogramScratchBytes(w: number, size: number): number;
}

type LumaWeights = { red: number; green: number; blue: number };

/** The weights in whole thousandths (BT.601's are), which the exact luma kernels need; null otherwise. */
function wholeThousandths(weights: LumaWeights): [number, number, number] | null {
  const given = [weights.red, weights.green, weights.blue];
  const thousandths = given.map((w) => Math.round(w * 1000));
  if (thousandths.some((k, i) => k < 0 || k > 1000 || k / 1000 !== given[i])) return null;
  return [thousandths[0], thousandths[1], thousandths[2]];
}

const BORDER_CODES: Record<BorderMode, number> = { reflect: 0, replicate: 1, constant: 2 };
const GRADIENT_CODES = { x: 0, y: 1, magnitude: 2 } as const;
const HISTOGRAM_BINS = 256;
/**
 * Images from this many pixels have their histogram counted in pairs of neighbours (assembly/threshold.ts).
 * Its one table (256 KB, an eighth of the 2 MB of tables before) is cleared and added up per call;
 * counting a gradient magnitude in pairs took 0.61 → 0.42 ns/px at 0.3 MP and 0.63 → 0.51 at 320×240, and
 * added 7 % at 200×150 and 28 % at 160×120 (one CPU, two builds of the module in one process).
 */
const HISTOGRAM_PAIRS_FROM = 2 ** 16;
/**
 * Non-separable kernels of at least this many weights go through the FFT in tiles (assembly/fft.ts),
 * unless the image holds a NaN or an infinity: 6.2 against about 13 ns/px direct at 11×11 on 5 MP.
 */
export const FFT_KERNEL_TAPS = 11 * 11;
/** Longest side the FFT's 128×128 tiles take (the schema allows 31). */
const FFT_KERNEL_SIDE = 63;

/**
 * The largest ‖k‖₁ of whole weights whose 16-bit sums hold for every byte (32767 ÷ 255 rounded
 * down): such a direct kernel reads an image's 8-bit copy instead of its float32 samples
 * (assembly/direct.ts decides the same from the float32 weights).
 */
const EIGHT_BIT_L1 = 128;

/**
 * The longest column `separable` reads from an 8-bit copy: longer ones are bound by their arithmetic,
 * and converting the rows into the ring costs more than the reads save (σ = 3, 19 taps, at 5 MP with
 * the caches emptied between runs: 2.17–2.18 ns/px from the float32 samples, 2.23–2.24 from the bytes;
 * σ = 1, 7 taps: 1.35–1.40 → 1.18–1.19).
 */
const BYTES_COLUMN_TAPS = 7;
/** Widest median window the selection networks take (3×3 and 5×5; wider ones count a running histogram). */
const MEDIAN_NETWORK_SIZE = 5;

/** Blocks taken for one call, released together at its end. */
class CallScope {
  private readonly blocks: number[] = [];

  constructor(private readonly heap: WasmHeap) {}

  alloc(bytes: number): number {
    const address = this.heap.alloc(bytes);
    this.blocks.push(address);
    return address;
  }

  f32(values: ArrayLike<number>): number {
    const address = this.alloc(4 * values.length);
    this.heap.f32(address, values.length).set(values);
    return address;
  }

  end(): void {
    for (const address of this.blocks) this.heap.release(address);
  }
}

export class SimdKernels {
  readonly heap: WasmHeap;

  constructor(private readonly wasm: EngineExports) {
    this.heap = new WasmHeap(wasm.memory, Math.ceil(wasm.heapBase() / 64) * 64);
  }

  private readingAhead = true;

  /** Whether the single-stream passes (the gradient, Otsu's counts) read ahead of their work; read-ahead.ts chooses it. */
  get readAhead(): boolean {
    return this.readingAhead;
  }

  /** Changes only the passes' speed, never their outputs. */
  setReadAhead(on: boolean): void {
    this.wasm.setReadAhead(on ? 1 : 0);
    this.readingAhead = on;
  }

  /** An image in the module's memory; its contents are undefined until a step writes it. */
  takeImage(width: number, height: number): ResidentImage {
    return new ResidentImage(this.heap, this.heap.alloc(4 * width * height), width, height);
  }

  owns(image: Image): image is ResidentImage {
    return image instanceof ResidentImage && image.heap === this.heap;
  }

  /**
   * column ⊗ row correlation plus offset; up to BYTES_COLUMN_TAPS taps down the columns from src's
   * 8-bit copy when it has one (the same bits).
   */
  separable(src: Image, column: ArrayLike<number>, row: ArrayLike<number>, border: BorderMode, out?: Image, offset = 0): Image {
    const bytes = column.length <= BYTES_COLUMN_TAPS ? this.eightBitOf(src) : 0;
    const { width: w, height: h } = src;
    return this.mapSeparable(src, out, column, row, bytes, (s, d, col, rw, scope) => {
      if (bytes === 0) {
        this.wasm.separable(s, d, w, h, col, column.length, rw, row.length, BORDER_CODES[border], offset, scope.alloc(this.wasm.separableScratchBytes(w, column.length, row.length)));
        return;
      }
      const scratch = scope.alloc(this.wasm.separableBytesScratchBytes(w, column.length, row.length));
      this.wasm.separableBytes(bytes, 1, 0, 0, 0, 0, d, w, h, col, column.length, rw, row.length, BORDER_CODES[border], offset, scratch);
    });
  }

  /**
   * Correlation with any kernel (weights / divisor + offset): direct, or through the FFT in tiles from
   * FFT_KERNEL_TAPS weights. A direct kernel that `readsEightBit` reads src's 8-bit copy when it has
   * one, and leaves samples src has not written yet unwritten.
   */
  correlate2d(src: Image, kernel: Kernel, border: BorderMode, out?: Image): Image {
    const bytes = this.readsEightBit(kernel) ? this.eightBitOf(src) : 0;
    const code = BORDER_CODES[border];
    const direct = (s: number, d: number, scope: CallScope) => {
      const scratch = scope.alloc(this.wasm.directScratchBytes(src.width, kernel.rows, kernel.cols));
      this.wasm.correlate2d(s, bytes, d, src.width, src.height, scope.f32(kernel.weights), kernel.rows, kernel.cols, code, 1 / kernel.divisor, kernel.offset, scratch);
    };
    if (!isLarge(kernel)) return this.mapImage(src, out, direct, true, bytes !== 0);
    return this.mapImage(src, out, (s, d, scope) => {
      const largest = this.wasm.largestFiniteMagnitude(s, src.width * src.height);
      if (largest < 0) return direct(s, d, scope);
      const floor = fftZeroFloor(kernel, largest, 2 ** -24);
      const scratch = scope.alloc(this.wasm.fftScratchBytes(src.width, kernel.cols));
      this.wasm.correlateFft(s, d, src.width, src.height, scope.f32(kernel.weights), kernel.rows, kernel.cols, code, 1 / kernel.divisor, kernel.offset, floor, scratch);
    });
  }

  /** True when `median` of this window size reads an image's 8-bit copy (the selection networks' sizes). */
  medianReadsEightBit(size: number): boolean {
    return size <= MEDIAN_NETWORK_SIZE;
  }

  /** True when correlate2d with this kernel reads an image's 8-bit copy (direct, whole weights, ‖k‖₁ ≤ EIGHT_BIT_L1). */
  readsEightBit(kernel: Kernel): boolean {
    if (isLarge(kernel)) return false;
    let l1 = 0;
    for (const w of kernel.weights) {
      const k = Math.fround(w);
      if (!Number.isInteger(k)) return false;
      l1 += Math.abs(k);
    }
    return l1 <= EIGHT_BIT_L1;
  }

  /** g″ across the vertically g-smoothed image plus g across its vertical g″ (symmetric weights of one length). */
  laplacianOfGaussian(src: Image, g: ArrayLike<number>, g2: ArrayLike<number>, border: BorderMode, out?: Image): Image {
    return this.mapImage(src, out, (s, d, scope) => {
      const gw = scope.f32(g);
      const g2w = scope.f32(g2);
      const scratch = scope.alloc(this.wasm.separableScratchBytes(src.width, g.length, g.length));
      this.wasm.laplacianOfGaussian(s, d, src.width, src.height, gw, g2w, (g.length - 1) >> 1, BORDER_CODES[border], scratch);
    });
  }

  /** [a b a]ᵀ ⊗ [−1 0 1] (x), its transpose (y), or the magnitude, whose range goes to `range` when given. */
  gradient(src: Image, a: number, b: number, output: 'x' | 'y' | 'magnitude', border: BorderMode, out?: Image, range?: ValueRange): Image {
    return this.mapImage(src, out, (s, d, scope) => {
      const rangeAddress = range ? scope.alloc(8) : 0;
      const scratch = scope.alloc(this.wasm.gradientScratchBytes(src.width));
      this.wasm.gradient(s, d, src.width, src.height, a, b, GRADIENT_CODES[output], BORDER_CODES[border], rangeAddress, scratch);
      if (range) this.readRange(rangeAddress, output, range);
    });
  }

  /**
   * Mean of the size × size neighbourhood, or with `comparison` the adaptive-mean mask
   * flip ^ (in > mean − c): the plain engine's double-precision sums in its order, so the same bits.
   */
  box(src: Image, size: number, border: BorderMode, out?: Image, comparison?: MeanComparison): Image {
    return this.mapImage(src, out, (s, d, scope) => {
      const scratch = scope.alloc(this.wasm.boxScratchBytes(src.width, size));
      this.wasm.box(s, d, src.width, src.height, size, BORDER_CODES[border], comparison ? 1 : 0, comparison?.c ?? 0, comparison?.flip ?? 0, scratch);
    });
  }

  /**
   * Median of the size × size neighbourhood (odd size ≥ 3), or null (nothing written) where the
   * plain engine's own code must decide: 3×3 and 5×5 of an image holding NaN or −0 (selection
   * networks elsewhere), wider windows of an image that is not all whole numbers in 0 … 65535
   * (running histogram elsewhere).
   */
  median(src: Image, size: number, border: BorderMode, out?: Image): Image | null {
    const dst = imageLike(src, out === src ? undefined : out);
    // The median of bytes is a byte: 3×3 and 5×5 of an 8-bit copy go sixteen pixels per v128.
    const bytes = this.medianReadsEightBit(size) ? this.eightBitOf(src) : 0;
    if (bytes !== 0 && this.owns(dst)) {
      return this.intoBytes(dst, false, (result, scope) => this.wasm.medianBytes(bytes, result, src.width, src.height, size, BORDER_CODES[border], scope.alloc(this.wasm.medianBytesScratchBytes(src.width, size))));
    }
    const scope = new CallScope(this.heap);
    try {
      const s = this.addressOf(src, scope);
      const resident = this.owns(dst);
      const d = resident ? this.outputAddress(dst) : scope.alloc(4 * dst.data.length);
      const network = size <= MEDIAN_NETWORK_SIZE;
      const scratch = scope.alloc(network ? this.wasm.medianScratchBytes(src.width, size) : this.wasm.medianHistogramScratchBytes(src.width, size));
      // An image with an 8-bit copy holds no NaN or −0: the network skips its search for them.
      const ordered = this.eightBitOf(src) !== 0 ? 1 : 0;
      const found = network
        ? this.wasm.median(s, d, src.width, src.height, size, BORDER_CODES[border], scratch, ordered)
        : this.wasm.medianHistogram(s, d, src.width, src.height, size, BORDER_CODES[border], scratch);
      if (found === 0) return null;
      if (!resident) dst.data.set(this.heap.f32(d, dst.data.length));
      return dst;
    } finally {
      scope.end();
    }
  }

  /**
   * `gradient` of the separable correlation column ⊗ row of src, in one sweep: the smoothed rows live
   * in a ring of four rows, never in a whole image. The same samples as `separable` then `gradient`.
   * From src's 8-bit copy when it has one (the same bits).
   */
  smoothedGradient(src: Image, column: ArrayLike<number>, row: ArrayLike<number>, a: number, b: number, output: 'x' | 'y' | 'magnitude', border: BorderMode, out?: Image, range?: ValueRange): Image {
    const bytes = this.eightBitOf(src);
    const { width: w, height: h } = src;
    const [gradientCode, borderCode] = [GRADIENT_CODES[output], BORDER_CODES[border]];
    return this.mapSeparable(src, out, column, row, bytes, (s, d, col, rw, scope) => {
      const rangeAddress = range ? scope.alloc(8) : 0;
      if (bytes === 0) {
        const scratch = scope.alloc(this.wasm.smoothedGradientScratchBytes(w, column.length, row.length));
        this.wasm.smoothedGradient(s, d, w, h, col, column.length, rw, row.length, a, b, gradientCode, borderCode, rangeAddress, scratch);
      } else {
        const scratch = scope.alloc(this.wasm.smoothedGradientBytesScratchBytes(w, column.length, row.length));
        this.wasm.smoothedGradientBytes(bytes, 1, 0, 0, 0, 0, d, w, h, col, column.length, rw, row.length, a, b, gradientCode, borderCode, rangeAddress, scratch);
      }
      if (range) this.readRange(rangeAddress, output, range);
    });
  }

  /** mapImage for a kernel of a column and a row of weights (copied in); `bytes`: it reads src's 8-bit copy there. */
  private mapSeparable(
    src: Image,
    out: Image | undefined,
    column: ArrayLike<number>,
    row: ArrayLike<number>,
    bytes: number,
    kernel: (src: number, dst: number, column: number, row: number, scope: CallScope) => void,
  ): Image {
    return this.mapImage(src, out, (s, d, scope) => kernel(s, d, scope.f32(column), scope.f32(row), scope), true, bytes !== 0);
  }

  /** The address of the image's 8-bit copy (ResidentImage.eightBit), or 0. */
  private eightBitOf(image: Image): number {
    return this.owns(image) ? image.eightBit : 0;
  }

  /**
   * An 8-bit photo's quality sums (as photoWithQualitySums: grey exact from the bytes, colour as
   * qualitySums of its luma) and smoothedGradient of its input image (grey samples, or luma as
   * lumaRgb8) into `out`, straight from the photo's bytes: no float32 image of the photo is written.
   * null when the weights are not whole thousandths.
   */
  photoQualityAndSmoothedGradient(
    samples: Uint8Array,
    channels: 1 | 3 | 4,
    weights: LumaWeights,
    column: ArrayLike<number>,
    row: ArrayLike<number>,
    a: number,
    b: number,
    output: 'x' | 'y' | 'magnitude',
    border: BorderMode,
    out: Image,
    range?: ValueRange,
  ): QualitySums | null {
    return this.fromPhoto(samples, channels, weights, out, (src, k, quality, dst, scope) => {
      const col = scope.f32(column);
      const rw = scope.f32(row);
      const rangeAddress = range ? scope.alloc(8) : 0;
      const scratch = scope.alloc(this.wasm.smoothedGradientBytesScratchBytes(out.width, column.length, row.length));
      const [gradientCode, borderCode] = [GRADIENT_CODES[output], BORDER_CODES[border]];
      this.wasm.smoothedGradientBytes(src, channels, k[0], k[1], k[2], quality, dst, out.width, out.height, col, column.length, rw, row.length, a, b, gradientCode, borderCode, rangeAddress, scratch);
      if (range) this.readRange(rangeAddress, output, range);
    });
  }

  /** As photoQualityAndSmoothedGradient, with `separable` (column ⊗ row + offset) of the input image. */
  photoQualityAndSeparable(samples: Uint8Array, channels: 1 | 3 | 4, weights: LumaWeights, column: ArrayLike<number>, row: ArrayLike<number>, border: BorderMode, offset: number, out: Image): QualitySums | null {
    return this.fromPhoto(samples, channels, weights, out, (src, k, quality, dst, scope) => {
      const col = scope.f32(column);
      const rw = scope.f32(row);
      const scratch = scope.alloc(this.wasm.separableBytesScratchBytes(out.width, column.length, row.length));
      this.wasm.separableBytes(src, channels, k[0], k[1], k[2], quality, dst, out.width, out.height, col, column.length, rw, row.length, BORDER_CODES[border], offset, scratch);
    });
  }

  /**
   * Copies the photo's bytes in and runs `kernel` from them into `out`; its `quality` is where the sums
   * go. With `keepGrey`, a grey photo's `out` (the input image, when resident) keeps the bytes as its
   * 8-bit copy.
   */
  private fromPhoto(
    samples: Uint8Array,
    channels: 1 | 3 | 4,
    weights: LumaWeights,
    out: Image,
    kernel: (src: number, thousandths: number[], quality: number, dst: number, scope: CallScope) => void,
    keepGrey = false,
  ): QualitySums | null {
    const thousandths = channels === 1 ? [0, 0, 0] : wholeThousandths(weights);
    if (!thousandths) return null;
    const pixels = out.width * out.height;
    const scope = new CallScope(this.heap);
    try {
      const resident = this.owns(out);
      const keep = keepGrey && channels === 1 && resident;
      const src = keep ? this.copyIn(samples) : scope.alloc(samples.length);
      if (!keep) new Uint8Array(this.heap.memory.buffer, src, samples.length).set(samples);
      const sums = scope.alloc(32);
      const dst = resident ? this.outputAddress(out) : scope.alloc(4 * pixels);
      kernel(src, thousandths, sums, dst, scope);
      if (keep) out.keepEightBit(src);
      if (!resident) out.data.set(this.heap.f32(dst, pixels));
      return this.qualityAt(sums);
    } finally {
      scope.end();
    }
  }

  /** An 8-bit grey photo's samples into `out`, which keeps the bytes as its 8-bit copy (channelImage's samples). */
  greyInput(samples: Uint8Array, out: ResidentImage): ResidentImage {
    this.samplesFromBytes(out, this.copyIn(samples), false);
    return out;
  }

  /**
   * An 8-bit grey photo's quality sums (as photoWithQualitySums) from its bytes alone: `out`, the input
   * image, keeps the bytes as its 8-bit copy and gets its float32 samples only when something reads
   * them (a kernel that reads the 8-bit copy does not).
   */
  greyQualityLater(samples: Uint8Array, out: ResidentImage): QualitySums {
    const bytes = this.copyIn(samples);
    const scope = new CallScope(this.heap);
    try {
      const sums = scope.alloc(32);
      this.wasm.grey8Quality(bytes, out.width, out.height, 0, sums);
      this.samplesFromBytes(out, bytes, true);
      return this.qualityAt(sums);
    } finally {
      scope.end();
    }
  }

  /** The bytes in a block of their own (the caller owns it). */
  private copyIn(samples: Uint8Array): number {
    const address = this.heap.alloc(samples.length);
    new Uint8Array(this.heap.memory.buffer, address, samples.length).set(samples);
    return address;
  }

  private qualityAt(sums: number): QualitySums {
    const [sum, clipped, lapSum, lapSquares] = new Float64Array(this.heap.memory.buffer, sums, 4);
    return { sum, clipped, lapSum, lapSquares };
  }

  /** The magnitude's range a gradient kernel stored at `address` (NaN for the other outputs). */
  private readRange(address: number, output: 'x' | 'y' | 'magnitude', range: ValueRange): void {
    const found = this.heap.f32(address, 2);
    range.min = output === 'magnitude' ? found[0] : NaN;
    range.max = output === 'magnitude' ? found[1] : NaN;
  }

  /** True when every value is a whole number in 0 … 255. */
  eightBitLevels(image: Image): boolean {
    return this.read(image, (s) => this.wasm.eightBitLevels(s, image.width * image.height) === 1);
  }

  /** [min, max] with NaN left out ([Infinity, −Infinity] when there is no number). */
  valueRange(image: Image): [number, number] {
    return this.read(image, (s, scope) => {
      const out = scope.alloc(8);
      this.wasm.valueRange(s, image.width * image.height, out);
      const found = this.heap.f32(out, 2);
      return [found[0], found[1]];
    });
  }

  /**
   * counts[min(255, trunc((v − origin)·scale))]++ for every v (computed in double precision; NaN
   * counts in bin 0). With keepBins, every pixel's bin also goes as a byte into a block of the
   * module's memory (`bins`, for thresholdBins; the caller frees it with releaseBlock). inPairs
   * chooses the counting in pairs of neighbours, which large images use (the same counts).
   */
  histogram(image: Image, origin: number, scale: number, keepBins = false, inPairs = image.width * image.height >= HISTOGRAM_PAIRS_FROM): { counts: Float64Array; bins?: number } {
    return this.read(image, (s, scope) => {
      const n = image.width * image.height;
      const pairs = inPairs ? 1 : 0;
      const scratch = scope.alloc(this.wasm.histogramScratchBytes(pairs));
      const sums = scope.alloc(4 * HISTOGRAM_BINS);
      // 32 spare bytes: thresholdBinsPacked reads two vectors from the last word's start.
      const bins = keepBins ? this.heap.alloc(n + 32) : 0;
      this.wasm.histogram(s, n, origin, scale, scratch, bins, sums, pairs);
      const counts = Float64Array.from(this.heap.i32(sums, HISTOGRAM_BINS));
      return keepBins ? { counts, bins } : { counts };
    });
  }

  /**
   * The packed mask of "bin above k" (swapped with invert) from the bins `histogram` kept; `out`
   * is the mask image, whose samples are left as they were (undefined: only the bits are wanted).
   */
  thresholdBins(bins: number, width: number, height: number, k: number, invert: boolean, packed: PackedMask, out: Image): void {
    if (this.owns(out)) out.discard();
    const scope = new CallScope(this.heap);
    try {
      const words = scope.alloc(4 * packed.words.length);
      this.wasm.thresholdBinsPacked(bins, width, height, k, invert ? 1 : 0, words);
      packed.words.set(this.heap.i32(words, packed.words.length));
    } finally {
      scope.end();
    }
  }

  releaseBlock(address: number): void {
    this.heap.release(address);
  }

  /** mask = (v ≥ cut) XOR invert, cut a float32; `packed` receives the mask in packed bits as well. */
  thresholdAt(src: Image, cut: number, invert: boolean, out?: Image, packed?: PackedMask): Image {
    return this.mapImage(src, out, (s, d, scope) => {
      if (!packed) {
        this.wasm.thresholdAt(s, d, src.width * src.height, cut, invert ? 1 : 0);
        return;
      }
      const words = scope.alloc(4 * packed.words.length);
      this.wasm.thresholdAtPacked(s, d, src.width, src.height, cut, invert ? 1 : 0, words);
      packed.words.set(this.heap.i32(words, packed.words.length));
    });
  }

  /**
   * Minimum (erosion) or maximum (dilation) over the square of side 2r+1, for any values. From an
   * 8-bit copy into a resident `out` when src has one; `samplesLater`: out is a scratch that the next
   * pass reads through its 8-bit copy, so its float32 samples are written only if something reads them.
   */
  extreme(src: Image, r: number, border: BorderMode, takeMax: boolean, out?: Image, samplesLater = false): Image {
    const bytes = this.eightBitOf(src);
    const dst = bytes === 0 ? null : imageLike(src, out === src ? undefined : out);
    if (dst && this.owns(dst)) {
      // The minima and maxima of bytes are bytes, taken sixteen to an instruction.
      return this.intoBytes(dst, samplesLater, (result, scope) =>
        this.wasm.extremeBytes(bytes, result, src.width, src.height, r, BORDER_CODES[border], takeMax ? 1 : 0, scope.alloc(this.wasm.extremeBytesScratchBytes(src.width, r))),
      );
    }
    return this.mapImage(src, dst ?? out, (s, d, scope) => {
      const scratch = scope.alloc(this.wasm.extremeScratchBytes(src.width, r));
      this.wasm.extreme(s, d, src.width, src.height, r, BORDER_CODES[border], takeMax ? 1 : 0, scratch);
    });
  }

  /**
   * A kernel whose output of bytes (w·h, into a block `compute` fills) becomes `out`'s samples, and
   * stays as its 8-bit copy for the next step. `samplesLater`: out is a scratch that the next pass
   * reads through its copy, so its float32 samples are written only if something reads them.
   */
  private intoBytes(out: ResidentImage, samplesLater: boolean, compute: (result: number, scope: CallScope) => void): ResidentImage {
    const result = this.heap.alloc(out.width * out.height);
    const scope = new CallScope(this.heap);
    try {
      compute(result, scope);
      this.samplesFromBytes(out, result, samplesLater);
      return out;
    } finally {
      scope.end();
    }
  }

  /**
   * `out`'s samples become the bytes of `block`, which it owns from now on as its 8-bit copy: written
   * now, or with `later` when first read (the fill reads the image's own block, not the caller's data).
   */
  private samplesFromBytes(out: ResidentImage, block: number, later: boolean): void {
    const pixels = out.width * out.height;
    const target = this.outputAddress(out);
    if (later) out.fillLater(() => this.wasm.bytesToFloats(out.eightBit, pixels, target));
    else this.wasm.bytesToFloats(block, pixels, target);
    out.keepEightBit(block);
  }

  /**
   * A morphology step on a 0/1 mask through packed bits (1 ≤ radius ≤ 31), or null when the image
   * holds other values. `packed`: the same mask already packed by the step that wrote it.
   */
  binaryMorphology(src: Image, op: MorphologyOp, radius: number, border: BorderMode, out?: Image, packed?: PackedMask): Image | null {
    const { width: w, height: h } = src;
    const wordsPerRow = (w + 31) >>> 5;
    const count = wordsPerRow * h;
    const scope = new CallScope(this.heap);
    try {
      const first = scope.alloc(4 * count);
      const bits = this.owns(src) ? src.packedMask : null;
      if (packed) this.heap.i32(first, count).set(packed.words);
      else if (bits) this.heap.i32(first, count).set(this.heap.i32(bits.words, count));
      else if (this.wasm.packMask(this.addressOf(src, scope), w, h, first) === 0) return null;
      const second = scope.alloc(4 * count);
      const scratch = scope.alloc(this.wasm.packedScratchBytes(w));
      // Outside the image: the identity of the operation, or 0 for erosion with the constant border.
      const erodeOutside = border === 'constant' ? 0 : 1;
      const pass = (from: number, to: number, takeMax: boolean) =>
        this.wasm.packedExtreme(from, to, w, h, radius, takeMax ? 1 : 0, takeMax ? 0 : erodeOutside, scratch);
      let result = second;
      if (op === 'erode' || op === 'dilate') pass(first, second, op === 'dilate');
      else {
        pass(first, second, op === 'close');
        pass(second, first, op === 'open');
        result = first;
      }
      const dst = imageLike(src, out === src ? undefined : out);
      if (this.owns(dst)) {
        // The samples stay in packed bits until something reads them (resident-image.ts).
        const words = this.heap.alloc(4 * count);
        this.heap.i32(words, count).set(this.heap.i32(result, count));
        const target = this.outputAddress(dst);
        dst.defer({ words, wordsPerRow, unpack: () => this.wasm.unpackMask(words, target, w, h) });
      } else {
        const temp = scope.alloc(4 * w * h);
        this.wasm.unpackMask(result, temp, w, h);
        dst.data.set(this.heap.f32(temp, w * h));
      }
      return dst;
    } finally {
      scope.end();
    }
  }

  /** Bit i of word k of row y set where pixel (32k + i, y) is not 0 (NaN counts, −0 does not); a copy in ordinary memory. */
  nonZeroWords(image: Image): Int32Array {
    const bits = this.owns(image) ? image.packedMask : null;
    if (bits) return withoutTailBits(this.heap.i32(bits.words, bits.wordsPerRow * image.height).slice(), image.width, bits.wordsPerRow);
    return this.read(image, (s, scope) => {
      const count = ((image.width + 31) >>> 5) * image.height;
      const words = scope.alloc(4 * count);
      this.wasm.packNonZero(s, image.width, image.height, words);
      return this.heap.i32(words, count).slice();
    });
  }

  /**
   * The quality gate's sums in double precision: Σv, the number of v ≥ top, Σlap and Σlap²
   * (4-neighbour Laplacian, reflect border). For 8-bit samples (whole numbers 0 … 255) they are
   * whole numbers, computed exactly, as cheaper integer and float32 arithmetic allows.
   */
  qualitySums(image: Image, top: number): QualitySums {
    return this.read(image, (s, scope) => {
      const out = scope.alloc(32);
      if (top === 255 && this.wasm.eightBitLevels(s, image.width * image.height) === 1) this.wasm.qualitySumsWhole8(s, image.width, image.height, out);
      else this.wasm.qualitySums(s, image.width, image.height, top, out, scope.alloc(this.wasm.wideRingBytes(image.width)));
      const [sum, clipped, lapSum, lapSquares] = new Float64Array(this.heap.memory.buffer, out, 4);
      return { sum, clipped, lapSum, lapSquares };
    });
  }

  /**
   * Over columns start[y] … end[y]−1 of each row y: Σv and Σ(v − mean)² (when `squares`) in double
   * precision, summed in another order than the plain engine's (last digits), and the smallest and
   * largest value with NaN left out, exactly (a minimum of ±0 may come out with the other sign).
   */
  regionStats(image: Image, start: Int32Array, end: Int32Array, squares: boolean, count: number): { sum: number; min: number; max: number; squares: number } {
    return this.read(image, (s, scope) => {
      const starts = scope.alloc(4 * image.height);
      const ends = scope.alloc(4 * image.height);
      const out = scope.alloc(16);
      this.heap.i32(starts, image.height).set(start);
      this.heap.i32(ends, image.height).set(end);
      this.wasm.regionSums(s, image.width, image.height, starts, ends, out);
      const sum = new Float64Array(this.heap.memory.buffer, out, 1)[0];
      const [min, max] = this.heap.f32(out + 8, 2);
      const sq = squares ? this.wasm.regionSquares(s, image.width, image.height, starts, ends, sum / count) : NaN;
      return { sum, min, max, squares: sq };
    });
  }

  /**
   * The image shrunk by a whole factor (each pixel its block's float32 mean, the sums in double
   * precision row by row) as 8-bit grey RGB, each mean mapped by display(smallest, largest mean) to
   * round(v·scale + shift) clamped to 0…255: server/vision/evidence.ts's plain loops, to the byte.
   */
  shrinkToGreyRgb(image: Image, factor: number, display: (min: number, max: number) => { scale: number; shift: number }): { width: number; height: number; rgb: Uint8Array } {
    const width = Math.ceil(image.width / factor);
    const height = Math.ceil(image.height / factor);
    return this.read(image, (s, scope) => {
      const means = scope.alloc(4 * width * height);
      const range = scope.alloc(16);
      this.wasm.shrinkMeans(s, image.width, image.height, factor, means, range);
      const [min, max] = new Float64Array(this.heap.memory.buffer, range, 2);
      const { scale, shift } = display(min, max);
      const rgb = scope.alloc(3 * width * height);
      this.wasm.greyRgb(means, width * height, scale, shift, rgb);
      return { width, height, rgb: new Uint8Array(this.heap.memory.buffer, rgb, 3 * width * height).slice() };
    });
  }

  /** The first pixel (raster order) in columns start[y] … end[y]−1 of each row y holding the largest or smallest value, NaN left out; −1 when none. */
  firstExtreme(image: Image, start: Int32Array, end: Int32Array, which: 'max' | 'min'): number {
    return this.read(image, (s, scope) => {
      const starts = scope.alloc(4 * image.height);
      const ends = scope.alloc(4 * image.height);
      this.heap.i32(starts, image.height).set(start);
      this.heap.i32(ends, image.height).set(end);
      return this.wasm.firstExtreme(s, image.width, image.height, starts, ends, which === 'max' ? 1 : 0);
    });
  }

  /** Pixels that are not 0 (NaN counts, −0 does not) in columns start[y] … end[y]−1 of each row y. */
  countNonZero(image: Image, start: Int32Array, end: Int32Array): number {
    const bits = this.owns(image) ? image.packedMask : null;
    if (bits) {
      const scope = new CallScope(this.heap);
      try {
        const starts = scope.alloc(4 * image.height);
        const ends = scope.alloc(4 * image.height);
        this.heap.i32(starts, image.height).set(start);
        this.heap.i32(ends, image.height).set(end);
        return this.wasm.countSetBits(bits.words, bits.wordsPerRow, image.width, image.height, starts, ends);
      } finally {
        scope.end();
      }
    }
    return this.read(image, (s, scope) => {
      const starts = scope.alloc(4 * image.height);
      const ends = scope.alloc(4 * image.height);
      this.heap.i32(starts, image.height).set(start);
      this.heap.i32(ends, image.height).set(end);
      return this.wasm.countNonZero(s, image.width, image.height, starts, ends);
    });
  }

  /**
   * wr·R + wg·G + wb·B of interleaved 8-bit RGB or RGBA samples into `out`, with the bits of the plain
   * engine's double-precision sum rounded once (see assembly/channels.ts); null when a weight is not
   * a whole number of thousandths from 0 to 1 (BT.601's are), which the kernel needs for that.
   */
  lumaRgb8(samples: Uint8Array, channels: 3 | 4, weights: LumaWeights, out: Image): Image | null {
    const thousandths = wholeThousandths(weights);
    if (!thousandths) return null;
    const pixels = out.width * out.height;
    const scope = new CallScope(this.heap);
    try {
      const src = scope.alloc(samples.length);
      new Uint8Array(this.heap.memory.buffer, src, samples.length).set(samples);
      const resident = this.owns(out);
      const dst = resident ? this.outputAddress(out) : scope.alloc(4 * pixels);
      this.wasm.lumaRgb8(src, channels, pixels, dst, thousandths[0], thousandths[1], thousandths[2]);
      if (!resident) out.data.set(this.heap.f32(dst, pixels));
    } finally {
      scope.end();
    }
    return out;
  }

  /**
   * An 8-bit photo's input image and its quality sums (top 255) in one pass over the rows: grey samples
   * as float32, their sums exact in whole numbers (a resident image keeps the bytes as its 8-bit copy);
   * colour to luma as lumaRgb8, the sums as qualitySums gives them for that image, to the bit. null
   * when the weights are not whole thousandths.
   */
  photoWithQualitySums(samples: Uint8Array, channels: 1 | 3 | 4, weights: LumaWeights, out: Image): QualitySums | null {
    const { width: w, height: h } = out;
    return this.fromPhoto(
      samples,
      channels,
      weights,
      out,
      (src, k, quality, dst, scope) => {
        if (channels === 1) this.wasm.grey8Quality(src, w, h, dst, quality);
        else this.wasm.lumaRgb8Quality(src, channels, w, h, dst, k[0], k[1], k[2], 255, quality, scope.alloc(this.wasm.wideRingBytes(w)));
      },
      true,
    );
  }

  /** Address of the image's samples in the module's memory: its own, or a copy for the call. */
  private addressOf(image: Image, scope: CallScope): number {
    if (this.owns(image)) {
      image.settle();
      return image.address;
    }
    return scope.f32(image.data);
  }

  /** Address of a resident image about to be overwritten (deferred samples it held are dropped). */
  private outputAddress(image: ResidentImage): number {
    image.discard();
    return image.address;
  }

  private read<T>(image: Image, fn: (address: number, scope: CallScope) => T): T {
    const scope = new CallScope(this.heap);
    try {
      return fn(this.addressOf(image, scope), scope);
    } finally {
      scope.end();
    }
  }

  /**
   * Runs a kernel from src into `out` (or a new image), copying in and out only what is not resident
   * (out only when the kernel writes the output image). `fromEightBit`: the kernel reads src's 8-bit
   * copy only, so samples src has not written yet stay unwritten.
   */
  private mapImage(src: Image, out: Image | undefined, kernel: (src: number, dst: number, scope: CallScope) => void, writesOutput = true, fromEightBit = false): Image {
    const dst = imageLike(src, out === src ? undefined : out);
    const scope = new CallScope(this.heap);
    try {
      const s = fromEightBit && this.owns(src) ? src.address : this.addressOf(src, scope);
      const resident = this.owns(dst);
      const d = resident ? this.outputAddress(dst) : scope.alloc(4 * dst.data.length);
      kernel(s, d, scope);
      if (!resident && writesOutput) dst.data.set(this.heap.f32(d, dst.data.length));
    } finally {
      scope.end();
    }
    return dst;
  }
}

/** Kernels correlate2d takes through the FFT. */
function isLarge(kernel: Kernel): boolean {
  return kernel.rows * kernel.cols >= FFT_KERNEL_TAPS && Math.max(kernel.rows, kernel.cols) <= FFT_KERNEL_SIDE;
}

/** Packed rows with the bits past the last column cleared (the morphology leaves them undefined). */
function withoutTailBits(words: Int32Array, width: number, wordsPerRow: number): Int32Array {
  const lastBits = width - ((wordsPerRow - 1) << 5);
  if (lastBits === 32) return words;
  const keep = (1 << lastBits) - 1;
  for (let last = wordsPerRow - 1; last < words.length; last += wordsPerRow) words[last] &= keep;
  return words;
}
