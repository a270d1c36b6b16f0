// First-derivative operators (Sobel, Scharr, Prewitt): x, y, magnitude and direction in one pass.
// Each operator is smoothing ⊗ difference; the x kernel is [a b a]ᵀ ⊗ [−1 0 1], the y kernel its
// transpose, unnormalised, positive where the image gets brighter to the right / downwards.
import type { GradientOperator, GradientOutput } from '../rules/schema';
import { borderTable, OUTSIDE, rowOffsetTable, type BorderMode } from './border';
import { imageLike, type Image, type ValueRange } from './image';
import { PREWITT_SMOOTHING, SCHARR_SMOOTHING, SOBEL_SMOOTHING } from './kernels';
import { simdKernels } from './engine';

const SMOOTHING: Record<GradientOperator, readonly number[]> = {
  sobel: SOBEL_SMOOTHING,
  scharr: SCHARR_SMOOTHING,
  prewitt: PREWITT_SMOOTHING,
};

const DEGREES_PER_RADIAN = 180 / Math.PI;

/** The operator's smoothing weights [a, b] of [a b a]. */
export function gradientWeights(operator: GradientOperator): readonly [number, number] {
  const [a, b] = SMOOTHING[operator];
  return [a, b];
}

/**
 * magnitude = sqrt(gx² + gy²); direction = atan2(gy, gx) in degrees, (−180, 180].
 * With `range`, the magnitude's minimum and maximum (as stored, float32) are written to it on the
 * way, so that a following Otsu threshold need not read the image once more for them (NaN for
 * the other outputs: not known).
 * One pass over three rows: per column, the vertical smoothing s = a·up + b·centre + a·down and
 * difference t = down − up; then gx = s(x+1) − s(x−1) and gy = a·t(x−1) + b·t(x) + a·t(x+1),
 * with the three columns kept in locals as the window slides right. Away from the border, rows y
 * and y+1 come from one load of the four rows around them (GradientRows.writePair).
 */
export function gradient(
  src: Image,
  operator: GradientOperator,
  output: GradientOutput,
  border: BorderMode,
  out?: Image,
  range?: ValueRange,
): Image {
  const [a, b] = SMOOTHING[operator];
  // Direction (atan2) has no SIMD kernel: it runs below, on the same buffers.
  const simd = output !== 'direction' ? simdKernels() : null;
  if (simd && output !== 'direction') return simd.gradient(src, a, b, output, border, out, range);
  const { width: w, height: h, data } = src;
  const dst = imageLike(src, out === src ? undefined : out);
  const o = dst.data;
  const rowOffsets = rowOffsetTable(h, w, 1, 1, border);
  const rows = new GradientRows(w, a, b, output, border);
  // A row with a constant-border row beside it reads three rows copied next to zeros.
  let edge: Float32Array | null = null;
  for (let y = 0; y < h; y++) {
    const up = rowOffsets[y];
    const down = rowOffsets[y + 2];
    const below = y + 3 < rowOffsets.length ? rowOffsets[y + 3] : OUTSIDE;
    if (up !== OUTSIDE && below !== OUTSIDE && y + 1 < h) {
      // Rows y and y+1 from one load of the four rows around them.
      rows.writePair(data, up, y * w, down, below, o, y * w);
      y++;
      continue;
    }
    if (up !== OUTSIDE && down !== OUTSIDE) {
      rows.write(data, up, y * w, down, o, y * w);
      continue;
    }
    edge ??= new Float32Array(3 * w);
    edge.fill(0);
    if (up !== OUTSIDE) edge.set(data.subarray(up, up + w), 0);
    edge.set(data.subarray(y * w, y * w + w), w);
    if (down !== OUTSIDE) edge.set(data.subarray(down, down + w), 2 * w);
    rows.write(edge, 0, w, 2 * w, o, y * w);
  }
  rows.report(range);
  return dst;
}

