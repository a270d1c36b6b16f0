// Thresholds and Otsu's histogram. Masks are float32 0 and 1, written without branches:
// a compare gives all-ones lanes, ANDed with the bit pattern of 1.0.
import { align16, at, keepTouched, readAhead } from './border';
import { storeExtremes } from './extremes';

const ONE_BITS: i32 = 0x3f800000;
/** Pixels checked between early exits of the 8-bit test. */
const BLOCK: i32 = 64;

/** 1 when every value is a whole number in 0 … 255 (8-bit data), else 0; stops at the first other value. */
export function eightBitLevels(src: usize, n: i32): i32 {
  const zero = f32x4.splat(0), top = f32x4.splat(255);
  let p = 0;
  while (p + 4 <= n) {
    const end = min(n - 3, p + BLOCK);
    let ok = i32x4.splat(-1);
    for (; p < end; p += 4) {
      const v = v128.load(at(src, p));
      const whole = f32x4.eq(f32x4.trunc(v), v);
      ok = v128.and(ok, v128.and(whole, v128.and(f32x4.ge(v, zero), f32x4.le(v, top))));
    }
    if (!i32x4.all_true(ok)) return 0;
  }
  for (; p < n; p++) {
    const v = load<f32>(at(src, p));
    if (!(Mathf.trunc(v) == v && v >= 0 && v <= 255)) return 0;
  }
  return 1;
}

/** Smallest and largest value, NaN left out (Infinity and −Infinity when there is none), stored at out as two float32. */
export function valueRange(src: usize, n: i32, out: usize): void {
  let lo = f32x4.splat(Infinity);
  let hi = f32x4.splat(-Infinity);
  let p = 0;
  for (; p + 4 <= n; p += 4) {
    const v = v128.load(at(src, p));
    // pmin(lo, v) is v < lo ? v : lo, so a NaN never replaces the extreme found so far.
    lo = f32x4.pmin(lo, v);
    hi = f32x4.pmax(hi, v);
  }
  let l: f32 = Infinity;
  let g: f32 = -Infinity;
  for (; p < n; p++) {
    const v = load<f32>(at(src, p));
    if (v < l) l = v;
    if (v > g) g = v;
  }
  storeExtremes(out, lo, hi, l, g);
}

/** Partial histograms of single pixels, filled in turn: 256 bins each, 1028 bytes apart (not a divisor of 4096). */
const SINGLE_TABLES: i32 = 8;
const SINGLE_TABLE_BYTES: usize = 4 * 257;
/**
 * The table of pair counts: 256 × 256 int32. One table, not eight (2 MB, twice the second-level
 * cache): equal pairs one after another cost no more in one table, as each stored count is
 * forwarded to the next load (shared/vision/README.md, "Otsu").
 */
const PAIR_TABLE_BYTES: usize = 4 * 256 * 256;
/**
 * The table of quad counts, after the pair table: 65,536 int32. A group of sixteen whose bins are all
 * below 16 (most of a gradient magnitude's groups) is counted as four quads, four bins of four bits
 * each one 16-bit index, so that one increment counts four pixels (shared/vision/README.md, "Otsu").
 */
const QUAD_TABLE_BYTES: usize = 4 * 65536;

/** Scratch bytes `histogram` needs, counting in pairs (pairs = 1) or singly. */
export function histogramScratchBytes(pairs: i32): i32 {
  return tableBytes(pairs) + 32 + 16;
}

/** Bytes of the tables `histogram` counts in; a spare 32 bytes follow them. */
@inline
function tableBytes(pairs: i32): i32 {
  return pairs ? <i32>(PAIR_TABLE_BYTES + QUAD_TABLE_BYTES) : SINGLE_TABLES * <i32>SINGLE_TABLE_BYTES;
}

/**
 * Counts bin(v) = min(255, trunc((v − origin)·scale)), the plain engine's double-precision bin (from
 * float32 arithmetic where `countGroups` finds it the same; NaN goes to bin 0), into counts (256 int32).
 * When bins ≠ 0 each pixel's bin also goes there as a byte, for `thresholdBinsPacked` (Otsu's chosen
 * bin is at most 254, so a value at the maximum counted in bin 255 gives the same mask). With pairs ≠ 0
 * neighbours are counted in pairs (`countPairs`), else singly.
 */
