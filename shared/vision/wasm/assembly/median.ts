// Median of 3×3 and 5×5 windows by selection networks of minima and maxima, four pixels per v128.
// Each output row first sorts the columns of its window rows (shared by the `size` windows that
// contain a column); a window's median then comes from a few order statistics of those sorted
// columns. A network of minima and maxima gives the exact k-th value of its inputs, so its output is
// the plain engine's median bit for bit whenever the order of the values is unambiguous: the image
// holds no NaN (unordered) and no −0 (equal to +0 but with other bits); otherwise it refuses.
import { align16, at, borderIndex, fillBorderOf, fillLineBorder, OUTSIDE, rowAddress } from './border';

const NEGATIVE_ZERO_BITS: i32 = 0x80000000;

/** Scratch bytes `median` needs for a w-wide image. */
export function medianScratchBytes(w: i32, size: i32): i32 {
  return 4 * size + 4 * (w + 4) + size * (4 * (w + size + 8) + 16) + 128;
}

/**
 * dst = median of the size × size neighbourhood (size 3 or 5, border by `mode`); returns 1, or 0
 * without writing anything when src holds a NaN or a −0. `ordered` ≠ 0: the caller knows there is
 * none (the samples are an 8-bit photo's), and the pass over the image that looks for them is skipped.
 */
export function median(src: usize, dst: usize, w: i32, h: i32, size: i32, mode: i32, scratch: usize, ordered: i32): i32 {
  if (ordered == 0 && hasUnorderedValues(src, w * h)) return 0;
  const r = size >> 1;
  const rows = align16(scratch);
  const zeros = align16(at(rows, size));
  memory.fill(zeros, 0, 4 * (w + 4));
  // Sorted column j of the window rows at lines + j·stride, padded by r on each side (+ room for a last partial vector).
  const stride = (<usize>(4 * (w + size + 8)) + 15) & ~(<usize>15);
  const lines = align16(at(zeros, w + 4));
  for (let y = 0; y < h; y++) {
    for (let j = 0; j < size; j++) store<usize>(at(rows, j), rowAddress(src, y + j - r, h, w, mode, zeros));
    if (size == 3) sortColumns3<f32>(rows, lines + (<usize>r << 2), stride, w);
    else sortColumns5<f32>(rows, lines + (<usize>r << 2), stride, w);
    for (let j = 0; j < size; j++) fillLineBorder(lines + <usize>j * stride, w, r, mode);
    const out = at(dst, y * w);
    if (size == 3) select3<f32>(lines, stride, w, out);
    else select5<f32>(lines, stride, w, out);
  }
  return 1;
}

/** Scratch bytes `medianBytes` needs for a w-wide image. */
export function medianBytesScratchBytes(w: i32, size: i32): i32 {
  return 4 * size + (w + 16) + size * (w + size + 48) + 128;
}

/**
 * `median` of 8-bit samples (w·h bytes at src) into bytes at dst, sixteen pixels per v128: whole
 * numbers 0 … 255 have one order, so the same networks give the same medians. Both blocks have the
 * heap's spare bytes after them, which the last vectors of a row may read or write.
 */
export function medianBytes(src: usize, dst: usize, w: i32, h: i32, size: i32, mode: i32, scratch: usize): void {
  const r = size >> 1;
  const rows = align16(scratch);
  const zeros = align16(at(rows, size));
  memory.fill(zeros, 0, w + 16);
  const stride = (<usize>(w + size + 32) + 15) & ~(<usize>15);
  const lines = align16(zeros + <usize>(w + 16));
  for (let y = 0; y < h; y++) {
    for (let j = 0; j < size; j++) {
      const sy = borderIndex(y + j - r, h, mode);
      store<usize>(at(rows, j), sy == OUTSIDE ? zeros : src + <usize>(sy * w));
    }
    if (size == 3) sortColumns3<u8>(rows, lines + <usize>r, stride, w);
    else sortColumns5<u8>(rows, lines + <usize>r, stride, w);
    for (let j = 0; j < size; j++) fillBorderOf<u8>(lines + <usize>j * stride, w, r, mode);
    const out = dst + <usize>(y * w);
    if (size == 3) select3<u8>(lines, stride, w, out);
    else select5<u8>(lines, stride, w, out);
  }
}

