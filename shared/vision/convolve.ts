// Applying kernels: correlation (the kernel applied as written, as imaging libraries do),
// with one border policy for every path. Rank-1 kernels run as two 1-D passes; other kernels
// run directly, or through the FFT in tiles when they are large (and the image is finite).
import { borderTable, fillRowBorder, isStrided, OUTSIDE, rowOffsetTable, type BorderMode } from './border';
import { correlateFft, FFT_MAX_KERNEL_SIDE, largestFiniteMagnitude } from './fft-correlate';
import { imageLike, type Image } from './image';
import { separate, type Kernel } from './kernels';
import { simdKernels } from './engine';
import { COLUMN_LOOP_ROWS, directRowLoop, symmetricColumnLoop, symmetricRowLoop, type ColumnLoop, type RowLoop } from './kernel-loops';

/**
 * Non-separable kernels of at least this many weights go through the plain engine's FFT
 * (fft-correlate.ts), the SIMD engine's threshold (FFT_KERNEL_TAPS in wasm/simd-kernels.ts), so that
 * both engines take the same kind of path for a kernel and differ by rounding only. (Where the exact
 * result is 0, a transform's round-off residue is written as 0 on both engines: `fftZeroFloor`.)
 * On a 5 MP image the FFT takes 15–22 ns/px from 7×7 to 31×31 and the direct path 15.6 ns/px at
 * 7×7 and 60 at 9×9 (tests/bench).
 */
export const PLAIN_FFT_KERNEL_TAPS = 11 * 11;

/** out(x,y) = Σⱼ Σᵢ m[j][i]·in[y+j−ry][x+i−rx] / divisor + offset, choosing the fastest path. */
export function correlate(src: Image, kernel: Kernel, border: BorderMode, out?: Image): Image {
  const pair = separate(kernel);
  if (pair) return correlateSeparable(src, pair.column, pair.row, border, out, kernel.offset);
  const simd = simdKernels();
  if (simd) return simd.correlate2d(src, kernel, border, out);
  const large = kernel.rows * kernel.cols >= PLAIN_FFT_KERNEL_TAPS && Math.max(kernel.rows, kernel.cols) <= FFT_MAX_KERNEL_SIDE;
  if (!large) return correlateDirect(src, kernel, border, out);
  // A NaN or an infinity would spread over a whole tile through the transform; directly it stays in its windows.
  const largest = largestFiniteMagnitude(src.data);
  if (!Number.isFinite(largest)) return correlateDirect(src, kernel, border, out);
  const dst = imageLike(src, out === src ? undefined : out);
  correlateFft(src, kernel, border, dst, largest);
  return dst;
}

function isSymmetric(w: ArrayLike<number>): boolean {
  for (let a = 0, b = w.length - 1; a < b; a++, b--) if (w[a] !== w[b]) return false;
  return true;
}

/**
 * Correlation with column ⊗ row, streaming one row at a time: the vertical pass writes one
 * row (padded on both sides by the border policy), the horizontal pass reads it. No temporary image.
 * Symmetric kernels up to radius 3 (Gaussians up to σ = 1, the derivative smoothings) run unrolled,
 * two output rows per vertical pass (four at radius 3, the Gaussian of σ = 1) so that each source
 * sample is loaded once for all of them.
 */
export function correlateSeparable(
  src: Image,
  column: ArrayLike<number>,
  row: ArrayLike<number>,
  border: BorderMode,
  out?: Image,
  offset = 0,
): Image {
  // −0 as +0, as kernelFromMatrix takes it: a zero sum then comes out +0 whatever its sign.
  const added = offset + 0;
  const simd = simdKernels();
  if (simd) return simd.separable(src, column, row, border, out, added);
  const { width: w } = src;
  const dst = imageLike(src, out === src ? undefined : out);
  const sweep = new SeparableSweep(src, column, row, border, added);
  while (sweep.next(dst.data, (y) => y * w) > 0);
  return dst;
}

/** Most rows one step of SeparableSweep makes. */
export const SEPARABLE_ROWS_AT_MOST = Math.max(4, COLUMN_LOOP_ROWS);

/**
 * The plain engine's separable correlation as a sweep down the image: each call of `next` computes
 * the next one, two, four or (generated loops) COLUMN_LOOP_ROWS output rows, as float32 (the image's
 * own values), into rows that the caller chooses, so that a following step can read them while they
 * are in the cache.
 */
export class SeparableSweep {
  private readonly w: number;
  private readonly h: number;
  private readonly data: Float32Array;
  private readonly rowOffsets: Int32Array;
  private readonly colTable: Int32Array;
  private readonly lines: Float64Array[];
  private readonly col: Float64Array;
  private readonly krow: Float64Array;
  private readonly ry: number;
  private readonly rx: number;
  private readonly zeros: Float32Array;
  private readonly rows: Float32Array[];
  private readonly verticalUnrolled: boolean;
  private readonly verticalFolded: boolean;
  private readonly horizontal: HorizontalKind;
  private readonly sums: Float64Array;
  private readonly columnLoop: ColumnLoop | null;
  private readonly rowLoop: RowLoop | null;
  private y = 0;

