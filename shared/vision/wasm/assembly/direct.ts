// Direct 2-D correlation for kernels that are not rank 1. Every output vector sums rows × cols shifted
// loads of the source rows, read in place, against the kernel's weights, splatted once into a table of
// v128 (held in locals for 3×3); the columns within reach of the left and right edges go one pixel at
// a time through the border policy. (Copying each row into a padded line first cost a quarter of the
// 3×3 kernel's time.)
// Whole-number kernels on whole-number rows (8-bit grey photos, masks) add in 16-bit integers, eight
// pixels per v128 instead of four: every product and partial sum is then a whole number of at most
// 32767, which float32 holds exactly too, so both ways give the same sums and the same bits. The rows
// go into 16 bits one ahead, while the row before them is summed; 3×3 kernels take this path when the
// image's first row is of whole numbers.
import { align16, at, borderIndex, fillBorderOf, keepTouched, OUTSIDE, rowAddress } from './border';

/** Largest magnitude of a 16-bit sum. */
const I16_LIMIT: i32 = 32767;

/** Scratch bytes `correlate2d` needs. */
export function directScratchBytes(w: i32, rows: i32, cols: i32): i32 {
  return 48 * rows * cols + 12 * rows + 4 * w + (rows + 1) * (2 * (w + cols) + 32) + 256;
}

/**
 * dst(x,y) = Σⱼ Σᵢ k[j][i]·src(x+i−rx, y+j−ry)·scale + offset, k float32 row-major at weights.
 * src8: 0, or the same samples as bytes (an 8-bit photo's); a kernel whose 16-bit sums hold for any
 * byte (whole weights, ‖k‖₁ ≤ 128 = 32767 ÷ 255 rounded down; EIGHT_BIT_L1 in simd-kernels.ts) then
 * reads them instead of src, which it never touches (src's samples need not be written).
 */
