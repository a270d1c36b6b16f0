// Morphology with a square structuring element of side 2r+1: erosion is the minimum over the
// square, dilation the maximum, each computed as a vertical then a horizontal 1-D pass.
// The rule's border applies: reflect and replicate never bring in a value from outside the
// square's reach, constant brings in 0 (OpenCV erode/dilate with BORDER_CONSTANT, value 0).
// Masks (every value 0 or 1) go through packed bits (binary-morphology.ts); this file is the
// path for any other values.
import type { MorphologyOp } from '../rules/schema';
import { binaryMorphology, type PackedMask } from './binary-morphology';
import { borderTable, fillRowBorder, OUTSIDE, rowOffsetTable, type BorderMode } from './border';
import { simdKernels } from './engine';
import { createImage, imageLike, type Image } from './image';
import { keysOf, minKey, sampleBits, sampleOrder, samplesFromKeys } from './ordered-keys';

export function erode(src: Image, radius: number, border: BorderMode, out?: Image): Image {
  return binaryMorphology(src, 'erode', radius, border, out) ?? extremeFilter(src, radius, border, false, out);
}

export function dilate(src: Image, radius: number, border: BorderMode, out?: Image): Image {
  return binaryMorphology(src, 'dilate', radius, border, out) ?? extremeFilter(src, radius, border, true, out);
}

/**
 * Opening (erode then dilate) removes specks; closing (dilate then erode) fills pinholes.
 * `packed`: the same mask already in packed bits, from the step that wrote it.
 */
export function morphology(src: Image, op: MorphologyOp, radius: number, border: BorderMode, out?: Image, scratch?: Image, packed?: PackedMask): Image {
  return binaryMorphology(src, op, radius, border, out, packed) ?? valueMorphology(src, op, radius, border, out, scratch);
}

/** The value path of every operation, for any image (the reference the packed mask path is tested against). */
export function valueMorphology(src: Image, op: MorphologyOp, radius: number, border: BorderMode, out?: Image, scratch?: Image): Image {
  switch (op) {
    case 'erode':
      return extremeFilter(src, radius, border, false, out);
    case 'dilate':
      return extremeFilter(src, radius, border, true, out);
    case 'open':
    case 'close': {
      // The scratch must not be the source: the first pass reads the source while it writes the scratch.
      const tmp = scratch && scratch !== out && scratch.data !== src.data ? imageLike(src, scratch) : createImage(src.width, src.height);
      const order = simdKernels() ? 'unordered' : sampleOrder(src.data);
      if (order === 'unordered') {
        const first = extremeFilter(src, radius, border, op !== 'open', tmp);
        return extremeFilter(first, radius, border, op === 'open', out);
      }
      // Keys from one pass to the next: converted once in and once out (the scratch holds keys).
      const dst = imageLike(src, out);
      const { width: w, height: h } = src;
      extremeOfKeys(keysOf(src.data, order), w, h, radius, border, op !== 'open', sampleBits(tmp.data));
      extremeOfKeys(sampleBits(tmp.data), w, h, radius, border, op === 'open', sampleBits(dst.data));
      if (order === 'ordered') samplesFromKeys(sampleBits(dst.data));
      return dst;
    }
  }
}

