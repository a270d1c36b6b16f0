// First-derivative operators (Sobel, Scharr, Prewitt): the x kernel is [a b a]ᵀ ⊗ [−1 0 1], y its
// transpose. Per row, in one pass along it: the smoothing s = a·(up + down) + b·centre and the
// difference t = down − up of four pixels at a time, kept in registers; then gx = s(x+1) − s(x−1)
// and gy = a·(t(x−1) + t(x+1)) + b·t(x), the neighbours' lanes taken from the vectors either side.
import { align16, at, borderIndex, keepTouched, OUTSIDE, readAhead, rowAddress } from './border';
import { storeExtremes } from './extremes';

export const GRADIENT_X: i32 = 0;
export const GRADIENT_Y: i32 = 1;
export const GRADIENT_MAGNITUDE: i32 = 2;

/** Scratch bytes `gradient` needs. */
export function gradientScratchBytes(w: i32): i32 {
  return 4 * w + 80;
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
    gradientRow(up, at(src, y * w), down, at(dst, y * w), w, a, b, output, mode, scratch, readAhead ? at(dst, (y + 2 < h ? y + 2 : y) * w) : at(src, y * w));
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
  return align16(at(zeros, w));
}

/** The magnitude's range over every row so far (NaN left out), as two float32 at range. */
export function storeRange(scratch: usize, w: i32, range: usize): void {
  const extremes = extremesAt(align16(scratch), w);
  storeExtremes(range, v128.load(extremes), v128.load(extremes, 16), load<f32>(extremes, 32), load<f32>(extremes, 36));
}

/**
 * One output row from the rows above (up), at (centre) and below (down) it, each w samples; the
 * magnitude's running range is kept in the scratch (see prepareGradientScratch). On the way the row
 * reads a word of every 16 bytes of `ahead` (w samples): the output row two below, so that its
 * stores find it in the cache two calls later (WebAssembly has no prefetch), or `out` at the end.
 * The Gaussian-and-gradient sweep at 5 MP, two builds in turn: 1.84–1.92 → 1.53–1.68 ns/px with the
 * caches emptied between runs, 1.54–1.55 → 1.18–1.29 without.
 */
export function gradientRow(up: usize, centre: usize, down: usize, out: usize, w: i32, a: f32, b: f32, output: i32, mode: i32, scratch: usize, ahead: usize): void {
  // One copy of the pass per output and for Sobel's weights, with no test inside it.
  if (a == 1 && b == 2) {
    if (output == GRADIENT_MAGNITUDE) rowPass(up, centre, down, out, w, a, b, GRADIENT_MAGNITUDE, true, mode, scratch, ahead);
    else if (output == GRADIENT_X) rowPass(up, centre, down, out, w, a, b, GRADIENT_X, true, mode, scratch, ahead);
    else rowPass(up, centre, down, out, w, a, b, GRADIENT_Y, true, mode, scratch, ahead);
  } else if (output == GRADIENT_MAGNITUDE) rowPass(up, centre, down, out, w, a, b, GRADIENT_MAGNITUDE, false, mode, scratch, ahead);
  else if (output == GRADIENT_X) rowPass(up, centre, down, out, w, a, b, GRADIENT_X, false, mode, scratch, ahead);
  else rowPass(up, centre, down, out, w, a, b, GRADIENT_Y, false, mode, scratch, ahead);
}

/**
 * gradientRow with `output` a constant. Writing s and t into padded lines and reading them back took
 * three stores and eight loads per four pixels; here each vector of s and t is made once, and its
 * neighbours' lanes come from the vectors before and after it. With `sobel` (a = 1, b = 2) the
 * weights are additions: 1·v is v and 2·v is v + v exactly, so the same bits without the two
 * weights' registers or their products.
 */