  constructor(src: Image, column: ArrayLike<number>, row: ArrayLike<number>, border: BorderMode, private readonly offset = 0) {
    const { width: w, height: h } = src;
    this.w = w;
    this.h = h;
    this.data = src.data;
    this.ry = (column.length - 1) >> 1;
    this.rx = (row.length - 1) >> 1;
    this.rowOffsets = rowOffsetTable(h, w, this.ry, this.ry, border);
    this.colTable = borderTable(w, this.rx, this.rx, border);
    this.col = Float64Array.from(column);
    this.krow = Float64Array.from(row);
    this.zeros = new Float32Array(w);
    this.rows = new Array<Float32Array>(Math.max(10, column.length + 1)).fill(this.zeros);
    this.columnLoop = isSymmetric(this.col) ? symmetricColumnLoop(this.col) : null;
    this.rowLoop = isSymmetric(this.krow) ? symmetricRowLoop(this.krow) : null;
    this.lines = Array.from({ length: this.columnLoop ? COLUMN_LOOP_ROWS : 4 }, () => new Float64Array(w + 2 * this.rx));
    this.verticalUnrolled = isSymmetric(this.col) && this.ry <= 3;
    this.verticalFolded = isSymmetric(this.col) && this.ry > 3;
    this.horizontal = !isSymmetric(this.krow) ? 'general' : this.rx <= 3 ? 'unrolled' : 'folded';
    this.sums = new Float64Array(this.horizontal === 'folded' ? w : 0);
  }

  /** Computes output rows y, y+1, … (one to SEPARABLE_ROWS_AT_MOST) into o from base(y), base(y+1), …; returns how many (0 at the end). */
  next(o: Float32Array, base: (y: number) => number): number {
    const { w, h, y, data, rowOffsets, rows, zeros, col, krow, rx, ry, lines, colTable, offset } = this;
    if (y >= h) return 0;
    const { horizontal, sums } = this;
    let count: number;
    const { columnLoop, rowLoop } = this;
    if (columnLoop && y + COLUMN_LOOP_ROWS <= h && isStrided(rowOffsets, y, COLUMN_LOOP_ROWS + 2 * ry, w)) {
      columnLoop(data, rowOffsets[y + ry], w, lines, rx);
      count = COLUMN_LOOP_ROWS;
    } else if (this.verticalUnrolled && ry === 3 && y + 3 < h && isStrided(rowOffsets, y, 10, w)) {
      verticalRadius3QuadStrided(data, rowOffsets[y], w, col, lines, rx);
      count = 4;
    } else if (this.verticalFolded && y + 1 < h && isStrided(rowOffsets, y, 2 * ry + 2, w)) {
      verticalFoldedStridedPair(data, rowOffsets[y + ry], w, col, ry, lines[0], lines[1], rx);
      count = 2;
    } else if (this.verticalFolded && isStrided(rowOffsets, y, 2 * ry + 1, w)) {
      verticalFoldedStrided(data, rowOffsets[y + ry], w, col, ry, lines[0], rx);
      count = 1;
    } else if (this.verticalUnrolled && ry === 3 && y + 3 < h) {
      for (let j = 0; j < 10; j++) {
        const off = rowOffsets[y + j];
        rows[j] = off === OUTSIDE ? zeros : data.subarray(off, off + w);
      }
      verticalRadius3Quad(rows, col, w, lines, rx);
      count = 4;
    } else {
      const pair = this.verticalUnrolled && y + 1 < h;
      const sources = pair ? col.length + 1 : col.length;
      for (let j = 0; j < sources; j++) {
        const off = rowOffsets[y + j];
        rows[j] = off === OUTSIDE ? zeros : data.subarray(off, off + w);
      }
      if (pair) {
        verticalSymmetricPair(rows, col, ry, w, lines[0], lines[1], rx);
        count = 2;
      } else {
        if (this.verticalUnrolled) verticalSymmetric(rows, col, ry, w, lines[0], rx);
        else if (this.verticalFolded) verticalFolded(rows, col, ry, w, lines[0], rx);
        else verticalGeneral(rows, col, w, lines[0], rx);
        count = 1;
      }
    }
    for (let q = 0; q < count; q++) horizontalPass(lines[q], krow, rx, w, colTable, horizontal, rowLoop, sums, o, base(y + q), offset);
    this.y = y + count;
    return count;
  }
}

/** How the horizontal pass runs: unrolled (symmetric, radius ≤ 3), folded (symmetric, wider), or tap by tap. */
type HorizontalKind = 'unrolled' | 'folded' | 'general';

/** Fills the row's border, then correlates it with the row kernel into o[base … base+w−1]. */
function horizontalPass(
  line: Float64Array,
  k: Float64Array,
  r: number,
  w: number,
  colTable: Int32Array,
  kind: HorizontalKind,
  rowLoop: RowLoop | null,
  sums: Float64Array,
  o: Float32Array,
  base: number,
  offset: number,
): void {
  for (let t = 0; t < r; t++) {
    const left = colTable[t];
    line[t] = left === OUTSIDE ? 0 : line[r + left];
    const right = colTable[r + w + t];
    line[r + w + t] = right === OUTSIDE ? 0 : line[r + right];
  }
  if (rowLoop) rowLoop(line, o, base, w, offset);
  else if (kind === 'unrolled') horizontalSymmetric(line, k, r, w, o, base, offset);
  else if (kind === 'folded') horizontalFolded(line, k, r, w, sums, o, base, offset);
  else horizontalGeneral(line, k, w, o, base, offset);
}