/** Minimum (erosion) or maximum (dilation) over the square of side 2r+1, vertical then horizontal. */
function extremeFilter(src: Image, r: number, border: BorderMode, takeMax: boolean, out?: Image): Image {
  const simd = simdKernels();
  if (simd) return simd.extreme(src, r, border, takeMax, out);
  const order = sampleOrder(src.data);
  if (order !== 'unordered') {
    const dst = imageLike(src, out === src ? undefined : out);
    extremeOfKeys(keysOf(src.data, order), src.width, src.height, r, border, takeMax, sampleBits(dst.data));
    if (order === 'ordered') samplesFromKeys(sampleBits(dst.data));
    return dst;
  }
  const { width: w, height: h, data } = src;
  const dst = imageLike(src, out === src ? undefined : out);
  const o = dst.data;
  const size = 2 * r + 1;
  const rowOffsets = rowOffsetTable(h, w, r, r, border);
  const colTable = borderTable(w, r, r, border);
  const line = new Float32Array(w + 2 * r);
  const zeros = new Float32Array(w);
  const rows: Float32Array[] = new Array(size);
  for (let y = 0; y < h; y++) {
    for (let j = 0; j < size; j++) {
      const off = rowOffsets[y + j];
      rows[j] = off === OUTSIDE ? zeros : data.subarray(off, off + w);
    }
    // Vertical pass into line[r … r+w−1], then the border, then the horizontal pass.
    if (takeMax) verticalMax(rows, w, line, r);
    else verticalMin(rows, w, line, r);
    fillRowBorder(line, w, r, colTable);
    if (takeMax) horizontalMax(line, size, w, o, y * w);
    else horizontalMin(line, size, w, o, y * w);
  }
  return dst;
}

function verticalMin(rows: Float32Array[], w: number, line: Float32Array, pad: number): void {
  if (rows.length === 3) {
    const a = rows[0], b = rows[1], c = rows[2];
    for (let x = 0; x < w; x++) {
      const u = a[x], v = b[x], t = c[x];
      const m = u < v ? u : v;
      line[pad + x] = m < t ? m : t;
    }
    return;
  }
  line.set(rows[0], pad);
  for (let j = 1; j < rows.length; j++) {
    const row = rows[j];
    for (let x = 0; x < w; x++) if (row[x] < line[pad + x]) line[pad + x] = row[x];
  }
}

function verticalMax(rows: Float32Array[], w: number, line: Float32Array, pad: number): void {
  if (rows.length === 3) {
    const a = rows[0], b = rows[1], c = rows[2];
    for (let x = 0; x < w; x++) {
      const u = a[x], v = b[x], t = c[x];
      const m = u > v ? u : v;
      line[pad + x] = m > t ? m : t;
    }
    return;
  }
  line.set(rows[0], pad);
  for (let j = 1; j < rows.length; j++) {
    const row = rows[j];
    for (let x = 0; x < w; x++) if (row[x] > line[pad + x]) line[pad + x] = row[x];
  }
}

function horizontalMin(line: Float32Array, size: number, w: number, o: Float32Array, base: number): void {
  if (size === 3) {
    for (let x = 0; x < w; x++) {
      const u = line[x], v = line[x + 1], t = line[x + 2];
      const m = u < v ? u : v;
      o[base + x] = m < t ? m : t;
    }
    return;
  }
  for (let x = 0; x < w; x++) {
    let m = line[x];
    for (let i = 1; i < size; i++) if (line[x + i] < m) m = line[x + i];
    o[base + x] = m;
  }
}

function horizontalMax(line: Float32Array, size: number, w: number, o: Float32Array, base: number): void {
  if (size === 3) {
    for (let x = 0; x < w; x++) {
      const u = line[x], v = line[x + 1], t = line[x + 2];
      const m = u > v ? u : v;
      o[base + x] = m > t ? m : t;
    }
    return;
  }
  for (let x = 0; x < w; x++) {
    let m = line[x];
    for (let i = 1; i < size; i++) if (line[x + i] > m) m = line[x + i];
    o[base + x] = m;
  }
}

/**
 * The minimum (maximum with takeMax) over the square of side 2r+1, from keys into out, as keys:
 * keys of an image without NaN or −0 sort as its values (ordered-keys.ts), so every minimum and
 * maximum is exact and needs no branch (a branch per
 * comparison mispredicts on noisy pixels). A maximum is the minimum of the keys' complements (~k
 * reverses the order), so one minimum path serves both. Down the image and along the row alike,
 * minima over runs of 1, 2, 4 … L (L the largest power of two within the window) are built from the
 * runs half as long, and each window is the minimum of two runs of L that cover it (down the image
 * from the input rows read in place, a maximum's complements taken on the way, the runs kept in rings
 * of the rows still needed; along the row in place, or in registers for r ≤ 3) (log₂L + 1
 * operations per pixel: the sparse table of range-minimum queries, M. A. Bender and
 * M. Farach-Colton, "The LCA Problem Revisited", LATIN 2000).
 */
