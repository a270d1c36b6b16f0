// The plain engine's correlation with a large kernel through the fast Fourier transform, in
// 128×128 tiles (overlap-save), in double precision: the counterpart of wasm/assembly/fft.ts.
// Each tile of the padded source is transformed, multiplied by the kernel's spectrum and transformed
// back; its (129 − kernel) × (129 − kernel) inner outputs are exact circular ones. Two tiles go
// through one complex transform, one as the real part and one as the imaginary part: the kernel is
// real, so their results come back apart. Transforms: iterative radix-2 Cooley–Tukey (J. W. Cooley
// and J. W. Tukey, Math. Comp. 19, 1965), two stages per sweep of the tile (three were slower: the
// values spill out of the registers), down every column of the tile at once; each dimension runs
// decimation in time, which takes its rows in bit-reversed order, or decimation in frequency, which
// leaves them so, so that no pass only reorders rows. The inverse is the forward transform of the
// complex conjugate.
import { borderIndex, borderTable, OUTSIDE, type BorderMode } from './border';
import type { Image } from './image';
import type { Kernel } from './kernels';

const N = 128;
const LOG_N = 7;
const AREA = N * N;

/** Longest kernel side the tiles take: a tile keeps N − side + 1 valid outputs each way. */
export const FFT_MAX_KERNEL_SIDE = 63;

/** cos and −sin of 2πk/N for k < N: the forward twiddles e^(−2πik/N). */
const COS = new Float64Array(N);
const MINUS_SIN = new Float64Array(N);
/** Bit-reversal permutation of 0 … N−1 (its own inverse). */
const REVERSED = new Int32Array(N);
for (let k = 0; k < N; k++) {
  COS[k] = Math.cos((2 * Math.PI * k) / N);
  MINUS_SIN[k] = -Math.sin((2 * Math.PI * k) / N);
}
for (let i = 0; i < N; i++) {
  let r = 0;
  for (let b = 0; b < LOG_N; b++) r |= ((i >> b) & 1) << (LOG_N - 1 - b);
  REVERSED[i] = r;
}

/*
 * The four planes a correlation works in (0.5 MB, kept): a tile pair (RE, IM) and the kernel's
 * spectrum (KRE, KIM). Module constants, which the butterflies name instead of taking as arguments
 * (5 MP, one CPU, four rounds of both versions in one process, the same bits: 31×31 18.7–19.1 →
 * 17.1–17.7 ns/px, 15×15 15.3–15.8 → 14.7; naming them in the other loops too measured slower, and
 * sweeps fused around the product and after the fill no faster). Made when the module loads: the same planes made
 * on first use in `let` bindings ran slower than arguments (31×31 19.0–19.7 → 20.1–20.8 ns/px).
 */
const RE = new Float64Array(AREA);
const IM = new Float64Array(AREA);
const KRE = new Float64Array(AREA);
const KIM = new Float64Array(AREA);

/**
 * The largest |sample|, or NaN when a sample is NaN or ±∞: through the transform one would spread
 * over a whole tile, where the direct sum keeps it to its windows.
 * On the float32 bit patterns: without the sign bit they order as the magnitudes do, and ±∞ and NaN
 * are the patterns from 0x7f800000 up (IEEE 754 binary32), so one integer maximum answers both
 * questions. 5 MP: 4.7–5 ms, against 11–12 ms comparing the values (and a sum of v·0 for NaN); with
 * Math.max instead of a branch per lane, 3.8–4.1 → 2.4 ms (0.76–0.82 → 0.48 ns/px on the AMD EPYC).
 */
export function largestFiniteMagnitude(data: Float32Array): number {
  const bits = new Int32Array(data.buffer, data.byteOffset, data.length);
  const n = bits.length;
  let m0 = 0, m1 = 0, m2 = 0, m3 = 0;
  let i = 0;
  for (; i + 3 < n; i += 4) {
    // Math.max of int32 values compiles to a compare and a conditional move: no branch to predict.
    m0 = Math.max(m0, bits[i] & 0x7fffffff);
    m1 = Math.max(m1, bits[i + 1] & 0x7fffffff);
    m2 = Math.max(m2, bits[i + 2] & 0x7fffffff);
    m3 = Math.max(m3, bits[i + 3] & 0x7fffffff);
  }
  for (; i < n; i++) {
    const a = bits[i] & 0x7fffffff;
    if (a > m0) m0 = a;
  }
  const largest = Math.max(m0, m1, m2, m3);
  if (largest >= 0x7f800000) return NaN;
  MAGNITUDE_BITS[0] = largest;
  return MAGNITUDE[0];
}

