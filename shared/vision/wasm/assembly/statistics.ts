// Sums over an image for the quality gate and the gauges, in double precision where the plain engine
// sums in double precision (each pixel's terms in the same order; the sums themselves in other order).
import { align16, at, borderIndex, REFLECT } from './border';
import { storeExtremes } from './extremes';

/**
 * The quality gate's running sums: Σv and Σlap and Σlap² as float64 pairs (bytes 0, 16, 32), then Σv,
 * Σlap, Σlap² of the columns summed one at a time (float64, bytes 64, 72, 80) and the clipped count
 * (int32, byte 88; bytes 48–63 unused). Static: the module runs one call at a time.
 */
const QUALITY_SUMS: usize = memory.data(96, 16);

/**
 * out[0] = Σ v, out[1] = number of v ≥ top, out[2] = Σ lap, out[3] = Σ lap² as four float64, where lap
 * is the 4-neighbour Laplacian with the reflect border, computed per pixel as the plain engine does:
 * up + down + left + right − 4·centre in double precision (first and last columns: up + down + 2·inner − 4·centre).
 * Each row is widened to float64 once into a ring of three rows in `scratch` (wideRingBytes(w) bytes).
 */
export function qualitySums(src: usize, w: i32, h: i32, top: f32, out: usize, scratch: usize): void {
  startQualitySums();
  const wide = align16(scratch);
  for (let y = 0; y < h; y++) {
    widenRow(at(src, y * w), w, y, wide);
    if (y > 0) qualityRowsWide(wide, w, h, y - 1, y, top);
  }
  if (h > 0) qualityRowsWide(wide, w, h, h - 1, h, top);
  finishQualitySums(out);
}

export function startQualitySums(): void {
  memory.fill(QUALITY_SUMS, 0, 96);
}

/** Rows of the quality gate's widened ring: a row and its neighbours above and below. */
export const WIDE_ROWS: i32 = 3;

/** Bytes of one widened row (float64 samples), a multiple of 16. */
@inline
export function wideRowBytes(w: i32): usize {
  return ((<usize>w << 3) + 15) & ~(<usize>15);
}

/** Scratch bytes the widened ring needs (with room to align it). */
export function wideRingBytes(w: i32): i32 {
  return <i32>(<usize>WIDE_ROWS * wideRowBytes(w)) + 16;
}

/** Row y of an image (n = w samples at src) as float64 into slot y mod WIDE_ROWS of the ring at `wide` (16-aligned). */
export function widenRow(src: usize, w: i32, y: i32, wide: usize): void {
  const dst = wide + <usize>(y % WIDE_ROWS) * wideRowBytes(w);
  let x = 0;
  for (; x + 4 <= w; x += 4) {
    const v = v128.load(at(src, x));
    const o = dst + ((<usize>x) << 3);
    v128.store(o, f64x2.promote_low_f32x4(v));
    v128.store(o, f64x2.promote_low_f32x4(v128.shuffle<f32>(v, v, 2, 3, 0, 1)), 16);
  }
  for (; x < w; x++) store<f64>(dst + ((<usize>x) << 3), <f64>load<f32>(at(src, x)));
}

/**
 * Adds rows y0 … y1−1 of the image to the quality gate's running sums (see qualitySums), from rows
 * already widened to float64 (widenRow; rows y−1 … y+1 of each row y in the ring): each sample is
 * widened once, not five times (as centre, up, down, left and right).
 */