@inline
function rowPass(up: usize, centre: usize, down: usize, out: usize, w: i32, a: f32, b: f32, output: i32, sobel: bool, mode: i32, scratch: usize, ahead: usize): void {
  const va = f32x4.splat(a), vb = f32x4.splat(b);
  const extremes = extremesAt(align16(scratch), w);
  let lo = v128.load(extremes);
  let hi = v128.load(extremes, 16);
  let loScalar = load<f32>(extremes, 32);
  let hiScalar = load<f32>(extremes, 36);
  let x = 0;
  if (w >= 4) {
    // Lane 3 of the vectors before x = 0 is the border's s(−1) and t(−1).
    let sBefore = f32x4.splat(smoothingAt(up, centre, down, -1, w, a, b, mode));
    let tBefore = f32x4.splat(differenceAt(up, down, -1, w, mode));
    let s = smoothing4(up, centre, down, 0, va, vb, sobel);
    let t = difference4(up, down, 0);
    let seen = 0;
    for (; x + 8 <= w; x += 4) {
      seen |= load<i32>(at(ahead, x));
      const sAfter = smoothing4(up, centre, down, x + 4, va, vb, sobel);
      const tAfter = difference4(up, down, x + 4);
      const m = gradient4(sBefore, s, sAfter, tBefore, t, tAfter, va, vb, output, sobel);
      v128.store(at(out, x), m);
      if (output == GRADIENT_MAGNITUDE) {
        // pmin(lo, m) is m < lo ? m : lo: a NaN never replaces the extreme found so far.
        lo = f32x4.pmin(lo, m);
        hi = f32x4.pmax(hi, m);
      }
      sBefore = s;
      s = sAfter;
      tBefore = t;
      t = tAfter;
    }
    keepTouched(seen);
    // The last whole vector: lane 0 after it is s(x + 4), in the row or from the border.
    const sAfter = f32x4.splat(smoothingAt(up, centre, down, x + 4, w, a, b, mode));
    const tAfter = f32x4.splat(differenceAt(up, down, x + 4, w, mode));
    const m = gradient4(sBefore, s, sAfter, tBefore, t, tAfter, va, vb, output, sobel);
    v128.store(at(out, x), m);
    if (output == GRADIENT_MAGNITUDE) {
      lo = f32x4.pmin(lo, m);
      hi = f32x4.pmax(hi, m);
    }
    x += 4;
  }
  for (; x < w; x++) {
    const sl = smoothingAt(up, centre, down, x - 1, w, a, b, mode), sr = smoothingAt(up, centre, down, x + 1, w, a, b, mode);
    const tl = differenceAt(up, down, x - 1, w, mode), tc = differenceAt(up, down, x, w, mode), tr = differenceAt(up, down, x + 1, w, mode);
    const gx = sr - sl;
    const gy = a * (tl + tr) + b * tc;
    if (output == GRADIENT_X) store<f32>(at(out, x), gx);
    else if (output == GRADIENT_Y) store<f32>(at(out, x), gy);
    else {
      const m = Mathf.sqrt(gx * gx + gy * gy);
      store<f32>(at(out, x), m);
      if (m < loScalar) loScalar = m;
      if (m > hiScalar) hiScalar = m;
    }
  }
  if (output == GRADIENT_MAGNITUDE) {
    v128.store(extremes, lo);
    v128.store(extremes, hi, 16);
    store<f32>(extremes, loScalar, 32);
    store<f32>(extremes, hiScalar, 36);
  }
}

/** gx, gy or the magnitude of four pixels from s and t of theirs (s, t) and of the four before and after. */
@inline
function gradient4(sBefore: v128, s: v128, sAfter: v128, tBefore: v128, t: v128, tAfter: v128, va: v128, vb: v128, output: i32, sobel: bool): v128 {
  // s(x+1 … x+4) and s(x−1 … x+2), and so for t.
  const gx = output == GRADIENT_Y ? s : f32x4.sub(v128.shuffle<f32>(s, sAfter, 1, 2, 3, 4), v128.shuffle<f32>(sBefore, s, 3, 4, 5, 6));
  const sides = f32x4.add(v128.shuffle<f32>(tBefore, t, 3, 4, 5, 6), v128.shuffle<f32>(t, tAfter, 1, 2, 3, 4));
  const gy = output == GRADIENT_X ? t : sobel ? f32x4.add(sides, f32x4.add(t, t)) : f32x4.add(f32x4.mul(va, sides), f32x4.mul(vb, t));
  if (output == GRADIENT_X) return gx;
  if (output == GRADIENT_Y) return gy;
  return f32x4.sqrt(f32x4.add(f32x4.mul(gx, gx), f32x4.mul(gy, gy)));
}

/** s = a·(up + down) + b·centre of pixels x … x+3 (with `sobel`, a = 1 and b = 2: additions only). */
@inline
function smoothing4(up: usize, centre: usize, down: usize, x: i32, va: v128, vb: v128, sobel: bool): v128 {
  const o = (<usize>x) << 2;
  const sides = f32x4.add(v128.load(up + o), v128.load(down + o));
  const c = v128.load(centre + o);
  return sobel ? f32x4.add(sides, f32x4.add(c, c)) : f32x4.add(f32x4.mul(va, sides), f32x4.mul(vb, c));
}

/** t = down − up of pixels x … x+3. */
@inline
function difference4(up: usize, down: usize, x: i32): v128 {
  const o = (<usize>x) << 2;
  return f32x4.sub(v128.load(down + o), v128.load(up + o));
}

/** s of column x, the border applied (0 outside under the constant border); the same bits as a lane of smoothing4. */
function smoothingAt(up: usize, centre: usize, down: usize, x: i32, w: i32, a: f32, b: f32, mode: i32): f32 {
  const i = borderIndex(x, w, mode);
  if (i == OUTSIDE) return 0;
  const o = (<usize>i) << 2;
  return a * (load<f32>(up + o) + load<f32>(down + o)) + b * load<f32>(centre + o);
}

/** t of column x, the border applied. */
function differenceAt(up: usize, down: usize, x: i32, w: i32, mode: i32): f32 {
  const i = borderIndex(x, w, mode);
  if (i == OUTSIDE) return 0;
  const o = (<usize>i) << 2;
  return load<f32>(down + o) - load<f32>(up + o);
}