export function correlate2d(src: usize, src8: usize, dst: usize, w: i32, h: i32, weights: usize, rows: i32, cols: i32, mode: i32, scale: f32, offset: f32, scratch: usize): void {
  const ry = rows >> 1;
  const rx = cols >> 1;
  const taps = rows * cols;
  const table = align16(scratch);
  for (let t = 0; t < taps; t++) v128.store(table + ((<usize>t) << 4), f32x4.splat(load<f32>(at(weights, t))));
  // The largest |sample| for which 16-bit sums cannot overflow (0: no 16-bit path).
  const bound = wholeSampleBound(weights, taps);
  // The 16-bit weights.
  const table16 = table + ((<usize>taps) << 4);
  // The 16-bit sums skip zero weights: only the nonzero taps go into table16, each with its
  // source (row j, byte offset 2i in its line) at taps16; adding a zero product changes no sum.
  const taps16 = table16 + ((<usize>taps) << 4);
  // Weights of 1 come first and −1 next: those taps add or subtract their line without a product.
  let nonzero = 0, ones = 0, minusOnes = 0;
  if (bound > 0) {
    for (let pass = 0; pass < 3; pass++) {
      for (let t = 0; t < taps; t++) {
        const k = <i16>load<f32>(at(weights, t));
        if (k == 0 || (pass == 0) != (k == 1) || (pass == 1) != (k == -1)) continue;
        v128.store(table16 + ((<usize>nonzero) << 4), i16x8.splat(k));
        store<i32>(at(taps16, 2 * nonzero), t / cols);
        store<i32>(at(taps16, 2 * nonzero + 1), 2 * (t % cols));
        nonzero++;
        if (pass == 0) ones++;
        else if (pass == 1) minusOnes++;
      }
    }
  }
  const slots = align16(at(taps16, 2 * taps));
  const slots16 = align16(at(slots, rows));
  const tapLines = align16(at(slots16, rows));
  // A ring of rows + 1 16-bit lines (see below), and whether each holds whole numbers.
  const ring = rows + 1;
  const whole = align16(at(tapLines, taps));
  const zeros = align16(at(whole, ring));
  memory.fill(zeros, 0, 4 * w);
  const line16Bytes = (<usize>(2 * (w + cols) + 16)) & ~(<usize>15);
  const ring16 = align16(at(zeros, w));
  // A 3×3 kernel goes through 16-bit sums only when the first source row is of whole numbers within
  // the bound (the ring's first line holds it meanwhile): an image of fractions (a smoothed one)
  // would try every row and then take the float32 loop anyway.
  // Bytes are whole numbers within any bound of 255 or more: no checks, a quarter of the reads.
  const bytes = src8 != 0 && bound >= 255;
  if (rows == 3 && cols == 3 && (bound == 0 || h == 0 || (!bytes && !toWhole16(src, ring16, w, bound, src)))) {
    correlate3x3(src, dst, w, h, mode, table, scale, offset, zeros);
    return;
  }
  // The ring's lines: those of source rows y − ry … y + ry, which output row y reads, and the next
  // one, converted while row y is summed (its source samples then arrive from memory while the sums
  // keep the processor busy). Rows that are not whole numbers within the bound send the windows
  // holding them to the float32 loop, which reads the source rows in place.
  for (let t = 0; t < rows; t++) {
    const line = ringLine(ring16, t, ring, line16Bytes);
    store<i32>(at(whole, t % ring), <i32>(bound > 0 && toWhole16Line(src, bytes ? src8 : 0, w, h, t - ry, rx, mode, line, bound, rowBelow(src, t - ry + 3, w, h))));
  }
  for (let y = 0; y < h; y++) {
    let allWhole = bound > 0;
    for (let j = 0; j < rows; j++) {
      store<usize>(at(slots16, j), ringLine(ring16, y + j, ring, line16Bytes));
      allWhole = allWhole && load<i32>(at(whole, (y + j) % ring)) != 0;
    }
    const out = at(dst, y * w);
    const next = y + rows;
    const nextRow = borderIndex(next - ry, h, mode);
    // The next line is converted inside whole16 when it is a source row, else afterwards.
    const during = bound > 0 && allWhole && y + 1 < h && nextRow != OUTSIDE;
    if (allWhole) {
      for (let t = 0; t < nonzero; t++) {
        const line = load<usize>(at(slots16, load<i32>(at(taps16, 2 * t))));
        store<usize>(at(tapLines, t), line + <usize>load<i32>(at(taps16, 2 * t + 1)));
      }
      const convert = during ? (bytes ? src8 + <usize>(nextRow * w) : at(src, nextRow * w)) : 0;
      const line16 = ringLine(ring16, next, ring, line16Bytes) + ((<usize>rx) << 1);
      const ahead = nonzero <= FEW_TAPS ? at(dst, min(y + OUTPUT_AHEAD, h - 1) * w) : 0;
      const done = whole16(tapLines, table16, ones, ones + minusOnes, nonzero, w, out, scale, offset, convert, line16, bound, ahead, bytes);
      if (during) {
        const ok = done >= 0 && (bytes ? bytesTo16(convert + <usize>done, line16 + ((<usize>done) << 1), w - done) : toWhole16(convert + ((<usize>done) << 2), line16 + ((<usize>done) << 1), w - done, bound, convert));
        if (ok) fillBorderOf<i16>(ringLine(ring16, next, ring, line16Bytes), w, rx, mode);
        store<i32>(at(whole, next % ring), <i32>ok);
        continue;
      }
    } else {
      for (let j = 0; j < rows; j++) store<usize>(at(slots, j), rowAddress(src, y + j - ry, h, w, mode, zeros));
      if (rows == 3 && cols == 3) row3x3(load<usize>(slots), load<usize>(slots, sizeof<usize>()), load<usize>(slots, 2 * sizeof<usize>()), out, w, mode, table, scale, offset);
      else general(slots, table, rows, cols, w, out, scale, offset, mode);
    }
    if (y + 1 < h) {
      const line = ringLine(ring16, next, ring, line16Bytes);
      store<i32>(at(whole, next % ring), <i32>(bound > 0 && toWhole16Line(src, bytes ? src8 : 0, w, h, next - ry, rx, mode, line, bound, rowBelow(src, next - ry + 3, w, h))));
    }
  }
}