const MAGNITUDE = new Float32Array(1);
const MAGNITUDE_BITS = new Int32Array(MAGNITUDE.buffer);

/**
 * Units of round-off below which a transform's output counts as 0. Where the exact result is 0 (a
 * LoG over a flat part of a mask) a direct sum gives 0 and a transform a residue of a few units of
 * round-off of ‖k‖₁·max|x| (measured: up to 3 in double precision, 2.3 in float32); a gauge counting
 * non-zero pixels would count every residue, so that a kernel crossing the FFT threshold would
 * change an edge fraction from 0.08 to 0.8. 32 units leave a margin of ten over the residues and
 * stay far inside the transform's error bound (Higham §24.1), which the results are stated within.
 */
export const FFT_ZERO_FLOOR_UNITS = 32;

/**
 * The magnitude up to which a transform's output is written as 0: FFT_ZERO_FLOOR_UNITS units of
 * round-off (unitRoundoff: 2⁻⁵³ in double, 2⁻²⁴ in float32) of ‖k‖₁/|divisor|·max|x|.
 */
export function fftZeroFloor(kernel: Kernel, largest: number, unitRoundoff: number): number {
  let l1 = 0;
  for (let i = 0; i < kernel.weights.length; i++) l1 += Math.abs(kernel.weights[i]);
  return FFT_ZERO_FLOOR_UNITS * unitRoundoff * (l1 / Math.abs(kernel.divisor)) * largest;
}

/**
 * dst(x,y) = Σⱼ Σᵢ m[j][i]·src(x+i−rx, y+j−ry) / divisor + offset, with the border, as the direct
 * correlation computes it (within double-precision rounding, then rounded to float32); a sum within
 * `fftZeroFloor` of 0 is written as 0 (plus offset). The source must hold finite samples only
 * (largest: its `largestFiniteMagnitude`) and the kernel's sides be at most FFT_MAX_KERNEL_SIDE.
 */
export function correlateFft(src: Image, kernel: Kernel, border: BorderMode, dst: Image, largest = largestFiniteMagnitude(src.data)): void {
  const { width: w, height: h, data } = src;
  const { rows, cols, weights, divisor, offset } = kernel;
  if (rows > FFT_MAX_KERNEL_SIDE || cols > FFT_MAX_KERNEL_SIDE) throw new RangeError(`the FFT takes kernels up to ${FFT_MAX_KERNEL_SIDE} a side`);
  if (!Number.isFinite(largest)) throw new RangeError('the FFT takes finite samples only');
  const floor = fftZeroFloor(kernel, largest, 2 ** -53);
  const ry = rows >> 1;
  const rx = cols >> 1;
  const validRows = N - rows + 1;
  const validCols = N - cols + 1;
  const tilesDown = Math.ceil(h / validRows);
  const tilesAcross = Math.ceil(w / validCols);
  // Source column of each tile column: image columns −rx … tilesAcross·validCols − rx + N − 1.
  const columns = borderTable(w, rx, tilesAcross * validCols + N - rx - w, border);

  // The kernel flipped about its centre, circularly, so that the tiles' circular convolution with it
  // is the correlation; 1/divisor and the inverse transform's 1/N² folded in.
  RE.fill(0);
  IM.fill(0);
  const scale = 1 / (divisor * AREA);
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < cols; i++) {
      const a = (ry - j + N) & (N - 1);
      const b = (rx - i + N) & (N - 1);
      RE[REVERSED[a] * N + b] = weights[j * cols + i] * scale;
    }
  }
  // Transformed in the tile planes, then kept apart.
  adjacentRows(RE, IM);
  forward(false);
  KRE.set(RE);
  KIM.set(IM);

  const out = dst.data;
  const tiles = tilesDown * tilesAcross;
  for (let t = 0; t < tiles; t += 2) {
    const y0 = Math.floor(t / tilesAcross) * validRows;
    const x0 = (t % tilesAcross) * validCols;
    fillTile(data, w, h, border, RE, columns, y0 - ry, x0);
    const second = t + 1 < tiles;
    const y1 = Math.floor((t + 1) / tilesAcross) * validRows;
    const x1 = ((t + 1) % tilesAcross) * validCols;
    if (second) fillTile(data, w, h, border, IM, columns, y1 - ry, x1);
    else IM.fill(0);
    forward(true);
    inverse(rx, rx + validCols);
    writeTile(RE, false, out, w, h, ry, rx, validRows, validCols, y0, x0, offset, floor);
    if (second) writeTile(IM, true, out, w, h, ry, rx, validRows, validCols, y1, x1, offset, floor);
  }
}