/** Output rows y (into `line`) and y+1 (into `next`) of a symmetric column; rows[0 … 2r+1] are source rows y−r … y+1+r. */
function verticalSymmetricPair(rows: Float32Array[], k: Float64Array, r: number, w: number, line: Float64Array, next: Float64Array, pad: number): void {
  const k0 = k[r];
  if (r === 0) {
    const a = rows[0], b = rows[1];
    for (let x = 0; x < w; x++) {
      line[pad + x] = k0 * a[x];
      next[pad + x] = k0 * b[x];
    }
  } else if (r === 1) {
    const k1 = k[2];
    const a = rows[0], b = rows[1], c = rows[2], d = rows[3];
    for (let x = 0; x < w; x++) {
      const v0 = a[x], v1 = b[x], v2 = c[x], v3 = d[x];
      line[pad + x] = k0 * v1 + k1 * (v0 + v2);
      next[pad + x] = k0 * v2 + k1 * (v1 + v3);
    }
  } else if (r === 2) {
    const k1 = k[3], k2 = k[4];
    const a = rows[0], b = rows[1], c = rows[2], d = rows[3], e = rows[4], f = rows[5];
    for (let x = 0; x < w; x++) {
      const v0 = a[x], v1 = b[x], v2 = c[x], v3 = d[x], v4 = e[x], v5 = f[x];
      line[pad + x] = k0 * v2 + k1 * (v1 + v3) + k2 * (v0 + v4);
      next[pad + x] = k0 * v3 + k1 * (v2 + v4) + k2 * (v1 + v5);
    }
  } else {
    const k1 = k[4], k2 = k[5], k3 = k[6];
    const a = rows[0], b = rows[1], c = rows[2], d = rows[3], e = rows[4], f = rows[5], g = rows[6], hh = rows[7];
    for (let x = 0; x < w; x++) {
      const v0 = a[x], v1 = b[x], v2 = c[x], v3 = d[x], v4 = e[x], v5 = f[x], v6 = g[x], v7 = hh[x];
      line[pad + x] = k0 * v3 + k1 * (v2 + v4) + k2 * (v1 + v5) + k3 * (v0 + v6);
      next[pad + x] = k0 * v4 + k1 * (v3 + v5) + k2 * (v2 + v6) + k3 * (v1 + v7);
    }
  }
}

/** Output rows y … y+3 of a symmetric 7-tap column from source rows y−3 … y+6 (rows[0 … 9]): 2.5 loads per output. */
function verticalRadius3Quad(rows: Float32Array[], k: Float64Array, w: number, lines: Float64Array[], pad: number): void {
  const k0 = k[3], k1 = k[4], k2 = k[5], k3 = k[6];
  const r0 = rows[0], r1 = rows[1], r2 = rows[2], r3 = rows[3], r4 = rows[4];
  const r5 = rows[5], r6 = rows[6], r7 = rows[7], r8 = rows[8], r9 = rows[9];
  const l0 = lines[0], l1 = lines[1], l2 = lines[2], l3 = lines[3];
  for (let x = 0; x < w; x++) {
    const v0 = r0[x], v1 = r1[x], v2 = r2[x], v3 = r3[x], v4 = r4[x];
    const v5 = r5[x], v6 = r6[x], v7 = r7[x], v8 = r8[x], v9 = r9[x];
    const i = pad + x;
    l0[i] = k0 * v3 + k1 * (v2 + v4) + k2 * (v1 + v5) + k3 * (v0 + v6);
    l1[i] = k0 * v4 + k1 * (v3 + v5) + k2 * (v2 + v6) + k3 * (v1 + v7);
    l2[i] = k0 * v5 + k1 * (v4 + v6) + k2 * (v3 + v7) + k3 * (v2 + v8);
    l3[i] = k0 * v6 + k1 * (v5 + v7) + k2 * (v4 + v8) + k3 * (v3 + v9);
  }
}

/**
 * verticalRadius3Quad for ten consecutive image rows from offset `first`: the loads go through one
 * array and one running index, which leaves the compiler registers that ten row arrays would take.
 */
