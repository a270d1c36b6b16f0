// Correlation with a large kernel through the fast Fourier transform, in tiles (overlap-save):
// each 128×128 tile of the padded source is transformed, multiplied by the kernel's spectrum and
// transformed back; its (129 − kernel) × (129 − kernel) inner outputs are exact circular ones.
// Two tiles go through one complex transform, one as the real part and one as the imaginary part:
// the kernel is real, so the two results come back apart (real and imaginary parts of the inverse).
// Transforms: iterative radix-2 Cooley–Tukey (J. W. Cooley and J. W. Tukey, Math. Comp. 19, 1965)
// down the columns, four columns per v128 and every column of the tile in one sweep of each butterfly
// pair of rows; the rows' transform is the columns' one on the transposed tile. Float32 throughout.
import { align16, at, borderIndex, OUTSIDE } from './border';

const N: i32 = 128;
const LOG_N: i32 = 7;
const PLANE_BYTES: usize = <usize>(N * N * 4);
const ROW_BYTES: usize = <usize>(N * 4);

/** Scratch bytes `correlateFft` needs for a w-wide image and a kernel of cols columns. */
export function fftScratchBytes(w: i32, cols: i32): i32 {
  return 4 * <i32>PLANE_BYTES + N * 8 + N * 4 + 4 * (w + cols + 2 * N) + 256;
}

/**
 * dst(x,y) = Σⱼ Σᵢ k[j][i]·src(x+i−rx, y+j−ry)·scale + offset (as `correlate2d`), k float32 row-major
 * at weights, rows and cols odd and at most N / 2 − 1 each; mode a border mode of border.ts. A sum of
 * magnitude up to floor is written as 0 (plus offset): a round-off residue where the exact sum is 0
 * (the plain engine's fftZeroFloor).
 */
export function correlateFft(src: usize, dst: usize, w: i32, h: i32, weights: usize, rows: i32, cols: i32, mode: i32, scale: f32, offset: f32, floor: f32, scratch: usize): void {
  const kre = align16(scratch);
  const kim = kre + PLANE_BYTES;
  const re = kim + PLANE_BYTES;
  const im = re + PLANE_BYTES;
  const twiddles = im + PLANE_BYTES;
  const reversed = twiddles + <usize>(N * 8);
  const columns = align16(reversed + <usize>(N * 4));
  const ry = rows >> 1, rx = cols >> 1;
  const validRows = N - rows + 1, validCols = N - cols + 1;
  const tilesDown = (h + validRows - 1) / validRows, tilesAcross = (w + validCols - 1) / validCols;
  prepareTables(twiddles, reversed);
  // Source column of every tile column: image columns −rx … tilesAcross·validCols − rx + N − 1.
  const firstColumn = -rx;
  const columnCount = tilesAcross * validCols + N;
  for (let c = 0; c < columnCount; c++) store<i32>(at(columns, c), borderIndex(firstColumn + c, w, mode));

  // The kernel flipped about its centre, circularly, so that the tiles' circular convolution with it
  // is the correlation; 1/N² of the inverse transform folded in.
  memory.fill(kre, 0, PLANE_BYTES);
  memory.fill(kim, 0, PLANE_BYTES);
  const norm = scale / <f32>(N * N);
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < cols; i++) {
      const a = (ry - j + N) & (N - 1), b = (rx - i + N) & (N - 1);
      store<f32>(at(kre, a * N + b), load<f32>(at(weights, j * cols + i)) * norm);
    }
  }
  transform2d(kre, kim, twiddles, reversed, false);

  const tiles = tilesDown * tilesAcross;
  for (let t = 0; t < tiles; t += 2) {
    const hasSecond = t + 1 < tiles;
    fillTile(src, w, h, mode, re, columns, (t / tilesAcross) * validRows - ry, (t % tilesAcross) * validCols);
    if (hasSecond) fillTile(src, w, h, mode, im, columns, ((t + 1) / tilesAcross) * validRows - ry, ((t + 1) % tilesAcross) * validCols);
    else memory.fill(im, 0, PLANE_BYTES);
    transform2d(re, im, twiddles, reversed, false);
    multiplySpectra(re, im, kre, kim);
    transform2d(re, im, twiddles, reversed, true);
    writeTile(re, dst, w, h, ry, rx, validRows, validCols, (t / tilesAcross) * validRows, (t % tilesAcross) * validCols, offset, floor);
    if (hasSecond) writeTile(im, dst, w, h, ry, rx, validRows, validCols, ((t + 1) / tilesAcross) * validRows, ((t + 1) % tilesAcross) * validCols, offset, floor);
  }
}