/**
 * The forward 2-D transform of (RE, IM), whose rows are in bit-reversed order and whose first stage
 * is done (`fillTile`, `adjacentRows`): down the columns (decimation in time), transpose, down the
 * columns (decimation in frequency). The spectrum is left transposed with its rows in bit-reversed
 * order. With `timesKernel` (the kernel's spectrum in that layout in KRE, KIM), the last stage
 * multiplies by it on the way and leaves the product's complex conjugate with the first stage of
 * `inverse` done on it.
 */
function forward(timesKernel: boolean): void {
  columnsInTime();
  transpose(RE);
  transpose(IM);
  columnsInFrequency();
  if (timesKernel) lastStageTimesConjugate(RE, IM, KRE, KIM);
  else adjacentRows(RE, IM);
}

/**
 * The inverse (unscaled) of `forward`, back untransposed, given the spectrum's complex conjugate: the
 * forward transform of it is the conjugate of the inverse transform (conj(F(conj Z)) = F⁻¹(Z)·N²), so
 * the real part is the result and the imaginary part its negative. Its first stage is done by
 * `forward`'s product, its last by `writeTile` as it writes the outputs. The second dimension is
 * transformed only in the columns writeTile reads (fromColumn … toColumn − 1, the tile's valid
 * ones: 5 MP, one CPU, 31×31 27.7 → 26.5 ns/px).
 */
function inverse(fromColumn: number, toColumn: number): void {
  columnsInTime();
  transpose(RE);
  transpose(IM);
  columnsInFrequency(fromColumn, toColumn);
}

/**
 * In place, in blocks of 16×16: a row of the plane is 1 KB, so the 128 lines of one column fall into 4
 * of the first-level cache's sets, more than their ways hold; a block pair's 32 lines stay.
 */
function transpose(plane: Float64Array): void {
  for (let bi = 0; bi < N; bi += TRANSPOSE_BLOCK) {
    for (let bj = bi; bj < N; bj += TRANSPOSE_BLOCK) {
      for (let i = bi; i < bi + TRANSPOSE_BLOCK; i++) {
        for (let j = bi === bj ? i + 1 : bj; j < bj + TRANSPOSE_BLOCK; j++) {
          const a = i * N + j;
          const b = j * N + i;
          const t = plane[a];
          plane[a] = plane[b];
          plane[b] = t;
        }
      }
    }
  }
}

const TRANSPOSE_BLOCK = 16;

/**
 * The stage of half 1, whose twiddle is 1: rows 2m and 2m+1 become their sum and difference. It is
 * both the first stage of decimation in time and the last of decimation in frequency.
 */
function adjacentRows(re: Float64Array, im: Float64Array): void {
  for (let a = 0; a < AREA; a += 2 * N) {
    const b = a + N;
    for (let x = 0; x < N; x++) {
      const ur = re[a + x], ui = im[a + x], vr = re[b + x], vi = im[b + x];
      re[a + x] = ur + vr;
      im[a + x] = ui + vi;
      re[b + x] = ur - vr;
      im[b + x] = ui - vi;
    }
  }
}

/**
 * The N-point transform down every column, decimation in time: rows in bit-reversed order in,
 * natural order out, forward (e^(−2πi/N)). Here the stages after the first (`adjacentRows`), as
 * three sweeps of two (half h, then 2h, for h = 2, 8, 32).
 */