function verticalRadius3QuadStrided(d: Float32Array, first: number, w: number, k: Float64Array, lines: Float64Array[], pad: number): void {
  const k0 = k[3], k1 = k[4], k2 = k[5], k3 = k[6];
  const l0 = lines[0], l1 = lines[1], l2 = lines[2], l3 = lines[3];
  for (let x = 0; x < w; x++) {
    let p = first + x;
    const v0 = d[p];
    const v1 = d[(p += w)];
    const v2 = d[(p += w)];
    const v3 = d[(p += w)];
    const v4 = d[(p += w)];
    const v5 = d[(p += w)];
    const v6 = d[(p += w)];
    const v7 = d[(p += w)];
    const v8 = d[(p += w)];
    const v9 = d[p + w];
    const i = pad + x;
    l0[i] = k0 * v3 + k1 * (v2 + v4) + k2 * (v1 + v5) + k3 * (v0 + v6);
    l1[i] = k0 * v4 + k1 * (v3 + v5) + k2 * (v2 + v6) + k3 * (v1 + v7);
    l2[i] = k0 * v5 + k1 * (v4 + v6) + k2 * (v3 + v7) + k3 * (v2 + v8);
    l3[i] = k0 * v6 + k1 * (v5 + v7) + k2 * (v4 + v8) + k3 * (v3 + v9);
  }
}

function verticalSymmetric(rows: Float32Array[], k: Float64Array, r: number, w: number, line: Float64Array, pad: number): void {
  const c = rows[r];
  const k0 = k[r];
  if (r === 0) {
    for (let x = 0; x < w; x++) line[pad + x] = k0 * c[x];
  } else if (r === 1) {
    const a1 = rows[0], b1 = rows[2], k1 = k[2];
    for (let x = 0; x < w; x++) line[pad + x] = k0 * c[x] + k1 * (a1[x] + b1[x]);
  } else if (r === 2) {
    const a1 = rows[1], b1 = rows[3], k1 = k[3];
    const a2 = rows[0], b2 = rows[4], k2 = k[4];
    for (let x = 0; x < w; x++) line[pad + x] = k0 * c[x] + k1 * (a1[x] + b1[x]) + k2 * (a2[x] + b2[x]);
  } else {
    const a1 = rows[2], b1 = rows[4], k1 = k[4];
    const a2 = rows[1], b2 = rows[5], k2 = k[5];
    const a3 = rows[0], b3 = rows[6], k3 = k[6];
    for (let x = 0; x < w; x++) {
      line[pad + x] = k0 * c[x] + k1 * (a1[x] + b1[x]) + k2 * (a2[x] + b2[x]) + k3 * (a3[x] + b3[x]);
    }
  }
}

/**
 * A symmetric column of radius above 3: the rows at equal distance from the centre are added before
 * their weight multiplies them; the centre and three pairs in the first pass, then four pairs per
 * pass, then one (a pass per tap was eight times slower than the separable paths above).
 */
function verticalFolded(rows: Float32Array[], k: Float64Array, r: number, w: number, line: Float64Array, pad: number): void {
  const c = rows[r];
  const k0 = k[r], k1 = k[r + 1], k2 = k[r + 2], k3 = k[r + 3];
  const a1 = rows[r - 1], b1 = rows[r + 1], a2 = rows[r - 2], b2 = rows[r + 2], a3 = rows[r - 3], b3 = rows[r + 3];
  for (let x = 0; x < w; x++) {
    line[pad + x] = k0 * c[x] + k1 * (a1[x] + b1[x]) + k2 * (a2[x] + b2[x]) + k3 * (a3[x] + b3[x]);
  }
  let j = 4;
  for (; j + 3 <= r; j += 4) {
    const ka = k[r + j], kb = k[r + j + 1], kc = k[r + j + 2], kd = k[r + j + 3];
    const ua = rows[r - j], va = rows[r + j], ub = rows[r - j - 1], vb = rows[r + j + 1];
    const uc = rows[r - j - 2], vc = rows[r + j + 2], ud = rows[r - j - 3], vd = rows[r + j + 3];
    for (let x = 0; x < w; x++) {
      line[pad + x] += ka * (ua[x] + va[x]) + kb * (ub[x] + vb[x]) + kc * (uc[x] + vc[x]) + kd * (ud[x] + vd[x]);
    }
  }
  // The last one to three pairs in one pass.
  if (j > r) return;
  const ka = k[r + j], ua = rows[r - j], va = rows[r + j];
  if (j + 2 === r) {
    const kb = k[r + j + 1], kc = k[r + j + 2];
    const ub = rows[r - j - 1], vb = rows[r + j + 1], uc = rows[r - j - 2], vc = rows[r + j + 2];
    for (let x = 0; x < w; x++) line[pad + x] += ka * (ua[x] + va[x]) + kb * (ub[x] + vb[x]) + kc * (uc[x] + vc[x]);
  } else if (j + 1 === r) {
    const kb = k[r + j + 1], ub = rows[r - j - 1], vb = rows[r + j + 1];
    for (let x = 0; x < w; x++) line[pad + x] += ka * (ua[x] + va[x]) + kb * (ub[x] + vb[x]);
  } else {
    for (let x = 0; x < w; x++) line[pad + x] += ka * (ua[x] + va[x]);
  }
}

