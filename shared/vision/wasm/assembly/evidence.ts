// The evidence image of a FAIL (server/vision/evidence.ts): its grey background, an image shrunk by a
// whole factor and turned into display bytes, and the pixel a failing min or max gauge rings; the
// same results as that file's plain loops give.
import { at } from './border';

/**
 * dst[by·sw + bx] = the float32 mean of src's factor × factor block (smaller at the right and bottom
 * edges), its sum taken in double precision row by row, as evidence.ts's blockMean; the smallest and
 * largest mean (NaN left out; ±Infinity when none) go to range as two float64.
 */
export function shrinkMeans(src: usize, w: i32, h: i32, factor: i32, dst: usize, range: usize): void {
  if (factor == 2) {
    halve(src, w, h, dst, range);
    return;
  }
  const sw = (w + factor - 1) / factor;
  const sh = (h + factor - 1) / factor;
  let lo = Infinity, hi = -Infinity;
  for (let by = 0; by < sh; by++) {
    const y0 = by * factor;
    const y1 = min(h, y0 + factor);
    for (let bx = 0; bx < sw; bx++) {
      const x0 = bx * factor;
      const x1 = min(w, x0 + factor);
      let sum: f64 = 0;
      for (let y = y0; y < y1; y++) {
        const row = y * w;
        for (let x = x0; x < x1; x++) sum += <f64>load<f32>(at(src, row + x));
      }
      const mean = <f32>(sum / <f64>((x1 - x0) * (y1 - y0)));
      store<f32>(at(dst, by * sw + bx), mean);
      const v = <f64>mean;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  store<f64>(range, lo);
  store<f64>(range, hi, 8);
}

/**
 * shrinkMeans by 2 (a 5 MP photo's evidence), its blocks written out: each block's sum in the same
 * order, from 0, and divided by 4, 2 or 1 as a product by 0.25, 0.5 or 1, which is the same number.
 */
function halve(src: usize, w: i32, h: i32, dst: usize, range: usize): void {
  const sw = (w + 1) >> 1;
  const sh = (h + 1) >> 1;
  const pairs = w >> 1;
  let lo = Infinity, hi = -Infinity;
  for (let by = 0; by < sh; by++) {
    const a = at(src, 2 * by * w);
    const two = 2 * by + 1 < h;
    const b = a + ((<usize>w) << 2);
    const unit: f64 = two ? 0.25 : 0.5;
    const out = at(dst, by * sw);
    for (let bx = 0; bx < pairs; bx++) {
      const o = (<usize>bx) << 3;
      let sum: f64 = 0;
      sum += <f64>load<f32>(a + o);
      sum += <f64>load<f32>(a + o, 4);
      if (two) {
        sum += <f64>load<f32>(b + o);
        sum += <f64>load<f32>(b + o, 4);
      }
      const mean = <f32>(sum * unit);
      store<f32>(out + ((<usize>bx) << 2), mean);
      const v = <f64>mean;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    if (w & 1) {
      const o = (<usize>pairs) << 3;
      let sum: f64 = 0;
      sum += <f64>load<f32>(a + o);
      if (two) sum += <f64>load<f32>(b + o);
      const mean = <f32>(sum * (two ? 0.5 : 1));
      store<f32>(out + ((<usize>pairs) << 2), mean);
      const v = <f64>mean;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  store<f64>(range, lo);
  store<f64>(range, hi, 8);
}

/**
 * Three equal bytes per sample (8-bit grey as RGB): round(v·scale + shift) clamped to 0…255, rounded
 * as JavaScript's Math.round (halves up) and NaN as 0, as display.ts's displaySamples stores them.
 */
export function greyRgb(src: usize, n: i32, scale: f64, shift: f64, dst: usize): void {
  const vs = f64x2.splat(scale), vo = f64x2.splat(shift);
  let p = 0;
  // Sixteen samples a step; the last step's third store writes 48 bytes, all its own.
  for (; p + 16 <= n; p += 16) {
    const s = src + ((<usize>p) << 2);
    const ab = i16x8.narrow_i32x4_s(bytes4(v128.load(s), vs, vo), bytes4(v128.load(s, 16), vs, vo));
    const cd = i16x8.narrow_i32x4_s(bytes4(v128.load(s, 32), vs, vo), bytes4(v128.load(s, 48), vs, vo));
    const g = i8x16.narrow_i16x8_u(ab, cd);
    const q = dst + <usize>(3 * p);
    v128.store(q, i8x16.shuffle(g, g, 0, 0, 0, 1, 1, 1, 2, 2, 2, 3, 3, 3, 4, 4, 4, 5));
    v128.store(q, i8x16.shuffle(g, g, 5, 5, 6, 6, 6, 7, 7, 7, 8, 8, 8, 9, 9, 9, 10, 10), 16);
    v128.store(q, i8x16.shuffle(g, g, 10, 11, 11, 11, 12, 12, 12, 13, 13, 13, 14, 14, 14, 15, 15, 15), 32);
  }
  for (; p < n; p++) {
    const v = <f64>load<f32>(at(src, p)) * scale + shift;
    let r = Math.ceil(v);
    if (r - 0.5 > v) r -= 1;
    const byte = r != r || r < 0 ? 0 : r > 255 ? 255 : <i32>r;
    const q = dst + <usize>(3 * p);
    store<u8>(q, <u8>byte);
    store<u8>(q, <u8>byte, 1);
    store<u8>(q, <u8>byte, 2);
  }
}

/**
 * The first pixel, in raster order over columns starts[y] … ends[y]−1 of each row y, holding the
 * largest value (takeMax ≠ 0) or the smallest; NaN never counts, and −1 when no value beats ∓∞.
 */
export function firstExtreme(src: usize, w: i32, h: i32, starts: usize, ends: usize, takeMax: i32): i32 {
  return takeMax != 0 ? firstBeyond(src, w, h, starts, ends, true) : firstBeyond(src, w, h, starts, ends, false);
}

@inline
function firstBeyond(src: usize, w: i32, h: i32, starts: usize, ends: usize, above: bool): i32 {
  let best: f32 = above ? -Infinity : Infinity;
  let found = -1;
  for (let y = 0; y < h; y++) {
    const end = y * w + load<i32>(at(ends, y));
    for (let p = y * w + load<i32>(at(starts, y)); p < end; p++) {
      const v = load<f32>(at(src, p));
      if (above ? v > best : v < best) {
        best = v;
        found = p;
      }
    }
  }
  return found;
}

/** Four float32 samples as the bytes of greyRgb, in four int32 lanes. */
@inline
function bytes4(v: v128, vs: v128, vo: v128): v128 {
  return i32x4.shuffle(roundedByte(f64x2.promote_low_f32x4(v), vs, vo), roundedByte(f64x2.promote_low_f32x4(i32x4.shuffle(v, v, 2, 3, 0, 1)), vs, vo), 0, 1, 4, 5);
}

/**
 * Two samples' bytes in the low two int32 lanes: round(v·scale + shift) as Math.round (ceil, less
 * one where that is more than a half above), clamped to 0…255, NaN as 0.
 */
@inline
function roundedByte(x: v128, vs: v128, vo: v128): v128 {
  const v = f64x2.add(f64x2.mul(x, vs), vo);
  const up = f64x2.ceil(v);
  const r = v128.bitselect(f64x2.sub(up, f64x2.splat(1)), up, f64x2.gt(f64x2.sub(up, f64x2.splat(0.5)), v));
  // pmax(0, r) is 0 for NaN r (r > 0 is false); then at most 255.
  const clamped = f64x2.pmin(f64x2.splat(255), f64x2.pmax(f64x2.splat(0), r));
  return i32x4.trunc_sat_f64x2_s_zero(clamped);
}
