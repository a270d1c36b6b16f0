// Morphology with a square structuring element of side 2r+1.
// Any image: erosion = minimum, dilation = maximum, a vertical then a horizontal pass, with the
// plain engine's comparisons (pmin(a, b) is b < a ? b : a), so that NaN and ±0 come out the same.
// Masks (every value 0 or 1): packed 32 pixels per int32 word, where the minimum is an AND and the
// maximum an OR over rows and shifted words, four words per v128.
import { align16, at, borderIndex, fillBorderOf, fillLineBorder, OUTSIDE, rowAddress } from './border';

const ONE_BITS: i32 = 0x3f800000;

/** Scratch bytes `extreme` needs. */
export function extremeScratchBytes(w: i32, r: i32): i32 {
  return 4 * (2 * r + 1) + 4 * w + 4 * (w + 2 * r + 4) + 128;
}

/** dst = minimum (takeMax 0) or maximum (takeMax 1) of src over the square of side 2r+1. */
export function extreme(src: usize, dst: usize, w: i32, h: i32, r: i32, mode: i32, takeMax: i32, scratch: usize): void {
  const size = 2 * r + 1;
  const rows = align16(scratch);
  const zeros = align16(at(rows, size));
  memory.fill(zeros, 0, 4 * w);
  const line = align16(at(zeros, w));
  for (let y = 0; y < h; y++) {
    for (let j = 0; j < size; j++) store<usize>(at(rows, j), rowAddress(src, y + j - r, h, w, mode, zeros));
    verticalExtreme(rows, size, w, at(line, r), takeMax != 0);
    fillLineBorder(line, w, r, mode);
    horizontalExtreme(line, size, w, at(dst, y * w), takeMax != 0);
  }
}

/**
 * `extreme` of 8-bit samples (w·h bytes at src) into bytes at dst: the same minima and maxima (the
 * outside, with the constant border, is 0 as there), sixteen pixels per instruction.
 */
export function extremeBytes(src: usize, dst: usize, w: i32, h: i32, r: i32, mode: i32, takeMax: i32, scratch: usize): void {
  const size = 2 * r + 1;
  const rows = align16(scratch);
  const zeros = align16(at(rows, size));
  memory.fill(zeros, 0, w);
  const line = align16(zeros + <usize>w);
  for (let y = 0; y < h; y++) {
    for (let j = 0; j < size; j++) {
      const sy = borderIndex(y + j - r, h, mode);
      store<usize>(at(rows, j), sy == OUTSIDE ? zeros : src + <usize>(sy * w));
    }
    if (takeMax != 0) verticalBytes(rows, size, w, line + <usize>r, true);
    else verticalBytes(rows, size, w, line + <usize>r, false);
    fillBorderOf<u8>(line, w, r, mode);
    if (takeMax != 0) horizontalBytes(line, size, w, dst + <usize>(y * w), true);
    else horizontalBytes(line, size, w, dst + <usize>(y * w), false);
  }
}

/** Scratch bytes `extremeBytes` needs. */
export function extremeBytesScratchBytes(w: i32, r: i32): i32 {
  return 4 * (2 * r + 1) + 2 * w + 2 * r + 64;
}

/** The extreme of two lanes of bytes (a constant `takeMax` in each inlined copy). */
@inline
function extremeU8(a: v128, b: v128, takeMax: bool): v128 {
  return takeMax ? i8x16.max_u(a, b) : i8x16.min_u(a, b);
}

@inline
function verticalBytes(rows: usize, size: i32, w: i32, line: usize, takeMax: bool): void {
  let x = 0;
  for (; x + 16 <= w; x += 16) {
    let m = v128.load(load<usize>(rows) + <usize>x);
    for (let j = 1; j < size; j++) m = extremeU8(m, v128.load(load<usize>(at(rows, j)) + <usize>x), takeMax);
    v128.store(line + <usize>x, m);
  }
  for (; x < w; x++) {
    let m = load<u8>(load<usize>(rows) + <usize>x);
    for (let j = 1; j < size; j++) {
      const v = load<u8>(load<usize>(at(rows, j)) + <usize>x);
      if (takeMax ? v > m : v < m) m = v;
    }
    store<u8>(line + <usize>x, m);
  }
}

@inline
function horizontalBytes(line: usize, size: i32, w: i32, out: usize, takeMax: bool): void {
  let x = 0;
  for (; x + 16 <= w; x += 16) {
    const p = line + <usize>x;
    let m = v128.load(p);
    for (let i = 1; i < size; i++) m = extremeU8(m, v128.load(p + <usize>i), takeMax);
    v128.store(out + <usize>x, m);
  }
  for (; x < w; x++) {
    const p = line + <usize>x;
    let m = load<u8>(p);
    for (let i = 1; i < size; i++) {
      const v = load<u8>(p + <usize>i);
      if (takeMax ? v > m : v < m) m = v;
    }
    store<u8>(out + <usize>x, m);
  }
}

