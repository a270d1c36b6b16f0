// Thresholds and Otsu's histogram. Masks are float32 0 and 1, written without branches:
// a compare gives all-ones lanes, ANDed with the bit pattern of 1.0.
import { at } from './border';
import { storeExtremes } from './extremes';

const ONE_BITS: i32 = 0x3f800000;
/** Pixels checked between early exits of the 8-bit test. */
const BLOCK: i32 = 64;
/** Bins of each partial histogram: 0 … 256 (a value at the maximum may land on 256 by rounding). */
const PARTIAL_STRIDE: i32 = 257;

/** 1 when every value is a whole number in 0 … 255 (8-bit data), else 0; stops at the first other value. */
export function eightBitLevels(src: usize, n: i32): i32 {
  const zero = f32x4.splat(0), top = f32x4.splat(255);
  let p = 0;
  while (p + 4 <= n) {
    const end = min(n - 3, p + BLOCK);
    let ok = i32x4.splat(-1);
    for (; p < end; p += 4) {
      const v = v128.load(at(src, p));
      const whole = f32x4.eq(f32x4.trunc(v), v);
      ok = v128.and(ok, v128.and(whole, v128.and(f32x4.ge(v, zero), f32x4.le(v, top))));
    }
    if (!i32x4.all_true(ok)) return 0;
  }
  for (; p < n; p++) {
    const v = load<f32>(at(src, p));
    if (!(Mathf.trunc(v) == v && v >= 0 && v <= 255)) return 0;
  }
  return 1;
}

/** Smallest and largest value, NaN left out (Infinity and −Infinity when there is none), stored at out as two float32. */
export function valueRange(src: usize, n: i32, out: usize): void {
  let lo = f32x4.splat(Infinity);
  let hi = f32x4.splat(-Infinity);
  let p = 0;
  for (; p + 4 <= n; p += 4) {
    const v = v128.load(at(src, p));
    // pmin(lo, v) is v < lo ? v : lo, so a NaN never replaces the extreme found so far.
    lo = f32x4.pmin(lo, v);
    hi = f32x4.pmax(hi, v);
  }
  let l: f32 = Infinity;
  let g: f32 = -Infinity;
  for (; p < n; p++) {
    const v = load<f32>(at(src, p));
    if (v < l) l = v;
    if (v > g) g = v;
  }
  storeExtremes(out, lo, hi, l, g);
}

/** Partial histograms the counting fills in turn. */
export const HISTOGRAM_TABLES: i32 = 8;

/**
 * Counts bin(v) = trunc((v − origin)·scale), computed in double precision as the plain engine does
 * (so both put every value in the same bin; NaN goes to bin 0), into eight partial histograms of
 * 257 int32 at partial (zeroed here): pixel p goes to table p mod 8, so that equal neighbours do not
 * wait on one counter. When bins ≠ 0 each pixel's bin also goes there as a byte (256, a value at the
 * maximum, as 255: Otsu's chosen bin is at most 254, so the mask is the same), for `thresholdBinsPacked`.
 */
export function histogram(src: usize, n: i32, origin: f64, scale: f64, partial: usize, bins: usize): void {
  memory.fill(partial, 0, 4 * HISTOGRAM_TABLES * PARTIAL_STRIDE);
  const vo = f64x2.splat(origin), vs = f64x2.splat(scale);
  const top = i32x4.splat(PARTIAL_STRIDE - 1);
  // Table t starts PARTIAL_STRIDE·t int32 after the first; 1028 bytes apart.
  const stride = (<usize>PARTIAL_STRIDE) << 2;
  // From origin 0 (a gradient magnitude's usual minimum) v − 0 is v for every float32, so the
  // subtraction goes (about 5 % of the pass).
  const fromZero = origin == 0;
  const zero16 = i16x8.splat(0);
  let p = 0;
  for (; p + 8 <= n; p += 8) {
    const va = v128.load(at(src, p)), vb = v128.load(at(src, p + 4));
    const a = fromZero ? binsFromZero(va, vs, top) : binsOf(va, vo, vs, top);
    const b = fromZero ? binsFromZero(vb, vs, top) : binsOf(vb, vo, vs, top);
    if (bins != 0) {
      const bytes = i8x16.narrow_i16x8_u(i16x8.narrow_i32x4_u(a, b), zero16);
      store<i64>(bins + <usize>p, i64x2.extract_lane(bytes, 0));
    }
    count(partial, i32x4.extract_lane(a, 0));
    count(partial + stride, i32x4.extract_lane(a, 1));
    count(partial + 2 * stride, i32x4.extract_lane(a, 2));
    count(partial + 3 * stride, i32x4.extract_lane(a, 3));
    count(partial + 4 * stride, i32x4.extract_lane(b, 0));
    count(partial + 5 * stride, i32x4.extract_lane(b, 1));
    count(partial + 6 * stride, i32x4.extract_lane(b, 2));
    count(partial + 7 * stride, i32x4.extract_lane(b, 3));
  }
  for (; p < n; p++) {
    const scaled = f64x2.splat((<f64>load<f32>(at(src, p)) - origin) * scale);
    const bin = i32x4.extract_lane(i32x4.min_u(i32x4.trunc_sat_f64x2_s_zero(scaled), top), 0);
    count(partial, bin);
    if (bins != 0) store<u8>(bins + <usize>p, <u8>min(bin, 255));
  }
}

