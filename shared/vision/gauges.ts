// Gauges: measurements of a step's output inside a region, converted to the gauge's unit and
// compared with its limits (inclusive).
import type { Gauge, GaugeMeasure, GaugeUnit, Limits, Region } from '../rules/schema';
import type { PackedMask } from './binary-morphology';
import { findBlobs, wholeImageSpans, type RowSpans } from './blobs';
import { pendingMask } from './deferrable-image';
import { simdKernels } from './engine';
import type { Image } from './image';
import { sampleBits } from './ordered-keys';

/**
 * The region's pixels as one span of columns per row. A pixel belongs when its centre
 * (x + ½, y + ½) lies inside the shape; rect fractions are of the width (x, w) and height (y, h),
 * a circle's radius is a fraction of the shorter side.
 */
export function regionSpans(width: number, height: number, region?: Region): RowSpans {
  if (!region) return wholeImageSpans(width, height);
  const start = new Int32Array(height);
  const end = new Int32Array(height);
  if (region.shape === 'rect') {
    const x0 = Math.max(0, Math.ceil(region.x * width - 0.5));
    const x1 = Math.min(width, Math.ceil((region.x + region.w) * width - 0.5));
    const y0 = Math.max(0, Math.ceil(region.y * height - 0.5));
    const y1 = Math.min(height, Math.ceil((region.y + region.h) * height - 0.5));
    for (let y = y0; y < y1; y++) {
      start[y] = x0;
      end[y] = x1;
    }
    return { start, end };
  }
  const cx = region.cx * width;
  const cy = region.cy * height;
  const r = region.r * Math.min(width, height);
  for (let y = 0; y < height; y++) {
    const dy = y + 0.5 - cy;
    if (Math.abs(dy) > r) continue;
    const half = Math.sqrt(r * r - dy * dy);
    start[y] = Math.max(0, Math.ceil(cx - half - 0.5));
    end[y] = Math.min(width, Math.floor(cx + half - 0.5) + 1);
  }
  return { start, end };
}

export function spanPixelCount(spans: RowSpans): number {
  let n = 0;
  for (let y = 0; y < spans.start.length; y++) n += Math.max(0, spans.end[y] - spans.start[y]);
  return n;
}

/** Share of the region's pixels that are not 0 (NaN for an empty region). */
function nonZeroShare(image: Image, spans: RowSpans): number {
  const simd = simdKernels();
  if (simd) {
    const n = spanPixelCount(spans);
    return n === 0 ? NaN : simd.countNonZero(image, spans.start, spans.end) / n;
  }
  const packed = pendingMask(image);
  if (packed) return setBitShare(packed, spans);
  const w = image.width;
  // Float32 bit patterns: a value is non-zero (NaN included) exactly when a bit other than the sign is set.
  const bits = sampleBits(image.data);
  let n = 0;
  let set = 0;
  for (let y = 0; y < spans.start.length; y++) {
    const row = y * w;
    const start = spans.start[y];
    const end = spans.end[y];
    if (end <= start) continue;
    n += end - start;
    for (let p = row + start; p < row + end; p++) set += -(bits[p] & 0x7fffffff) >>> 31;
  }
  return n === 0 ? NaN : set / n;
}

/** nonZeroShare of a 0/1 mask from its packed bits: the set bits of each row's span, 32 columns a word. */
function setBitShare(mask: PackedMask, spans: RowSpans): number {
  const { wordsPerRow, words } = mask;
  let n = 0;
  let set = 0;
  for (let y = 0; y < spans.start.length; y++) {
    const start = spans.start[y];
    const end = spans.end[y];
    if (end <= start) continue;
    n += end - start;
    const row = y * wordsPerRow;
    const first = start >>> 5;
    const last = (end - 1) >>> 5;
    for (let k = first; k <= last; k++) {
      let word = words[row + k];
      if (k === first) word &= -1 << (start & 31);
      const past = end - (k << 5);
      if (k === last && past < 32) word &= (1 << past) - 1;
      set += bitCount(word);
    }
  }
  return n === 0 ? NaN : set / n;
}