function hasUnorderedValues(src: usize, n: i32): bool {
  const negativeZero = i32x4.splat(NEGATIVE_ZERO_BITS);
  let found = i32x4.splat(0);
  let p = 0;
  for (; p + 4 <= n; p += 4) {
    const v = v128.load(at(src, p));
    found = v128.or(found, v128.or(f32x4.ne(v, v), i32x4.eq(v, negativeZero)));
  }
  if (v128.any_true(found)) return true;
  for (; p < n; p++) {
    const v = load<f32>(at(src, p));
    if (v != v || load<i32>(at(src, p)) == NEGATIVE_ZERO_BITS) return true;
  }
  return false;
}

/** pmin(a, b) is b < a ? b : a: the smaller of two ordered values (of bytes: the unsigned minimum). */
@inline
function lo<T>(a: v128, b: v128): v128 {
  return isFloat<T>() ? f32x4.pmin(a, b) : i8x16.min_u(a, b);
}

@inline
function hi<T>(a: v128, b: v128): v128 {
  return isFloat<T>() ? f32x4.pmax(a, b) : i8x16.max_u(a, b);
}

/** The vector of samples k to k + lanes − 1 from p (T: f32 or u8 samples). */
@inline
function lanesAt<T>(p: usize, k: i32): v128 {
  return v128.load(p + <usize>(k * sizeof<T>()));
}

/** Samples per v128. */
@inline
function lanes<T>(): i32 {
  return 16 / <i32>sizeof<T>();
}

/**
 * Stores the lanes of v that fall inside the row (w − x of them when fewer than four). Bytes go as a
 * whole vector: past the row's end they land on the next row's pixels, which come later, or in the
 * output block's spare bytes.
 */
@inline
function storePixels<T>(out: usize, x: i32, w: i32, v: v128): void {
  if (!isFloat<T>()) {
    v128.store(out + <usize>x, v);
    return;
  }
  const p = at(out, x);
  if (x + 4 <= w) {
    v128.store(p, v);
    return;
  }
  store<f32>(p, f32x4.extract_lane(v, 0));
  if (x + 1 < w) store<f32>(p, f32x4.extract_lane(v, 1), 4);
  if (x + 2 < w) store<f32>(p, f32x4.extract_lane(v, 2), 8);
}

/**
 * The three window rows' samples of each column, sorted: line 0 the smallest. The last vector may
 * read past the row (into the next row, the heap's spare bytes or the zeros row's spare samples) and
 * write into the right padding, which the border fill then overwrites.
 */
function sortColumns3<T>(rows: usize, line: usize, stride: usize, w: i32): void {
  const r0 = load<usize>(rows), r1 = load<usize>(at(rows, 1)), r2 = load<usize>(at(rows, 2));
  for (let x = 0; x < w; x += lanes<T>()) {
    const o = <usize>(x * sizeof<T>());
    let a = v128.load(r0 + o), b = v128.load(r1 + o), c = v128.load(r2 + o);
    let t = lo<T>(a, b); b = hi<T>(a, b); a = t;
    t = lo<T>(b, c); c = hi<T>(b, c); b = t;
    t = lo<T>(a, b); b = hi<T>(a, b); a = t;
    v128.store(line + o, a);
    v128.store(line + stride + o, b);
    v128.store(line + 2 * stride + o, c);
  }
}

/** The same for five rows, with the nine-comparator network for five values. */
function sortColumns5<T>(rows: usize, line: usize, stride: usize, w: i32): void {
  const r0 = load<usize>(rows), r1 = load<usize>(at(rows, 1)), r2 = load<usize>(at(rows, 2));
  const r3 = load<usize>(at(rows, 3)), r4 = load<usize>(at(rows, 4));
  for (let x = 0; x < w; x += lanes<T>()) {
    const o = <usize>(x * sizeof<T>());
    let a = v128.load(r0 + o), b = v128.load(r1 + o), c = v128.load(r2 + o), d = v128.load(r3 + o), e = v128.load(r4 + o);
    // Comparators (0,1) (3,4) (2,4) (2,3) (0,3) (0,2) (1,4) (1,3) (1,2).
    let t = lo<T>(a, b); b = hi<T>(a, b); a = t;
    t = lo<T>(d, e); e = hi<T>(d, e); d = t;
    t = lo<T>(c, e); e = hi<T>(c, e); c = t;
    t = lo<T>(c, d); d = hi<T>(c, d); c = t;
    t = lo<T>(a, d); d = hi<T>(a, d); a = t;
    t = lo<T>(a, c); c = hi<T>(a, c); a = t;
    t = lo<T>(b, e); e = hi<T>(b, e); b = t;
    t = lo<T>(b, d); d = hi<T>(b, d); b = t;
    t = lo<T>(b, c); c = hi<T>(b, c); b = t;
    v128.store(line + o, a);
    v128.store(line + stride + o, b);
    v128.store(line + 2 * stride + o, c);
    v128.store(line + 3 * stride + o, d);
    v128.store(line + 4 * stride + o, e);
  }
}