function verticalExtreme(rows: usize, size: i32, w: i32, line: usize, takeMax: bool): void {
  let x = 0;
  if (size == 3) {
    // As the plain engine: m = u < v ? u : v, then m < t ? m : t (maximum alike).
    const a = load<usize>(rows), b = load<usize>(at(rows, 1)), c = load<usize>(at(rows, 2));
    for (; x + 4 <= w; x += 4) {
      const o = (<usize>x) << 2;
      const u = v128.load(a + o), v = v128.load(b + o), t = v128.load(c + o);
      v128.store(line + o, takeMax ? f32x4.pmax(t, f32x4.pmax(v, u)) : f32x4.pmin(t, f32x4.pmin(v, u)));
    }
    for (; x < w; x++) {
      const o = (<usize>x) << 2;
      const u = load<f32>(a + o), v = load<f32>(b + o), t = load<f32>(c + o);
      let m: f32;
      if (takeMax) {
        m = u > v ? u : v;
        m = m > t ? m : t;
      } else {
        m = u < v ? u : v;
        m = m < t ? m : t;
      }
      store<f32>(line + o, m);
    }
    return;
  }
  // As the plain engine: start from the first row, take a row's value where it is smaller (larger).
  for (; x + 4 <= w; x += 4) {
    const o = (<usize>x) << 2;
    let m = v128.load(load<usize>(rows) + o);
    for (let j = 1; j < size; j++) {
      const v = v128.load(load<usize>(at(rows, j)) + o);
      m = takeMax ? f32x4.pmax(m, v) : f32x4.pmin(m, v);
    }
    v128.store(line + o, m);
  }
  for (; x < w; x++) {
    const o = (<usize>x) << 2;
    let m = load<f32>(load<usize>(rows) + o);
    for (let j = 1; j < size; j++) {
      const v = load<f32>(load<usize>(at(rows, j)) + o);
      if (takeMax ? v > m : v < m) m = v;
    }
    store<f32>(line + o, m);
  }
}

function horizontalExtreme(line: usize, size: i32, w: i32, out: usize, takeMax: bool): void {
  let x = 0;
  if (size == 3) {
    for (; x + 4 <= w; x += 4) {
      const p = at(line, x);
      const u = v128.load(p), v = v128.load(p, 4), t = v128.load(p, 8);
      v128.store(at(out, x), takeMax ? f32x4.pmax(t, f32x4.pmax(v, u)) : f32x4.pmin(t, f32x4.pmin(v, u)));
    }
    for (; x < w; x++) {
      const p = at(line, x);
      const u = load<f32>(p), v = load<f32>(p, 4), t = load<f32>(p, 8);
      let m: f32;
      if (takeMax) {
        m = u > v ? u : v;
        m = m > t ? m : t;
      } else {
        m = u < v ? u : v;
        m = m < t ? m : t;
      }
      store<f32>(at(out, x), m);
    }
    return;
  }
  for (; x + 4 <= w; x += 4) {
    const p = at(line, x);
    let m = v128.load(p);
    for (let i = 1; i < size; i++) {
      const v = v128.load(at(p, i));
      m = takeMax ? f32x4.pmax(m, v) : f32x4.pmin(m, v);
    }
    v128.store(at(out, x), m);
  }
  for (; x < w; x++) {
    const p = at(line, x);
    let m = load<f32>(p);
    for (let i = 1; i < size; i++) {
      const v = load<f32>(at(p, i));
      if (takeMax ? v > m : v < m) m = v;
    }
    store<f32>(at(out, x), m);
  }
}

/**
 * Packs a 0/1 mask into words (bit i of word k of row y is pixel (32k + i, y), bits past the last
 * column 0); returns 0 as soon as a value other than 0 and 1 turns up (−0 counts as 0), else 1.
 */
export function packMask(src: usize, w: i32, h: i32, words: usize): i32 {
  const zero = f32x4.splat(0), one = f32x4.splat(1);
  const wordsPerRow = (w + 31) >>> 5;
  for (let y = 0; y < h; y++) {
    const row = y * w;
    let valid = i32x4.splat(-1);
    for (let k = 0; k < wordsPerRow; k++) {
      const x0 = row + (k << 5);
      const count = min(32, w - (k << 5));
      let word = 0;
      if (count == 32) {
        for (let g = 0; g < 8; g++) {
          const v = v128.load(at(src, x0 + (g << 2)));
          const isOne = f32x4.eq(v, one);
          valid = v128.and(valid, v128.or(isOne, f32x4.eq(v, zero)));
          word |= i32x4.bitmask(isOne) << (g << 2);
        }
      } else {
        for (let i = 0; i < count; i++) {
          const v = load<f32>(at(src, x0 + i));
          if (v != 0 && v != 1) return 0;
          word |= (v == 1 ? 1 : 0) << i;
        }
      }
      store<i32>(at(words, y * wordsPerRow + k), word);
    }
    if (!i32x4.all_true(valid)) return 0;
  }
  return 1;
}

