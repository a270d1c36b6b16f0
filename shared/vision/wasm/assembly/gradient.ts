// First-derivative operators (Sobel, Scharr, Prewitt): the x kernel is [a b a]ᵀ ⊗ [−1 0 1], y its
// transpose. Per row, one vertical pass writes the smoothing s = a·(up + down) + b·centre and the
// difference t = down − up into two padded lines; then gx = s(x+1) − s(x−1) and
// gy = a·(t(x−1) + t(x+1)) + b·t(x), four pixels per v128.
import { align16, at, fillLineBorder, rowAddress } from './border';
import { storeExtremes } from './extremes';

export const GRADIENT_X: i32 = 0;
export const GRADIENT_Y: i32 = 1;
export const GRADIENT_MAGNITUDE: i32 = 2;

/** Scratch bytes `gradient` needs. */
export function gradientScratchBytes(w: i32): i32 {
  return 12 * w + 192;
}

/**
 * dst = gx, gy or sqrt(gx² + gy²) of src. For the magnitude, when range ≠ 0, its smallest and
 * largest value (NaN left out) are stored there as two float32.
 */
export function gradient(src: usize, dst: usize, w: i32, h: i32, a: f32, b: f32, output: i32, mode: i32, range: usize, scratch: usize): void {
  prepareGradientScratch(scratch, w);
  const zeros = align16(scratch);
  for (let y = 0; y < h; y++) {
    const up = rowAddress(src, y - 1, h, w, mode, zeros);
    const down = rowAddress(src, y + 1, h, w, mode, zeros);
    gradientRow(up, at(src, y * w), down, at(dst, y * w), w, a, b, output, mode, scratch);
  }
  if (range != 0) storeRange(scratch, w, range);
}

/** Readies the scratch of `gradientRow` for a w-wide image: its row of zeros (the first w samples) and the range found so far. */
export function prepareGradientScratch(scratch: usize, w: i32): void {
  const zeros = align16(scratch);
  memory.fill(zeros, 0, 4 * w);
  const extremes = extremesAt(zeros, w);
  v128.store(extremes, f32x4.splat(Infinity));
  v128.store(extremes, f32x4.splat(-Infinity), 16);
  store<f32>(extremes, Infinity, 32);
  store<f32>(extremes, -Infinity, 36);
}

/** The smallest and largest magnitude so far: four lanes each, then two float32 for the pixels past the last whole vector. */
@inline
function extremesAt(zeros: usize, w: i32): usize {
  return align16(at(align16(at(align16(at(zeros, w)), w + 4)), w + 4));
}

/** The magnitude's range over every row so far (NaN left out), as two float32 at range. */
export function storeRange(scratch: usize, w: i32, range: usize): void {
  const extremes = extremesAt(align16(scratch), w);
  storeExtremes(range, v128.load(extremes), v128.load(extremes, 16), load<f32>(extremes, 32), load<f32>(extremes, 36));
}

/**
 * One output row from the rows above (up), at (centre) and below (down) it, each w samples; the
 * magnitude's running range is kept in the scratch (see prepareGradientScratch).
 */