/** verticalFolded for 2r+1 consecutive image rows around the row at offset `centre`, through one array (see verticalRadius3QuadStrided). */
function verticalFoldedStrided(d: Float32Array, centre: number, w: number, k: Float64Array, r: number, line: Float64Array, pad: number): void {
  const k0 = k[r], k1 = k[r + 1], k2 = k[r + 2], k3 = k[r + 3];
  const w2 = 2 * w, w3 = 3 * w;
  for (let x = 0, p = centre; x < w; x++, p++) {
    line[pad + x] = k0 * d[p] + k1 * (d[p - w] + d[p + w]) + k2 * (d[p - w2] + d[p + w2]) + k3 * (d[p - w3] + d[p + w3]);
  }
  let j = 4;
  for (; j + 3 <= r; j += 4) {
    const ka = k[r + j], kb = k[r + j + 1], kc = k[r + j + 2], kd = k[r + j + 3];
    const da = j * w, db = da + w, dc = db + w, dd = dc + w;
    for (let x = 0, p = centre; x < w; x++, p++) {
      line[pad + x] += ka * (d[p - da] + d[p + da]) + kb * (d[p - db] + d[p + db]) + kc * (d[p - dc] + d[p + dc]) + kd * (d[p - dd] + d[p + dd]);
    }
  }
  // The last one to three pairs in one pass.
  if (j > r) return;
  const ka = k[r + j], da = j * w;
  if (j + 2 === r) {
    const kb = k[r + j + 1], kc = k[r + j + 2], db = da + w, dc = db + w;
    for (let x = 0, p = centre; x < w; x++, p++) line[pad + x] += ka * (d[p - da] + d[p + da]) + kb * (d[p - db] + d[p + db]) + kc * (d[p - dc] + d[p + dc]);
  } else if (j + 1 === r) {
    const kb = k[r + j + 1], db = da + w;
    for (let x = 0, p = centre; x < w; x++, p++) line[pad + x] += ka * (d[p - da] + d[p + da]) + kb * (d[p - db] + d[p + db]);
  } else {
    for (let x = 0, p = centre; x < w; x++, p++) line[pad + x] += ka * (d[p - da] + d[p + da]);
  }
}

/**
 * verticalFoldedStrided for two output rows, centred on `centre` and the row below: the same sums for
 * each, with the source rows both need loaded once (ten loads per column for four pairs of each).
 */
function verticalFoldedStridedPair(d: Float32Array, centre: number, w: number, k: Float64Array, r: number, line: Float64Array, next: Float64Array, pad: number): void {
  const k0 = k[r], k1 = k[r + 1], k2 = k[r + 2], k3 = k[r + 3];
  const w2 = 2 * w, w3 = 3 * w, w4 = 4 * w;
  for (let x = 0, p = centre; x < w; x++, p++) {
    const m3 = d[p - w3], m2 = d[p - w2], m1 = d[p - w], c = d[p], p1 = d[p + w], p2 = d[p + w2], p3 = d[p + w3], p4 = d[p + w4];
    line[pad + x] = k0 * c + k1 * (m1 + p1) + k2 * (m2 + p2) + k3 * (m3 + p3);
    next[pad + x] = k0 * p1 + k1 * (c + p2) + k2 * (m1 + p3) + k3 * (m2 + p4);
  }
  let j = 4;
  for (; j + 3 <= r; j += 4) {
    const ka = k[r + j], kb = k[r + j + 1], kc = k[r + j + 2], kd = k[r + j + 3];
    // Rows centre − (j−1 … j+3) and centre + (j … j+4).
    const da = j * w, db = da + w, dc = db + w, dd = dc + w, de = dd + w, dz = da - w;
    for (let x = 0, p = centre; x < w; x++, p++) {
      const ua = d[p - da], ub = d[p - db], uc = d[p - dc], ud = d[p - dd], uz = d[p - dz];
      const va = d[p + da], vb = d[p + db], vc = d[p + dc], vd = d[p + dd], ve = d[p + de];
      line[pad + x] += ka * (ua + va) + kb * (ub + vb) + kc * (uc + vc) + kd * (ud + vd);
      next[pad + x] += ka * (uz + vb) + kb * (ua + vc) + kc * (ub + vd) + kd * (uc + ve);
    }
  }
  if (j > r) return;
  // The last one to three pairs in one pass.
  const ka = k[r + j], da = j * w, dz = da - w, db = da + w;
  if (j + 2 === r) {
    const kb = k[r + j + 1], kc = k[r + j + 2], dc = db + w, dd = dc + w;
    for (let x = 0, p = centre; x < w; x++, p++) {
      const uz = d[p - dz], ua = d[p - da], ub = d[p - db], uc = d[p - dc];
      const va = d[p + da], vb = d[p + db], vc = d[p + dc], vd = d[p + dd];
      line[pad + x] += ka * (ua + va) + kb * (ub + vb) + kc * (uc + vc);
      next[pad + x] += ka * (uz + vb) + kb * (ua + vc) + kc * (ub + vd);
    }
  } else if (j + 1 === r) {
    const kb = k[r + j + 1], dc = db + w;
    for (let x = 0, p = centre; x < w; x++, p++) {
      const uz = d[p - dz], ua = d[p - da], ub = d[p - db];
      const va = d[p + da], vb = d[p + db], vc = d[p + dc];
      line[pad + x] += ka * (ua + va) + kb * (ub + vb);
      next[pad + x] += ka * (uz + vb) + kb * (ua + vc);
    }
  } else {
    for (let x = 0, p = centre; x < w; x++, p++) {
      line[pad + x] += ka * (d[p - da] + d[p + da]);
      next[pad + x] += ka * (d[p - dz] + d[p + db]);
    }
  }
}