/**
 * The packed mask of "bin above k" from the bytes `histogram` wrote for a w×h image (swapped with
 * invert): 32 pixels from two 16-byte compares. Bit i of word j of row y is pixel (32j + i, y); bits
 * past the last column are 0. The bytes need 32 spare bytes after the last.
 */
export function thresholdBinsPacked(bins: usize, w: i32, h: i32, k: i32, invert: i32, words: usize): void {
  const vk = i8x16.splat(<i8>k);
  const wordsPerRow = (w + 31) >>> 5;
  const whole = invert ? -1 : 0;
  for (let y = 0; y < h; y++) {
    const row = bins + <usize>(y * w);
    for (let j = 0; j < wordsPerRow; j++) {
      const x0 = j << 5;
      const count = min(32, w - x0);
      const low = i8x16.bitmask(i8x16.gt_u(v128.load(row + <usize>x0), vk));
      const high = i8x16.bitmask(i8x16.gt_u(v128.load(row + <usize>x0, 16), vk));
      // Bits past the row's end read the next row's bytes: cleared.
      const valid = count == 32 ? -1 : (1 << count) - 1;
      store<i32>(at(words, y * wordsPerRow + j), ((low | (high << 16)) ^ whole) & valid);
    }
  }
}

/** binsOf with origin 0. */
@inline
function binsFromZero(v: v128, scale: v128, top: v128): v128 {
  const low = i32x4.trunc_sat_f64x2_s_zero(f64x2.mul(f64x2.promote_low_f32x4(v), scale));
  const high = i32x4.trunc_sat_f64x2_s_zero(f64x2.mul(f64x2.promote_low_f32x4(v128.shuffle<f32>(v, v, 2, 3, 0, 1)), scale));
  return i32x4.min_u(v128.shuffle<i32>(low, high, 0, 1, 4, 5), top);
}

/** The four values' bins; above 256 cannot occur for values up to the maximum, the clamp keeps memory safe. */
@inline
function binsOf(v: v128, origin: v128, scale: v128, top: v128): v128 {
  const low = i32x4.trunc_sat_f64x2_s_zero(f64x2.mul(f64x2.sub(f64x2.promote_low_f32x4(v), origin), scale));
  const high = i32x4.trunc_sat_f64x2_s_zero(f64x2.mul(f64x2.sub(f64x2.promote_low_f32x4(v128.shuffle<f32>(v, v, 2, 3, 0, 1)), origin), scale));
  return i32x4.min_u(v128.shuffle<i32>(low, high, 0, 1, 4, 5), top);
}

@inline
function count(table: usize, bin: i32): void {
  const address = at(table, bin);
  store<i32>(address, load<i32>(address) + 1);
}

/** dst = 1 where v ≥ cut, else 0 (swapped when invert is 1); NaN is below every cut. */
export function thresholdAt(src: usize, dst: usize, n: i32, cut: f32, invert: i32): void {
  const vc = f32x4.splat(cut);
  const one = i32x4.splat(ONE_BITS);
  const flip = i32x4.splat(invert ? -1 : 0);
  let p = 0;
  for (; p + 4 <= n; p += 4) {
    const above = v128.xor(f32x4.ge(v128.load(at(src, p)), vc), flip);
    v128.store(at(dst, p), v128.and(above, one));
  }
  for (; p < n; p++) {
    const above = (load<f32>(at(src, p)) >= cut ? 1 : 0) ^ invert;
    store<f32>(at(dst, p), <f32>above);
  }
}

/**
 * thresholdAt on a w×h image that also writes the mask in packed bits: bit i of word k of row y is
 * pixel (32k + i, y); bits past the last column are 0. With writeMask 0 only the bits are written.
 */
export function thresholdAtPacked(src: usize, dst: usize, w: i32, h: i32, cut: f32, invert: i32, words: usize, writeMask: i32): void {
  const vc = f32x4.splat(cut);
  const one = i32x4.splat(ONE_BITS);
  const flip = i32x4.splat(invert ? -1 : 0);
  const wordsPerRow = (w + 31) >>> 5;
  for (let y = 0; y < h; y++) {
    const row = y * w;
    for (let k = 0; k < wordsPerRow; k++) {
      const x0 = row + (k << 5);
      const count = min(32, w - (k << 5));
      let word = 0;
      if (count == 32 && writeMask) {
        for (let g = 0; g < 8; g++) {
          const p = x0 + (g << 2);
          const above = v128.xor(f32x4.ge(v128.load(at(src, p)), vc), flip);
          v128.store(at(dst, p), v128.and(above, one));
          word |= i32x4.bitmask(above) << (g << 2);
        }
      } else if (count == 32) {
        for (let g = 0; g < 8; g++) word |= i32x4.bitmask(v128.xor(f32x4.ge(v128.load(at(src, x0 + (g << 2))), vc), flip)) << (g << 2);
      } else {
        for (let i = 0; i < count; i++) {
          const bit = (load<f32>(at(src, x0 + i)) >= cut ? 1 : 0) ^ invert;
          if (writeMask) store<f32>(at(dst, x0 + i), <f32>bit);
          word |= bit << i;
        }
      }
      store<i32>(at(words, y * wordsPerRow + k), word);
    }
  }
}