/** Twiddles e^(−2πik/N) for k < N/2 (cosine, then sine, as float32 pairs) and the bit-reversal permutation. */
function prepareTables(twiddles: usize, reversed: usize): void {
  for (let k = 0; k < N / 2; k++) {
    const angle = (2 * Math.PI * <f64>k) / <f64>N;
    store<f32>(twiddles + ((<usize>k) << 3), <f32>Math.cos(angle));
    store<f32>(twiddles + ((<usize>k) << 3), <f32>-Math.sin(angle), 4);
  }
  for (let i = 0; i < N; i++) {
    let r = 0;
    for (let b = 0; b < LOG_N; b++) r |= ((i >> b) & 1) << (LOG_N - 1 - b);
    store<i32>(at(reversed, i), r);
  }
}

/**
 * Source rows y0 … y0+N−1 and columns x0 − rx … (through the column table, which starts at −rx)
 * into a plane, border applied; zeros for positions outside with the constant border.
 */
function fillTile(src: usize, w: i32, h: i32, mode: i32, plane: usize, columns: usize, y0: i32, x0: i32): void {
  const table = at(columns, x0);
  // Inside the image across the whole tile: contiguous copies.
  const first = load<i32>(table), last = load<i32>(at(table, N - 1));
  const inside = first != OUTSIDE && last == first + N - 1;
  for (let t = 0; t < N; t++) {
    const row = borderIndex(y0 + t, h, mode);
    const line = plane + <usize>t * ROW_BYTES;
    if (row == OUTSIDE) {
      memory.fill(line, 0, ROW_BYTES);
      continue;
    }
    const source = at(src, row * w);
    if (inside) {
      memory.copy(line, at(source, first), ROW_BYTES);
      continue;
    }
    for (let s = 0; s < N; s++) {
      const c = load<i32>(at(table, s));
      store<f32>(at(line, s), c == OUTSIDE ? <f32>0 : load<f32>(at(source, c)));
    }
  }
}

/** The valid inner part of a tile (rows ry …, columns rx …) into the output at (y0, x0), sums within floor of 0 as 0, plus offset. */
function writeTile(plane: usize, dst: usize, w: i32, h: i32, ry: i32, rx: i32, validRows: i32, validCols: i32, y0: i32, x0: i32, offset: f32, floor: f32): void {
  const rowsOut = min(validRows, h - y0), colsOut = min(validCols, w - x0);
  const vo = f32x4.splat(offset), vf = f32x4.splat(floor);
  for (let t = 0; t < rowsOut; t++) {
    const from = plane + <usize>(ry + t) * ROW_BYTES + ((<usize>rx) << 2);
    const to = at(dst, (y0 + t) * w + x0);
    let s = 0;
    for (; s + 4 <= colsOut; s += 4) {
      const v = v128.load(from + ((<usize>s) << 2));
      v128.store(to + ((<usize>s) << 2), f32x4.add(v128.and(v, f32x4.gt(f32x4.abs(v), vf)), vo));
    }
    for (; s < colsOut; s++) {
      const v = load<f32>(at(from, s));
      store<f32>(at(to, s), (Mathf.abs(v) > floor ? v : <f32>0) + offset);
    }
  }
}

/** (re + i·im) ← (re + i·im)·(kre + i·kim), element by element. */
function multiplySpectra(re: usize, im: usize, kre: usize, kim: usize): void {
  for (let o: usize = 0; o < PLANE_BYTES; o += 16) {
    const a = v128.load(re + o), b = v128.load(im + o), c = v128.load(kre + o), d = v128.load(kim + o);
    v128.store(re + o, f32x4.sub(f32x4.mul(a, c), f32x4.mul(b, d)));
    v128.store(im + o, f32x4.add(f32x4.mul(a, d), f32x4.mul(b, c)));
  }
}

/**
 * The 2-D transform of the tile (re, im), forward or inverse (unscaled), leaving it transposed:
 * columns, transpose, columns. Applied forward then inverse, the transposes cancel.
 */
function transform2d(re: usize, im: usize, twiddles: usize, reversed: usize, inverse: bool): void {
  transformColumns(re, im, twiddles, reversed, inverse);
  transpose(re);
  transpose(im);
  transformColumns(re, im, twiddles, reversed, inverse);
}

/** The N-point transform down every column of the tile at once (rows in bit-reversed order first). */
function transformColumns(re: usize, im: usize, twiddles: usize, reversed: usize, inverse: bool): void {
  for (let y = 0; y < N; y++) {
    const r = load<i32>(at(reversed, y));
    if (r > y) {
      swapRows(re + <usize>y * ROW_BYTES, re + <usize>r * ROW_BYTES);
      swapRows(im + <usize>y * ROW_BYTES, im + <usize>r * ROW_BYTES);
    }
  }
  const sign: f32 = inverse ? -1 : 1;
  for (let half = 1; half < N; half <<= 1) {
    const step = N / (2 * half);
    for (let k = 0; k < half; k++) {
      const twiddle = twiddles + ((<usize>(k * step)) << 3);
      const wr = f32x4.splat(load<f32>(twiddle)), wi = f32x4.splat(sign * load<f32>(twiddle, 4));
      for (let start = 0; start < N; start += 2 * half) {
        const a = <usize>(start + k) * ROW_BYTES, b = a + <usize>half * ROW_BYTES;
        butterflyRows(re + a, im + a, re + b, im + b, wr, wi);
      }
    }
  }
}

