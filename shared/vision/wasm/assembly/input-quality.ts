// A photo's input image and the quality gate's sums in one pass over its rows: each row is converted
// and then summed while it is still in the cache, instead of a second pass over the whole float32
// image (20 MB at 5 MP).
import { align16, at, borderIndex, REFLECT } from './border';
import { bytesToFloats, lumaRgb8 } from './channels';
import { finishQualitySums, qualityRowsWide, startQualitySums, widenRow } from './statistics';

/**
 * 8-bit colour: dst = luma as lumaRgb8 writes it, out = qualitySums(dst) with the same per-pixel terms
 * (each row's sums are added once the row below it is converted, from rows widened to float64 in
 * `scratch`, wideRingBytes(w) bytes).
 */
export function lumaRgb8Quality(src: usize, channels: i32, w: i32, h: i32, dst: usize, kr: i32, kg: i32, kb: i32, top: f32, out: usize, scratch: usize): void {
  startQualitySums();
  const wide = align16(scratch);
  const rowBytes = <usize>(w * channels);
  for (let y = 0; y < h; y++) {
    const row = at(dst, y * w);
    lumaRgb8(src + <usize>y * rowBytes, channels, w, row, kr, kg, kb);
    widenRow(row, w, y, wide);
    if (y > 0) qualityRowsWide(wide, w, h, y - 1, y, top);
  }
  if (h > 0) qualityRowsWide(wide, w, h, h - 1, h, top);
  finishQualitySums(out);
}

/**
 * 8-bit grey, n = w·h bytes at src: dst = the samples as float32 (none when dst is 0), out = Σv, the number of v = 255, Σlap
 * and Σlap² (4-neighbour Laplacian, reflect border) as four float64, computed exactly from the bytes
 * in whole numbers (|lap| ≤ 1020): the plain engine's double-precision sums of the same whole numbers,
 * exact below 2⁵³, in any order.
 */
export function grey8Quality(src: usize, w: i32, h: i32, dst: usize, out: usize): void {
  startGreyQuality();
  for (let y = 0; y < h; y++) {
    if (dst != 0) bytesToFloats(src + <usize>(y * w), w, at(dst, y * w));
    greyQualityRow(src, w, h, y);
  }
  finishGreyQuality(out);
}

/** grey8Quality's running sums: Σv, Σlap and Σlap² as int64, then the count of v = 255 as int32. */
const GREY_SUMS: usize = memory.data(32, 16);

export function startGreyQuality(): void {
  memory.fill(GREY_SUMS, 0, 32);
}

/** The four sums (as grey8Quality gives them) of every row added with greyQualityRow, at out. */
export function finishGreyQuality(out: usize): void {
  store<f64>(out, <f64>load<i64>(GREY_SUMS));
  store<f64>(out, <f64>load<i32>(GREY_SUMS, 24), 8);
  store<f64>(out, <f64>load<i64>(GREY_SUMS, 8), 16);
  store<f64>(out, <f64>load<i64>(GREY_SUMS, 16), 24);
}

/**
 * Adds row y of a w×h 8-bit grey image at src to grey8Quality's sums (its Laplacian reads rows y − 1
 * and y + 1, the border reflected): each row once, in any order.
 */