/**
 * One output row at a time from three source rows of one array (up, centre, down, given by their
 * offsets: one array and one index leave the compiler registers that three row arrays would take),
 * so that a sweep can hand over rows it has just computed (`smoothed-gradient.ts`); the
 * magnitude's range is gathered across the rows written.
 */
export class GradientRows {
  private readonly leftColumn: number;
  private readonly rightColumn: number;
  /** The smoothing s and difference t of columns −1 and w: [s(−1), t(−1), s(w), t(w)]. */
  private readonly ends = new Float64Array(4);
  /** The same for two rows: [s(−1), t(−1), s(w), t(w)] of the first, then of the second. */
  private readonly pairEnds = new Float64Array(8);
  /** The magnitude's [minimum, maximum] so far. */
  private readonly extremes = Float64Array.of(Infinity, -Infinity);

  constructor(
    private readonly w: number,
    private readonly a: number,
    private readonly b: number,
    private readonly output: GradientOutput,
    border: BorderMode,
  ) {
    const colTable = borderTable(w, 1, 1, border);
    this.leftColumn = colTable[0];
    this.rightColumn = colTable[w + 1];
  }

  /** Writes the output row of the centre row (s[c … c+w−1]; up at s[u …], down at s[d …]) into o[base … base+w−1]. */
  write(s: Float32Array, u: number, c: number, d: number, o: Float32Array, base: number): void {
    const { w, a, b, leftColumn, rightColumn, ends } = this;
    // Columns −1 and w from the border policy (0 for the constant border).
    ends[0] = leftColumn === OUTSIDE ? 0 : a * (s[u + leftColumn] + s[d + leftColumn]) + b * s[c + leftColumn];
    ends[1] = leftColumn === OUTSIDE ? 0 : s[d + leftColumn] - s[u + leftColumn];
    ends[2] = rightColumn === OUTSIDE ? 0 : a * (s[u + rightColumn] + s[d + rightColumn]) + b * s[c + rightColumn];
    ends[3] = rightColumn === OUTSIDE ? 0 : s[d + rightColumn] - s[u + rightColumn];
    switch (this.output) {
      case 'x':
        if (a === 1 && b === 2) sobelXRow(s, u - c, c, d - c, w, ends, o, base);
        else xRow(s, u - c, c, d - c, w, a, b, ends, o, base);
        break;
      case 'y':
        if (a === 1 && b === 2) sobelYRow(s, u - c, c, d - c, w, ends, o, base);
        else yRow(s, u - c, c, d - c, w, a, b, ends, o, base);
        break;
      case 'magnitude':
        // Sobel's weights 1 and 2 need no multiplication (1·v and v + v are exact: the same bits).
        if (a === 1 && b === 2) sobelMagnitudeRow(s, u - c, c, d - c, w, ends, o, base, this.extremes);
        else magnitudeRow(s, u - c, c, d - c, w, a, b, ends, o, base, this.extremes);
        break;
      case 'direction':
        directionRow(s, u - c, c, d - c, w, a, b, ends, o, base);
        break;
    }
  }

  /**
   * Writes the output rows of the centre rows c and d (rows u, c, d and e one below the other) into
   * o[base … base+w−1] and o[base+w … base+2w−1]; Sobel's x, y and magnitude compute both from one
   * load of each of the four rows (5 MP, one CPU: x 2.9 → 1.75 ns/px with eight pixels per
   * iteration, magnitude 4.0 → 3.3), the other operators and the direction row by row.
   */
  writePair(s: Float32Array, u: number, c: number, d: number, e: number, o: Float32Array, base: number): void {
    if (this.output === 'direction' || this.a !== 1 || this.b !== 2) {
      this.write(s, u, c, d, o, base);
      this.write(s, c, d, e, o, base + this.w);
      return;
    }
    const { w, leftColumn, rightColumn, pairEnds } = this;
    for (let row = 0; row < 2; row++) {
      const [up, centre, down] = row === 0 ? [u, c, d] : [c, d, e];
      pairEnds[4 * row] = leftColumn === OUTSIDE ? 0 : s[up + leftColumn] + s[down + leftColumn] + 2 * s[centre + leftColumn];
      pairEnds[4 * row + 1] = leftColumn === OUTSIDE ? 0 : s[down + leftColumn] - s[up + leftColumn];
      pairEnds[4 * row + 2] = rightColumn === OUTSIDE ? 0 : s[up + rightColumn] + s[down + rightColumn] + 2 * s[centre + rightColumn];
      pairEnds[4 * row + 3] = rightColumn === OUTSIDE ? 0 : s[down + rightColumn] - s[up + rightColumn];
    }
    if (this.output === 'magnitude') sobelMagnitudeRowPair(s, u - c, c, d - c, e - c, w, pairEnds, o, base, this.extremes);
    else if (this.output === 'x') sobelXRowPair(s, u - c, c, d - c, e - c, w, pairEnds, o, base);
    else sobelYRowPair(s, u - c, c, d - c, e - c, w, pairEnds, o, base);
  }