export function histogram(src: usize, n: i32, origin: f64, scale: f64, scratch: usize, bins: usize, counts: usize, pairs: i32): void {
  const tables = align16(scratch);
  const spot = tables + <usize>tableBytes(pairs);
  const top = i32x4.splat(255);
  const p = pairs ? countPairs(src, n, origin, scale, tables, spot, bins, counts) : countSingles(src, n, origin, scale, tables, spot, bins, counts);
  for (let q = p; q < n; q++) {
    const scaled = f64x2.splat((<f64>load<f32>(at(src, q)) - origin) * scale);
    const bin = i32x4.extract_lane(i32x4.min_u(i32x4.trunc_sat_f64x2_s_zero(scaled), top), 0);
    count(counts, bin);
    if (bins != 0) store<u8>(bins + <usize>q, <u8>bin);
  }
}

/**
 * `histogram` for the pixels before the last multiple of 16; returns that multiple. Pixel p goes to
 * table p mod 8, so that equal neighbours do not wait on one counter.
 */
function countSingles(src: usize, n: i32, origin: f64, scale: f64, tables: usize, spot: usize, bins: usize, counts: usize): i32 {
  memory.fill(tables, 0, SINGLE_TABLES * SINGLE_TABLE_BYTES);
  const p = countGroups(src, n, origin, scale, tables, spot, bins, false);
  memory.fill(counts, 0, 4 * 256);
  for (let t: usize = 0; t < <usize>SINGLE_TABLES; t++) {
    const table = tables + t * SINGLE_TABLE_BYTES;
    for (let k: usize = 0; k < 1024; k += 16) v128.store(counts + k, i32x4.add(v128.load(counts + k), v128.load(table + k)));
  }
  return p;
}

/**
 * `histogram` for the pixels before the last multiple of 16, counted in pairs; returns that multiple.
 * Two neighbours' bins, as bytes, are one 16-bit index into a 256 × 256 table, so one increment counts
 * two pixels. The table's rows and columns then add up to the bins' counts.
 */
function countPairs(src: usize, n: i32, origin: f64, scale: f64, tables: usize, spot: usize, bins: usize, counts: usize): i32 {
  memory.fill(tables, 0, PAIR_TABLE_BYTES + QUAD_TABLE_BYTES);
  const p = countGroups(src, n, origin, scale, tables, spot, bins, true);
  addPairTable(tables, counts);
  addQuadTable(tables + PAIR_TABLE_BYTES, counts);
  return p;
}

/**
 * The groups of sixteen values counted (in pairs, or singly), their bins kept when bins ≠ 0. The bins
 * come from t = (v − origin)·scale in float32 where that gives the double-precision bins (see
 * `countGroupsOn`): from origin 0 with a power-of-two scale (8-bit levels among them) t is exact;
 * otherwise it is checked; where origin or scale is no float32 number the product could use, every
 * group goes through double precision.
 */
function countGroups(src: usize, n: i32, origin: f64, scale: f64, tables: usize, spot: usize, bins: usize, pairs: bool): i32 {
  const o = <f32>origin, s = <f32>scale;
  const usable = isFinite(s) && s > 0 && <f64>o == origin;
  const exact = usable && origin == 0 && <f64>s == scale && (reinterpret<u32>(s) & 0x7fffff) == 0;
  if (pairs) {
    return exact ? countGroupsOn(src, n, origin, scale, o, s, usable, tables, spot, bins, true, true)
      : countGroupsOn(src, n, origin, scale, o, s, usable, tables, spot, bins, false, true);
  }
  return exact ? countGroupsOn(src, n, origin, scale, o, s, usable, tables, spot, bins, true, false)
    : countGroupsOn(src, n, origin, scale, o, s, usable, tables, spot, bins, false, false);
}