export function qualityRowsWide(wide: usize, w: i32, h: i32, y0: i32, y1: i32, top: f32): void {
  let sum = v128.load(QUALITY_SUMS);
  let lapSum = v128.load(QUALITY_SUMS, 16);
  let lapSquares = v128.load(QUALITY_SUMS, 32);
  let clippedWide = i64x2.splat(0);
  let sumScalar = load<f64>(QUALITY_SUMS, 64);
  let lapSumScalar = load<f64>(QUALITY_SUMS, 72);
  let lapSquaresScalar = load<f64>(QUALITY_SUMS, 80);
  let clipped = load<i32>(QUALITY_SUMS, 88);
  const vtop = f64x2.splat(<f64>top);
  const four = f64x2.splat(4);
  const stride = wideRowBytes(w);
  for (let y = y0; y < y1; y++) {
    const c = wide + <usize>(y % WIDE_ROWS) * stride;
    const up = wide + <usize>(borderIndex(y - 1, h, REFLECT) % WIDE_ROWS) * stride;
    const down = wide + <usize>(borderIndex(y + 1, h, REFLECT) % WIDE_ROWS) * stride;
    if (w == 1) {
      const v = load<f64>(c);
      const lap = load<f64>(up) + load<f64>(down) - 2 * v;
      sumScalar += v;
      clipped += v >= <f64>top ? 1 : 0;
      lapSumScalar += lap;
      lapSquaresScalar += lap * lap;
      continue;
    }
    const last = (<usize>(w - 1)) << 3;
    const v0 = load<f64>(c);
    const vLast = load<f64>(c + last);
    const first = load<f64>(up) + load<f64>(down) + 2 * load<f64>(c, 8) - 4 * v0;
    const lastLap = load<f64>(up + last) + load<f64>(down + last) + 2 * load<f64>(c + last - 8) - 4 * vLast;
    lapSumScalar += first + lastLap;
    lapSquaresScalar += first * first + lastLap * lastLap;
    sumScalar += v0 + vLast;
    clipped += (v0 >= <f64>top ? 1 : 0) + (vLast >= <f64>top ? 1 : 0);
    let x = 1;
    for (; x + 4 <= w - 1; x += 4) {
      const o = (<usize>x) << 3;
      // Pixels x, x+1, then x+2, x+3 into the same pairs of sums.
      let m = v128.load(c + o);
      let lap = laplacianPair(v128.load(up + o), v128.load(down + o), v128.load(c + o - 8), v128.load(c + o + 8), m, four);
      clippedWide = i64x2.sub(clippedWide, f64x2.ge(m, vtop));
      sum = f64x2.add(sum, m);
      lapSum = f64x2.add(lapSum, lap);
      lapSquares = f64x2.add(lapSquares, f64x2.mul(lap, lap));
      m = v128.load(c + o, 16);
      lap = laplacianPair(v128.load(up + o, 16), v128.load(down + o, 16), v128.load(c + o + 8), v128.load(c + o, 24), m, four);
      clippedWide = i64x2.sub(clippedWide, f64x2.ge(m, vtop));
      sum = f64x2.add(sum, m);
      lapSum = f64x2.add(lapSum, lap);
      lapSquares = f64x2.add(lapSquares, f64x2.mul(lap, lap));
    }
    for (; x < w - 1; x++) {
      const o = (<usize>x) << 3;
      const centre = load<f64>(c + o);
      const lap = load<f64>(up + o) + load<f64>(down + o) + load<f64>(c + o - 8) + load<f64>(c + o + 8) - 4 * centre;
      sumScalar += centre;
      clipped += centre >= <f64>top ? 1 : 0;
      lapSumScalar += lap;
      lapSquaresScalar += lap * lap;
    }
  }
  v128.store(QUALITY_SUMS, sum);
  v128.store(QUALITY_SUMS, lapSum, 16);
  v128.store(QUALITY_SUMS, lapSquares, 32);
  store<f64>(QUALITY_SUMS, sumScalar, 64);
  store<f64>(QUALITY_SUMS, lapSumScalar, 72);
  store<f64>(QUALITY_SUMS, lapSquaresScalar, 80);
  store<i32>(QUALITY_SUMS, clipped + <i32>(i64x2.extract_lane(clippedWide, 0) + i64x2.extract_lane(clippedWide, 1)), 88);
}

/** The running sums' totals, as qualitySums stores them at out. */
export function finishQualitySums(out: usize): void {
  const sum = v128.load(QUALITY_SUMS), lapSum = v128.load(QUALITY_SUMS, 16), lapSquares = v128.load(QUALITY_SUMS, 32);
  store<f64>(out, load<f64>(QUALITY_SUMS, 64) + f64x2.extract_lane(sum, 0) + f64x2.extract_lane(sum, 1));
  store<f64>(out, <f64>load<i32>(QUALITY_SUMS, 88), 8);
  store<f64>(out, load<f64>(QUALITY_SUMS, 72) + f64x2.extract_lane(lapSum, 0) + f64x2.extract_lane(lapSum, 1), 16);
  store<f64>(out, load<f64>(QUALITY_SUMS, 80) + f64x2.extract_lane(lapSquares, 0) + f64x2.extract_lane(lapSquares, 1), 24);
}

/** 1.5·2²³: adding it to a whole number n with |n| < 2²² leaves 0x4b400000 + n in the float32's bits. */
const WHOLE_MAGIC: f32 = 12582912.0;
const WHOLE_MAGIC_BITS: i32 = 0x4b400000;

/**
 * qualitySums for an image whose every value is a whole number in 0 … 255 (top 255), exactly: the
 * Laplacian is a whole number (|lap| ≤ 2040) and so is every sum (Σlap² ≤ 2040²·n stays below 2⁵³
 * for any photo the server takes), so they equal the plain engine's double-precision sums in any
 * order. Per row, Σv and Σlap add up in float32 lanes (whole numbers below 2²⁴); lap² in int32 lanes, then int64.
 */
