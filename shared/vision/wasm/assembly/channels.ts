// A photo's luma from interleaved 8-bit RGB or RGBA samples with weights in thousandths (BT.601:
// 299, 587, 114), with the same bits as the plain engine's wr·R + wg·G + wb·B in double precision
// rounded once to float32. Here N = kr·R + kg·G + kb·B is an exact integer (below 2²⁴), and N/1000 in
// float32 is the correctly rounded quotient. The double sum differs from N/1000 by at most a few
// units of 2⁻⁵³ relative (non-negative terms), while N/1000 is never closer than 1/(1000·2ˢ) to a
// float32 rounding midpoint (odd multiples of 2⁻ˢ: N·2ˢ − 1000·j is a non-zero integer, as N/1000 is
// not such a multiple), far more than that error: both round to the same float32. Checked for all
// 2²⁴ colours by tests/unit/vision/simd-exact-paths.test.ts.
import { at } from './border';

/**
 * dst[p] = (kr·R + kg·G + kb·B) / 1000 in float32 for pixel p of n, samples at src with 3 or 4 bytes
 * per pixel; weights 0 … 32767 with kr + kg + kb ≤ 65535 (so N < 2²⁴).
 */
export function lumaRgb8(src: usize, channels: i32, n: i32, dst: usize, kr: i32, kg: i32, kb: i32): void {
  const zero = i32x4.splat(0);
  // R and G of four pixels as eight int16 (R₀ G₀ R₁ G₁ …), B as four int16 each followed by 0:
  // one multiply-and-add of pairs gives kr·R + kg·G, another kb·B, per pixel as int32.
  const redGreen = i16x8(<i16>kr, <i16>kg, <i16>kr, <i16>kg, <i16>kr, <i16>kg, <i16>kr, <i16>kg);
  const blue = i16x8(<i16>kb, 0, <i16>kb, 0, <i16>kb, 0, <i16>kb, 0);
  const thousand = f32x4.splat(1000);
  let p = 0;
  // Sixteen bytes are loaded for the twelve (or sixteen) of four pixels; heap blocks keep 16 spare bytes.
  if (channels == 3) {
    for (; p + 4 <= n; p += 4) {
      const v = v128.load(src + <usize>(p * 3));
      const rg = i8x16.shuffle(v, zero, 0, 16, 1, 16, 3, 16, 4, 16, 6, 16, 7, 16, 9, 16, 10, 16);
      const b = i8x16.shuffle(v, zero, 2, 16, 16, 16, 5, 16, 16, 16, 8, 16, 16, 16, 11, 16, 16, 16);
      const sum = i32x4.add(i32x4.dot_i16x8_s(rg, redGreen), i32x4.dot_i16x8_s(b, blue));
      v128.store(at(dst, p), f32x4.div(f32x4.convert_i32x4_s(sum), thousand));
    }
  } else {
    for (; p + 4 <= n; p += 4) {
      const v = v128.load(src + <usize>(p * 4));
      const rg = i8x16.shuffle(v, zero, 0, 16, 1, 16, 4, 16, 5, 16, 8, 16, 9, 16, 12, 16, 13, 16);
      const b = i8x16.shuffle(v, zero, 2, 16, 16, 16, 6, 16, 16, 16, 10, 16, 16, 16, 14, 16, 16, 16);
      const sum = i32x4.add(i32x4.dot_i16x8_s(rg, redGreen), i32x4.dot_i16x8_s(b, blue));
      v128.store(at(dst, p), f32x4.div(f32x4.convert_i32x4_s(sum), thousand));
    }
  }
  for (; p < n; p++) {
    const s = src + <usize>(p * channels);
    store<f32>(at(dst, p), <f32>(kr * <i32>load<u8>(s) + kg * <i32>load<u8>(s, 1) + kb * <i32>load<u8>(s, 2)) / <f32>1000);
  }
}

/** dst[x] = src[x] as float32 for x < n (bytes at src). */
export function bytesToFloats(src: usize, n: i32, dst: usize): void {
  let x = 0;
  for (; x + 16 <= n; x += 16) {
    const v = v128.load(src + <usize>x);
    const low = i16x8.extend_low_i8x16_u(v), high = i16x8.extend_high_i8x16_u(v);
    const o = dst + ((<usize>x) << 2);
    v128.store(o, f32x4.convert_i32x4_u(i32x4.extend_low_i16x8_u(low)));
    v128.store(o, f32x4.convert_i32x4_u(i32x4.extend_high_i16x8_u(low)), 16);
    v128.store(o, f32x4.convert_i32x4_u(i32x4.extend_low_i16x8_u(high)), 32);
    v128.store(o, f32x4.convert_i32x4_u(i32x4.extend_high_i16x8_u(high)), 48);
  }
  for (; x < n; x++) store<f32>(at(dst, x), <f32>load<u8>(src + <usize>x));
}