/** Median of three: max(min(a, b), min(max(a, b), c)). */
@inline
function median3<T>(a: v128, b: v128, c: v128): v128 {
  return hi<T>(lo<T>(a, b), lo<T>(hi<T>(a, b), c));
}

/**
 * 3×3: with the columns sorted, the median is the median of the largest of the three minima, the
 * median of the three middles and the smallest of the three maxima (common practice).
 */
function select3<T>(lines: usize, stride: usize, w: i32, out: usize): void {
  const low = lines, middle = lines + stride, high = lines + 2 * stride;
  for (let x = 0; x < w; x += lanes<T>()) {
    const o = <usize>(x * sizeof<T>());
    const lows = hi<T>(hi<T>(v128.load(low + o), lanesAt<T>(low + o, 1)), lanesAt<T>(low + o, 2));
    const middles = median3<T>(v128.load(middle + o), lanesAt<T>(middle + o, 1), lanesAt<T>(middle + o, 2));
    const highs = lo<T>(lo<T>(v128.load(high + o), lanesAt<T>(high + o, 1)), lanesAt<T>(high + o, 2));
    storePixels<T>(out, x, w, median3<T>(lows, middles, highs));
  }
}

/**
 * 5×5: row i of the window (the i-th smallest of each of its five sorted columns), if sorted as well,
 * would give a matrix with sorted rows and columns, in which the element at (i, j) has at least
 * (i+1)(j+1) − 1 values below it and (5−i)(5−j) − 1 above. Six places are therefore below the median
 * and six above it; the other thirteen — the two largest of row 0, the three largest of row 1, the
 * middle three of row 2, the three smallest of row 3, the two smallest of row 4 — hold it as their
 * own median, found by forgetful selection: of eight values the smallest and the largest cannot be
 * the median, so they go and the next values join. Minima and maxima only, so the 0-1 principle
 * applies: right on every 0/1 window means right on every window (D. E. Knuth, The Art of Computer
 * Programming, vol. 3, §5.3.4, from memory).
 */