/** t = (v − origin)·scale is counted in units of 2⁻¹⁴: the bin is the units ÷ 2¹⁴ (see countGroupsOn). */
const UNIT_SHIFT: i32 = 14;
/** 2⁹: t + 2⁹ lies in [2⁹, 2¹⁰), where a float32's last bit is worth 2⁻¹⁴. */
const UNIT_BASE: f32 = 512;
/**
 * Values ahead of the group whose line the loop reads (8 KB, below it: the loop runs backwards), so
 * that it is on its way from memory: WebAssembly has no prefetch instruction, and on a machine whose
 * processor did not fetch this stream ahead across 4 KB pages the groups' first loads waited on
 * memory (shared/vision/README.md, "Otsu").
 */
const READ_AHEAD: i32 = 2048;
/** Below this t the bin is 0 however t was rounded; a NaN t (bin 0 in double precision too) becomes it. */
const SURE_ZERO: f32 = 1.0 / 1024;
/** Above every t of a value within the range (at most 256 and a rounding): t + UNIT_BASE stays below 2¹⁰. */
const T_CAP: f32 = 300;

/** Four values' t in units of 2⁻¹⁴ (rounded to the nearest unit), or with `exact` their truncation in units. */
@inline
function units4(src: usize, p: i32, fromZero: bool, o: v128, s: v128, sureZero: v128, cap: v128, base: v128, baseBits: v128, exact: bool): v128 {
  const v = v128.load(at(src, p));
  let t = f32x4.mul(fromZero ? v : f32x4.sub(v, o), s);
  t = f32x4.pmin(f32x4.pmax(sureZero, t), cap);
  if (exact) t = f32x4.floor(t);
  return i32x4.sub(f32x4.add(t, base), baseBits);
}

/**
 * Each group's bins from float32 arithmetic, four values per v128 where double precision takes two.
 * The float32 t differs from the double-precision t by less than 771·2⁻²⁴ (t ≤ 257; three roundings
 * of at most 2⁻²⁴ relative, against 2⁻⁵² for double precision), and t + 2⁹ rounds it to units of 2⁻¹⁴
 * within half a unit more: 1.26 units in all. Where a value's units lie within two of a whole number,
 * its truncation could differ from the double-precision one, and the group goes through `bins4`
 * (about 0.03 % of values of random fraction; every group when not `usable`). With `exact` (origin 0,
 * a power-of-two scale: t is the exact product), t is truncated before it is counted in units.
 */
