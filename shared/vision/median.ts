// Median filter over a square window with the rule's border.
// Integer samples (8- and 16-bit photos) use a running histogram per row, with the median tracked
// as the window slides (T. S. Huang, G. J. Yang, G. Y. Tang, "A fast two-dimensional median
// filtering algorithm", IEEE Trans. ASSP 27(1), 1979); other values use selection per window.
// The SIMD engine takes 3×3 and 5×5 through selection networks (wasm/assembly/median.ts), which give
// the same bits unless the image holds NaN or −0, and wider windows of whole numbers through this
// running histogram (wasm/assembly/median-histogram.ts); this code runs the rest.
import { borderTable, OUTSIDE, rowOffsetTable, type BorderMode } from './border';
import { padImage } from './convolve';
import { simdKernels } from './engine';
import { imageLike, type Image } from './image';

const HISTOGRAM_LEVELS = 65536;

export function medianFilter(src: Image, size: number, border: BorderMode, out?: Image): Image {
  const simd = size >= 3 ? simdKernels() : null;
  const selected = simd?.median(src, size, border, out);
  if (selected) return selected;
  const dst = imageLike(src, out);
  if (size === 1) {
    dst.data.set(src.data);
    return dst;
  }
  const levels = integerLevels(src.data);
  if (levels > 0) medianByHistogram(src, size, border, dst.data, levels);
  else medianBySelection(src, size, border, dst.data);
  return dst;
}

/** max + 1 when every sample is an integer in 0 … 65535 (the histogram size needed), else 0. */
function integerLevels(data: Float32Array): number {
  let max = 0;
  for (let p = 0; p < data.length; p++) {
    const v = data[p];
    if (!(v >= 0 && v < HISTOGRAM_LEVELS) || (v | 0) !== v) return 0;
    if (v > max) max = v;
  }
  return max + 1;
}

function medianByHistogram(src: Image, size: number, border: BorderMode, o: Float32Array, levels: number): void {
  const { width: w, height: h } = src;
  const r = (size - 1) >> 1;
  // Integer indices: a float-valued key would make every histogram access a slow generic lookup.
  const padded = Int32Array.from(padImage(src, r, r, border));
  const pw = w + 2 * r;
  const hist = new Int32Array(levels);
  const rank = (size * size - 1) >> 1; // 0-based rank of the median among size² values

  for (let y = 0; y < h; y++) {
    const top = y * pw;
    hist.fill(0);
    for (let j = 0; j < size; j++) {
      const row = top + j * pw;
      for (let i = 0; i < size; i++) hist[padded[row + i]]++;
    }
    // below = number of values < m; the median m satisfies below ≤ rank < below + hist[m].
    let m = 0;
    let below = 0;
    while (below + hist[m] <= rank) below += hist[m++];
    const base = y * w;
    o[base] = m;
    for (let x = 1; x < w; x++) {
      for (let j = 0; j < size; j++) {
        const row = top + j * pw + x;
        const vOut = padded[row - 1];
        const vIn = padded[row + size - 1];
        hist[vOut]--;
        hist[vIn]++;
        // Branch-free: (v − m) >> 31 is −1 when v < m, else 0 (integers well inside 32 bits).
        below += ((vOut - m) >> 31) - ((vIn - m) >> 31);
      }
      while (below > rank) below -= hist[--m];
      while (below + hist[m] <= rank) below += hist[m++];
      o[base + x] = m;
    }
  }
}

function medianBySelection(src: Image, size: number, border: BorderMode, o: Float32Array): void {
  const { width: w, height: h, data } = src;
  const r = (size - 1) >> 1;
  const rowOffsets = rowOffsetTable(h, w, r, r, border);
  const colTable = borderTable(w, r, r, border);
  const count = size * size;
  const rank = (count - 1) >> 1;
  const window = new Float64Array(count);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      let n = 0;
      for (let j = 0; j < size; j++) {
        const off = rowOffsets[y + j];
        for (let i = 0; i < size; i++) {
          const sx = colTable[x + i];
          window[n++] = off === OUTSIDE || sx === OUTSIDE ? 0 : data[off + sx];
        }
      }
      o[y * w + x] = selectRank(window, count, rank);
    }
  }
}

/** k-th smallest of values[0 … n-1] (Hoare's selection); reorders values. */
function selectRank(values: Float64Array, n: number, k: number): number {
  let lo = 0;
  let hi = n - 1;
  while (lo < hi) {
    const pivot = values[(lo + hi) >> 1];
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (values[i] < pivot) i++;
      while (values[j] > pivot) j--;
      if (i <= j) {
        const t = values[i];
        values[i] = values[j];
        values[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return values[k];
  }
  return values[k];
}
