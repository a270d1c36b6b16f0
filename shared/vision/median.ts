// Median filter over a square window with the rule's border.
// Integer samples (8- and 16-bit photos) use a running histogram per row, with the median tracked
// as the window slides (T. S. Huang, G. J. Yang, G. Y. Tang, "A fast two-dimensional median
// filtering algorithm", IEEE Trans. ASSP 27(1), 1979); other values use selection per window.
// The SIMD engine takes 3×3 and 5×5 through selection networks (wasm/assembly/median.ts), which give
// the same bits unless the image holds NaN or −0, and wider windows of whole numbers through this
// running histogram (wasm/assembly/median-histogram.ts); this code runs the rest.
import { borderTable, fillRowBorder, OUTSIDE, rowOffsetTable, type BorderMode } from './border';
import { simdKernels } from './engine';
import { imageLike, type Image } from './image';
import { histogramMedianRowLoop, type MedianRowLoop } from './kernel-loops';
import { keysOf, maxKey, minKey, sampleBits, sampleOrder, samplesFromKeys } from './ordered-keys';

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
  // Most images are of +0 and above without NaN: tried first, checking each row as it comes in.
  if (size === 3 && median3OfNonNegative(src, border, dst.data)) return dst;
  const order = size === 3 ? sampleOrder(src.data) : 'unordered';
  if (order !== 'unordered') {
    median3BySortedColumns(src, border, dst.data, order === 'non-negative');
    return dst;
  }
  if (!medianByHistogram(src, size, border, dst.data)) medianBySelection(src, size, border, dst.data);
  return dst;
}

/**
 * The running-histogram median of whole numbers in 0 … 65535 (8- and 16-bit photos); false, leaving
 * the output to be overwritten, as soon as a source row holds another value. The check is made as
 * each row is converted to integers (a pass of its own over the image before: 5 MP, one CPU, the 5×5
 * median 33.8–34.5 → 31.4–32.3 ns/px), and the histogram is cleared only up to the largest level met so far.
 */
function medianByHistogram(src: Image, size: number, border: BorderMode, o: Float32Array): boolean {
  const { width: w, height: h, data } = src;
  const r = (size - 1) >> 1;
  const pw = w + 2 * r;
  // The padded rows a window needs, in a ring of `size` rows (padded row t in slot t mod size), as
  // integers: a float-valued key would make every histogram access a slow generic lookup.
  const ring = new Int32Array(size * pw);
  const rowsAt = new Int32Array(size);
  const colTable = borderTable(w, r, r, border);
  const rowTable = borderTable(h, r, r, border);
  let top = 0;
  /** Padded row t into its slot; false when the source row holds a value that is not a level. */
  const fill = (t: number): boolean => {
    const sy = rowTable[t];
    const slot = (t % size) * pw;
    if (sy === OUTSIDE) {
      ring.fill(0, slot, slot + pw);
      return true;
    }
    const largest = levelsRow(data, sy * w, w, ring, slot + r);
    if (largest < 0) return false;
    if (largest > top) top = largest;
    fillRowBorder(ring.subarray(slot, slot + pw), w, r, colTable);
    return true;
  };
  for (let t = 0; t < size - 1; t++) if (!fill(t)) return false;
  const hist = new Int32Array(HISTOGRAM_LEVELS);
  const generated = histogramMedianRowLoop(size);
  for (let y = 0; y < h; y++) {
    if (!fill(y + size - 1)) return false;
    for (let j = 0; j < size; j++) rowsAt[j] = ((y + j) % size) * pw;
    medianRowByHistogram(ring, rowsAt, w, size, hist, top + 1, o, y * w, generated);
  }
  return true;
}

/**
 * ring[at + s] = data[from + s] for s < w when every one of them is a whole number in 0 … 65535
 * (−0 as 0): returns the largest, or −1 as soon as one is not (NaN, a fraction, out of range).
 */
function levelsRow(data: Float32Array, from: number, w: number, ring: Int32Array, at: number): number {
  let largest = 0;
  let stray = 0;
  for (let s = 0; s < w; s++) {
    const v = data[from + s];
    const level = v | 0;
    // A fraction, NaN or ±∞ differs from its integer part; a negative or too large level has bits from 16 up.
    stray |= +(level !== v) | (level >>> 16);
    largest = largest > level ? largest : level;
    ring[at + s] = level;
  }
  return stray === 0 ? largest : -1;
}

/**
 * One output row of the running-histogram median from the padded rows at rowsAt[0 … size−1]: the
 * first window counted whole, then each step right drops a column and adds one (the generated loop
 * for the size, or the general one). A function of its own, warmed up when the module loads
 * (warmUpMedianRows), so that the optimising compiler sees every statement with type feedback
 * instead of compiling the first photo's long loop on-stack (tests/bench: 29–42 ns/px for the same
 * 5×5 median from one process to the next before).
 */