  /** The magnitude's range over the rows written, as stored (float32); NaN for the other outputs. */
  report(range?: ValueRange): void {
    if (!range) return;
    // float32 rounding is monotonic, so the range of the stored values is the rounded range.
    const known = this.output === 'magnitude';
    range.min = known ? Math.fround(this.extremes[0]) : NaN;
    range.max = known ? Math.fround(this.extremes[1]) : NaN;
  }
}

// The row functions: s(x) = a·up(x) + b·centre(x) + a·down(x) and t(x) = down(x) − up(x) slide
// across the row in locals; p indexes the centre row, p + du and p + dd the rows above and below.
// Every value the loops carry is a double from the start (read from `ends`), so that the compiler
// keeps them unboxed in registers.

function xRow(s: Float32Array, du: number, c: number, dd: number, w: number, a: number, b: number, ends: Float64Array, o: Float32Array, base: number): void {
  let sPrev = ends[0];
  let sCur = a * (s[c + du] + s[c + dd]) + b * s[c];
  const last = w - 1;
  for (let x = 0, p = c + 1; x < last; x++, p++) {
    const sNext = a * (s[p + du] + s[p + dd]) + b * s[p];
    o[base + x] = sNext - sPrev;
    sPrev = sCur;
    sCur = sNext;
  }
  o[base + last] = ends[2] - sPrev;
}

function yRow(s: Float32Array, du: number, c: number, dd: number, w: number, a: number, b: number, ends: Float64Array, o: Float32Array, base: number): void {
  let tPrev = ends[1];
  let tCur = s[c + dd] - s[c + du];
  const last = w - 1;
  for (let x = 0, p = c + 1; x < last; x++, p++) {
    const tNext = s[p + dd] - s[p + du];
    o[base + x] = a * (tPrev + tNext) + b * tCur;
    tPrev = tCur;
    tCur = tNext;
  }
  o[base + last] = a * (tPrev + ends[3]) + b * tCur;
}

/** xRow with Sobel's weights 1 and 2 (no multiplications: the same bits), four pixels per iteration (eight spill), then two. */
function sobelXRow(s: Float32Array, du: number, c: number, dd: number, w: number, ends: Float64Array, o: Float32Array, base: number): void {
  let sPrev = ends[0];
  let sCur = s[c + du] + s[c + dd] + 2 * s[c];
  const last = w - 1;
  let x = 0;
  let p = c + 1;
  for (; x + 3 < last; x += 4, p += 4) {
    const q = base + x, u = p + du, d = p + dd;
    const c1 = s[p], c2 = s[p + 1], c3 = s[p + 2], c4 = s[p + 3];
    const s1 = s[u] + s[d] + (c1 + c1);
    const s2 = s[u + 1] + s[d + 1] + (c2 + c2);
    const s3 = s[u + 2] + s[d + 2] + (c3 + c3);
    const s4 = s[u + 3] + s[d + 3] + (c4 + c4);
    o[q] = s1 - sPrev;
    o[q + 1] = s2 - sCur;
    o[q + 2] = s3 - s1;
    o[q + 3] = s4 - s2;
    sPrev = s3;
    sCur = s4;
  }
  for (; x + 1 < last; x += 2, p += 2) {
    const c1 = s[p];
    const s1 = s[p + du] + s[p + dd] + (c1 + c1);
    const c2 = s[p + 1];
    const s2 = s[p + 1 + du] + s[p + 1 + dd] + (c2 + c2);
    o[base + x] = s1 - sPrev;
    o[base + x + 1] = s2 - sCur;
    sPrev = s1;
    sCur = s2;
  }
  for (; x < last; x++, p++) {
    const centre = s[p];
    const sNext = s[p + du] + s[p + dd] + (centre + centre);
    o[base + x] = sNext - sPrev;
    sPrev = sCur;
    sCur = sNext;
  }
  o[base + last] = ends[2] - sPrev;
}

