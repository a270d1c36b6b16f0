// A photo's BT.601 luma from interleaved 8-bit RGB or RGBA samples, computed as the plain engine does:
// wr·R + wg·G + wb·B in double precision, in that order, rounded once to float32 (so both give the same bits).
import { at } from './border';

/** dst[p] = wr·R + wg·G + wb·B of pixel p of n, samples at src with 3 or 4 bytes per pixel. */
export function lumaRgb8(src: usize, channels: i32, n: i32, dst: usize, wr: f64, wg: f64, wb: f64): void {
  const zero = i32x4.splat(0);
  const vr = f64x2.splat(wr), vg = f64x2.splat(wg), vb = f64x2.splat(wb);
  let p = 0;
  // Sixteen bytes are loaded for the twelve (or sixteen) of four pixels; heap blocks keep 16 spare bytes.
  if (channels == 3) {
    for (; p + 4 <= n; p += 4) {
      const v = v128.load(src + <usize>(p * 3));
      const r = i8x16.shuffle(v, zero, 0, 16, 16, 16, 3, 16, 16, 16, 6, 16, 16, 16, 9, 16, 16, 16);
      const g = i8x16.shuffle(v, zero, 1, 16, 16, 16, 4, 16, 16, 16, 7, 16, 16, 16, 10, 16, 16, 16);
      const b = i8x16.shuffle(v, zero, 2, 16, 16, 16, 5, 16, 16, 16, 8, 16, 16, 16, 11, 16, 16, 16);
      v128.store(at(dst, p), luma4(r, g, b, vr, vg, vb));
    }
  } else {
    for (; p + 4 <= n; p += 4) {
      const v = v128.load(src + <usize>(p * 4));
      const r = i8x16.shuffle(v, zero, 0, 16, 16, 16, 4, 16, 16, 16, 8, 16, 16, 16, 12, 16, 16, 16);
      const g = i8x16.shuffle(v, zero, 1, 16, 16, 16, 5, 16, 16, 16, 9, 16, 16, 16, 13, 16, 16, 16);
      const b = i8x16.shuffle(v, zero, 2, 16, 16, 16, 6, 16, 16, 16, 10, 16, 16, 16, 14, 16, 16, 16);
      v128.store(at(dst, p), luma4(r, g, b, vr, vg, vb));
    }
  }
  for (; p < n; p++) {
    const s = src + <usize>(p * channels);
    store<f32>(at(dst, p), <f32>(wr * <f64>load<u8>(s) + wg * <f64>load<u8>(s, 1) + wb * <f64>load<u8>(s, 2)));
  }
}

/** Luma of four pixels whose R, G and B are int32 lanes, as float32 lanes. */
@inline
function luma4(r: v128, g: v128, b: v128, wr: v128, wg: v128, wb: v128): v128 {
  const low = lumaPair(f64x2.convert_low_i32x4_u(r), f64x2.convert_low_i32x4_u(g), f64x2.convert_low_i32x4_u(b), wr, wg, wb);
  const high = lumaPair(
    f64x2.convert_low_i32x4_u(v128.shuffle<i32>(r, r, 2, 3, 0, 1)),
    f64x2.convert_low_i32x4_u(v128.shuffle<i32>(g, g, 2, 3, 0, 1)),
    f64x2.convert_low_i32x4_u(v128.shuffle<i32>(b, b, 2, 3, 0, 1)),
    wr,
    wg,
    wb,
  );
  return v128.shuffle<i32>(f32x4.demote_f64x2_zero(low), f32x4.demote_f64x2_zero(high), 0, 1, 4, 5);
}

@inline
function lumaPair(r: v128, g: v128, b: v128, wr: v128, wg: v128, wb: v128): v128 {
  return f64x2.add(f64x2.add(f64x2.mul(wr, r), f64x2.mul(wg, g)), f64x2.mul(wb, b));
}