function medianRowByHistogram(padded: Int32Array, rowsAt: Int32Array, w: number, size: number, hist: Int32Array, levels: number, o: Float32Array, base: number, generated: MedianRowLoop | null): void {
  const rank = (size * size - 1) >> 1; // 0-based rank of the median among size² values
  hist.fill(0, 0, levels);
  for (let j = 0; j < size; j++) {
    const row = rowsAt[j];
    for (let i = 0; i < size; i++) hist[padded[row + i]]++;
  }
  // below = number of values < m; the median m satisfies below ≤ rank < below + hist[m].
  let m = 0;
  let below = 0;
  while (below + hist[m] <= rank) below += hist[m++];
  o[base] = m;
  if (generated) {
    generated(padded, rowsAt, w, hist, o, base, m, below, rank);
    return;
  }
  for (let x = 1; x < w; x++) {
    for (let j = 0; j < size; j++) {
      const row = rowsAt[j] + x;
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

/** Runs the row functions on short rows when the module loads (see medianRowByHistogram). */
function warmUpMedianRows(): void {
  const w = 8;
  const padded = Int32Array.from({ length: 7 * (w + 6) }, (_, i) => (i * 7) % 11);
  const hist = new Int32Array(16);
  const o = new Float32Array(w);
  for (let i = 0; i < 6; i++) {
    for (const size of [3, 5, 7]) medianRowByHistogram(padded, Int32Array.from({ length: size }, (_, j) => j * (w + size - 1)), w, size, hist, 16, o, 0, null);
    median3Row(padded.subarray(0, w), padded.subarray(w, 2 * w), padded.subarray(2 * w, 3 * w), w, 1, OUTSIDE, sampleBits(o), 0);
  }
}

/**
 * 3×3 median with each column of three sorted once per row (it serves three windows): the window's
 * median is the median of the largest of the three lows, the middle of the three middles and the
 * smallest of the three highs (the 3×3 sorting network: columns, rows, then the anti-diagonal;
 * common practice, from memory). Samples hold no NaN or −0 (see sampleOrder), so they are compared
 * as integer keys that sort as the values do (ordered-keys.ts), with minima and maxima that need no
 * branch (a branch per comparison mispredicts on noisy pixels: four times slower, measured).
 * The columns are sorted as the window reaches them (median3Row, warmed up: 5 MP, one CPU,
 * 13.5 → 11.0 ns/px against sorting a row's columns into arrays first).
 */
function median3BySortedColumns(src: Image, border: BorderMode, o: Float32Array, nonNegative: boolean): void {
  const { width: w, height: h, data } = src;
  const out = sampleBits(o);
  // Samples of +0 and above sort by their bit patterns; others are compared as keys, converted once
  // here and back at the end (converting in the column sorts did it three times per sample: 8 % slower).
  const keys = keysOf(data, nonNegative ? 'non-negative' : 'ordered');
  median3Rows(keys, w, h, border, out, false);
  if (!nonNegative) samplesFromKeys(out);
}

/** Every output row of the 3×3 median of the key image; with `checked`, false at the first row below an output row that holds a key outside +0 … +∞. */
function median3Rows(keys: Int32Array, w: number, h: number, border: BorderMode, out: Int32Array, checked: boolean): boolean {
  const rowOffsets = rowOffsetTable(h, w, 1, 1, border);
  const colTable = borderTable(w, 1, 1, border);
  // The key of +0 is 0: rows outside the image under the constant border.
  const zeros = new Int32Array(w);
  const left = colTable[0];
  const right = colTable[w + 1];
  for (let y = 0; y < h; y++) {
    const upOff = rowOffsets[y];
    const downOff = rowOffsets[y + 2];
    const up = upOff === OUTSIDE ? zeros : keys.subarray(upOff, upOff + w);
    const centre = keys.subarray(y * w, y * w + w);
    const down = downOff === OUTSIDE ? zeros : keys.subarray(downOff, downOff + w);
    const outside = median3Row(up, centre, down, w, left, right, out, y * w);
    if (checked && outside < 0) return false;
  }
  return true;
}

/**
 * median3BySortedColumns for an image whose samples are all +0 and above, without NaN (their bit
 * patterns are their keys), checking each row as the column sorts first read it instead of a pass of
 * its own over the image first (`sampleOrder`: 5 MP, one CPU, 14.1–15.1 → 12.3–13.5 ns/px). False as
 * soon as a row holds another value; the caller then decides the path and overwrites the output.
 */
function median3OfNonNegative(src: Image, border: BorderMode, o: Float32Array): boolean {
  const { width: w, height: h, data } = src;
  const keys = sampleBits(data);
  // Row 0 is never the row below another; every other row is, for the output row above it.
  if (outsideNonNegative(keys, 0, w) < 0) return false;
  return median3Rows(keys, w, h, border, sampleBits(o), true);
}

/** Negative when a bit pattern of keys[from … from+n−1] is not that of +0 … +∞ (a negative value, −0 or NaN). */
function outsideNonNegative(keys: Int32Array, from: number, n: number): number {
  let outside = 0;
  for (let i = 0; i < n; i++) outside |= patternOutside(keys[from + i]);
  return outside;
}

/** (+∞'s pattern − k) | k: the sign bit is set exactly when k is below 0 or above +∞'s pattern (NaN). */
function patternOutside(k: number): number {
  return (0x7f800000 - k) | k;
}

/**
 * One output row of the 3×3 median from the key rows a, b, c (columns −1 and w: `left` and `right`
 * of the border table, key 0 outside). Each column is sorted once, into locals, as the window
 * slides right (no arrays of lows, middles and highs between the sort and the windows); two
 * windows per iteration share their two middle columns' comparisons.
 */
function median3Row(a: Int32Array, b: Int32Array, c: Int32Array, w: number, left: number, right: number, out: Int32Array, base: number): number {
  // Column −1, then column 0: (low, middle, high) of each.
  const sorted = COLUMN;
  sortColumn(a, b, c, left, sorted);
  let l0 = sorted[0], m0 = sorted[1], h0 = sorted[2];
  sortColumn(a, b, c, 0, sorted);
  let l1 = sorted[0], m1 = sorted[1], h1 = sorted[2];
  let outside = patternOutside(c[0]);
  let x = 0;
  for (; x + 2 < w; x += 2) {
    const u2 = a[x + 1], v2 = b[x + 1], t2 = c[x + 1];
    outside |= patternOutside(t2);
    const lo2 = minKey(u2, v2), hi2 = maxKey(u2, v2);
    const l2 = minKey(lo2, t2), h2 = maxKey(hi2, t2), m2 = maxKey(lo2, minKey(hi2, t2));
    const u3 = a[x + 2], v3 = b[x + 2], t3 = c[x + 2];
    outside |= patternOutside(t3);
    const lo3 = minKey(u3, v3), hi3 = maxKey(u3, v3);
    const l3 = minKey(lo3, t3), h3 = maxKey(hi3, t3), m3 = maxKey(lo3, minKey(hi3, t3));
    const lowPair = maxKey(l1, l2);
    const highPair = minKey(h1, h2);
    const lowMiddle = minKey(m1, m2);
    const highMiddle = maxKey(m1, m2);
    const maxLow0 = maxKey(l0, lowPair);
    const minHigh0 = minKey(h0, highPair);
    const middle0 = maxKey(lowMiddle, minKey(highMiddle, m0));
    out[base + x] = maxKey(minKey(maxLow0, middle0), minKey(maxKey(maxLow0, middle0), minHigh0));
    const maxLow1 = maxKey(lowPair, l3);
    const minHigh1 = minKey(highPair, h3);
    const middle1 = maxKey(lowMiddle, minKey(highMiddle, m3));
    out[base + x + 1] = maxKey(minKey(maxLow1, middle1), minKey(maxKey(maxLow1, middle1), minHigh1));
    l0 = l2;
    m0 = m2;
    h0 = h2;
    l1 = l3;
    m1 = m3;
    h1 = h3;
  }
  for (; x < w; x++) {
    // Column x+1, or column w from the border.
    if (x + 1 < w) outside |= patternOutside(c[x + 1]);
    sortColumn(a, b, c, x + 1 < w ? x + 1 : right, sorted);
    const l2 = sorted[0], m2 = sorted[1], h2 = sorted[2];
    const maxLow = maxKey(maxKey(l0, l1), l2);
    const minHigh = minKey(minKey(h0, h1), h2);
    const middle = maxKey(minKey(m0, m1), minKey(maxKey(m0, m1), m2));
    out[base + x] = maxKey(minKey(maxLow, middle), minKey(maxKey(maxLow, middle), minHigh));
    l0 = l1;
    m0 = m1;
    h0 = h1;
    l1 = l2;
    m1 = m2;
    h1 = h2;
  }
  return outside;
}

/** Scratch for sortColumn's (low, middle, high). */
const COLUMN = new Int32Array(3);

/** into = (low, middle, high) of column col of the key rows a, b, c; the key 0 three times for OUTSIDE. */
function sortColumn(a: Int32Array, b: Int32Array, c: Int32Array, col: number, into: Int32Array): void {
  if (col === OUTSIDE) {
    into.fill(0);
    return;
  }
  const u = a[col], v = b[col], t = c[col];
  const lo = minKey(u, v), hi = maxKey(u, v);
  into[0] = minKey(lo, t);
  into[1] = maxKey(lo, minKey(hi, t));
  into[2] = maxKey(hi, t);
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

// Last, once every constant of the module is initialised.
warmUpMedianRows();