/**
 * sobelXRow for two output rows from one load of the four rows around them (two loads per output
 * instead of three), eight pixels per iteration, then two.
 */
function sobelXRowPair(s: Float32Array, du: number, c: number, dd: number, de: number, w: number, ends: Float64Array, o: Float32Array, base: number): void {
  let sPrev0 = ends[0];
  let sPrev1 = ends[4];
  const centre0 = s[c], down0 = s[c + dd];
  let sCur0 = s[c + du] + down0 + (centre0 + centre0);
  let sCur1 = centre0 + s[c + de] + (down0 + down0);
  const last = w - 1;
  let x = 0;
  let p = c + 1;
  for (; x + 7 < last; x += 8, p += 8) {
    const q = base + x;
    const u1 = s[p + du], c1 = s[p], d1 = s[p + dd], e1 = s[p + de];
    const u2 = s[p + 1 + du], c2 = s[p + 1], d2 = s[p + 1 + dd], e2 = s[p + 1 + de];
    const a1 = u1 + d1 + (c1 + c1);
    const b1 = c1 + e1 + (d1 + d1);
    const a2 = u2 + d2 + (c2 + c2);
    const b2 = c2 + e2 + (d2 + d2);
    o[q] = a1 - sPrev0;
    o[q + w] = b1 - sPrev1;
    o[q + 1] = a2 - sCur0;
    o[q + 1 + w] = b2 - sCur1;
    const u3 = s[p + 2 + du], c3 = s[p + 2], d3 = s[p + 2 + dd], e3 = s[p + 2 + de];
    const u4 = s[p + 3 + du], c4 = s[p + 3], d4 = s[p + 3 + dd], e4 = s[p + 3 + de];
    const a3 = u3 + d3 + (c3 + c3);
    const b3 = c3 + e3 + (d3 + d3);
    const a4 = u4 + d4 + (c4 + c4);
    const b4 = c4 + e4 + (d4 + d4);
    o[q + 2] = a3 - a1;
    o[q + 2 + w] = b3 - b1;
    o[q + 3] = a4 - a2;
    o[q + 3 + w] = b4 - b2;
    const u5 = s[p + 4 + du], c5 = s[p + 4], d5 = s[p + 4 + dd], e5 = s[p + 4 + de];
    const u6 = s[p + 5 + du], c6 = s[p + 5], d6 = s[p + 5 + dd], e6 = s[p + 5 + de];
    const a5 = u5 + d5 + (c5 + c5);
    const b5 = c5 + e5 + (d5 + d5);
    const a6 = u6 + d6 + (c6 + c6);
    const b6 = c6 + e6 + (d6 + d6);
    o[q + 4] = a5 - a3;
    o[q + 4 + w] = b5 - b3;
    o[q + 5] = a6 - a4;
    o[q + 5 + w] = b6 - b4;
    const u7 = s[p + 6 + du], c7 = s[p + 6], d7 = s[p + 6 + dd], e7 = s[p + 6 + de];
    const u8 = s[p + 7 + du], c8 = s[p + 7], d8 = s[p + 7 + dd], e8 = s[p + 7 + de];
    const a7 = u7 + d7 + (c7 + c7);
    const b7 = c7 + e7 + (d7 + d7);
    const a8 = u8 + d8 + (c8 + c8);
    const b8 = c8 + e8 + (d8 + d8);
    o[q + 6] = a7 - a5;
    o[q + 6 + w] = b7 - b5;
    o[q + 7] = a8 - a6;
    o[q + 7 + w] = b8 - b6;
    sPrev0 = a7;
    sCur0 = a8;
    sPrev1 = b7;
    sCur1 = b8;
  }
  for (; x + 1 < last; x += 2, p += 2) {
    const q = base + x;
    const u1 = s[p + du], c1 = s[p], d1 = s[p + dd], e1 = s[p + de];
    const u2 = s[p + 1 + du], c2 = s[p + 1], d2 = s[p + 1 + dd], e2 = s[p + 1 + de];
    const a1 = u1 + d1 + (c1 + c1);
    const b1 = c1 + e1 + (d1 + d1);
    const a2 = u2 + d2 + (c2 + c2);
    const b2 = c2 + e2 + (d2 + d2);
    o[q] = a1 - sPrev0;
    o[q + w] = b1 - sPrev1;
    o[q + 1] = a2 - sCur0;
    o[q + 1 + w] = b2 - sCur1;
    sPrev0 = a1;
    sCur0 = a2;
    sPrev1 = b1;
    sCur1 = b2;
  }
  for (; x < last; x++, p++) {
    const c1 = s[p], d1 = s[p + dd];
    const a1 = s[p + du] + d1 + (c1 + c1);
    const b1 = c1 + s[p + de] + (d1 + d1);
    o[base + x] = a1 - sPrev0;
    o[base + x + w] = b1 - sPrev1;
    sPrev0 = sCur0;
    sCur0 = a1;
    sPrev1 = sCur1;
    sCur1 = b1;
  }
  o[base + last] = ends[2] - sPrev0;
  o[base + w + last] = ends[6] - sPrev1;
}