/** Writes packed words as float32 0 and 1. */
export function unpackMask(words: usize, dst: usize, w: i32, h: i32): void {
  const wordsPerRow = (w + 31) >>> 5;
  const one = i32x4.splat(ONE_BITS);
  const firstBits = i32x4(1, 2, 4, 8);
  for (let y = 0; y < h; y++) {
    const row = y * w;
    for (let k = 0; k < wordsPerRow; k++) {
      const x0 = row + (k << 5);
      const count = min(32, w - (k << 5));
      const word = load<i32>(at(words, y * wordsPerRow + k));
      if (count == 32) {
        const all = i32x4.splat(word);
        let bits = firstBits;
        for (let g = 0; g < 8; g++) {
          // A lane is all ones where its bit is set: (word & bit) == bit.
          const set = i32x4.eq(v128.and(all, bits), bits);
          v128.store(at(dst, x0 + (g << 2)), v128.and(set, one));
          bits = i32x4.shl(bits, 4);
        }
      } else {
        for (let i = 0; i < count; i++) store<i32>(at(dst, x0 + i), ((word >>> i) & 1) * ONE_BITS);
      }
    }
  }
}

/** Scratch bytes `packedExtreme` needs. */
export function packedScratchBytes(w: i32): i32 {
  return 4 * (((w + 31) >>> 5) + 8) + 64;
}

/**
 * Erosion (AND, takeMax 0) or dilation (OR, takeMax 1) of packed words over the square of side
 * 2r+1 (1 ≤ r ≤ 31). `outside` (0 or 1) is the value of every position outside the image.
 */
export function packedExtreme(src: usize, dst: usize, w: i32, h: i32, r: i32, takeMax: i32, outside: i32, scratch: usize): void {
  const n = (w + 31) >>> 5;
  const identity = takeMax ? 0 : -1;
  const fill = outside ? -1 : 0;
  const lastBits = w - ((n - 1) << 5);
  // Bits past the last column read as outside the image.
  const tailMask = lastBits == 32 ? 0 : -1 << lastBits;
  const tailFill = fill & tailMask;
  // One row of the vertical result at line[1 … n], with a word of outside values on each side.
  const line = align16(scratch);
  store<i32>(line, fill);
  store<i32>(at(line, n + 1), fill);
  for (let y = 0; y < h; y++) {
    const top = y - r;
    const bottom = y + r;
    const out = at(dst, y * n);
    if ((top < 0 || bottom >= h) && fill != identity) {
      // An outside row decides the whole row: all 0 for erosion with the constant border.
      for (let k = 0; k < n; k++) store<i32>(at(out, k), fill);
      continue;
    }
    const first = max(0, top);
    const last = min(h - 1, bottom);
    memory.copy(at(line, 1), at(src, first * n), 4 * n);
    for (let j = first + 1; j <= last; j++) {
      const row = at(src, j * n);
      let k = 0;
      for (; k + 4 <= n; k += 4) {
        const a = v128.load(at(line, 1 + k)), b = v128.load(at(row, k));
        v128.store(at(line, 1 + k), takeMax ? v128.or(a, b) : v128.and(a, b));
      }
      for (; k < n; k++) {
        const a = load<i32>(at(line, 1 + k)), b = load<i32>(at(row, k));
        store<i32>(at(line, 1 + k), takeMax ? a | b : a & b);
      }
    }
    store<i32>(at(line, n), (load<i32>(at(line, n)) & ~tailMask) | tailFill);
    let k = 1;
    for (; k + 3 <= n; k += 4) {
      const prev = v128.load(at(line, k - 1)), cur = v128.load(at(line, k)), next = v128.load(at(line, k + 1));
      let acc = cur;
      for (let s = 1; s <= r; s++) {
        const left = v128.or(i32x4.shl(cur, s), i32x4.shr_u(prev, 32 - s));
        const right = v128.or(i32x4.shr_u(cur, s), i32x4.shl(next, 32 - s));
        acc = takeMax ? v128.or(acc, v128.or(left, right)) : v128.and(acc, v128.and(left, right));
      }
      v128.store(at(out, k - 1), acc);
    }
    for (; k <= n; k++) {
      const prev = load<i32>(at(line, k - 1)), cur = load<i32>(at(line, k)), next = load<i32>(at(line, k + 1));
      let acc = cur;
      for (let s = 1; s <= r; s++) {
        const left = (cur << s) | (prev >>> (32 - s));
        const right = (cur >>> s) | (next << (32 - s));
        acc = takeMax ? acc | left | right : acc & left & right;
      }
      store<i32>(at(out, k - 1), acc);
    }
  }
}