/** Any column: one streaming pass per tap (simple loops, no per-pixel inner loop). */
function verticalGeneral(rows: Float32Array[], k: Float64Array, w: number, line: Float64Array, pad: number): void {
  const first = rows[0];
  const k0 = k[0];
  for (let x = 0; x < w; x++) line[pad + x] = k0 * first[x];
  for (let j = 1; j < k.length; j++) {
    const kj = k[j];
    if (kj === 0) continue;
    const r = rows[j];
    for (let x = 0; x < w; x++) line[pad + x] += kj * r[x];
  }
}

function horizontalSymmetric(line: Float64Array, k: Float64Array, r: number, w: number, o: Float32Array, base: number, offset: number): void {
  const k0 = k[r];
  if (r === 0) {
    for (let x = 0; x < w; x++) o[base + x] = k0 * line[x] + offset;
  } else if (r === 1) {
    const k1 = k[2];
    for (let x = 0; x < w; x++) o[base + x] = k0 * line[x + 1] + k1 * (line[x] + line[x + 2]) + offset;
  } else if (r === 2) {
    const k1 = k[3], k2 = k[4];
    for (let x = 0; x < w; x++) {
      o[base + x] = k0 * line[x + 2] + k1 * (line[x + 1] + line[x + 3]) + k2 * (line[x] + line[x + 4]) + offset;
    }
  } else {
    // A rolling window: one load per pixel, four pixels per iteration (measured faster than one).
    const k1 = k[4], k2 = k[5], k3 = k[6];
    let l0 = line[0], l1 = line[1], l2 = line[2], l3 = line[3], l4 = line[4], l5 = line[5];
    let x = 0;
    for (; x + 3 < w; x += 4) {
      const l6 = line[x + 6], l7 = line[x + 7], l8 = line[x + 8], l9 = line[x + 9];
      o[base + x] = k0 * l3 + k1 * (l2 + l4) + k2 * (l1 + l5) + k3 * (l0 + l6) + offset;
      o[base + x + 1] = k0 * l4 + k1 * (l3 + l5) + k2 * (l2 + l6) + k3 * (l1 + l7) + offset;
      o[base + x + 2] = k0 * l5 + k1 * (l4 + l6) + k2 * (l3 + l7) + k3 * (l2 + l8) + offset;
      o[base + x + 3] = k0 * l6 + k1 * (l5 + l7) + k2 * (l4 + l8) + k3 * (l3 + l9) + offset;
      l0 = l4; l1 = l5; l2 = l6; l3 = l7; l4 = l8; l5 = l9;
    }
    for (; x < w; x++) {
      const l6 = line[x + 6];
      o[base + x] = k0 * l3 + k1 * (l2 + l4) + k2 * (l1 + l5) + k3 * (l0 + l6) + offset;
      l0 = l1; l1 = l2; l2 = l3; l3 = l4; l4 = l5; l5 = l6;
    }
  }
}

/** A symmetric row of radius above 3, folded as verticalFolded, summed in `sums`, then written with the offset. */
function horizontalFolded(line: Float64Array, k: Float64Array, r: number, w: number, sums: Float64Array, o: Float32Array, base: number, offset: number): void {
  const k0 = k[r], k1 = k[r + 1], k2 = k[r + 2], k3 = k[r + 3];
  // Two pixels per iteration: their windows share all but one sample on each side.
  const even = w & ~1;
  for (let x = 0, p = r; x < even; x += 2, p += 2) {
    const m3 = line[p - 3], m2 = line[p - 2], m1 = line[p - 1], c = line[p], p1 = line[p + 1], p2 = line[p + 2], p3 = line[p + 3], p4 = line[p + 4];
    sums[x] = k0 * c + k1 * (m1 + p1) + k2 * (m2 + p2) + k3 * (m3 + p3);
    sums[x + 1] = k0 * p1 + k1 * (c + p2) + k2 * (m1 + p3) + k3 * (m2 + p4);
  }
  for (let x = even, p = r + even; x < w; x++, p++) {
    sums[x] = k0 * line[p] + k1 * (line[p - 1] + line[p + 1]) + k2 * (line[p - 2] + line[p + 2]) + k3 * (line[p - 3] + line[p + 3]);
  }
  let j = 4;
  for (; j + 3 <= r; j += 4) {
    const ka = k[r + j], kb = k[r + j + 1], kc = k[r + j + 2], kd = k[r + j + 3];
    // Positions x + r ± j … x + r ± (j + 3) as x + lo − i and x + hi + i.
    const lo = r - j, hi = r + j;
    for (let x = 0; x < even; x += 2) {
      const left = x + lo, right = x + hi;
      const u1 = line[left + 1], u0 = line[left], um1 = line[left - 1], um2 = line[left - 2], um3 = line[left - 3];
      const v0 = line[right], v1 = line[right + 1], v2 = line[right + 2], v3 = line[right + 3], v4 = line[right + 4];
      sums[x] += ka * (u0 + v0) + kb * (um1 + v1) + kc * (um2 + v2) + kd * (um3 + v3);
      sums[x + 1] += ka * (u1 + v1) + kb * (u0 + v2) + kc * (um1 + v3) + kd * (um2 + v4);
    }
    for (let x = even; x < w; x++) {
      const left = x + lo, right = x + hi;
      sums[x] += ka * (line[left] + line[right]) + kb * (line[left - 1] + line[right + 1]) + kc * (line[left - 2] + line[right + 2]) + kd * (line[left - 3] + line[right + 3]);
    }
  }
  // The last one to three pairs in the pass that writes the output (no pairs left: a pass of its own).
  if (j > r) {
    for (let x = 0; x < w; x++) o[base + x] = sums[x] + offset;
    return;
  }
  const ka = k[r + j], lo = r - j, hi = r + j;
  if (j + 2 === r) {
    const kb = k[r + j + 1], kc = k[r + j + 2];
    for (let x = 0; x < w; x++) {
      const left = x + lo, right = x + hi;
      o[base + x] = sums[x] + (ka * (line[left] + line[right]) + kb * (line[left - 1] + line[right + 1]) + kc * (line[left - 2] + line[right + 2])) + offset;
    }
  } else if (j + 1 === r) {
    const kb = k[r + j + 1];
    for (let x = 0; x < w; x++) {
      const left = x + lo, right = x + hi;
      o[base + x] = sums[x] + (ka * (line[left] + line[right]) + kb * (line[left - 1] + line[right + 1])) + offset;
    }
  } else {
    for (let x = 0; x < w; x++) o[base + x] = sums[x] + ka * (line[x + lo] + line[x + hi]) + offset;
  }
}