@inline
function countGroupsOn(src: usize, n: i32, origin: f64, scale: f64, o: f32, s: f32, usable: bool, tables: usize, spot: usize, bins: usize, exact: bool, pairs: bool): i32 {
  const vo = f64x2.splat(origin), vs = f64x2.splat(scale);
  const top = i32x4.splat(255);
  // From origin 0 (a gradient magnitude's usual minimum) v − 0 is v for every float32, so the
  // subtraction goes (about 5 % of the pass).
  const fromZero = origin == 0;
  const o32 = f32x4.splat(o), s32 = f32x4.splat(s);
  const sureZero = f32x4.splat(SURE_ZERO), cap = f32x4.splat(T_CAP), base = f32x4.splat(UNIT_BASE), baseBits = i32x4.splat(reinterpret<i32>(UNIT_BASE));
  // A unit u is within two of a whole number when (u + 2) mod 2¹⁴ < 5; a limit of 0 sends no group to
  // double precision, 2¹⁵ − 1 every group.
  const fraction = i16x8.splat(<i16>0x3fff), two = i16x8.splat(2);
  const limit = i16x8.splat(!usable ? <i16>0x7fff : exact ? <i16>0 : <i16>5);
  // Bins of 16 and above: their group is counted in pairs, the others in quads.
  const high = i8x16.splat(<i8>0xf0);
  // From the last group back to the first: the image was most often written just before from its
  // first row to its last (a gradient), so its last rows are the likeliest to be still in the caches.
  const end = (n >> 4) << 4;
  let seen = 0;
  const ahead = readAhead ? READ_AHEAD : 0;
  for (let p = end - 16; p >= 0; p -= 16) {
    if (p >= ahead) seen |= load<i32>(at(src, p - ahead));
    const ua = units4(src, p, fromZero, o32, s32, sureZero, cap, base, baseBits, exact);
    const ub = units4(src, p + 4, fromZero, o32, s32, sureZero, cap, base, baseBits, exact);
    const uc = units4(src, p + 8, fromZero, o32, s32, sureZero, cap, base, baseBits, exact);
    const ud = units4(src, p + 12, fromZero, o32, s32, sureZero, cap, base, baseBits, exact);
    // The units' low 16 bits, eight to a v128.
    const lowAB = i8x16.shuffle(ua, ub, 0, 1, 4, 5, 8, 9, 12, 13, 16, 17, 20, 21, 24, 25, 28, 29);
    const lowCD = i8x16.shuffle(uc, ud, 0, 1, 4, 5, 8, 9, 12, 13, 16, 17, 20, 21, 24, 25, 28, 29);
    const near = v128.or(
      i16x8.lt_s(v128.and(i16x8.add(lowAB, two), fraction), limit),
      i16x8.lt_s(v128.and(i16x8.add(lowCD, two), fraction), limit),
    );
    let bytes: v128;
    if (v128.any_true(near)) {
      const a = bins4(src, p, fromZero, vo, vs, top);
      const b = bins4(src, p + 4, fromZero, vo, vs, top);
      const c = bins4(src, p + 8, fromZero, vo, vs, top);
      const d = bins4(src, p + 12, fromZero, vo, vs, top);
      bytes = i8x16.narrow_i16x8_u(i16x8.narrow_i32x4_u(a, b), i16x8.narrow_i32x4_u(c, d));
    } else {
      // Bin 256 (t = 256 at the maximum) narrows to 255.
      bytes = i8x16.narrow_i16x8_u(
        i16x8.narrow_i32x4_u(i32x4.shr_u(ua, UNIT_SHIFT), i32x4.shr_u(ub, UNIT_SHIFT)),
        i16x8.narrow_i32x4_u(i32x4.shr_u(uc, UNIT_SHIFT), i32x4.shr_u(ud, UNIT_SHIFT)),
      );
    }
    // The bytes go to the bins (or to a spare spot) and come back as scalars: a load each, where
    // taking a lane out of the vector took a move and a zero extension.
    const stored = bins != 0 ? bins + <usize>p : spot;
    v128.store(stored, bytes);
    if (pairs && !v128.any_true(v128.and(bytes, high))) countQuads(tables + PAIR_TABLE_BYTES, spot + 16, bytes);
    else countStored(tables, stored, pairs);
  }
  keepTouched(seen);
  return end;
}

/**
 * Sixteen bins below 16 counted as four quads: quad j, bins b(4j) … b(4j+3), as the 16-bit number
 * b(4j) + 16·b(4j+1) + 256·b(4j+2) + 4096·b(4j+3), its four nibbles made two bytes at a time in the
 * 16-bit lanes (byte b(2m) + 16·b(2m+1)), stored at `spot` and read back as scalars.
 */
@inline
function countQuads(quads: usize, spot: usize, bytes: v128): void {
  const nibblePairs = v128.and(v128.or(bytes, i16x8.shr_u(bytes, 4)), i16x8.splat(0xff));
  v128.store(spot, i8x16.narrow_i16x8_u(nibblePairs, nibblePairs));
  count(quads, <i32>load<u16>(spot));
  count(quads, <i32>load<u16>(spot, 2));
  count(quads, <i32>load<u16>(spot, 4));
  count(quads, <i32>load<u16>(spot, 6));
}

/**
 * counts[i] += each quad's count once for each of its four bins that is i. Row `high` of 256 quads
 * shares its last two nibbles (high mod 16, high ÷ 16); the first two (nibble pair q: q mod 16, q ÷ 16)
 * are summed over the rows first.
 */
function addQuadTable(quads: usize, counts: usize): void {
  const pairs = QUAD_SUMS;
  memory.fill(pairs, 0, 4 * 256);
  for (let high = 0; high < 256; high++) {
    const total = addRow(quads + ((<usize>high) << 10), pairs);
    addCount(counts, high & 15, total);
    addCount(counts, high >> 4, total);
  }
  for (let q = 0; q < 256; q++) {
    const c = load<i32>(at(pairs, q));
    addCount(counts, q & 15, c);
    addCount(counts, q >> 4, c);
  }
}

