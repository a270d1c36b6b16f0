// Box mean and the adaptive-mean threshold that compares with it, computed as the plain engine does
// (shared/vision/smoothing.ts): column sums and window sums in double precision with the same
// operations in the same order, so that both engines give the same bits. The column sums move down
// one row at a time, for all columns at once (two per f64x2); the window sum of a row is the plain
// engine's two running sums (even and odd columns) held in the two lanes of one f64x2, and two rows
// run side by side so that each addition does not wait on the one just before it.
import { align16, at, borderIndex, OUTSIDE, rowAddress } from './border';

const ONE_BITS: i32 = 0x3f800000;

/** Scratch bytes `box` needs for a w-wide image. */
export function boxScratchBytes(w: i32, size: i32): i32 {
  return 4 * (w + 4) + 2 * (8 * (w + size + 1) + 16) + 128;
}

/**
 * compare 0: dst = mean of the size × size neighbourhood (divisor size², border pixels included);
 * compare 1: dst = flip XOR (src > fround(mean) − c), as float32 0 and 1.
 */
export function box(src: usize, dst: usize, w: i32, h: i32, size: i32, mode: i32, compare: i32, c: f64, flip: i32, scratch: usize): void {
  const r = size >> 1;
  const zeros = align16(scratch);
  memory.fill(zeros, 0, 4 * (w + 4));
  // Column sums of positions −r … w−1+r, and two zeros that only the odd running sum's last, unused step reads.
  const length = w + 2 * r + 2;
  const lineBytes = ((<usize>length << 3) + 15) & ~(<usize>15);
  const even = align16(at(zeros, w + 4));
  const odd = even + lineBytes;
  memory.fill(even, 0, <i32>(2 * lineBytes));
  const scale = 1.0 / <f64>(size * size);
  for (let t = 0; t < size; t++) addRow(even + (<usize>r << 3), rowAddress(src, t - r, h, w, mode, zeros), w);
  // `even` holds the sums of rows y (even y), `odd` those of row y + 1. A row outside the image adds
  // the zeros row: s + (a − 0) is s + a and s + (0 − d) is s − d, since no column sum is ever −0.
  for (let y = 0; y < h; y += 2) {
    const pair = y + 1 < h;
    if (pair) slide(even, odd, r, w, rowAddress(src, y + r + 1, h, w, mode, zeros), rowAddress(src, y - r, h, w, mode, zeros));
    fillBorder(even, w, r, mode);
    if (pair) {
      fillBorder(odd, w, r, mode);
      windowPair(even, odd, size, w, scale, y, compare, src, dst, c, flip);
      if (y + 2 < h) slide(odd, even, r, w, rowAddress(src, y + r + 2, h, w, mode, zeros), rowAddress(src, y + 1 - r, h, w, mode, zeros));
    } else {
      windowSingle(even, size, w, scale, y, compare, src, dst, c, flip);
    }
  }
}

/** sums[x] += row[x] for the w columns. */
function addRow(sums: usize, row: usize, w: i32): void {
  let x = 0;
  for (; x + 4 <= w; x += 4) {
    const v = v128.load(at(row, x));
    const p = sums + (<usize>x << 3);
    v128.store(p, f64x2.add(v128.load(p), f64x2.promote_low_f32x4(v)));
    v128.store(p, f64x2.add(v128.load(p, 16), f64x2.promote_low_f32x4(v128.shuffle<f32>(v, v, 2, 3, 0, 1))), 16);
  }
  for (; x < w; x++) {
    const p = sums + (<usize>x << 3);
    store<f64>(p, load<f64>(p) + <f64>load<f32>(at(row, x)));
  }
}

/** Column sums one row further down: to[x] = from[x] + (add[x] − drop[x]) (lines padded by r). */
function slide(from: usize, to: usize, r: i32, w: i32, add: usize, drop: usize): void {
  const f = from + (<usize>r << 3);
  const t = to + (<usize>r << 3);
  let x = 0;
  for (; x + 4 <= w; x += 4) {
    const a = v128.load(at(add, x)), d = v128.load(at(drop, x));
    const o = <usize>x << 3;
    const low = f64x2.sub(f64x2.promote_low_f32x4(a), f64x2.promote_low_f32x4(d));
    const high = f64x2.sub(f64x2.promote_low_f32x4(v128.shuffle<f32>(a, a, 2, 3, 0, 1)), f64x2.promote_low_f32x4(v128.shuffle<f32>(d, d, 2, 3, 0, 1)));
    v128.store(t + o, f64x2.add(v128.load(f + o), low));
    v128.store(t + o, f64x2.add(v128.load(f + o, 16), high), 16);
  }
  for (; x < w; x++) {
    const o = <usize>x << 3;
    store<f64>(t + o, load<f64>(f + o) + (<f64>load<f32>(at(add, x)) - <f64>load<f32>(at(drop, x))));
  }
}

