// Morphology of 0/1 masks on packed bits: 32 pixels per 32-bit word, so the square element's
// minimum (erosion) is an AND and its maximum (dilation) an OR over rows and shifted words.
// Same results as the value path in morphology.ts for masks; other images go there instead.
import type { MorphologyOp } from '../rules/schema';
import type { BorderMode } from './border';
import { DeferrableImage, FLOAT_ONE_BITS, pendingMask, unpackMask } from './deferrable-image';
import { simdKernels } from './engine';
import { imageLike, type Image } from './image';
import { maskWordsLoop } from './kernel-loops';
import { sampleBits } from './ordered-keys';

/** Radius the packed path handles: a shift must stay within the neighbouring word. */
export const MAX_PACKED_RADIUS = 31;

/** A mask packed row by row: bit i of word k of row y is pixel (32k + i, y); bits past the last column are 0. */
export interface PackedMask {
  readonly width: number;
  readonly height: number;
  readonly wordsPerRow: number;
  readonly words: Int32Array;
}

/**
 * Packs an image whose every value is 0 or 1; null as soon as another value turns up.
 * Bits past the last column are left 0. Works on the bit patterns: 1.0 is 0x3f800000 (bit 29 set),
 * +0 is 0; anything else (−0 included) sends that word through the exact float comparison.
 */
function packMask(src: Image): PackedMask | null {
  const { width: w, height: h, data } = src;
  const bits = sampleBits(data);
  const wordsPerRow = (w + 31) >>> 5;
  const words = new Int32Array(wordsPerRow * h);
  const generated = maskWordsLoop(FLOAT_ONE_BITS);
  const full = w >>> 5;
  for (let y = 0; y < h; y++) {
    const row = y * w;
    const wordRow = y * wordsPerRow;
    // The generated loop stops at a word with another pattern; the loop below takes that one and the rest.
    const from = generated ? generated(bits, words, row, wordRow, 0, full) : 0;
    for (let k = from; k < wordsPerRow; k++) {
      const x0 = row + (k << 5);
      const n = Math.min(32, w - (k << 5));
      let word = 0;
      let stray = 0;
      for (let i = 0; i < n; i++) {
        const b = bits[x0 + i];
        const one = (b >>> 29) & 1;
        word |= one << i;
        stray |= b ^ (one * FLOAT_ONE_BITS);
      }
      if (stray !== 0) {
        const exact = packWordByValue(data, x0, n);
        if (exact === null) return null;
        word = exact;
      }
      words[wordRow + k] = word;
    }
  }
  return { width: w, height: h, wordsPerRow, words };
}

/** One word from n samples compared as numbers (so −0 counts as 0); null for a value other than 0 and 1. */
function packWordByValue(data: Float32Array, x0: number, n: number): number | null {
  let word = 0;
  for (let i = 0; i < n; i++) {
    const v = data[x0 + i];
    if (v !== 0 && v !== 1) return null;
    word |= (v === 1 ? 1 : 0) << i;
  }
  return word;
}

/**
 * Erosion (AND) or dilation (OR) over the square of side 2r+1. `outside` is the value of every
 * position outside the image: the identity of the operation (ignored pixels) or 0 (constant border).
 */
function packedExtreme(src: PackedMask, r: number, takeMax: boolean, outside: 0 | 1): PackedMask {
  const { width: w, height: h, wordsPerRow: n, words } = src;
  const dst = new Int32Array(n * h);
  const identity = takeMax ? 0 : -1;
  const fill = outside ? -1 : 0;
  const lastBits = w - ((n - 1) << 5);
  // Bits past the last column read as outside the image.
  const tailMask = lastBits === 32 ? 0 : -1 << lastBits;
  const tailFill = fill & tailMask;
  // One row of the vertical result, with a word of outside values on each side.
  const line = new Int32Array(n + 2);
  line[0] = fill;
  line[n + 1] = fill;
  for (let y = 0; y < h; y++) {
    const top = y - r;
    const bottom = y + r;
    const reachesOutside = top < 0 || bottom >= h;
    if (reachesOutside && fill !== identity) {
      // An outside row decides the whole row: all 0 for erosion with the constant border.
      dst.fill(fill, y * n, y * n + n);
      continue;
    }
    const first = Math.max(0, top);
    const last = Math.min(h - 1, bottom);
    for (let k = 0; k < n; k++) line[k + 1] = words[first * n + k];
    if (takeMax) {
      for (let j = first + 1; j <= last; j++) {
        const base = j * n - 1;
        for (let k = 1; k <= n; k++) line[k] |= words[base + k];
      }
    } else {
      for (let j = first + 1; j <= last; j++) {
        const base = j * n - 1;
        for (let k = 1; k <= n; k++) line[k] &= words[base + k];
      }
    }
    line[n] = (line[n] & ~tailMask) | tailFill;
    const out = y * n - 1;
    for (let k = 1; k <= n; k++) {
      const prev = line[k - 1];
      const cur = line[k];
      const next = line[k + 1];
      let acc = cur;
      if (takeMax) {
        for (let s = 1; s <= r; s++) acc |= (cur << s) | (prev >>> (32 - s)) | (cur >>> s) | (next << (32 - s));
      } else {
        for (let s = 1; s <= r; s++) acc &= ((cur << s) | (prev >>> (32 - s))) & ((cur >>> s) | (next << (32 - s)));
      }
      dst[out + k] = acc;
    }
  }
  return { width: w, height: h, wordsPerRow: n, words: dst };
}

/**
 * The step on a 0/1 mask through packed bits, or null when the image holds other values.
 * With reflect and replicate, positions outside the image never change a minimum or maximum over
 * the square (they repeat pixels within reach); constant brings in zeros.
 * `packed`, when the previous step wrote `src` in packed form too (see `thresholdOtsu`), is used
 * instead of packing `src` again.
 */
export function binaryMorphology(src: Image, op: MorphologyOp, radius: number, border: BorderMode, out?: Image, packed?: PackedMask): Image | null {
  if (radius < 1 || radius > MAX_PACKED_RADIUS) return null;
  const given = packed && packed.width === src.width && packed.height === src.height ? packed : null;
  const simd = simdKernels();
  if (simd) return simd.binaryMorphology(src, op, radius, border, out, given ?? undefined);
  const source = given ?? pendingMask(src) ?? packMask(src);
  if (!source) return null;
  const erodeOutside: 0 | 1 = border === 'constant' ? 0 : 1;
  const erodeOnce = (m: PackedMask) => packedExtreme(m, radius, false, erodeOutside);
  const dilateOnce = (m: PackedMask) => packedExtreme(m, radius, true, 0);
  let result: PackedMask;
  switch (op) {
    case 'erode':
      result = erodeOnce(source);
      break;
    case 'dilate':
      result = dilateOnce(source);
      break;
    case 'open':
      result = dilateOnce(erodeOnce(source));
      break;
    case 'close':
      result = erodeOnce(dilateOnce(source));
      break;
  }
  // A workspace image keeps the result in bits until its samples are read.
  if (out instanceof DeferrableImage && out.width === src.width && out.height === src.height) {
    out.defer(result);
    return out;
  }
  const dst = imageLike(src, out);
  unpackMask(result, dst.data);
  return dst;
}