/**
 * With at most FEW_TAPS nonzero weights (3×3 kernels) a row of 16-bit sums waits on memory more than
 * on its arithmetic, so it reads a word of each 64 bytes of the output row OUTPUT_AHEAD below as it
 * goes: that row's stores then find their lines in the cache. With more taps the extra loads cost
 * the sums more than they save.
 */
const FEW_TAPS = 9;
const OUTPUT_AHEAD = 8;

/**
 * Source row sy clamped to the image: a row read on the way so that it is in the cache when its turn
 * comes (WebAssembly has no prefetch; see touchAhead).
 */
@inline
function rowBelow(src: usize, sy: i32, w: i32, h: i32): usize {
  return at(src, min(max(sy, 0), h - 1) * w);
}

/** The ring's line for row t (lines lineBytes apart, `ring` of them). */
@inline
function ringLine(ring16: usize, t: i32, ring: i32, lineBytes: usize): usize {
  return ring16 + <usize>(t % ring) * lineBytes;
}

/**
 * I16_LIMIT ÷ ‖k‖₁ rounded down when every weight is a whole number and ‖k‖₁ ≤ I16_LIMIT (all weights 0:
 * I16_LIMIT), else 0: rows whose samples are whole numbers of at most this magnitude add in 16 bits.
 */
function wholeSampleBound(weights: usize, taps: i32): i32 {
  let l1: f64 = 0;
  for (let t = 0; t < taps; t++) {
    const k = <f64>load<f32>(at(weights, t));
    if (Math.trunc(k) != k) return 0;
    l1 += Math.abs(k);
  }
  if (l1 > <f64>I16_LIMIT) return 0;
  return l1 == 0 ? I16_LIMIT : <i32>Math.floor(<f64>I16_LIMIT / l1);
}

/**
 * Source row sy (border applied) as 16-bit integers into line16[rx … rx+w−1], its border columns
 * filled; false when a sample is not a whole number of magnitude at most bound (line16 then unused).
 * From src8's bytes instead when it is not 0. `ahead`: a row of w samples to read on the way (toWhole16).
 */
function toWhole16Line(src: usize, src8: usize, w: i32, h: i32, sy: i32, rx: i32, mode: i32, line16: usize, bound: i32, ahead: usize): bool {
  const row = borderIndex(sy, h, mode);
  if (row == OUTSIDE) {
    memory.fill(line16, 0, 2 * (w + 2 * rx));
    return true;
  }
  if (src8 != 0) bytesTo16(src8 + <usize>(row * w), line16 + ((<usize>rx) << 1), w);
  else if (!toWhole16(at(src, row * w), line16 + ((<usize>rx) << 1), w, bound, ahead)) return false;
  fillBorderOf<i16>(line16, w, rx, mode);
  return true;
}

/** 1.5·2²³ in four lanes: v + WHOLE_MAGIC rounds v to a whole number, which the low bits of the sum's pattern then hold (|v| < 2²²). */
const WHOLE_MAGIC_LANES: usize = memory.data<f32>([12582912, 12582912, 12582912, 12582912], 16);

/** Writes the n samples as 16-bit integers; true when every one is a whole number of magnitude at most bound (line16 else unused). Reads a word of every 32 bytes of `ahead` (n samples). */
function toWhole16(line: usize, line16: usize, n: i32, bound: i32, ahead: usize): bool {
  let seen = 0;
  const magic = v128.load(WHOLE_MAGIC_LANES);
  const high = wholeHigh(bound), low = i16x8.neg(high);
  let ok = i32x4.splat(-1);
  let p = 0;
  // Checked every 64 samples: a row of fractions (a smoothed image) stops at its first block.
  while (p + 8 <= n) {
    const end = min(n & ~7, p + 64);
    for (; p < end; p += 8) {
      seen |= load<i32>(at(ahead, p));
      ok = wholeBlock(line, line16, p, magic, high, low, ok);
    }
    // A failed check clears a 16-bit lane (the bound) or two (not whole).
    if (!i16x8.all_true(ok)) return false;
  }
  keepTouched(seen);
  for (; p < n; p++) {
    const v = load<f32>(at(line, p));
    if (!(Mathf.trunc(v) == v && Mathf.abs(v) <= <f32>bound)) return false;
    store<i16>(line16 + ((<usize>p) << 1), <i16>v);
  }
  return true;
}