/** The r positions on each side of a line of column sums, following the border policy. */
function fillBorder(line: usize, w: i32, r: i32, mode: i32): void {
  for (let t = 0; t < r; t++) {
    const left = borderIndex(t - r, w, mode);
    store<f64>(line + (<usize>t << 3), left == OUTSIDE ? 0 : load<f64>(line + (<usize>(r + left) << 3)));
    const right = borderIndex(w + t, w, mode);
    store<f64>(line + (<usize>(r + w + t) << 3), right == OUTSIDE ? 0 : load<f64>(line + (<usize>(r + right) << 3)));
  }
}

/** (even, odd): the running window sums at columns 0 and 1, as the plain engine starts them. */
@inline
function firstSums(s: usize, size: i32): v128 {
  let even: f64 = 0;
  for (let i = 0; i < size; i++) even += load<f64>(s + (<usize>i << 3));
  const odd = even + load<f64>(s + (<usize>size << 3)) - load<f64>(s);
  return f64x2.replace_lane(f64x2.splat(even), 1, odd);
}

/** What the running sums at columns x and x+1 gain to move two columns on: (s[x+size] + s[x+size+1]) − (s[x] + s[x+1]), and the same one column further. */
@inline
function step(s: usize, x: i32, size: i32): v128 {
  const p = s + (<usize>x << 3);
  const q = s + (<usize>(x + size) << 3);
  const enter = f64x2.add(v128.load(q), v128.load(q, 8));
  const leave = f64x2.add(v128.load(p), v128.load(p, 8));
  return f64x2.sub(enter, leave);
}

/** Writes pixels x and x+1 of a row from the two running sums: the means, or the mask against them. */
@inline
function emit(sums: v128, scale: v128, x: i32, row: i32, compare: i32, src: usize, dst: usize, c: v128, flip: v128, one: v128): void {
  const means = f32x4.demote_f64x2_zero(f64x2.mul(sums, scale));
  const out = at(dst, row + x);
  if (compare == 0) {
    v128.store64_lane(out, means, 0);
    return;
  }
  const limit = f64x2.sub(f64x2.promote_low_f32x4(means), c);
  const above = f64x2.gt(f64x2.promote_low_f32x4(v128.load64_zero(at(src, row + x))), limit);
  const bits = v128.and(v128.xor(v128.shuffle<i32>(above, above, 0, 2, 0, 2), flip), one);
  v128.store64_lane(out, bits, 0);
}

/** The last pixel of an odd-width row, from the even running sum. */
@inline
function emitLast(sum: f64, scale: f64, x: i32, row: i32, compare: i32, src: usize, dst: usize, c: f64, flip: i32): void {
  const mean = <f32>(sum * scale);
  const out = at(dst, row + x);
  if (compare == 0) store<f32>(out, mean);
  else store<f32>(out, <f32>(flip ^ (<f64>load<f32>(at(src, row + x)) > <f64>mean - c ? 1 : 0)));
}

function windowSingle(s: usize, size: i32, w: i32, scale: f64, y: i32, compare: i32, src: usize, dst: usize, c: f64, flip: i32): void {
  const vs = f64x2.splat(scale), vc = f64x2.splat(c), vf = i32x4.splat(flip ? -1 : 0), one = i32x4.splat(ONE_BITS);
  const row = y * w;
  let sums = firstSums(s, size);
  let x = 0;
  for (; x + 1 < w; x += 2) {
    emit(sums, vs, x, row, compare, src, dst, vc, vf, one);
    sums = f64x2.add(sums, step(s, x, size));
  }
  if (x < w) emitLast(f64x2.extract_lane(sums, 0), scale, x, row, compare, src, dst, c, flip);
}

/** Rows y (sums in a) and y + 1 (sums in b) in one sweep: two independent chains of additions. */
function windowPair(a: usize, b: usize, size: i32, w: i32, scale: f64, y: i32, compare: i32, src: usize, dst: usize, c: f64, flip: i32): void {
  const vs = f64x2.splat(scale), vc = f64x2.splat(c), vf = i32x4.splat(flip ? -1 : 0), one = i32x4.splat(ONE_BITS);
  const rowA = y * w;
  const rowB = rowA + w;
  let sumsA = firstSums(a, size);
  let sumsB = firstSums(b, size);
  let x = 0;
  for (; x + 1 < w; x += 2) {
    emit(sumsA, vs, x, rowA, compare, src, dst, vc, vf, one);
    emit(sumsB, vs, x, rowB, compare, src, dst, vc, vf, one);
    sumsA = f64x2.add(sumsA, step(a, x, size));
    sumsB = f64x2.add(sumsB, step(b, x, size));
  }
  if (x < w) {
    emitLast(f64x2.extract_lane(sumsA, 0), scale, x, rowA, compare, src, dst, c, flip);
    emitLast(f64x2.extract_lane(sumsB, 0), scale, x, rowB, compare, src, dst, c, flip);
  }
}