/** Where `addQuadTable` sums the quads' first two nibbles. */
const QUAD_SUMS: usize = memory.data(4 * 256, 16);

@inline
function addCount(counts: usize, bin: i32, c: i32): void {
  const address = at(counts, bin);
  store<i32>(address, load<i32>(address) + c);
}

/** counts[i] = pairs with first bin i plus pairs with second bin i. */
function addPairTable(table: usize, counts: usize): void {
  memory.fill(counts, 0, 4 * 256);
  for (let second = 0; second < 256; second++) addCount(counts, second, addRow(table + ((<usize>second) << 10), counts));
}

/** Adds a table row of 256 int32 into `into` (256 int32) element by element; returns the row's sum. */
function addRow(row: usize, into: usize): i32 {
  let sum = i32x4.splat(0);
  for (let i: usize = 0; i < 1024; i += 16) {
    const v = v128.load(row + i);
    sum = i32x4.add(sum, v);
    v128.store(into + i, i32x4.add(v128.load(into + i), v));
  }
  return i32x4.extract_lane(sum, 0) + i32x4.extract_lane(sum, 1) + i32x4.extract_lane(sum, 2) + i32x4.extract_lane(sum, 3);
}

/**
 * The packed mask of "bin above k" from the bytes `histogram` wrote for a w×h image (swapped with
 * invert): 32 pixels from two 16-byte compares. Bit i of word j of row y is pixel (32j + i, y); bits
 * past the last column are 0. The bytes need 32 spare bytes after the last.
 */
export function thresholdBinsPacked(bins: usize, w: i32, h: i32, k: i32, invert: i32, words: usize): void {
  const vk = i8x16.splat(<i8>k);
  const wordsPerRow = (w + 31) >>> 5;
  const whole = invert ? -1 : 0;
  for (let y = 0; y < h; y++) {
    const row = bins + <usize>(y * w);
    for (let j = 0; j < wordsPerRow; j++) {
      const x0 = j << 5;
      const count = min(32, w - x0);
      const low = i8x16.bitmask(i8x16.gt_u(v128.load(row + <usize>x0), vk));
      const high = i8x16.bitmask(i8x16.gt_u(v128.load(row + <usize>x0, 16), vk));
      // Bits past the row's end read the next row's bytes: cleared.
      const valid = count == 32 ? -1 : (1 << count) - 1;
      store<i32>(at(words, y * wordsPerRow + j), ((low | (high << 16)) ^ whole) & valid);
    }
  }
}

@inline
function bins4(src: usize, p: i32, fromZero: bool, vo: v128, vs: v128, top: v128): v128 {
  const v = v128.load(at(src, p));
  return fromZero ? binsFromZero(v, vs, top) : binsOf(v, vo, vs, top);
}

/** binsOf with origin 0. */
@inline
function binsFromZero(v: v128, scale: v128, top: v128): v128 {
  const low = i32x4.trunc_sat_f64x2_s_zero(f64x2.mul(f64x2.promote_low_f32x4(v), scale));
  const high = i32x4.trunc_sat_f64x2_s_zero(f64x2.mul(f64x2.promote_low_f32x4(v128.shuffle<f32>(v, v, 2, 3, 0, 1)), scale));
  return i32x4.min_u(v128.shuffle<i32>(low, high, 0, 1, 4, 5), top);
}

/** The four values' bins, at most 255 (a value at the maximum may land on 256 by rounding). */
@inline
function binsOf(v: v128, origin: v128, scale: v128, top: v128): v128 {
  const low = i32x4.trunc_sat_f64x2_s_zero(f64x2.mul(f64x2.sub(f64x2.promote_low_f32x4(v), origin), scale));
  const high = i32x4.trunc_sat_f64x2_s_zero(f64x2.mul(f64x2.sub(f64x2.promote_low_f32x4(v128.shuffle<f32>(v, v, 2, 3, 0, 1)), origin), scale));
  return i32x4.min_u(v128.shuffle<i32>(low, high, 0, 1, 4, 5), top);
}