function columnsInTime(): void {
  for (let h = 2; h < N; h <<= 2) {
    const s1 = N / (2 * h);
    const s2 = N / (4 * h);
    unitButterfliesInTime(h);
    for (let k = 1; k < h; k++) {
      // Stage h: a0 ± w1·a1, a2 ± w1·a3 with w1 = W(2h)^k; stage 2h: the sums ± w2·(a2 + w1·a3) and the
      // differences ± w3·(a2 − w1·a3), w2 = W(4h)^k, w3 = W(4h)^(k+h) = −i·w2. Three products:
      // w1·a1, w2·a2 and w2·w1·a3, with w2·w1 = W(4h)^3k.
      const w1r = COS[k * s1], w1i = MINUS_SIN[k * s1];
      const w2r = COS[k * s2], w2i = MINUS_SIN[k * s2];
      const w3r = COS[3 * k * s2], w3i = MINUS_SIN[3 * k * s2];
      for (let start = 0; start < N; start += 4 * h) {
        const p0 = (start + k) * N, p1 = p0 + h * N, p2 = p1 + h * N, p3 = p2 + h * N;
        for (let x = 0; x < N; x++) {
          const a0r = RE[p0 + x], a0i = IM[p0 + x];
          const a1r = RE[p1 + x], a1i = IM[p1 + x];
          const a2r = RE[p2 + x], a2i = IM[p2 + x];
          const a3r = RE[p3 + x], a3i = IM[p3 + x];
          const rr = a1r * w1r - a1i * w1i, ri = a1r * w1i + a1i * w1r;
          const pr = a2r * w2r - a2i * w2i, pi = a2r * w2i + a2i * w2r;
          const qr = a3r * w3r - a3i * w3i, qi = a3r * w3i + a3i * w3r;
          const c0r = a0r + rr, c0i = a0i + ri, c1r = a0r - rr, c1i = a0i - ri;
          const sr = pr + qr, si = pi + qi;
          // −i·(p − q)
          const dr = pi - qi, di = qr - pr;
          RE[p0 + x] = c0r + sr;
          IM[p0 + x] = c0i + si;
          RE[p2 + x] = c0r - sr;
          IM[p2 + x] = c0i - si;
          RE[p1 + x] = c1r + dr;
          IM[p1 + x] = c1i + di;
          RE[p3 + x] = c1r - dr;
          IM[p3 + x] = c1i - di;
        }
      }
    }
  }
}

/**
 * The N-point transform down every column, decimation in frequency: natural order in, rows in
 * bit-reversed order out after the last (`adjacentRows`). Here the first six stages, as three sweeps of two
 * (half 2h, then h, for h = 32, 8, 2).
 */
function columnsInFrequency(fromColumn = 0, toColumn = N): void {
  for (let h = N >> 2; h >= 2; h >>= 2) {
    const s1 = N / (2 * h);
    const s2 = N / (4 * h);
    unitButterfliesInFrequency(h, fromColumn, toColumn);
    for (let k = 1; k < h; k++) {
      // Stage 2h: a0 + a2, a1 + a3 and (a0 − a2)·w2, (a1 − a3)·w3 with w2 = W(4h)^k, w3 = −i·w2;
      // stage h: the sums' sum and their difference times w1 = W(2h)^k, likewise for the products.
      // Three products: w1·(c0 − c1), w2·(d2 − i·d3) and w2·w1·(d2 + i·d3), w2·w1 = W(4h)^3k.
      const w1r = COS[k * s1], w1i = MINUS_SIN[k * s1];
      const w2r = COS[k * s2], w2i = MINUS_SIN[k * s2];
      const w3r = COS[3 * k * s2], w3i = MINUS_SIN[3 * k * s2];
      for (let start = 0; start < N; start += 4 * h) {
        const p0 = (start + k) * N, p1 = p0 + h * N, p2 = p1 + h * N, p3 = p2 + h * N;
        for (let x = fromColumn; x < toColumn; x++) {
          const a0r = RE[p0 + x], a0i = IM[p0 + x];
          const a1r = RE[p1 + x], a1i = IM[p1 + x];
          const a2r = RE[p2 + x], a2i = IM[p2 + x];
          const a3r = RE[p3 + x], a3i = IM[p3 + x];
          const c0r = a0r + a2r, c0i = a0i + a2i, d2r = a0r - a2r, d2i = a0i - a2i;
          const c1r = a1r + a3r, c1i = a1i + a3i, d3r = a1r - a3r, d3i = a1i - a3i;
          // i·d3
          const jr = -d3i, ji = d3r;
          const er = c0r - c1r, ei = c0i - c1i;
          const fr = d2r - jr, fi = d2i - ji;
          const gr = d2r + jr, gi = d2i + ji;
          RE[p0 + x] = c0r + c1r;
          IM[p0 + x] = c0i + c1i;
          RE[p1 + x] = er * w1r - ei * w1i;
          IM[p1 + x] = er * w1i + ei * w1r;
          RE[p2 + x] = fr * w2r - fi * w2i;
          IM[p2 + x] = fr * w2i + fi * w2r;
          RE[p3 + x] = gr * w3r - gi * w3i;
          IM[p3 + x] = gr * w3i + gi * w3r;
        }
      }
    }
  }
}