/** Set bits of a 32-bit word, by the parallel sideways sum (H. S. Warren, Hacker's Delight, 2nd ed., §5-1). */
function bitCount(word: number): number {
  let v = word - ((word >>> 1) & 0x55555555);
  v = (v & 0x33333333) + ((v >>> 2) & 0x33333333);
  return Math.imul((v + (v >>> 4)) & 0x0f0f0f0f, 0x01010101) >>> 24;
}

/** The measure in pixel units (px, px²) or unitless; NaN for statistics of an empty region. */
export function measurePixels(image: Image, measure: GaugeMeasure, spans: RowSpans): number {
  const w = image.width;
  const height = spans.start.length;
  switch (measure) {
    case 'blob-count':
      return findBlobs(image, spans).length;
    case 'largest-blob-area':
      return findBlobs(image, spans).reduce((best, b) => Math.max(best, b.area), 0);
    case 'largest-blob-length': {
      const blobs = findBlobs(image, spans);
      if (blobs.length === 0) return 0;
      let largest = blobs[0];
      for (const b of blobs) if (b.area > largest.area) largest = b;
      return Math.max(largest.maxX - largest.minX + 1, largest.maxY - largest.minY + 1);
    }
    case 'edge-fraction':
      return nonZeroShare(image, spans);
    default:
      break;
  }
  const simd = simdKernels();
  if (simd) {
    const n = spanPixelCount(spans);
    if (n === 0) return NaN;
    const stats = simd.regionStats(image, spans.start, spans.end, measure === 'stddev', n);
    if (measure === 'mean') return stats.sum / n;
    if (measure === 'min') return stats.min;
    if (measure === 'max') return stats.max;
    return Math.sqrt(stats.squares / n);
  }
  // Read only here: the blob and edge measures above may count a mask from its packed bits.
  const data = image.data;
  let n = 0;
  let sum = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let y = 0; y < height; y++) {
    const row = y * w;
    for (let x = spans.start[y]; x < spans.end[y]; x++) {
      const v = data[row + x];
      n++;
      sum += v;
      if (v < min) min = v;
      if (v > max) max = v;
    }
  }
  if (n === 0) return NaN;
  switch (measure) {
    case 'mean':
      return sum / n;
    case 'min':
      return min;
    case 'max':
      return max;
    case 'stddev': {
      // Population standard deviation, second pass around the mean for accuracy.
      const mean = sum / n;
      let sq = 0;
      for (let y = 0; y < height; y++) {
        const row = y * w;
        for (let x = spans.start[y]; x < spans.end[y]; x++) {
          const d = data[row + x] - mean;
          sq += d * d;
        }
      }
      return Math.sqrt(sq / n);
    }
  }
}

/** Unit a gauge reports in: its own, or px / px² for length and area when it gives none. */
export function gaugeUnit(gauge: Pick<Gauge, 'measure' | 'unit'>): GaugeUnit | null {
  if (gauge.unit) return gauge.unit;
  if (gauge.measure === 'largest-blob-area') return 'px2';
  if (gauge.measure === 'largest-blob-length') return 'px';
  return null;
}

export function needsCalibration(gauge: Pick<Gauge, 'unit'>): boolean {
  return gauge.unit === 'mm' || gauge.unit === 'mm2';
}

/** Converts a pixel-unit value to the gauge's unit: mm = px·s, mm² = px²·s² with s in mm per pixel. */
export function toUnit(valuePx: number, unit: GaugeUnit | null, mmPerPx?: number): number {
  if (unit === 'mm' || unit === 'mm2') {
    if (!(mmPerPx !== undefined && mmPerPx > 0)) throw new RangeError(`a gauge in ${unit} needs the station's calibration (mm per pixel)`);
    return unit === 'mm' ? valuePx * mmPerPx : valuePx * mmPerPx * mmPerPx;
  }
  return valuePx;
}

/** Inclusive limits; a value that is not a number never passes. */
export function withinLimits(value: number, limits: Limits): boolean {
  if (Number.isNaN(value)) return false;
  if (limits.min !== undefined && value < limits.min) return false;
  if (limits.max !== undefined && value > limits.max) return false;
  return true;
}