export function gradientRow(up: usize, centre: usize, down: usize, out: usize, w: i32, a: f32, b: f32, output: i32, mode: i32, scratch: usize): void {
  const zeros = align16(scratch);
  const s = align16(at(zeros, w));
  const t = align16(at(s, w + 4));
  const va = f32x4.splat(a), vb = f32x4.splat(b);
  // The smoothing s serves gx, the difference t serves gy: each line only when its output needs it.
  if (output == GRADIENT_MAGNITUDE) {
    let x = 0;
    for (; x + 4 <= w; x += 4) {
      const o = (<usize>x) << 2;
      const u = v128.load(up + o), d = v128.load(down + o);
      v128.store(s + o, f32x4.add(f32x4.mul(va, f32x4.add(u, d)), f32x4.mul(vb, v128.load(centre + o))), 4);
      v128.store(t + o, f32x4.sub(d, u), 4);
    }
    for (; x < w; x++) {
      const o = (<usize>x) << 2;
      const u = load<f32>(up + o), d = load<f32>(down + o);
      store<f32>(s + o, a * (u + d) + b * load<f32>(centre + o), 4);
      store<f32>(t + o, d - u, 4);
    }
    fillLineBorder(s, w, 1, mode);
    fillLineBorder(t, w, 1, mode);
  } else if (output == GRADIENT_X) {
    let x = 0;
    for (; x + 4 <= w; x += 4) {
      const o = (<usize>x) << 2;
      v128.store(s + o, f32x4.add(f32x4.mul(va, f32x4.add(v128.load(up + o), v128.load(down + o))), f32x4.mul(vb, v128.load(centre + o))), 4);
    }
    for (; x < w; x++) {
      const o = (<usize>x) << 2;
      store<f32>(s + o, a * (load<f32>(up + o) + load<f32>(down + o)) + b * load<f32>(centre + o), 4);
    }
    fillLineBorder(s, w, 1, mode);
  } else {
    let x = 0;
    for (; x + 4 <= w; x += 4) {
      const o = (<usize>x) << 2;
      v128.store(t + o, f32x4.sub(v128.load(down + o), v128.load(up + o)), 4);
    }
    for (; x < w; x++) {
      const o = (<usize>x) << 2;
      store<f32>(t + o, load<f32>(down + o) - load<f32>(up + o), 4);
    }
    fillLineBorder(t, w, 1, mode);
  }
  let x = 0;
  if (output == GRADIENT_X) {
    for (; x + 4 <= w; x += 4) {
      const o = (<usize>x) << 2;
      v128.store(out + o, f32x4.sub(v128.load(s + o, 8), v128.load(s + o)));
    }
    for (; x < w; x++) {
      const o = (<usize>x) << 2;
      store<f32>(out + o, load<f32>(s + o, 8) - load<f32>(s + o));
    }
  } else if (output == GRADIENT_Y) {
    for (; x + 4 <= w; x += 4) {
      const o = (<usize>x) << 2;
      v128.store(out + o, f32x4.add(f32x4.mul(va, f32x4.add(v128.load(t + o), v128.load(t + o, 8))), f32x4.mul(vb, v128.load(t + o, 4))));
    }
    for (; x < w; x++) {
      const o = (<usize>x) << 2;
      store<f32>(out + o, a * (load<f32>(t + o) + load<f32>(t + o, 8)) + b * load<f32>(t + o, 4));
    }
  } else {
    const extremes = extremesAt(zeros, w);
    let lo = v128.load(extremes);
    let hi = v128.load(extremes, 16);
    let loScalar = load<f32>(extremes, 32);
    let hiScalar = load<f32>(extremes, 36);
    for (; x + 4 <= w; x += 4) {
      const o = (<usize>x) << 2;
      const gx = f32x4.sub(v128.load(s + o, 8), v128.load(s + o));
      const gy = f32x4.add(f32x4.mul(va, f32x4.add(v128.load(t + o), v128.load(t + o, 8))), f32x4.mul(vb, v128.load(t + o, 4)));
      const m = f32x4.sqrt(f32x4.add(f32x4.mul(gx, gx), f32x4.mul(gy, gy)));
      v128.store(out + o, m);
      // pmin(lo, m) is m < lo ? m : lo: a NaN never replaces the extreme found so far.
      lo = f32x4.pmin(lo, m);
      hi = f32x4.pmax(hi, m);
    }
    for (; x < w; x++) {
      const o = (<usize>x) << 2;
      const gx = load<f32>(s + o, 8) - load<f32>(s + o);
      const gy = a * (load<f32>(t + o) + load<f32>(t + o, 8)) + b * load<f32>(t + o, 4);
      const m = Mathf.sqrt(gx * gx + gy * gy);
      store<f32>(out + o, m);
      if (m < loScalar) loScalar = m;
      if (m > hiScalar) hiScalar = m;
    }
    v128.store(extremes, lo);
    v128.store(extremes, hi, 16);
    store<f32>(extremes, loScalar, 32);
    store<f32>(extremes, hiScalar, 36);
  }
}