/** sobelYRow for two output rows from one load of the four rows around them. */
function sobelYRowPair(s: Float32Array, du: number, c: number, dd: number, de: number, w: number, ends: Float64Array, o: Float32Array, base: number): void {
  let tPrev0 = ends[1];
  let tPrev1 = ends[5];
  const centre0 = s[c], down0 = s[c + dd];
  let tCur0 = down0 - s[c + du];
  let tCur1 = s[c + de] - centre0;
  const last = w - 1;
  for (let x = 0, p = c + 1; x < last; x++, p++) {
    const centre = s[p], down = s[p + dd];
    const t0 = down - s[p + du];
    const t1 = s[p + de] - centre;
    o[base + x] = tPrev0 + t0 + (tCur0 + tCur0);
    o[base + w + x] = tPrev1 + t1 + (tCur1 + tCur1);
    tPrev0 = tCur0;
    tCur0 = t0;
    tPrev1 = tCur1;
    tCur1 = t1;
  }
  o[base + last] = tPrev0 + ends[3] + (tCur0 + tCur0);
  o[base + w + last] = tPrev1 + ends[7] + (tCur1 + tCur1);
}

/** yRow with Sobel's weights 1 and 2 (no multiplications: the same bits), two pixels per iteration. */
function sobelYRow(s: Float32Array, du: number, c: number, dd: number, w: number, ends: Float64Array, o: Float32Array, base: number): void {
  let tPrev = ends[1];
  let tCur = s[c + dd] - s[c + du];
  const last = w - 1;
  let x = 0;
  let p = c + 1;
  for (; x + 1 < last; x += 2, p += 2) {
    const t1 = s[p + dd] - s[p + du];
    const t2 = s[p + 1 + dd] - s[p + 1 + du];
    o[base + x] = tPrev + t1 + (tCur + tCur);
    o[base + x + 1] = tCur + t2 + (t1 + t1);
    tPrev = t1;
    tCur = t2;
  }
  for (; x < last; x++, p++) {
    const tNext = s[p + dd] - s[p + du];
    o[base + x] = tPrev + tNext + (tCur + tCur);
    tPrev = tCur;
    tCur = tNext;
  }
  o[base + last] = tPrev + ends[3] + (tCur + tCur);
}