export function greyQualityRow(src: usize, w: i32, h: i32, y: i32): void {
  const c = src + <usize>(y * w);
  const up = src + <usize>(borderIndex(y - 1, h, REFLECT) * w);
  const down = src + <usize>(borderIndex(y + 1, h, REFLECT) * w);
  if (w == 1) {
    const v = <i32>load<u8>(c);
    const lap = <i32>load<u8>(up) + <i32>load<u8>(down) - 2 * v;
    addGreySums(<i64>v, <i64>lap, <i64>(lap * lap), v == 255 ? 1 : 0);
    return;
  }
  const ff = i8x16.splat(-1);
  const v0 = <i32>load<u8>(c), vLast = <i32>load<u8>(c + <usize>(w - 1));
  const first = <i32>load<u8>(up) + <i32>load<u8>(down) + 2 * <i32>load<u8>(c + 1) - 4 * v0;
  const last = <i32>load<u8>(up + <usize>(w - 1)) + <i32>load<u8>(down + <usize>(w - 1)) + 2 * <i32>load<u8>(c + <usize>(w - 2)) - 4 * vLast;
  let rowSum: i64 = v0 + vLast;
  let rowLap: i64 = first + last;
  let squaresScalar: i64 = <i64>(first * first) + <i64>(last * last);
  let clipped = (v0 == 255 ? 1 : 0) + (vLast == 255 ? 1 : 0);
  // Sixteen pixels a step, widened to int16: the Laplacians' squares added in pairs by dot products
  // into int32 lanes, at most 4·1020² a step, flushed to int64 every 256 steps (below 2³¹).
  let squares = i64x2.splat(0);
  let sums = i32x4.splat(0), laps = i32x4.splat(0), block = i32x4.splat(0);
  let steps = 0;
  let x = 1;
  for (; x + 16 <= w - 1; x += 16) {
    const o = <usize>x;
    const m = v128.load(c + o), l = v128.load(c + o - 1), r = v128.load(c + o + 1), u = v128.load(up + o), d = v128.load(down + o);
    const lapLow = i16x8.sub(
      i16x8.add(i16x8.add(i16x8.extend_low_i8x16_u(u), i16x8.extend_low_i8x16_u(d)), i16x8.add(i16x8.extend_low_i8x16_u(l), i16x8.extend_low_i8x16_u(r))),
      i16x8.shl(i16x8.extend_low_i8x16_u(m), 2),
    );
    const lapHigh = i16x8.sub(
      i16x8.add(i16x8.add(i16x8.extend_high_i8x16_u(u), i16x8.extend_high_i8x16_u(d)), i16x8.add(i16x8.extend_high_i8x16_u(l), i16x8.extend_high_i8x16_u(r))),
      i16x8.shl(i16x8.extend_high_i8x16_u(m), 2),
    );
    block = i32x4.add(block, i32x4.add(i32x4.dot_i16x8_s(lapLow, lapLow), i32x4.dot_i16x8_s(lapHigh, lapHigh)));
    laps = i32x4.add(laps, i32x4.add(i32x4.extadd_pairwise_i16x8_s(lapLow), i32x4.extadd_pairwise_i16x8_s(lapHigh)));
    sums = i32x4.add(sums, i32x4.extadd_pairwise_i16x8_u(i16x8.extadd_pairwise_i8x16_u(m)));
    clipped += <i32>popcnt(i8x16.bitmask(i8x16.eq(m, ff)));
    if (++steps == 256) {
      squares = i64x2.add(squares, i64x2.add(i64x2.extend_low_i32x4_s(block), i64x2.extend_high_i32x4_s(block)));
      block = i32x4.splat(0);
      steps = 0;
    }
  }
  squares = i64x2.add(squares, i64x2.add(i64x2.extend_low_i32x4_s(block), i64x2.extend_high_i32x4_s(block)));
  rowSum += <i64>i32x4.extract_lane(sums, 0) + <i64>i32x4.extract_lane(sums, 1) + <i64>i32x4.extract_lane(sums, 2) + <i64>i32x4.extract_lane(sums, 3);
  rowLap += <i64>i32x4.extract_lane(laps, 0) + <i64>i32x4.extract_lane(laps, 1) + <i64>i32x4.extract_lane(laps, 2) + <i64>i32x4.extract_lane(laps, 3);
  for (; x < w - 1; x++) {
    const o = <usize>x;
    const m = <i32>load<u8>(c + o);
    const lap = <i32>load<u8>(up + o) + <i32>load<u8>(down + o) + <i32>load<u8>(c + o - 1) + <i32>load<u8>(c + o + 1) - 4 * m;
    rowSum += m;
    rowLap += lap;
    squaresScalar += <i64>(lap * lap);
    clipped += m == 255 ? 1 : 0;
  }
  addGreySums(rowSum, rowLap, squaresScalar + i64x2.extract_lane(squares, 0) + i64x2.extract_lane(squares, 1), clipped);
}

@inline
function addGreySums(sum: i64, lap: i64, squares: i64, clipped: i32): void {
  store<i64>(GREY_SUMS, load<i64>(GREY_SUMS) + sum);
  store<i64>(GREY_SUMS, load<i64>(GREY_SUMS, 8) + lap, 8);
  store<i64>(GREY_SUMS, load<i64>(GREY_SUMS, 16) + squares, 16);
  store<i32>(GREY_SUMS, load<i32>(GREY_SUMS, 24) + clipped, 24);
}