/**
 * The butterflies of twiddle index 0, whose twiddles are 1 (cos 0 = 1, −sin 0 = −0): the products
 * drop out, and the results are the general butterflies' (a product by 1 or a sum with a product by
 * −0 changes only the sign of a zero, which no output keeps). A quarter of all butterflies at half
 * 2, fewer after: 5 MP, one CPU, 15×15 20.5 → 20.0 and 31×31 24.6 → 23.8 ns/px.
 */
function unitButterfliesInTime(h: number): void {
  for (let start = 0; start < N; start += 4 * h) {
    const p0 = start * N, p1 = p0 + h * N, p2 = p1 + h * N, p3 = p2 + h * N;
    for (let x = 0; x < N; x++) {
      const a0r = RE[p0 + x], a0i = IM[p0 + x];
      const a1r = RE[p1 + x], a1i = IM[p1 + x];
      const a2r = RE[p2 + x], a2i = IM[p2 + x];
      const a3r = RE[p3 + x], a3i = IM[p3 + x];
      const c0r = a0r + a1r, c0i = a0i + a1i, c1r = a0r - a1r, c1i = a0i - a1i;
      const sr = a2r + a3r, si = a2i + a3i;
      const dr = a2i - a3i, di = a3r - a2r;
      RE[p0 + x] = c0r + sr;
      IM[p0 + x] = c0i + si;
      RE[p2 + x] = c0r - sr;
      IM[p2 + x] = c0i - si;
      RE[p1 + x] = c1r + dr;
      IM[p1 + x] = c1i + di;
      RE[p3 + x] = c1r - dr;
      IM[p3 + x] = c1i - di;
    }
  }
}

function unitButterfliesInFrequency(h: number, fromColumn: number, toColumn: number): void {
  for (let start = 0; start < N; start += 4 * h) {
    const p0 = start * N, p1 = p0 + h * N, p2 = p1 + h * N, p3 = p2 + h * N;
    for (let x = fromColumn; x < toColumn; x++) {
      const a0r = RE[p0 + x], a0i = IM[p0 + x];
      const a1r = RE[p1 + x], a1i = IM[p1 + x];
      const a2r = RE[p2 + x], a2i = IM[p2 + x];
      const a3r = RE[p3 + x], a3i = IM[p3 + x];
      const c0r = a0r + a2r, c0i = a0i + a2i, d2r = a0r - a2r, d2i = a0i - a2i;
      const c1r = a1r + a3r, c1i = a1i + a3i, d3r = a1r - a3r, d3i = a1i - a3i;
      RE[p0 + x] = c0r + c1r;
      IM[p0 + x] = c0i + c1i;
      RE[p1 + x] = c0r - c1r;
      IM[p1 + x] = c0i - c1i;
      // d2 ∓ i·d3
      RE[p2 + x] = d2r + d3i;
      IM[p2 + x] = d2i - d3r;
      RE[p3 + x] = d2r - d3i;
      IM[p3 + x] = d2i + d3r;
    }
  }
}

/**
 * The last stage (`adjacentRows`) with each result multiplied by the kernel spectrum at its place and
 * conjugated, then the inverse's first stage on the same two rows (in the spectrum's layout both pair rows 2m and 2m+1).
 */
function lastStageTimesConjugate(re: Float64Array, im: Float64Array, kre: Float64Array, kim: Float64Array): void {
  for (let a = 0; a < AREA; a += 2 * N) {
    const b = a + N;
    for (let x = 0; x < N; x++) {
      const ur = re[a + x], ui = im[a + x], vr = re[b + x], vi = im[b + x];
      const sr = ur + vr, si = ui + vi, dr = ur - vr, di = ui - vi;
      const pr = kre[a + x], pi = kim[a + x], qr = kre[b + x], qi = kim[b + x];
      const yr = sr * pr - si * pi, yi = -(sr * pi + si * pr);
      const zr = dr * qr - di * qi, zi = -(dr * qi + di * qr);
      re[a + x] = yr + zr;
      im[a + x] = yi + zi;
      re[b + x] = yr - zr;
      im[b + x] = yi - zi;
    }
  }
}