/** Sixteen bytes at p as 16-bit integers at line16 (32 bytes). */
@inline
function widen16Bytes(p: usize, line16: usize): void {
  const b = v128.load(p);
  v128.store(line16, i16x8.extend_low_i8x16_u(b));
  v128.store(line16, i16x8.extend_high_i8x16_u(b), 16);
}

/** n bytes as 16-bit integers at line16 (true: every byte is a whole number within any bound of 255 or more). */
function bytesTo16(bytes: usize, line16: usize, n: i32): bool {
  let p = 0;
  for (; p + 16 <= n; p += 16) widen16Bytes(bytes + <usize>p, line16 + ((<usize>p) << 1));
  for (; p < n; p++) store<i16>(line16 + ((<usize>p) << 1), <i16>load<u8>(bytes + <usize>p));
  return true;
}

/**
 * One output row in 16-bit sums, eight pixels per v128: tap t adds weight table16[t] times the 16-bit
 * line from tapLines[t] (already offset to the tap's column); each sum converted to float32, then
 * scaled and offset as the float32 loops do. Pixels past the last eight add the same products one at
 * a time in 32-bit integers: the same exact sums. When `convert` is a source row (else 0), its samples
 * go to line16 as 16-bit integers alongside, 32 for each 32 pixels summed (as toWhole16, within
 * `bound`); returns how many it converted, or −1 when one of them was not a whole number within it.
 * With `bytes`, `convert` is a row of bytes, taken as they are.
 */
function whole16(tapLines: usize, table16: usize, ones: i32, signed: i32, taps: i32, w: i32, out: usize, scale: f32, offset: f32, convert: usize, line16: usize, bound: i32, ahead: usize, bytes: bool): i32 {
  if (bytes) return ahead != 0
    ? whole16Row(tapLines, table16, ones, signed, taps, w, out, scale, offset, convert, line16, bound, ahead, true, true)
    : whole16Row(tapLines, table16, ones, signed, taps, w, out, scale, offset, convert, line16, bound, 0, false, true);
  return ahead != 0
    ? whole16Row(tapLines, table16, ones, signed, taps, w, out, scale, offset, convert, line16, bound, ahead, true, false)
    : whole16Row(tapLines, table16, ones, signed, taps, w, out, scale, offset, convert, line16, bound, 0, false, false);
}