/**
 * The magnitude row, and its extremes gathered into `extremes`. New extremes are rare, so the
 * branches are well predicted (and skip NaN, as Otsu's own range does).
 */
function magnitudeRow(s: Float32Array, du: number, c: number, dd: number, w: number, a: number, b: number, ends: Float64Array, o: Float32Array, base: number, extremes: Float64Array): void {
  let lo = extremes[0];
  let hi = extremes[1];
  let sPrev = ends[0];
  let tPrev = ends[1];
  let sCur = a * (s[c + du] + s[c + dd]) + b * s[c];
  let tCur = s[c + dd] - s[c + du];
  const last = w - 1;
  // Two pixels per iteration (measured faster than one), then the rest one at a time.
  let x = 0;
  let p = c + 1;
  for (; x + 1 < last; x += 2, p += 2) {
    const up1 = s[p + du];
    const down1 = s[p + dd];
    const s1 = a * (up1 + down1) + b * s[p];
    const t1 = down1 - up1;
    const up2 = s[p + 1 + du];
    const down2 = s[p + 1 + dd];
    const s2 = a * (up2 + down2) + b * s[p + 1];
    const t2 = down2 - up2;
    const gx1 = s1 - sPrev;
    const gy1 = a * (tPrev + t1) + b * tCur;
    const m1 = Math.sqrt(gx1 * gx1 + gy1 * gy1);
    const gx2 = s2 - sCur;
    const gy2 = a * (tCur + t2) + b * t1;
    const m2 = Math.sqrt(gx2 * gx2 + gy2 * gy2);
    o[base + x] = m1;
    o[base + x + 1] = m2;
    if (m1 < lo) lo = m1;
    if (m1 > hi) hi = m1;
    if (m2 < lo) lo = m2;
    if (m2 > hi) hi = m2;
    sPrev = s1;
    sCur = s2;
    tPrev = t1;
    tCur = t2;
  }
  for (; x < last; x++, p++) {
    const up = s[p + du];
    const down = s[p + dd];
    const sNext = a * (up + down) + b * s[p];
    const tNext = down - up;
    const gx = sNext - sPrev;
    const gy = a * (tPrev + tNext) + b * tCur;
    const m = Math.sqrt(gx * gx + gy * gy);
    o[base + x] = m;
    if (m < lo) lo = m;
    if (m > hi) hi = m;
    sPrev = sCur;
    sCur = sNext;
    tPrev = tCur;
    tCur = tNext;
  }
  const gx = ends[2] - sPrev;
  const gy = a * (tPrev + ends[3]) + b * tCur;
  const m = Math.sqrt(gx * gx + gy * gy);
  o[base + last] = m;
  extremes[0] = lo;
  extremes[1] = hi;
  widenRange(extremes, m);
}