/** (a, b) ← (a + w·b, a − w·b) for every column of two rows. */
@inline
function butterflyRows(ar: usize, ai: usize, br: usize, bi: usize, wr: v128, wi: v128): void {
  for (let o: usize = 0; o < ROW_BYTES; o += 16) {
    const xr = v128.load(br + o), xi = v128.load(bi + o);
    const tr = f32x4.sub(f32x4.mul(xr, wr), f32x4.mul(xi, wi));
    const ti = f32x4.add(f32x4.mul(xr, wi), f32x4.mul(xi, wr));
    const ur = v128.load(ar + o), ui = v128.load(ai + o);
    v128.store(ar + o, f32x4.add(ur, tr));
    v128.store(ai + o, f32x4.add(ui, ti));
    v128.store(br + o, f32x4.sub(ur, tr));
    v128.store(bi + o, f32x4.sub(ui, ti));
  }
}

@inline
function swapRows(a: usize, b: usize): void {
  for (let o: usize = 0; o < ROW_BYTES; o += 16) {
    const x = v128.load(a + o);
    v128.store(a + o, v128.load(b + o));
    v128.store(b + o, x);
  }
}

/** In-place transpose of an N×N float32 plane, four by four. */
function transpose(plane: usize): void {
  for (let bi = 0; bi < N; bi += 4) {
    for (let bj = bi; bj < N; bj += 4) {
      const p = plane + <usize>bi * ROW_BYTES + ((<usize>bj) << 2);
      if (bi == bj) {
        transposeBlock(p, p);
        continue;
      }
      const q = plane + <usize>bj * ROW_BYTES + ((<usize>bi) << 2);
      swapTransposedBlocks(p, q);
    }
  }
}

/** The 4×4 block at p, transposed, into the block at q (q may be p). */
@inline
function transposeBlock(p: usize, q: usize): void {
  storeTransposed(q, v128.load(p), v128.load(p + ROW_BYTES), v128.load(p + 2 * ROW_BYTES), v128.load(p + 3 * ROW_BYTES));
}

/** Rows r0 … r3 of a 4×4 block stored at q as its columns. */
@inline
function storeTransposed(q: usize, r0: v128, r1: v128, r2: v128, r3: v128): void {
  const t0 = v128.shuffle<f32>(r0, r1, 0, 4, 1, 5), t1 = v128.shuffle<f32>(r0, r1, 2, 6, 3, 7);
  const t2 = v128.shuffle<f32>(r2, r3, 0, 4, 1, 5), t3 = v128.shuffle<f32>(r2, r3, 2, 6, 3, 7);
  v128.store(q, v128.shuffle<f32>(t0, t2, 0, 1, 4, 5));
  v128.store(q + ROW_BYTES, v128.shuffle<f32>(t0, t2, 2, 3, 6, 7));
  v128.store(q + 2 * ROW_BYTES, v128.shuffle<f32>(t1, t3, 0, 1, 4, 5));
  v128.store(q + 3 * ROW_BYTES, v128.shuffle<f32>(t1, t3, 2, 3, 6, 7));
}

/** Block p becomes the transpose of block q and q that of p. */
function swapTransposedBlocks(p: usize, q: usize): void {
  const p0 = v128.load(p), p1 = v128.load(p + ROW_BYTES), p2 = v128.load(p + 2 * ROW_BYTES), p3 = v128.load(p + 3 * ROW_BYTES);
  transposeBlock(q, p);
  storeTransposed(q, p0, p1, p2, p3);
}

/**
 * The largest |v| when every one of the n values is finite, else −1, in one pass: a NaN or an infinity
 * in a tile would spread over the whole tile's outputs through the transform, where the direct sum
 * keeps it to its window; the largest magnitude sets the transform's zero floor.
 */
export function largestFiniteMagnitude(src: usize, n: i32): f32 {
  const zero = f32x4.splat(0);
  let ok = i32x4.splat(-1);
  let largest = zero;
  let p = 0;
  // v − v is 0 exactly for finite v (NaN for NaN and ±∞).
  for (; p + 4 <= n; p += 4) {
    const v = v128.load(at(src, p));
    ok = v128.and(ok, f32x4.eq(f32x4.sub(v, v), zero));
    largest = f32x4.pmax(largest, f32x4.abs(v));
  }
  if (!i32x4.all_true(ok)) return -1;
  let m = max(max(f32x4.extract_lane(largest, 0), f32x4.extract_lane(largest, 1)), max(f32x4.extract_lane(largest, 2), f32x4.extract_lane(largest, 3)));
  for (; p < n; p++) {
    const v = load<f32>(at(src, p));
    if (v - v != 0) return -1;
    m = max(m, Mathf.abs(v));
  }
  return m;
}