/**
 * The sixteen bins stored at `at` counted: in pairs, pair k as the 16-bit number b(2k) + 256·b(2k+1)
 * in the one pair table; singly, byte k in single table k mod 8.
 */
@inline
function countStored(tables: usize, at: usize, pairs: bool): void {
  if (pairs) {
    count(tables, <i32>load<u16>(at));
    count(tables, <i32>load<u16>(at, 2));
    count(tables, <i32>load<u16>(at, 4));
    count(tables, <i32>load<u16>(at, 6));
    count(tables, <i32>load<u16>(at, 8));
    count(tables, <i32>load<u16>(at, 10));
    count(tables, <i32>load<u16>(at, 12));
    count(tables, <i32>load<u16>(at, 14));
  } else {
    countBytes(tables, at);
    countBytes(tables, at + 8);
  }
}

/** The eight bytes at `bytes` counted, byte k in single table k. */
@inline
function countBytes(tables: usize, bytes: usize): void {
  count(tables, <i32>load<u8>(bytes));
  count(tables + SINGLE_TABLE_BYTES, <i32>load<u8>(bytes, 1));
  count(tables + 2 * SINGLE_TABLE_BYTES, <i32>load<u8>(bytes, 2));
  count(tables + 3 * SINGLE_TABLE_BYTES, <i32>load<u8>(bytes, 3));
  count(tables + 4 * SINGLE_TABLE_BYTES, <i32>load<u8>(bytes, 4));
  count(tables + 5 * SINGLE_TABLE_BYTES, <i32>load<u8>(bytes, 5));
  count(tables + 6 * SINGLE_TABLE_BYTES, <i32>load<u8>(bytes, 6));
  count(tables + 7 * SINGLE_TABLE_BYTES, <i32>load<u8>(bytes, 7));
}

@inline
function count(table: usize, bin: i32): void {
  addCount(table, bin, 1);
}

/** dst = 1 where v ≥ cut, else 0 (swapped when invert is 1); NaN is below every cut. */
export function thresholdAt(src: usize, dst: usize, n: i32, cut: f32, invert: i32): void {
  const vc = f32x4.splat(cut);
  const one = i32x4.splat(ONE_BITS);
  const flip = i32x4.splat(invert ? -1 : 0);
  let p = 0;
  for (; p + 4 <= n; p += 4) {
    const above = v128.xor(f32x4.ge(v128.load(at(src, p)), vc), flip);
    v128.store(at(dst, p), v128.and(above, one));
  }
  for (; p < n; p++) {
    const above = (load<f32>(at(src, p)) >= cut ? 1 : 0) ^ invert;
    store<f32>(at(dst, p), <f32>above);
  }
}

/**
 * thresholdAt on a w×h image that also writes the mask in packed bits: bit i of word k of row y is
 * pixel (32k + i, y); bits past the last column are 0.
 */
export function thresholdAtPacked(src: usize, dst: usize, w: i32, h: i32, cut: f32, invert: i32, words: usize): void {
  const vc = f32x4.splat(cut);
  const one = i32x4.splat(ONE_BITS);
  const flip = i32x4.splat(invert ? -1 : 0);
  const wordsPerRow = (w + 31) >>> 5;
  for (let y = 0; y < h; y++) {
    const row = y * w;
    for (let k = 0; k < wordsPerRow; k++) {
      const x0 = row + (k << 5);
      const count = min(32, w - (k << 5));
      let word = 0;
      if (count == 32) {
        for (let g = 0; g < 8; g++) {
          const p = x0 + (g << 2);
          const above = v128.xor(f32x4.ge(v128.load(at(src, p)), vc), flip);
          v128.store(at(dst, p), v128.and(above, one));
          word |= i32x4.bitmask(above) << (g << 2);
        }
      } else {
        for (let i = 0; i < count; i++) {
          const bit = (load<f32>(at(src, x0 + i)) >= cut ? 1 : 0) ^ invert;
          store<f32>(at(dst, x0 + i), <f32>bit);
          word |= bit << i;
        }
      }
      store<i32>(at(words, y * wordsPerRow + k), word);
    }
  }
}