/** whole16's loops; `touch` is a constant in each of its two copies, so the copy without it keeps no trace of it. */
@inline
function whole16Row(tapLines: usize, table16: usize, ones: i32, signed: i32, taps: i32, w: i32, out: usize, scale: f32, offset: f32, convert: usize, line16: usize, bound: i32, ahead: usize, touch: bool, bytes: bool): i32 {
  let seen = 0;
  const vs = f32x4.splat(scale), vo = f32x4.splat(offset);
  const magic = v128.load(WHOLE_MAGIC_LANES);
  const high = wholeHigh(bound), low = i16x8.neg(high);
  let ok = i32x4.splat(-1);
  // x·1 + 0 is x for every whole number a sum can be (never −0).
  const unit = scale == 1 && offset == 0;
  let x = 0;
  for (; x + 32 <= w; x += 32) {
    const o = (<usize>x) << 1;
    let acc0 = i16x8.splat(0);
    let acc1 = i16x8.splat(0);
    let acc2 = i16x8.splat(0);
    let acc3 = i16x8.splat(0);
    let t = 0;
    // Two taps a step, which halves the loop's own instructions per tap. Two lines of weight 1 are
    // added together first: 16-bit sums wrap, so any order gives the same sum when it fits.
    for (; t + 2 <= ones; t += 2) {
      const p = load<usize>(at(tapLines, t)) + o;
      const p2 = load<usize>(at(tapLines, t + 1)) + o;
      acc0 = i16x8.add(acc0, i16x8.add(v128.load(p), v128.load(p2)));
      acc1 = i16x8.add(acc1, i16x8.add(v128.load(p + 16), v128.load(p2 + 16)));
      acc2 = i16x8.add(acc2, i16x8.add(v128.load(p + 32), v128.load(p2 + 32)));
      acc3 = i16x8.add(acc3, i16x8.add(v128.load(p + 48), v128.load(p2 + 48)));
    }
    for (; t < ones; t++) {
      const p = load<usize>(at(tapLines, t)) + o;
      acc0 = i16x8.add(acc0, v128.load(p));
      acc1 = i16x8.add(acc1, v128.load(p + 16));
      acc2 = i16x8.add(acc2, v128.load(p + 32));
      acc3 = i16x8.add(acc3, v128.load(p + 48));
    }
    for (; t < signed; t++) {
      const p = load<usize>(at(tapLines, t)) + o;
      acc0 = i16x8.sub(acc0, v128.load(p));
      acc1 = i16x8.sub(acc1, v128.load(p + 16));
      acc2 = i16x8.sub(acc2, v128.load(p + 32));
      acc3 = i16x8.sub(acc3, v128.load(p + 48));
    }
    for (; t + 2 <= taps; t += 2) {
      const k = v128.load(table16 + ((<usize>t) << 4));
      const p = load<usize>(at(tapLines, t)) + o;
      const k2 = v128.load(table16 + ((<usize>t) << 4) + 16);
      const p2 = load<usize>(at(tapLines, t + 1)) + o;
      acc0 = i16x8.add(acc0, i16x8.mul(k, v128.load(p)));
      acc1 = i16x8.add(acc1, i16x8.mul(k, v128.load(p + 16)));
      acc2 = i16x8.add(acc2, i16x8.mul(k, v128.load(p + 32)));
      acc3 = i16x8.add(acc3, i16x8.mul(k, v128.load(p + 48)));
      acc0 = i16x8.add(acc0, i16x8.mul(k2, v128.load(p2)));
      acc1 = i16x8.add(acc1, i16x8.mul(k2, v128.load(p2 + 16)));
      acc2 = i16x8.add(acc2, i16x8.mul(k2, v128.load(p2 + 32)));
      acc3 = i16x8.add(acc3, i16x8.mul(k2, v128.load(p2 + 48)));
    }
    for (; t < taps; t++) {
      const k = v128.load(table16 + ((<usize>t) << 4));
      const p = load<usize>(at(tapLines, t)) + o;
      // The vectors' offsets go into the address: as the loads' immediate offsets, Node 20's V8
      // returned zeros from these 16-bit products (seen here, caught by the exact-path test).
      acc0 = i16x8.add(acc0, i16x8.mul(k, v128.load(p)));
      acc1 = i16x8.add(acc1, i16x8.mul(k, v128.load(p + 16)));
      acc2 = i16x8.add(acc2, i16x8.mul(k, v128.load(p + 32)));
      acc3 = i16x8.add(acc3, i16x8.mul(k, v128.load(p + 48)));
    }
    if (touch) seen |= load<i32>(at(ahead, x)) | load<i32>(at(ahead, x + 16));
    if (bytes && convert != 0) {
      widen16Bytes(convert + <usize>x, line16 + ((<usize>x) << 1));
      widen16Bytes(convert + <usize>x + 16, line16 + ((<usize>x) << 1) + 32);
    } else if (convert != 0) {
      ok = wholeBlock(convert, line16, x, magic, high, low, ok);
      ok = wholeBlock(convert, line16, x + 8, magic, high, low, ok);
      ok = wholeBlock(convert, line16, x + 16, magic, high, low, ok);
      ok = wholeBlock(convert, line16, x + 24, magic, high, low, ok);
    }
    const q = out + ((<usize>x) << 2);
    storeSums(q, acc0, vs, vo, unit, 0);
    storeSums(q, acc1, vs, vo, unit, 32);
    storeSums(q, acc2, vs, vo, unit, 64);
    storeSums(q, acc3, vs, vo, unit, 96);
  }
  const converted = x;
  if (touch) keepTouched(seen);
  for (; x + 8 <= w; x += 8) {
    const o = (<usize>x) << 1;
    let acc = i16x8.splat(0);
    for (let t = 0; t < taps; t++) acc = i16x8.add(acc, i16x8.mul(v128.load(table16 + ((<usize>t) << 4)), v128.load(load<usize>(at(tapLines, t)) + o)));
    storeSums(out + ((<usize>x) << 2), acc, vs, vo, unit, 0);
  }
  for (; x < w; x++) {
    let acc: i32 = 0;
    for (let t = 0; t < taps; t++) acc += <i32>load<i16>(table16 + ((<usize>t) << 4)) * <i32>load<i16>(load<usize>(at(tapLines, t)) + ((<usize>x) << 1));
    store<f32>(at(out, x), <f32>acc * scale + offset);
  }
  return i16x8.all_true(ok) ? converted : -1;
}