function extremeOfKeys(keysIn: Int32Array, w: number, h: number, r: number, border: BorderMode, takeMax: boolean, out: Int32Array): void {
  const size = 2 * r + 1;
  const n = w + 2 * r;
  const flip = takeMax ? -1 : 0;
  const rowOffsets = rowOffsetTable(h, w, r, r, border);
  const colTable = borderTable(w, r, r, border);
  let run = 1;
  let levels = 0;
  while (run * 2 <= size) {
    run *= 2;
    levels++;
  }
  // levels[l] holds the minima of runs of 2^l table rows starting at t, in a ring of the rows still
  // needed: a run of 2^(l+1) reads the runs at t and t + 2^l; the output reads the top runs at y and y + size − run.
  const ringSize = (l: number) => (l < levels ? (1 << l) + 1 : size - run + 1);
  const zeroRow = new Int32Array(w);
  const rings: Int32Array[][] = Array.from({ length: levels + 1 }, (_, l) => Array.from({ length: ringSize(l) }, () => (l === 0 ? zeroRow : new Int32Array(w))));
  const line = new Int32Array(n);
  const inputs = rings[0];
  for (let t = 0; t < h + 2 * r; t++) {
    // Table entry t is image row t − r (an outside row holds the value 0); the rows are read in
    // place, a maximum's complement taken as the first runs read them.
    const off = rowOffsets[t];
    inputs[t % inputs.length] = off === OUTSIDE ? zeroRow : keysIn.subarray(off, off + w);
    const y = t - 2 * r;
    if (y >= 0 && levels <= 2) {
      // Every run length has a new row at each t from here: all of them in one sweep along the row.
      columnRunsInOneSweep(rings, t, levels, y, size - run, w, flip, line, r);
    } else {
      for (let l = 1; l <= levels; l++) {
        const start = t - (1 << l) + 1;
        if (start < 0) break;
        const below = rings[l - 1];
        minOfRows(below[start % below.length], below[(start + (1 << (l - 1))) % below.length], rings[l][start % rings[l].length], w, 0, l === 1 ? flip : 0);
      }
      if (y < 0) continue;
      const top = rings[levels];
      minOfRows(top[y % top.length], top[(y + size - run) % top.length], line, w, r, 0);
    }
    windowMinima(line, w, r, run, colTable, flip, out, y * w);
  }
}

/**
 * The runs of 2 (and 4, with two levels) that start at table rows t − 1 (and t − 3), and the
 * window's minimum of the oldest and newest top runs into line, in one pass: the new runs stay in
 * registers for the next level, stored once for the rows after.
 */
function columnRunsInOneSweep(rings: Int32Array[][], t: number, levels: number, y: number, gap: number, w: number, flip: number, line: Int32Array, pad: number): void {
  const inputs = rings[0];
  const upper = inputs[(t - 1) % inputs.length];
  const lower = inputs[t % inputs.length];
  const pairs = rings[1];
  const newPairs = pairs[(t - 1) % pairs.length];
  if (levels === 1) {
    const oldest = pairs[y % pairs.length];
    for (let x = 0; x < w; x++) {
      const pair = minKey(upper[x] ^ flip, lower[x] ^ flip);
      newPairs[x] = pair;
      line[pad + x] = minKey(oldest[x], pair);
    }
    return;
  }
  const olderPairs = pairs[(t - 3) % pairs.length];
  const fours = rings[2];
  const newFours = fours[(y + gap) % fours.length];
  const oldest = fours[y % fours.length];
  for (let x = 0; x < w; x++) {
    const pair = minKey(upper[x] ^ flip, lower[x] ^ flip);
    newPairs[x] = pair;
    const four = minKey(olderPairs[x], pair);
    newFours[x] = four;
    line[pad + x] = minKey(oldest[x], four);
  }
}

