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
 * Three equal bytes per sample (8-bit grey as RGB): round(v·scale + shift) clamped to 0…255, rounded
 * as JavaScript's Math.round (halves up) and NaN as 0, as display.ts's displaySamples stores them.
 */
export function greyRgb(src: usize, n: i32, scale: f64, shift: f64, dst: usize): void {
  for (let p = 0; p < n; p++) {
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