/**
 * The bound as the largest 16-bit value a whole number may have in eight lanes: one below the lanes'
 * largest, so that a saturated value never passes.
 */
@inline
function wholeHigh(bound: i32): v128 {
  return i16x8.splat(<i16>min(bound, I16_LIMIT - 1));
}

/**
 * Samples x … x+7 of a source row as 16-bit integers at line16 (the same offsets); returns `ok` with a
 * 16-bit lane cleared for a sample outside low … high and two for one that is not a whole number.
 * The rounding constant comes from memory (WHOLE_MAGIC_LANES): V8 makes a constant vector again
 * wherever a loop uses it.
 */
@inline
function wholeBlock(line: usize, line16: usize, x: i32, magic: v128, high: v128, low: v128, ok: v128): v128 {
  const a = v128.load(at(line, x)), b = v128.load(at(line, x + 4));
  const ra = f32x4.add(a, magic), rb = f32x4.add(b, magic);
  // Whole: rounding changed nothing (NaN fails). The magic's bits taken from the sum's leave the whole
  // number (|v| < 2²²; larger values, infinities among them, saturate).
  const whole = v128.and(f32x4.eq(f32x4.sub(ra, magic), a), f32x4.eq(f32x4.sub(rb, magic), b));
  const values = i16x8.narrow_i32x4_s(i32x4.sub(ra, magic), i32x4.sub(rb, magic));
  v128.store(line16 + ((<usize>x) << 1), values);
  return v128.and(ok, v128.andnot(whole, v128.or(i16x8.gt_s(values, high), i16x8.lt_s(values, low))));
}

/** Eight 16-bit sums as float32, times scale plus offset (with `unit`, scale 1 and offset 0: as they are), at q + byteOffset. */
@inline
function storeSums(q: usize, acc: v128, vs: v128, vo: v128, unit: bool, byteOffset: usize): void {
  const low = f32x4.convert_i32x4_s(i32x4.extend_low_i16x8_s(acc));
  const high = f32x4.convert_i32x4_s(i32x4.extend_high_i16x8_s(acc));
  if (unit) {
    v128.store(q + byteOffset, low);
    v128.store(q + byteOffset + 16, high);
    return;
  }
  v128.store(q + byteOffset, f32x4.add(f32x4.mul(low, vs), vo));
  v128.store(q + byteOffset + 16, f32x4.add(f32x4.mul(high, vs), vo));
}

/** A 3×3 kernel in float32 straight from the source rows, no padded copies (see row3x3); `zeros` holds w zeros. */
function correlate3x3(src: usize, dst: usize, w: i32, h: i32, mode: i32, table: usize, scale: f32, offset: f32, zeros: usize): void {
  for (let y = 0; y < h; y++) {
    row3x3(rowAddress(src, y - 1, h, w, mode, zeros), at(src, y * w), rowAddress(src, y + 1, h, w, mode, zeros), at(dst, y * w), w, mode, table, scale, offset);
  }
}