function sobelMagnitudeRow(s: Float32Array, du: number, c: number, dd: number, w: number, ends: Float64Array, o: Float32Array, base: number, extremes: Float64Array): void {
  let lo = extremes[0];
  let hi = extremes[1];
  let sPrev = ends[0];
  let tPrev = ends[1];
  let sCur = s[c + du] + s[c + dd] + 2 * s[c];
  let tCur = s[c + dd] - s[c + du];
  const last = w - 1;
  // Two pixels per iteration (measured faster than one), then the rest one at a time.
  let x = 0;
  let p = c + 1;
  for (; x + 1 < last; x += 2, p += 2) {
    const up1 = s[p + du];
    const down1 = s[p + dd];
    const c1 = s[p];
    const s1 = up1 + down1 + (c1 + c1);
    const t1 = down1 - up1;
    const up2 = s[p + 1 + du];
    const down2 = s[p + 1 + dd];
    const c2 = s[p + 1];
    const s2 = up2 + down2 + (c2 + c2);
    const t2 = down2 - up2;
    const gx1 = s1 - sPrev;
    const gy1 = tPrev + t1 + (tCur + tCur);
    const m1 = Math.sqrt(gx1 * gx1 + gy1 * gy1);
    const gx2 = s2 - sCur;
    const gy2 = tCur + t2 + (t1 + t1);
    const m2 = Math.sqrt(gx2 * gx2 + gy2 * gy2);
    o[base + x] = m1;
    o[base + x + 1] = m2;
    if (m1 < lo) lo = m1;
    if (m1 > hi) hi = m1;
    if (m2 < lo) lo = m2;
    if (m2 > hi) hi = m2;
    sPrev = s1;
    sCur = s2;
    tPrev = t1;
    tCur = t2;
  }
  for (; x < last; x++, p++) {
    const up = s[p + du];
    const down = s[p + dd];
    const centre = s[p];
    const sNext = up + down + (centre + centre);
    const tNext = down - up;
    const gx = sNext - sPrev;
    const gy = tPrev + tNext + (tCur + tCur);
    const m = Math.sqrt(gx * gx + gy * gy);
    o[base + x] = m;
    if (m < lo) lo = m;
    if (m > hi) hi = m;
    sPrev = sCur;
    sCur = sNext;
    tPrev = tCur;
    tCur = tNext;
  }
  const gx = ends[2] - sPrev;
  const gy = tPrev + ends[3] + (tCur + tCur);
  const m = Math.sqrt(gx * gx + gy * gy);
  o[base + last] = m;
  extremes[0] = lo;
  extremes[1] = hi;
  widenRange(extremes, m);
}

/**
 * sobelMagnitudeRow for two output rows at once: the rows around them (up, centre, down, below)
 * are each loaded once for both (four loads per column instead of six). The same operations per row.
 */
function sobelMagnitudeRowPair(s: Float32Array, du: number, c: number, dd: number, de: number, w: number, ends: Float64Array, o: Float32Array, base: number, extremes: Float64Array): void {
  let lo = extremes[0];
  let hi = extremes[1];
  let sPrev0 = ends[0];
  let tPrev0 = ends[1];
  let sPrev1 = ends[4];
  let tPrev1 = ends[5];
  const up0 = s[c + du], centre0 = s[c], down0 = s[c + dd], below0 = s[c + de];
  let sCur0 = up0 + down0 + 2 * centre0;
  let tCur0 = down0 - up0;
  let sCur1 = centre0 + below0 + 2 * down0;
  let tCur1 = below0 - centre0;
  const last = w - 1;
  for (let x = 0, p = c + 1; x < last; x++, p++) {
    const up = s[p + du];
    const centre = s[p];
    const down = s[p + dd];
    const below = s[p + de];
    const s0 = up + down + (centre + centre);
    const t0 = down - up;
    const s1 = centre + below + (down + down);
    const t1 = below - centre;
    const gx0 = s0 - sPrev0;
    const gy0 = tPrev0 + t0 + (tCur0 + tCur0);
    const m0 = Math.sqrt(gx0 * gx0 + gy0 * gy0);
    const gx1 = s1 - sPrev1;
    const gy1 = tPrev1 + t1 + (tCur1 + tCur1);
    const m1 = Math.sqrt(gx1 * gx1 + gy1 * gy1);
    o[base + x] = m0;
    o[base + w + x] = m1;
    if (m0 < lo) lo = m0;
    if (m0 > hi) hi = m0;
    if (m1 < lo) lo = m1;
    if (m1 > hi) hi = m1;
    sPrev0 = sCur0;
    sCur0 = s0;
    tPrev0 = tCur0;
    tCur0 = t0;
    sPrev1 = sCur1;
    sCur1 = s1;
    tPrev1 = tCur1;
    tCur1 = t1;
  }
  const gx0 = ends[2] - sPrev0;
  const gy0 = tPrev0 + ends[3] + (tCur0 + tCur0);
  const m0 = Math.sqrt(gx0 * gx0 + gy0 * gy0);
  const gx1 = ends[6] - sPrev1;
  const gy1 = tPrev1 + ends[7] + (tCur1 + tCur1);
  const m1 = Math.sqrt(gx1 * gx1 + gy1 * gy1);
  o[base + last] = m0;
  o[base + w + last] = m1;
  extremes[0] = lo;
  extremes[1] = hi;
  widenRange(extremes, m0);
  widenRange(extremes, m1);
}