export function qualitySumsWhole8(src: usize, w: i32, h: i32, out: usize): void {
  let total: f64 = 0, lapTotal: f64 = 0;
  let squares = i64x2.splat(0);
  let squaresScalar: i64 = 0;
  let clippedLanes = i32x4.splat(0);
  let clipped: i32 = 0;
  const top = f32x4.splat(255), four = f32x4.splat(4), magic = f32x4.splat(WHOLE_MAGIC), magicBits = i32x4.splat(WHOLE_MAGIC_BITS);
  for (let y = 0; y < h; y++) {
    const c = at(src, y * w);
    const up = at(src, borderIndex(y - 1, h, REFLECT) * w);
    const down = at(src, borderIndex(y + 1, h, REFLECT) * w);
    let rowSum = f32x4.splat(0), rowLap = f32x4.splat(0);
    let sumScalar: f32 = 0, lapScalar: f32 = 0;
    if (w == 1) {
      const v = load<f32>(c);
      const lap = load<f32>(up) + load<f32>(down) - 2 * v;
      total += <f64>v;
      lapTotal += <f64>lap;
      squaresScalar += <i64>(lap * lap);
      clipped += v >= 255 ? 1 : 0;
      continue;
    }
    const v0 = load<f32>(c), vLast = load<f32>(at(c, w - 1));
    const first = load<f32>(up) + load<f32>(down) + 2 * load<f32>(at(c, 1)) - 4 * v0;
    const last = load<f32>(at(up, w - 1)) + load<f32>(at(down, w - 1)) + 2 * load<f32>(at(c, w - 2)) - 4 * vLast;
    sumScalar += v0 + vLast;
    lapScalar += first + last;
    squaresScalar += <i64>(first * first) + <i64>(last * last);
    clipped += (v0 >= 255 ? 1 : 0) + (vLast >= 255 ? 1 : 0);
    // Eight pixels a step: the two Laplacians as int16 (|lap| ≤ 2040), squared and added in pairs by one
    // dot product into int32 lanes, which take at most 2·2040² per step: flushed to int64 every 64 steps.
    let x = 1;
    let block = i32x4.splat(0);
    let steps = 0;
    for (; x + 8 <= w - 1; x += 8) {
      const o = (<usize>x) << 2;
      const m = v128.load(c + o), n = v128.load(c + o, 16);
      const lapA = f32x4.sub(f32x4.add(f32x4.add(f32x4.add(v128.load(up + o), v128.load(down + o)), v128.load(c + o - 4)), v128.load(c + o + 4)), f32x4.mul(four, m));
      const lapB = f32x4.sub(f32x4.add(f32x4.add(f32x4.add(v128.load(up + o, 16), v128.load(down + o, 16)), v128.load(c + o + 12)), v128.load(c + o + 20)), f32x4.mul(four, n));
      rowSum = f32x4.add(rowSum, f32x4.add(m, n));
      rowLap = f32x4.add(rowLap, f32x4.add(lapA, lapB));
      clippedLanes = i32x4.sub(i32x4.sub(clippedLanes, f32x4.ge(m, top)), f32x4.ge(n, top));
      const laps = i16x8.narrow_i32x4_s(i32x4.sub(f32x4.add(lapA, magic), magicBits), i32x4.sub(f32x4.add(lapB, magic), magicBits));
      block = i32x4.add(block, i32x4.dot_i16x8_s(laps, laps));
      if (++steps == 64) {
        squares = i64x2.add(squares, i64x2.add(i64x2.extend_low_i32x4_s(block), i64x2.extend_high_i32x4_s(block)));
        block = i32x4.splat(0);
        steps = 0;
      }
    }
    squares = i64x2.add(squares, i64x2.add(i64x2.extend_low_i32x4_s(block), i64x2.extend_high_i32x4_s(block)));
    for (; x < w - 1; x++) {
      const m = load<f32>(at(c, x));
      const lap = load<f32>(at(up, x)) + load<f32>(at(down, x)) + load<f32>(at(c, x - 1)) + load<f32>(at(c, x + 1)) - 4 * m;
      sumScalar += m;
      lapScalar += lap;
      squaresScalar += <i64>(lap * lap);
      clipped += m >= 255 ? 1 : 0;
    }
    total += <f64>sumScalar + <f64>f32x4.extract_lane(rowSum, 0) + <f64>f32x4.extract_lane(rowSum, 1) + <f64>f32x4.extract_lane(rowSum, 2) + <f64>f32x4.extract_lane(rowSum, 3);
    lapTotal += <f64>lapScalar + <f64>f32x4.extract_lane(rowLap, 0) + <f64>f32x4.extract_lane(rowLap, 1) + <f64>f32x4.extract_lane(rowLap, 2) + <f64>f32x4.extract_lane(rowLap, 3);
  }
  store<f64>(out, total);
  store<f64>(out, <f64>(clipped + i32x4.extract_lane(clippedLanes, 0) + i32x4.extract_lane(clippedLanes, 1) + i32x4.extract_lane(clippedLanes, 2) + i32x4.extract_lane(clippedLanes, 3)), 8);
  store<f64>(out, lapTotal, 16);
  store<f64>(out, <f64>(squaresScalar + i64x2.extract_lane(squares, 0) + i64x2.extract_lane(squares, 1)), 24);
}