function select5<T>(lines: usize, stride: usize, w: i32, out: usize): void {
  for (let x = 0; x < w; x += lanes<T>()) {
    const o = <usize>(x * sizeof<T>());
    // Row 0: its two largest.
    let p = lines + o;
    let l1 = lo<T>(v128.load(p), lanesAt<T>(p, 1)), h1 = hi<T>(v128.load(p), lanesAt<T>(p, 1));
    let l2 = lo<T>(lanesAt<T>(p, 2), lanesAt<T>(p, 3)), h2 = hi<T>(lanesAt<T>(p, 2), lanesAt<T>(p, 3));
    let e = lanesAt<T>(p, 4);
    let m1 = hi<T>(h1, h2);
    let m2 = hi<T>(lo<T>(h1, h2), hi<T>(l1, l2));
    const c0 = hi<T>(m1, e), c1 = hi<T>(lo<T>(m1, e), m2);
    // Row 1: its three largest.
    p += stride;
    l1 = lo<T>(v128.load(p), lanesAt<T>(p, 1)); h1 = hi<T>(v128.load(p), lanesAt<T>(p, 1));
    l2 = lo<T>(lanesAt<T>(p, 2), lanesAt<T>(p, 3)); h2 = hi<T>(lanesAt<T>(p, 2), lanesAt<T>(p, 3));
    e = hi<T>(lo<T>(l1, l2), lanesAt<T>(p, 4));
    m1 = hi<T>(l1, l2);
    m2 = lo<T>(h1, h2);
    const c2 = hi<T>(m1, m2), c3 = hi<T>(lo<T>(m1, m2), e), c4 = hi<T>(h1, h2);
    // Row 2: all but its smallest and largest.
    p += stride;
    l1 = lo<T>(v128.load(p), lanesAt<T>(p, 1)); h1 = hi<T>(v128.load(p), lanesAt<T>(p, 1));
    l2 = lo<T>(lanesAt<T>(p, 2), lanesAt<T>(p, 3)); h2 = hi<T>(lanesAt<T>(p, 2), lanesAt<T>(p, 3));
    e = hi<T>(lo<T>(l1, l2), lanesAt<T>(p, 4));
    const c5 = hi<T>(l1, l2), c6 = lo<T>(h1, h2), c7 = lo<T>(e, hi<T>(h1, h2));
    // Row 3: its three smallest.
    p += stride;
    l1 = lo<T>(v128.load(p), lanesAt<T>(p, 1)); h1 = hi<T>(v128.load(p), lanesAt<T>(p, 1));
    l2 = lo<T>(lanesAt<T>(p, 2), lanesAt<T>(p, 3)); h2 = hi<T>(lanesAt<T>(p, 2), lanesAt<T>(p, 3));
    e = lo<T>(hi<T>(h1, h2), lanesAt<T>(p, 4));
    m1 = hi<T>(l1, l2);
    m2 = lo<T>(h1, h2);
    const c8 = lo<T>(m1, m2), c9 = lo<T>(hi<T>(m1, m2), e), c10 = lo<T>(l1, l2);
    // Row 4: its two smallest.
    p += stride;
    l1 = lo<T>(v128.load(p), lanesAt<T>(p, 1)); h1 = hi<T>(v128.load(p), lanesAt<T>(p, 1));
    l2 = lo<T>(lanesAt<T>(p, 2), lanesAt<T>(p, 3)); h2 = hi<T>(lanesAt<T>(p, 2), lanesAt<T>(p, 3));
    e = lanesAt<T>(p, 4);
    m1 = lo<T>(l1, l2);
    m2 = lo<T>(hi<T>(l1, l2), lo<T>(h1, h2));
    const c11 = lo<T>(m1, e), c12 = lo<T>(hi<T>(m1, e), m2);
    // Forgetful selection over the thirteen: three rounds of eight values in, all but the smallest
    // and the largest out, two more joining; then seven, of which five stay; then their median.
    let a = c0, b = c1, c = c2, d = c3, f = c4, g = c5, k = c6, n = c7;
    for (let round = 0; round < 3; round++) {
      const ab0 = lo<T>(a, b), ab1 = hi<T>(a, b), cd0 = lo<T>(c, d), cd1 = hi<T>(c, d);
      const fg0 = lo<T>(f, g), fg1 = hi<T>(f, g), kn0 = lo<T>(k, n), kn1 = hi<T>(k, n);
      a = hi<T>(ab0, cd0);
      b = hi<T>(fg0, kn0);
      c = hi<T>(lo<T>(ab0, cd0), lo<T>(fg0, kn0));
      d = lo<T>(ab1, cd1);
      f = lo<T>(fg1, kn1);
      g = lo<T>(hi<T>(ab1, cd1), hi<T>(fg1, kn1));
      k = round == 0 ? c8 : c10;
      n = round == 0 ? c9 : c11;
    }
    // Seven values: sort the triple (a, b, c12) so that its middle stays; the smallest of the other
    // lows and the largest of the other highs go.
    const t0 = lo<T>(a, b), t1 = hi<T>(a, b);
    const s0 = lo<T>(t0, c12), s1 = hi<T>(t0, c12);
    const middle = lo<T>(s1, t1), top = hi<T>(s1, t1);
    const u0 = lo<T>(c, d), u1 = hi<T>(c, d);
    const v0 = lo<T>(f, g), v1 = hi<T>(f, g);
    const lowKeep = hi<T>(lo<T>(s0, u0), v0), lowNext = hi<T>(s0, u0);
    const highKeep = lo<T>(hi<T>(top, u1), v1), highNext = lo<T>(top, u1);
    storePixels<T>(out, x, w, median5<T>(middle, lowNext, lowKeep, highNext, highKeep));
  }
}

/** Median of five: drop the smallest and the largest of the first four, then the median of three. */
@inline
function median5<T>(a: v128, b: v128, c: v128, d: v128, e: v128): v128 {
  return median3<T>(hi<T>(lo<T>(a, b), lo<T>(c, d)), lo<T>(hi<T>(a, b), hi<T>(c, d)), e);
}