/**
 * One output row of a 3×3 kernel in float32 from source rows a, b, c (the border applied to the rows):
 * the vectors of the inner columns (1 … w−2) read their neighbours in place; the first and last
 * columns, and any left over, take theirs through the border policy one pixel at a time, adding in
 * the vectors' order. The weights are held in registers.
 */
function row3x3(a: usize, b: usize, c: usize, out: usize, w: i32, mode: i32, table: usize, scale: f32, offset: f32): void {
  const k0 = v128.load(table), k1 = v128.load(table, 16), k2 = v128.load(table, 32);
  const k3 = v128.load(table, 48), k4 = v128.load(table, 64), k5 = v128.load(table, 80);
  const k6 = v128.load(table, 96), k7 = v128.load(table, 112), k8 = v128.load(table, 128);
  const vs = f32x4.splat(scale), vo = f32x4.splat(offset);
  let x = 1;
  for (; x + 5 <= w; x += 4) {
    // Columns x−1 … x+4 of each row: the loads start one sample to the left of the outputs.
    const o = (<usize>(x - 1)) << 2;
    let acc = f32x4.mul(k0, v128.load(a + o));
    acc = f32x4.add(acc, f32x4.mul(k1, v128.load(a + o, 4)));
    acc = f32x4.add(acc, f32x4.mul(k2, v128.load(a + o, 8)));
    acc = f32x4.add(acc, f32x4.mul(k3, v128.load(b + o)));
    acc = f32x4.add(acc, f32x4.mul(k4, v128.load(b + o, 4)));
    acc = f32x4.add(acc, f32x4.mul(k5, v128.load(b + o, 8)));
    acc = f32x4.add(acc, f32x4.mul(k6, v128.load(c + o)));
    acc = f32x4.add(acc, f32x4.mul(k7, v128.load(c + o, 4)));
    acc = f32x4.add(acc, f32x4.mul(k8, v128.load(c + o, 8)));
    v128.store(out + ((<usize>x) << 2), f32x4.add(f32x4.mul(acc, vs), vo));
  }
  pixel3x3(a, b, c, table, 0, w, mode, out, scale, offset);
  for (; x < w; x++) pixel3x3(a, b, c, table, x, w, mode, out, scale, offset);
}

/** Output x of a 3×3 kernel from rows a, b, c, its columns x−1 and x+1 through the border policy. */
function pixel3x3(a: usize, b: usize, c: usize, table: usize, x: i32, w: i32, mode: i32, out: usize, scale: f32, offset: f32): void {
  const l = borderIndex(x - 1, w, mode), r = borderIndex(x + 1, w, mode);
  let acc = load<f32>(table) * sample(a, l);
  acc += load<f32>(table, 16) * load<f32>(at(a, x));
  acc += load<f32>(table, 32) * sample(a, r);
  acc += load<f32>(table, 48) * sample(b, l);
  acc += load<f32>(table, 64) * load<f32>(at(b, x));
  acc += load<f32>(table, 80) * sample(b, r);
  acc += load<f32>(table, 96) * sample(c, l);
  acc += load<f32>(table, 112) * load<f32>(at(c, x));
  acc += load<f32>(table, 128) * sample(c, r);
  store<f32>(at(out, x), acc * scale + offset);
}

/** Sample i of a row, 0 for OUTSIDE. */
@inline
function sample(row: usize, i: i32): f32 {
  return i == OUTSIDE ? <f32>0 : load<f32>(at(row, i));
}

/**
 * One output row of any kernel in float32 from its source rows in place (rows[j], border applied to
 * the rows): the inner columns (rx … w−1−rx) as vectors, the others one pixel at a time with their
 * columns through the border policy.
 */