/** up + down + left + right − 4·centre, in this order. */
@inline
function laplacianPair(up: v128, down: v128, left: v128, right: v128, centre: v128, four: v128): v128 {
  return f64x2.sub(f64x2.add(f64x2.add(f64x2.add(up, down), left), right), f64x2.mul(four, centre));
}

/** Number of pixels that are not 0 (NaN counts, −0 does not) in row y's columns start[y] … end[y]−1, summed over the rows. */
export function countNonZero(src: usize, w: i32, h: i32, starts: usize, ends: usize): i32 {
  const zero = f32x4.splat(0);
  let lanes = i32x4.splat(0);
  let count = 0;
  for (let y = 0; y < h; y++) {
    const row = at(src, y * w);
    const end = min(w, load<i32>(at(ends, y)));
    let x = max(0, load<i32>(at(starts, y)));
    for (; x + 4 <= end; x += 4) lanes = i32x4.sub(lanes, f32x4.ne(v128.load(at(row, x)), zero));
    for (; x < end; x++) count += load<f32>(at(row, x)) != 0 ? 1 : 0;
  }
  return count + i32x4.extract_lane(lanes, 0) + i32x4.extract_lane(lanes, 1) + i32x4.extract_lane(lanes, 2) + i32x4.extract_lane(lanes, 3);
}

/**
 * Over row y's columns start[y] … end[y]−1 of every row: Σv in double precision (to out, float64),
 * the smallest and the largest value with NaN left out (Infinity and −Infinity when there is none;
 * float32 at out + 8 and out + 12). The gauges' mean, minimum and maximum.
 */
export function regionSums(src: usize, w: i32, h: i32, starts: usize, ends: usize, out: usize): void {
  let lo = f32x4.splat(Infinity), hi = f32x4.splat(-Infinity);
  let low = f64x2.splat(0), high = f64x2.splat(0);
  let l: f32 = Infinity, g: f32 = -Infinity;
  let sum: f64 = 0;
  for (let y = 0; y < h; y++) {
    const row = at(src, y * w);
    const end = min(w, load<i32>(at(ends, y)));
    let x = max(0, load<i32>(at(starts, y)));
    for (; x + 4 <= end; x += 4) {
      const v = v128.load(at(row, x));
      // pmin(lo, v) is v < lo ? v : lo: a NaN never replaces the extreme found so far.
      lo = f32x4.pmin(lo, v);
      hi = f32x4.pmax(hi, v);
      low = f64x2.add(low, f64x2.promote_low_f32x4(v));
      high = f64x2.add(high, f64x2.promote_low_f32x4(v128.shuffle<f32>(v, v, 2, 3, 0, 1)));
    }
    for (; x < end; x++) {
      const v = load<f32>(at(row, x));
      if (v < l) l = v;
      if (v > g) g = v;
      sum += <f64>v;
    }
  }
  store<f64>(out, sum + f64x2.extract_lane(low, 0) + f64x2.extract_lane(low, 1) + f64x2.extract_lane(high, 0) + f64x2.extract_lane(high, 1));
  storeExtremes(out + 8, lo, hi, l, g);
}

/** Σ(v − mean)² in double precision over the same spans as regionSums (the population variance's second pass). */
export function regionSquares(src: usize, w: i32, h: i32, starts: usize, ends: usize, mean: f64): f64 {
  const m = f64x2.splat(mean);
  let low = f64x2.splat(0), high = f64x2.splat(0);
  let sum: f64 = 0;
  for (let y = 0; y < h; y++) {
    const row = at(src, y * w);
    const end = min(w, load<i32>(at(ends, y)));
    let x = max(0, load<i32>(at(starts, y)));
    for (; x + 4 <= end; x += 4) {
      const v = v128.load(at(row, x));
      const a = f64x2.sub(f64x2.promote_low_f32x4(v), m), b = f64x2.sub(f64x2.promote_low_f32x4(v128.shuffle<f32>(v, v, 2, 3, 0, 1)), m);
      low = f64x2.add(low, f64x2.mul(a, a));
      high = f64x2.add(high, f64x2.mul(b, b));
    }
    for (; x < end; x++) {
      const d = <f64>load<f32>(at(row, x)) - mean;
      sum += d * d;
    }
  }
  return sum + f64x2.extract_lane(low, 0) + f64x2.extract_lane(low, 1) + f64x2.extract_lane(high, 0) + f64x2.extract_lane(high, 1);
}