/**
 * The last column's magnitude into the range, NaN skipped as in the loops. Through Number.isNaN and
 * Math.min/max, not comparisons: a comparison here, reached once per row, may have seen only small
 * whole numbers (the first rows' edges are often 0) and been compiled for them, and the row function
 * was then seen leaving its compiled code at every row, taking twice the time.
 */
function widenRange(extremes: Float64Array, m: number): void {
  if (Number.isNaN(m)) return;
  extremes[0] = Math.min(extremes[0], m);
  extremes[1] = Math.max(extremes[1], m);
}

/**
 * Runs every row function a few times on short rows when the module loads, so that each of their
 * statements has type feedback before the optimising compiler first sees them. Otherwise a
 * photo's first row compiles the long loop on-stack before the code after it has ever run, and
 * that code then leaves the compiled loop at every row (seen as 1,166 deoptimisations of the Sobel
 * pair in one benchmark run and a 1.7× slower standard pipeline, in some processes only).
 */
function warmUpRowFunctions(): void {
  const w = 8;
  const s = Float32Array.from({ length: 4 * w }, (_, i) => ((i * 7) % 5) + 0.25);
  const o = new Float32Array(2 * w);
  const ends = Float64Array.of(0.5, 1.5, 2.5, 3.5, 0.5, 1.5, 2.5, 3.5);
  const extremes = Float64Array.of(Infinity, -Infinity);
  for (let i = 0; i < 4; i++) {
    sobelMagnitudeRowPair(s, -w, w, w, 2 * w, w, ends, o, 0, extremes);
    sobelMagnitudeRow(s, -w, w, w, w, ends, o, 0, extremes);
    magnitudeRow(s, -w, w, w, w, 3, 10, ends, o, 0, extremes);
    sobelXRow(s, -w, w, w, w, ends, o, 0);
    sobelXRowPair(s, -w, w, w, 2 * w, w, ends, o, 0);
    sobelYRowPair(s, -w, w, w, 2 * w, w, ends, o, 0);
    sobelYRow(s, -w, w, w, w, ends, o, 0);
    xRow(s, -w, w, w, w, 3, 10, ends, o, 0);
    yRow(s, -w, w, w, w, 3, 10, ends, o, 0);
    directionRow(s, -w, w, w, w, 1, 2, ends, o, 0);
  }
}

warmUpRowFunctions();

function directionRow(s: Float32Array, du: number, c: number, dd: number, w: number, a: number, b: number, ends: Float64Array, o: Float32Array, base: number): void {
  let sPrev = ends[0];
  let tPrev = ends[1];
  let sCur = a * (s[c + du] + s[c + dd]) + b * s[c];
  let tCur = s[c + dd] - s[c + du];
  const last = w - 1;
  for (let x = 0, p = c + 1; x < last; x++, p++) {
    const up = s[p + du];
    const down = s[p + dd];
    const sNext = a * (up + down) + b * s[p];
    const tNext = down - up;
    o[base + x] = Math.atan2(a * (tPrev + tNext) + b * tCur, sNext - sPrev) * DEGREES_PER_RADIAN;
    sPrev = sCur;
    sCur = sNext;
    tPrev = tCur;
    tCur = tNext;
  }
  o[base + last] = Math.atan2(a * (tPrev + ends[3]) + b * tCur, ends[2] - sPrev) * DEGREES_PER_RADIAN;
}