function general(rows_: usize, table: usize, rows: i32, cols: i32, w: i32, out: usize, scale: f32, offset: f32, mode: i32): void {
  const rx = cols >> 1;
  const vs = f32x4.splat(scale), vo = f32x4.splat(offset);
  let x = rx;
  // Eight vectors per pass: each weight is loaded once for 32 pixels, and each sum is a chain of
  // rows·cols dependent additions; eight chains side by side keep the adders busy, where four waited
  // on their chains (2.4 against 2.1–2.3 ns/px at 5×5) and two more so (2.7). The last pixels of a row
  // go four at a time. Each sum keeps its order of additions, so the same bits.
  for (; x + 32 + rx <= w; x += 32) {
    const o = (<usize>(x - rx)) << 2;
    const q = out + ((<usize>x) << 2);
    let acc0 = f32x4.splat(0);
    let acc1 = f32x4.splat(0);
    let acc2 = f32x4.splat(0);
    let acc3 = f32x4.splat(0);
    let acc4 = f32x4.splat(0);
    let acc5 = f32x4.splat(0);
    let acc6 = f32x4.splat(0);
    let acc7 = f32x4.splat(0);
    for (let j = 0; j < rows; j++) {
      const line = load<usize>(at(rows_, j)) + o;
      const kj = table + ((<usize>(j * cols)) << 4);
      for (let i = 0; i < cols; i++) {
        const k = v128.load(kj + ((<usize>i) << 4));
        const p = at(line, i);
        acc0 = f32x4.add(acc0, f32x4.mul(k, v128.load(p)));
        acc1 = f32x4.add(acc1, f32x4.mul(k, v128.load(p, 16)));
        acc2 = f32x4.add(acc2, f32x4.mul(k, v128.load(p, 32)));
        acc3 = f32x4.add(acc3, f32x4.mul(k, v128.load(p, 48)));
        acc4 = f32x4.add(acc4, f32x4.mul(k, v128.load(p, 64)));
        acc5 = f32x4.add(acc5, f32x4.mul(k, v128.load(p, 80)));
        acc6 = f32x4.add(acc6, f32x4.mul(k, v128.load(p, 96)));
        acc7 = f32x4.add(acc7, f32x4.mul(k, v128.load(p, 112)));
      }
    }
    v128.store(q, f32x4.add(f32x4.mul(acc0, vs), vo));
    v128.store(q, f32x4.add(f32x4.mul(acc1, vs), vo), 16);
    v128.store(q, f32x4.add(f32x4.mul(acc2, vs), vo), 32);
    v128.store(q, f32x4.add(f32x4.mul(acc3, vs), vo), 48);
    v128.store(q, f32x4.add(f32x4.mul(acc4, vs), vo), 64);
    v128.store(q, f32x4.add(f32x4.mul(acc5, vs), vo), 80);
    v128.store(q, f32x4.add(f32x4.mul(acc6, vs), vo), 96);
    v128.store(q, f32x4.add(f32x4.mul(acc7, vs), vo), 112);
  }
  for (; x + 4 + rx <= w; x += 4) {
    const o = (<usize>(x - rx)) << 2;
    let acc = f32x4.splat(0);
    for (let j = 0; j < rows; j++) {
      const line = load<usize>(at(rows_, j)) + o;
      const kj = table + ((<usize>(j * cols)) << 4);
      for (let i = 0; i < cols; i++) acc = f32x4.add(acc, f32x4.mul(v128.load(kj + ((<usize>i) << 4)), v128.load(at(line, i))));
    }
    v128.store(out + ((<usize>x) << 2), f32x4.add(f32x4.mul(acc, vs), vo));
  }
  for (let e = 0; e < min(rx, w); e++) scalarPixel(rows_, table, rows, cols, e, w, mode, out, scale, offset);
  for (; x < w; x++) scalarPixel(rows_, table, rows, cols, x, w, mode, out, scale, offset);
}

function scalarPixel(rows_: usize, table: usize, rows: i32, cols: i32, x: i32, w: i32, mode: i32, out: usize, scale: f32, offset: f32): void {
  const rx = cols >> 1;
  let acc: f32 = 0;
  for (let j = 0; j < rows; j++) {
    const line = load<usize>(at(rows_, j));
    for (let i = 0; i < cols; i++) acc += load<f32>(table + ((<usize>(j * cols + i)) << 4)) * sample(line, borderIndex(x + i - rx, w, mode));
  }
  store<f32>(at(out, x), acc * scale + offset);
}