function horizontalGeneral(line: Float64Array, k: Float64Array, w: number, o: Float32Array, base: number, offset: number): void {
  const taps = k.length;
  for (let x = 0; x < w; x++) {
    let acc = offset;
    for (let i = 0; i < taps; i++) acc += k[i] * line[x + i];
    o[base + x] = acc;
  }
}

/**
 * Direct 2-D correlation. The source rows a kernel row needs are kept padded (border columns
 * filled) in a ring of `rows` lines, each made once; every kernel row runs as one pass over the
 * line with its taps in locals (unrolled for 3, 5 and 7 columns), adding into a row of sums.
 */
export function correlateDirect(src: Image, kernel: Kernel, border: BorderMode, out?: Image): Image {
  const simd = simdKernels();
  if (simd) return simd.correlate2d(src, kernel, border, out);
  const { width: w, height: h, data } = src;
  const { rows, cols, weights, divisor, offset } = kernel;
  const ry = (rows - 1) >> 1;
  const rx = (cols - 1) >> 1;
  const pw = w + 2 * rx;
  const dst = imageLike(src, out === src ? undefined : out);
  const o = dst.data;
  const rowTable = borderTable(h, ry, ry, border);
  const colTable = borderTable(w, rx, rx, border);
  const ring = Array.from({ length: rows }, () => new Float64Array(pw));
  const isZeroRow = new Uint8Array(rows);
  const acc = new Float64Array(w);
  const scale = 1 / divisor;
  const taps = new Float64Array(cols);
  const fillLine = (t: number) => {
    const line = ring[t % rows];
    const sy = rowTable[t];
    isZeroRow[t % rows] = sy === OUTSIDE ? 1 : 0;
    if (sy === OUTSIDE) return;
    line.set(data.subarray(sy * w, sy * w + w), rx);
    fillRowBorder(line, w, rx, colTable);
  };
  for (let t = 0; t < rows - 1; t++) fillLine(t);
  const generated = directRowLoop(weights, rows, cols, scale === 1);
  if (generated) {
    // Rows outside the image under the constant border read a line of zeros.
    const zeros = new Float64Array(pw);
    const lines = new Array<Float64Array>(rows);
    for (let y = 0; y < h; y++) {
      fillLine(y + rows - 1);
      for (let j = 0; j < rows; j++) {
        const slot = (y + j) % rows;
        lines[j] = isZeroRow[slot] ? zeros : ring[slot];
      }
      // + 0 makes an offset of −0 a +0, as the general loop's sums starting from +0 do.
      generated(lines, o, y * w, w, scale, offset + 0);
    }
    return dst;
  }
  for (let y = 0; y < h; y++) {
    fillLine(y + rows - 1);
    acc.fill(0);
    for (let j = 0; j < rows; j++) {
      const slot = (y + j) % rows;
      if (isZeroRow[slot]) continue;
      let any = false;
      for (let i = 0; i < cols; i++) any = (taps[i] = weights[j * cols + i]) !== 0 || any;
      if (any) addKernelRow(ring[slot], taps, cols, w, acc);
    }
    writeScaled(acc, o, y * w, w, scale, offset);
  }
  return dst;
}

/** o[row + x] = acc[x]·scale + offset (its own function: compiled for every call, not on-stack inside a long loop). */
function writeScaled(acc: Float64Array, o: Float32Array, row: number, w: number, scale: number, offset: number): void {
  for (let x = 0; x < w; x++) o[row + x] = acc[x] * scale + offset;
}