/** into[pad + x] = the smaller key of a[x] ^ flip and b[x] ^ flip. */
function minOfRows(a: Int32Array, b: Int32Array, into: Int32Array, w: number, pad: number, flip: number): void {
  for (let x = 0; x < w; x++) into[pad + x] = minKey(a[x] ^ flip, b[x] ^ flip);
}

/** Fills the line's border, then out[base + x] = the minimum of line[x … x+2r] (the flip undone). */
function windowMinima(line: Int32Array, w: number, r: number, run: number, colTable: Int32Array, flip: number, out: Int32Array, base: number): void {
  const n = w + 2 * r;
  for (let t = 0; t < r; t++) {
    const left = colTable[t];
    line[t] = left === OUTSIDE ? flip : line[r + left];
    const right = colTable[r + w + t];
    line[r + w + t] = right === OUTSIDE ? flip : line[r + right];
  }
  if (r <= 3) {
    windowMinimaInRegisters(line, w, r, flip, out, base);
    return;
  }
  // In place, ascending: line[x + step] is still the shorter run when line[x] reads it.
  for (let step = 1; step < run; step *= 2) {
    for (let x = 0; x + step < n; x++) line[x] = minKey(line[x], line[x + step]);
  }
  const second = 2 * r + 1 - run;
  for (let x = 0; x < w; x++) out[base + x] = minKey(line[x], line[x + second]) ^ flip;
}

/**
 * windowMinima's runs for r ≤ 3 kept in registers as they slide: one load and one store per pixel
 * instead of two loads and a store per run length (the same minima, so the same keys).
 */
function windowMinimaInRegisters(line: Int32Array, w: number, r: number, flip: number, out: Int32Array, base: number): void {
  if (r === 1) {
    // out = min(pair at x, line[x + 2])
    let a1 = line[1];
    let pair0 = minKey(line[0], a1);
    for (let x = 0; x < w; x++) {
      const a2 = line[x + 2];
      out[base + x] = minKey(pair0, a2) ^ flip;
      pair0 = minKey(a1, a2);
      a1 = a2;
    }
    return;
  }
  // pairK: the minimum of line[x + K] and line[x + K + 1]; fourK: of line[x + K … x + K + 3].
  if (r === 2) {
    // out = min(four at x, four at x + 1)
    let a3 = line[3];
    let pair1 = minKey(line[1], line[2]);
    let pair2 = minKey(line[2], a3);
    let four0 = minKey(minKey(line[0], line[1]), pair2);
    for (let x = 0; x < w; x++) {
      const a4 = line[x + 4];
      const pair3 = minKey(a3, a4);
      const four1 = minKey(pair1, pair3);
      out[base + x] = minKey(four0, four1) ^ flip;
      four0 = four1;
      pair1 = pair2;
      pair2 = pair3;
      a3 = a4;
    }
    return;
  }
  // r = 3: out = min(four at x, four at x + 3)
  let a5 = line[5];
  const pair0 = minKey(line[0], line[1]);
  const pair1 = minKey(line[1], line[2]);
  const pair2 = minKey(line[2], line[3]);
  let pair3 = minKey(line[3], line[4]);
  let pair4 = minKey(line[4], a5);
  let four0 = minKey(pair0, pair2);
  let four1 = minKey(pair1, pair3);
  let four2 = minKey(pair2, pair4);
  for (let x = 0; x < w; x++) {
    const a6 = line[x + 6];
    const pair5 = minKey(a5, a6);
    const four3 = minKey(pair3, pair5);
    out[base + x] = minKey(four0, four3) ^ flip;
    four0 = four1;
    four1 = four2;
    four2 = four3;
    pair3 = pair4;
    pair4 = pair5;
    a5 = a6;
  }
}
