// Connected components: blobs are the 8-connected groups of non-zero pixels, optionally restricted
// to a region given as one span of columns per row, labelled over runs of set bits (run-labels.ts).
import { pendingMask } from './deferrable-image';
import { simdKernels } from './engine';
import type { Image } from './image';
import { nonZeroWordsLoop } from './kernel-loops';
import { sampleBits } from './ordered-keys';
import { blobsOfRuns, labelRuns } from './run-labels';

/** Per row y, the region holds columns start[y] ≤ x < end[y] (empty when start ≥ end). */
export interface RowSpans {
  readonly start: Int32Array;
  readonly end: Int32Array;
}

export interface Blob {
  readonly area: number;
  readonly minX: number;
  readonly minY: number;
  readonly maxX: number;
  readonly maxY: number;
}

export interface BlobLabels {
  /** Label per pixel: 0 background, 1 … count for blobs (numbered in raster order of first pixel). */
  readonly labels: Int32Array;
  readonly blobs: Blob[];
}

export function wholeImageSpans(width: number, height: number): RowSpans {
  return { start: new Int32Array(height), end: new Int32Array(height).fill(width) };
}

/**
 * Blobs through runs of set bits (run-labels.ts), the non-zero pixels packed 32 to a word first
 * (a run is labelled once instead of each of its pixels: 2.6× faster than a pixel scan, measured).
 * `labels`, when given with width × height entries, is cleared and reused for the image of labels.
 */
export function labelBlobs(image: Image, spans: RowSpans = wholeImageSpans(image.width, image.height), labels?: Int32Array): BlobLabels {
  return labelRuns(nonZeroWords(image), image.width, image.height, spans, labels);
}

/**
 * The blobs of labelBlobs without the image of labels, which gauges never read: at 5 MP that image
 * is 20 MB, written for every blob gauge of every inspection and collected after.
 */
export function findBlobs(image: Image, spans: RowSpans = wholeImageSpans(image.width, image.height)): Blob[] {
  return blobsOfRuns(nonZeroWords(image), image.width, image.height, spans);
}

function nonZeroWords(image: Image): Int32Array {
  const simd = simdKernels();
  if (simd) return simd.nonZeroWords(image);
  // A mask still in packed bits is its own non-zero words (bits past the last column are 0).
  return pendingMask(image)?.words ?? packNonZero(image);
}

/** Bit i of word k of row y set when pixel (32k + i, y) is not zero (NaN counts as not zero, −0 as zero, as `!== 0`). */
function packNonZero(image: Image): Int32Array {
  const { width: w, height: h, data } = image;
  const bits = sampleBits(data);
  const wordsPerRow = (w + 31) >>> 5;
  const words = new Int32Array(wordsPerRow * h);
  const generated = nonZeroWordsLoop();
  const full = generated ? w >>> 5 : 0;
  for (let y = 0; y < h; y++) {
    const row = y * w;
    if (generated) generated(bits, words, row, y * wordsPerRow, full);
    for (let k = full; k < wordsPerRow; k++) {
      const x0 = row + (k << 5);
      const n = Math.min(32, w - (k << 5));
      let word = 0;
      // Without the sign bit, ±0 is 0 and every other value (NaN included) is positive, so 0 minus it is negative.
      for (let i = 0; i < n; i++) word |= ((0 - (bits[x0 + i] & 0x7fffffff)) >>> 31) << i;
      words[y * wordsPerRow + k] = word;
    }
  }
  return words;
}