/**
 * acc[x] += Σᵢ k[i]·line[x+i]: one kernel row over one padded source line. Four pixels per
 * iteration, each sample loaded once for the four (5×5 at 5 MP: 12.1 → 8.9 ns/px with the
 * changes of correlateDirect; a window sliding through locals kept them boxed between iterations).
 */
function addKernelRow(line: Float64Array, k: Float64Array, cols: number, w: number, acc: Float64Array): void {
  if (cols === 1) {
    const k0 = k[0];
    for (let x = 0; x < w; x++) acc[x] += k0 * line[x];
  } else if (cols === 3) {
    const k0 = k[0], k1 = k[1], k2 = k[2];
    let x = 0;
    for (; x + 3 < w; x += 4) {
      const a = line[x], b = line[x + 1], c = line[x + 2], d = line[x + 3], e = line[x + 4], f = line[x + 5];
      acc[x] += k0 * a + k1 * b + k2 * c;
      acc[x + 1] += k0 * b + k1 * c + k2 * d;
      acc[x + 2] += k0 * c + k1 * d + k2 * e;
      acc[x + 3] += k0 * d + k1 * e + k2 * f;
    }
    for (; x < w; x++) acc[x] += k0 * line[x] + k1 * line[x + 1] + k2 * line[x + 2];
  } else if (cols === 7) {
    const k0 = k[0], k1 = k[1], k2 = k[2], k3 = k[3], k4 = k[4], k5 = k[5], k6 = k[6];
    let x = 0;
    for (; x + 3 < w; x += 4) {
      const a = line[x], b = line[x + 1], c = line[x + 2], d = line[x + 3], e = line[x + 4];
      const f = line[x + 5], g = line[x + 6], h = line[x + 7], i = line[x + 8], j = line[x + 9];
      acc[x] += k0 * a + k1 * b + k2 * c + k3 * d + k4 * e + k5 * f + k6 * g;
      acc[x + 1] += k0 * b + k1 * c + k2 * d + k3 * e + k4 * f + k5 * g + k6 * h;
      acc[x + 2] += k0 * c + k1 * d + k2 * e + k3 * f + k4 * g + k5 * h + k6 * i;
      acc[x + 3] += k0 * d + k1 * e + k2 * f + k3 * g + k4 * h + k5 * i + k6 * j;
    }
    for (; x < w; x++) acc[x] += k0 * line[x] + k1 * line[x + 1] + k2 * line[x + 2] + k3 * line[x + 3] + k4 * line[x + 4] + k5 * line[x + 5] + k6 * line[x + 6];
  } else {
    // Five columns, and wider rows in groups of five, then any last taps one at a time.
    let i = 0;
    for (; i + 4 < cols; i += 5) addFiveTaps(line, k, i, w, acc);
    for (; i < cols; i++) {
      const ki = k[i];
      if (ki === 0) continue;
      for (let x = 0; x < w; x++) acc[x] += ki * line[x + i];
    }
  }
}

/** acc[x] += Σ_{t<5} k[i+t]·line[x+i+t], four pixels per iteration. */
function addFiveTaps(line: Float64Array, k: Float64Array, i: number, w: number, acc: Float64Array): void {
  const k0 = k[i], k1 = k[i + 1], k2 = k[i + 2], k3 = k[i + 3], k4 = k[i + 4];
  let x = 0;
  for (; x + 3 < w; x += 4) {
    const p = x + i;
    const a = line[p], b = line[p + 1], c = line[p + 2], d = line[p + 3];
    const e = line[p + 4], f = line[p + 5], g = line[p + 6], h = line[p + 7];
    acc[x] += k0 * a + k1 * b + k2 * c + k3 * d + k4 * e;
    acc[x + 1] += k0 * b + k1 * c + k2 * d + k3 * e + k4 * f;
    acc[x + 2] += k0 * c + k1 * d + k2 * e + k3 * f + k4 * g;
    acc[x + 3] += k0 * d + k1 * e + k2 * f + k3 * g + k4 * h;
  }
  for (; x < w; x++) {
    const p = x + i;
    acc[x] += k0 * line[p] + k1 * line[p + 1] + k2 * line[p + 2] + k3 * line[p + 3] + k4 * line[p + 4];
  }
}

/** A copy of the image with rx columns and ry rows of border on each side (row-major, width w+2rx); the benchmark's ndarray-convolve input. */
export function padImage(src: Image, rx: number, ry: number, border: BorderMode): Float32Array {
  const { width: w, height: h, data } = src;
  const pw = w + 2 * rx;
  const padded = new Float32Array(pw * (h + 2 * ry));
  const colTable = borderTable(w, rx, rx, border);
  const rowTable = borderTable(h, ry, ry, border);
  for (let t = 0; t < rowTable.length; t++) {
    const sy = rowTable[t];
    if (sy === OUTSIDE) continue;
    padded.set(data.subarray(sy * w, sy * w + w), t * pw + rx);
    fillRowBorder(padded.subarray(t * pw, (t + 1) * pw), w, rx, colTable);
  }
  return padded;
}