/**
 * Tile rows y0 … y0+N−1 into a plane (source rows through the border, columns through the column
 * table, which starts at −rx; zeros outside with the constant border) with the transform's first
 * stage done on the way: plane rows 2m and 2m+1 take the sum and the difference of tile rows r and
 * r + N/2, r = REVERSED[2m] (decimation in time takes the rows in bit-reversed order).
 */
function fillTile(data: Float32Array, w: number, h: number, border: BorderMode, plane: Float64Array, columns: Int32Array, y0: number, x0: number): void {
  const first = columns[x0];
  const inside = first !== OUTSIDE && columns[x0 + N - 1] === first + N - 1;
  const half = N >> 1;
  for (let r = 0; r < half; r++) {
    const sum = REVERSED[r] * N;
    const difference = sum + N;
    const top = borderIndex(y0 + r, h, border);
    const bottom = borderIndex(y0 + r + half, h, border);
    if (inside && top !== OUTSIDE && bottom !== OUTSIDE) {
      const a = top * w + first;
      const b = bottom * w + first;
      for (let s = 0; s < N; s++) {
        const u = data[a + s], v = data[b + s];
        plane[sum + s] = u + v;
        plane[difference + s] = u - v;
      }
      continue;
    }
    copyTileRow(data, w, top, columns, x0, plane, sum);
    copyTileRow(data, w, bottom, columns, x0, plane, difference);
    for (let s = 0; s < N; s++) {
      const u = plane[sum + s], v = plane[difference + s];
      plane[sum + s] = u + v;
      plane[difference + s] = u - v;
    }
  }
}

function copyTileRow(data: Float32Array, w: number, row: number, columns: Int32Array, x0: number, plane: Float64Array, line: number): void {
  if (row === OUTSIDE) {
    plane.fill(0, line, line + N);
    return;
  }
  const source = row * w;
  for (let s = 0; s < N; s++) {
    const c = columns[x0 + s];
    plane[line + s] = c === OUTSIDE ? 0 : data[source + c];
  }
}

/**
 * The inverse transform's last stage (half 1; real and imaginary parts apart), done only where a
 * valid output needs it, of the real part (`negate` false) or the imaginary part's negative (`negate`
 * true, see `inverse`: −a − b and b − a are exactly −(a + b) and −(a − b) under rounding to nearest,
 * so no product by −1), written straight to the output at (y0, x0), plus offset: plane rows 2m and
 * 2m+1 give tile rows r and r + N/2, r = REVERSED[2m]; a tile's valid part is its rows ry … and
 * columns rx …. A sum within floor of 0 is written as 0, plus offset, without a branch (outputs near
 * 0 are common, and a branch on them mispredicted: 18 → 23 ns/px at 15×15); v·0 may be −0, and
 * −0 + offset is +0 for offset 0.
 */
function writeTile(plane: Float64Array, negate: boolean, out: Float32Array, w: number, h: number, ry: number, rx: number, validRows: number, validCols: number, y0: number, x0: number, offset: number, floor: number): void {
  const rowsOut = Math.min(validRows, h - y0);
  const colsOut = Math.min(validCols, w - x0);
  for (let m = 0; m < N; m += 2) {
    const a = m * N + rx;
    const b = a + N;
    const top = REVERSED[m] - ry;
    const bottom = top + (N >> 1);
    if (top >= 0 && top < rowsOut) {
      const to = (y0 + top) * w + x0;
      if (negate) {
        for (let s = 0; s < colsOut; s++) {
          const v = -plane[a + s] - plane[b + s];
          out[to + s] = v * +(Math.abs(v) > floor) + offset;
        }
      } else {
        for (let s = 0; s < colsOut; s++) {
          const v = plane[a + s] + plane[b + s];
          out[to + s] = v * +(Math.abs(v) > floor) + offset;
        }
      }
    }
    if (bottom >= 0 && bottom < rowsOut) {
      const to = (y0 + bottom) * w + x0;
      if (negate) {
        for (let s = 0; s < colsOut; s++) {
          const v = plane[b + s] - plane[a + s];
          out[to + s] = v * +(Math.abs(v) > floor) + offset;
        }
      } else {
        for (let s = 0; s < colsOut; s++) {
          const v = plane[a + s] - plane[b + s];
          out[to + s] = v * +(Math.abs(v) > floor) + offset;
        }
      }
    }
  }
}
