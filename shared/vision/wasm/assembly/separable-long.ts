// Separable correlation with a symmetric column of radius 2 or more (Gaussians from σ ≈ 0.4), rows
// first: each source row is filtered along the row once, into a ring of rows a constant stride apart,
// and the column pass reads that ring. With the stride a constant, every sample of a column sweep is
// a constant offset from one of two addresses, where rows of the image itself (stride w) each took an
// address of its own and an address computation per load.
import { align16, at, borderIndex, fillLineBorder, keepTouched, OUTSIDE } from './border';
import { horizontalAny, isSymmetric, SWEEP_WEIGHTS } from './separable';

/** Widest image the ring takes (a 12 MP phone photo is 4032 wide); wider ones go the columns-first way. */
export const LONG_MAX_WIDTH: i32 = 4096;
/**
 * Bytes from one ring row to the next: room for LONG_MAX_WIDTH samples and one cache line more, so
 * that the rows a sweep reads fall in different sets of the caches (a multiple of 4 KB would put
 * them all in one).
 */
const STRIDE: usize = 4 * <usize>LONG_MAX_WIDTH + 64;
/**
 * Most pairs of taps one column sweep takes. σ = 3 (radius 9) at 5 MP, one CPU: three sweeps of three
 * pairs 0.98–1.03 ns/px a pass, against 1.04–1.07 for sweeps of five and four (two builds in one process).
 */
const RING_SWEEP_PAIRS: i32 = 3;
/** Columns a strip takes through all its sweeps before the next, so that the partial sums stay in the first-level cache. */
const STRIP: i32 = 512;

/** Whether `separableLongRows` takes a column of colLen taps on a w-wide image (radius 1 was no faster there). */
export function takesLong(w: i32, colLen: i32, colSymmetric: bool): bool {
  return colSymmetric && colLen >= 5 && w <= LONG_MAX_WIDTH;
}

/** Scratch bytes of `separableLongRows`: its state, a padded line, a spare output row and the ring (each row twice). */
export function separableLongScratchBytes(w: i32, colLen: i32, rowLen: i32): i32 {
  return 16 + 4 * (w + rowLen + 4) + 4 * w + 2 * (colLen + 1) * <i32>STRIDE + 192;
}

/**
 * Output row y into out and row y + 1 (when there is one) into next, as `separableRows`, for a symmetric
 * column of radius r ≥ 2 and w ≤ LONG_MAX_WIDTH; returns the rows written. Calls go down the image two
 * rows at a time from y = 0. Source row k, filtered along the row, sits in ring slots (k + r) mod R and
 * that + R (R = 2r + 2 rows, those two output rows share), so that the rows of any two output rows are
 * consecutive slots. With `ring` > 0, src holds source row k in slot k mod ring (as `separableRows`).
 */
export function separableLongRows(src: usize, ring: i32, w: i32, h: i32, y: i32, colK: usize, colLen: i32, rowK: usize, rowLen: i32, mode: i32, offset: f32, scratch: usize, out: usize, next: usize): i32 {
  const r = colLen >> 1;
  const rx = rowLen >> 1;
  const rowsInRing = colLen + 1;
  const state = align16(scratch);
  const line = state + 16;
  const spare = align16(at(line, w + rowLen + 4));
  const filteredRows = (spare + <usize>(4 * w) + 63) & ~(<usize>63);
  // The next source row to filter, kept in the scratch from one call to the next.
  let filtered = y == 0 ? -r : load<i32>(state);
  for (; filtered <= y + 1 + r; filtered++) {
    const slot = filteredRows + <usize>((filtered + r) % rowsInRing) * STRIDE;
    filterRow(src, ring, w, h, filtered, rowK, rowLen, rx, mode, line, slot, slot + <usize>rowsInRing * STRIDE);
  }
  store<i32>(state, filtered);
  columnPair(filteredRows + <usize>(y % rowsInRing) * STRIDE, colK, r, w, out, y + 1 < h ? next : spare, offset);
  return y + 1 < h ? 2 : 1;
}

/** Most pairs of taps a row filtered in one sweep may have (a copy of the sweep for each radius from 1). */
const ROW_SWEEP_PAIRS: i32 = 9;
/** The row's splatted weights, centre first, on their way into registers (see SWEEP_WEIGHTS). */
const ROW_WEIGHTS: usize = memory.data(16 * (ROW_SWEEP_PAIRS + 1), 16);

/**
 * Source row k (border applied; of a ring of `ring` rows when ring > 0) filtered along the row into
 * `out` and `twin`; an outside row is zeros. A symmetric row of radius 1 … ROW_SWEEP_PAIRS is read in
 * place but for its ends, which go into `line` with the border around them; other rows go into `line` whole.
 */
function filterRow(src: usize, ring: i32, w: i32, h: i32, k: i32, rowK: usize, rowLen: i32, rx: i32, mode: i32, line: usize, out: usize, twin: usize): void {
  const sy = borderIndex(k, h, mode);
  if (sy == OUTSIDE) {
    memory.fill(out, 0, 4 * w);
    memory.fill(twin, 0, 4 * w);
    return;
  }
  const row = at(src, (ring > 0 ? sy % ring : sy) * w);
  if (rx < 1 || rx > ROW_SWEEP_PAIRS || !isSymmetric(rowK, rowLen)) {
    memory.copy(at(line, rx), row, 4 * w);
    fillLineBorder(line, w, rx, mode);
    horizontalAny(line, rowK, rowLen, w, out, 0);
    memory.copy(twin, out, 4 * w);
    return;
  }
  const edge = min(w, 2 * rx + 8);
  memory.copy(at(line, rx), row, 4 * edge);
  memory.copy(at(line, rx + w - edge), at(row, w - edge), 4 * edge);
  fillLineBorder(line, w, rx, mode);
  for (let t = 0; t <= rx; t++) v128.store(ROW_WEIGHTS + <usize>(16 * t), f32x4.splat(load<f32>(at(rowK, rx + t))));
  // Vectors whose samples are all inside the row read it in place (from xa to xb); the others read `line`.
  const whole = w & ~3;
  const xa = min(whole, (rx + 3) & ~3);
  const xb = max(xa, min(whole, (w - rx) & ~3));
  // The middle reads a word of each line of a row three below on the way, so that it is in the
  // cache when its turn comes (WebAssembly has no prefetch; see touchAhead).
  const ahead = ring == 0 && sy + 3 < h ? at(row, 3 * w) : row;
  rowSweep(rx, line, line, 0, xa, out, twin);
  rowSweep(rx, row - ((<usize>rx) << 2), ahead, xa, xb, out, twin);
  rowSweep(rx, line, line, xb, whole, out, twin);
  for (let x = whole; x < w; x++) {
    const p = at(line, x + rx);
    let acc = load<f32>(at(rowK, rx)) * load<f32>(p);
    for (let i = 1; i <= rx; i++) acc += load<f32>(at(rowK, rx + i)) * (load<f32>(p - ((<usize>i) << 2)) + load<f32>(p + ((<usize>i) << 2)));
    store<f32>(at(out, x), acc);
    store<f32>(at(twin, x), acc);
  }
}

/** `rowSweepOf` with its radius a constant in each copy. */
function rowSweep(rx: i32, base: usize, ahead: usize, x0: i32, x1: i32, out: usize, twin: usize): void {
  if (rx == 1) rowSweep1(base, ahead, x0, x1, out, twin);
  else if (rx == 2) rowSweep2(base, ahead, x0, x1, out, twin);
  else if (rx == 3) rowSweep3(base, ahead, x0, x1, out, twin);
  else if (rx == 4) rowSweep4(base, ahead, x0, x1, out, twin);
  else if (rx == 5) rowSweep5(base, ahead, x0, x1, out, twin);
  else if (rx == 6) rowSweep6(base, ahead, x0, x1, out, twin);
  else if (rx == 7) rowSweep7(base, ahead, x0, x1, out, twin);
  else if (rx == 8) rowSweep8(base, ahead, x0, x1, out, twin);
  else rowSweep9(base, ahead, x0, x1, out, twin);
}

// One function per radius: the optimiser folds each copy's sample offsets to constants. From radius 5
// two vectors a step take their samples once each, unfolded (unfoldedStep).
function rowSweep1(base: usize, ahead: usize, x0: i32, x1: i32, out: usize, twin: usize): void {
  rowSweepOf(1, false, base, ahead, x0, x1, out, twin);
}
function rowSweep2(base: usize, ahead: usize, x0: i32, x1: i32, out: usize, twin: usize): void {
  rowSweepOf(2, false, base, ahead, x0, x1, out, twin);
}
function rowSweep3(base: usize, ahead: usize, x0: i32, x1: i32, out: usize, twin: usize): void {
  rowSweepOf(3, false, base, ahead, x0, x1, out, twin);
}
function rowSweep4(base: usize, ahead: usize, x0: i32, x1: i32, out: usize, twin: usize): void {
  rowSweepOf(4, false, base, ahead, x0, x1, out, twin);
}
function rowSweep5(base: usize, ahead: usize, x0: i32, x1: i32, out: usize, twin: usize): void {
  rowSweepOf(5, true, base, ahead, x0, x1, out, twin);
}
function rowSweep6(base: usize, ahead: usize, x0: i32, x1: i32, out: usize, twin: usize): void {
  rowSweepOf(6, true, base, ahead, x0, x1, out, twin);
}
function rowSweep7(base: usize, ahead: usize, x0: i32, x1: i32, out: usize, twin: usize): void {
  rowSweepOf(7, true, base, ahead, x0, x1, out, twin);
}
function rowSweep8(base: usize, ahead: usize, x0: i32, x1: i32, out: usize, twin: usize): void {
  rowSweepOf(8, true, base, ahead, x0, x1, out, twin);
}
function rowSweep9(base: usize, ahead: usize, x0: i32, x1: i32, out: usize, twin: usize): void {
  rowSweepOf(9, true, base, ahead, x0, x1, out, twin);
}

/** Sample t (a constant, 0 … 22) of the vector at p: the load's offset is 4t. */
@inline
function sampleAt(p: usize, t: i32): v128 {
  if (t == 0) return v128.load(p);
  if (t == 1) return v128.load(p, 4);
  if (t == 2) return v128.load(p, 8);
  if (t == 3) return v128.load(p, 12);
  if (t == 4) return v128.load(p, 16);
  if (t == 5) return v128.load(p, 20);
  if (t == 6) return v128.load(p, 24);
  if (t == 7) return v128.load(p, 28);
  if (t == 8) return v128.load(p, 32);
  if (t == 9) return v128.load(p, 36);
  if (t == 10) return v128.load(p, 40);
  if (t == 11) return v128.load(p, 44);
  if (t == 12) return v128.load(p, 48);
  if (t == 13) return v128.load(p, 52);
  if (t == 14) return v128.load(p, 56);
  if (t == 15) return v128.load(p, 60);
  if (t == 16) return v128.load(p, 64);
  if (t == 17) return v128.load(p, 68);
  if (t == 18) return v128.load(p, 72);
  if (t == 19) return v128.load(p, 76);
  if (t == 20) return v128.load(p, 80);
  if (t == 21) return v128.load(p, 84);
  return v128.load(p, 88);
}

/** Pair j's weight (a constant, 0 for the centre) from ROW_WEIGHTS. */
@inline
function rowWeight(j: i32): v128 {
  return v128.load(ROW_WEIGHTS + <usize>(16 * j));
}

/**
 * out[x] = twin[x] = k_c·s_(r) + Σ_(j=1…r) k_j·(s_(r−j) + s_(r+j)) for the vectors x0 … x1, s_t being
 * the samples at base + 4·(x + t): all from one address, the pairs added outwards in one sweep; with
 * `unfolded`, two vectors a step take their samples as `unfoldedStep` does.
 */
@inline
function rowSweepOf(r: i32, unfolded: bool, base: usize, ahead: usize, x0: i32, x1: i32, out: usize, twin: usize): void {
  const kc = rowWeight(0), k1 = rowWeight(1), k2 = r >= 2 ? rowWeight(2) : kc, k3 = r >= 3 ? rowWeight(3) : kc, k4 = r >= 4 ? rowWeight(4) : kc;
  const k5 = r >= 5 ? rowWeight(5) : kc, k6 = r >= 6 ? rowWeight(6) : kc, k7 = r >= 7 ? rowWeight(7) : kc;
  const k8 = r >= 8 ? rowWeight(8) : kc, k9 = r >= 9 ? rowWeight(9) : kc;
  let seen = 0;
  let x = x0;
  // Two vectors a step (x and x + 4), each weight taken for both.
  for (; x + 8 <= x1; x += 8) {
    const o = (<usize>x) << 2;
    const p = base + o;
    seen |= load<i32>(ahead + o);
    if (unfolded) {
      unfoldedStep(r, p, out + o, twin + o, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9);
      continue;
    }
    let a = f32x4.mul(kc, sampleAt(p, r)), b = f32x4.mul(kc, sampleAt(p, r + 4));
    {
      a = f32x4.add(a, f32x4.mul(k1, f32x4.add(sampleAt(p, r - 1), sampleAt(p, r + 1))));
      b = f32x4.add(b, f32x4.mul(k1, f32x4.add(sampleAt(p, r + 4 - 1), sampleAt(p, r + 4 + 1))));
    }
    if (r >= 2) {
      a = f32x4.add(a, f32x4.mul(k2, f32x4.add(sampleAt(p, r - 2), sampleAt(p, r + 2))));
      b = f32x4.add(b, f32x4.mul(k2, f32x4.add(sampleAt(p, r + 4 - 2), sampleAt(p, r + 4 + 2))));
    }
    if (r >= 3) {
      a = f32x4.add(a, f32x4.mul(k3, f32x4.add(sampleAt(p, r - 3), sampleAt(p, r + 3))));
      b = f32x4.add(b, f32x4.mul(k3, f32x4.add(sampleAt(p, r + 4 - 3), sampleAt(p, r + 4 + 3))));
    }
    if (r >= 4) {
      a = f32x4.add(a, f32x4.mul(k4, f32x4.add(sampleAt(p, r - 4), sampleAt(p, r + 4))));
      b = f32x4.add(b, f32x4.mul(k4, f32x4.add(sampleAt(p, r + 4 - 4), sampleAt(p, r + 4 + 4))));
    }
    if (r >= 5) {
      a = f32x4.add(a, f32x4.mul(k5, f32x4.add(sampleAt(p, r - 5), sampleAt(p, r + 5))));
      b = f32x4.add(b, f32x4.mul(k5, f32x4.add(sampleAt(p, r + 4 - 5), sampleAt(p, r + 4 + 5))));
    }
    if (r >= 6) {
      a = f32x4.add(a, f32x4.mul(k6, f32x4.add(sampleAt(p, r - 6), sampleAt(p, r + 6))));
      b = f32x4.add(b, f32x4.mul(k6, f32x4.add(sampleAt(p, r + 4 - 6), sampleAt(p, r + 4 + 6))));
    }
    if (r >= 7) {
      a = f32x4.add(a, f32x4.mul(k7, f32x4.add(sampleAt(p, r - 7), sampleAt(p, r + 7))));
      b = f32x4.add(b, f32x4.mul(k7, f32x4.add(sampleAt(p, r + 4 - 7), sampleAt(p, r + 4 + 7))));
    }
    if (r >= 8) {
      a = f32x4.add(a, f32x4.mul(k8, f32x4.add(sampleAt(p, r - 8), sampleAt(p, r + 8))));
      b = f32x4.add(b, f32x4.mul(k8, f32x4.add(sampleAt(p, r + 4 - 8), sampleAt(p, r + 4 + 8))));
    }
    if (r >= 9) {
      a = f32x4.add(a, f32x4.mul(k9, f32x4.add(sampleAt(p, r - 9), sampleAt(p, r + 9))));
      b = f32x4.add(b, f32x4.mul(k9, f32x4.add(sampleAt(p, r + 4 - 9), sampleAt(p, r + 4 + 9))));
    }
    v128.store(out + o, a);
    v128.store(twin + o, a);
    v128.store(out + o, b, 16);
    v128.store(twin + o, b, 16);
  }
  for (; x < x1; x += 4) {
    const o = (<usize>x) << 2;
    const p = base + o;
    seen |= load<i32>(ahead + o);
    let acc = f32x4.mul(kc, sampleAt(p, r));
    acc = f32x4.add(acc, f32x4.mul(k1, f32x4.add(sampleAt(p, r - 1), sampleAt(p, r + 1))));
    if (r >= 2) acc = f32x4.add(acc, f32x4.mul(k2, f32x4.add(sampleAt(p, r - 2), sampleAt(p, r + 2))));
    if (r >= 3) acc = f32x4.add(acc, f32x4.mul(k3, f32x4.add(sampleAt(p, r - 3), sampleAt(p, r + 3))));
    if (r >= 4) acc = f32x4.add(acc, f32x4.mul(k4, f32x4.add(sampleAt(p, r - 4), sampleAt(p, r + 4))));
    if (r >= 5) acc = f32x4.add(acc, f32x4.mul(k5, f32x4.add(sampleAt(p, r - 5), sampleAt(p, r + 5))));
    if (r >= 6) acc = f32x4.add(acc, f32x4.mul(k6, f32x4.add(sampleAt(p, r - 6), sampleAt(p, r + 6))));
    if (r >= 7) acc = f32x4.add(acc, f32x4.mul(k7, f32x4.add(sampleAt(p, r - 7), sampleAt(p, r + 7))));
    if (r >= 8) acc = f32x4.add(acc, f32x4.mul(k8, f32x4.add(sampleAt(p, r - 8), sampleAt(p, r + 8))));
    if (r >= 9) acc = f32x4.add(acc, f32x4.mul(k9, f32x4.add(sampleAt(p, r - 9), sampleAt(p, r + 9))));
    v128.store(out + o, acc);
    v128.store(twin + o, acc);
  }
  keepTouched(seen);
}

/**
 * acc plus sample t times its weight for the vector whose centre sample is c (radius r): the weight
 * of distance |t − c|, nothing beyond r, the first tap (t = c − r) starting the sum. Every argument
 * but the vectors is a constant where it is inlined, so this is one multiply and at most one add.
 */
@inline
function addTap(acc: v128, s: v128, t: i32, c: i32, r: i32, kc: v128, k1: v128, k2: v128, k3: v128, k4: v128, k5: v128, k6: v128, k7: v128, k8: v128, k9: v128): v128 {
  const j = t > c ? t - c : c - t;
  if (j > r) return acc;
  const k = j == 0 ? kc : j == 1 ? k1 : j == 2 ? k2 : j == 3 ? k3 : j == 4 ? k4 : j == 5 ? k5 : j == 6 ? k6 : j == 7 ? k7 : j == 8 ? k8 : k9;
  return t == c - r ? f32x4.mul(k, s) : f32x4.add(acc, f32x4.mul(k, s));
}

/**
 * Two vectors of rowSweepOf (radius r ≥ 5) with the pairs unfolded: each sample of their windows loaded
 * once and added to both sums at once, left to right. Twice the products of the folded sweep, but no
 * sample waits in a register for its partner, so the ten weights and both sums stay in registers
 * (V8's code for radius 9: 5 reloads and no spill in 119 instructions per 8 samples, against 30
 * spill moves in about 125): σ = 3 1.97–2.03 → 1.80–1.88 ns/px for both passes, 5–10 % less for
 * radii 5 to 8 (two builds in one process, in turn); radius 4 was slower and 2–3 no faster.
 */
@inline
function unfoldedStep(r: i32, p: usize, out: usize, twin: usize, kc: v128, k1: v128, k2: v128, k3: v128, k4: v128, k5: v128, k6: v128, k7: v128, k8: v128, k9: v128): void {
  let s = sampleAt(p, 0);
  let a = addTap(s, s, 0, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9);
  let b = a;
  if (2 * r + 4 >= 1) { s = sampleAt(p, 1); a = addTap(a, s, 1, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 1, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 2) { s = sampleAt(p, 2); a = addTap(a, s, 2, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 2, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 3) { s = sampleAt(p, 3); a = addTap(a, s, 3, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 3, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 4) { s = sampleAt(p, 4); a = addTap(a, s, 4, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 4, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 5) { s = sampleAt(p, 5); a = addTap(a, s, 5, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 5, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 6) { s = sampleAt(p, 6); a = addTap(a, s, 6, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 6, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 7) { s = sampleAt(p, 7); a = addTap(a, s, 7, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 7, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 8) { s = sampleAt(p, 8); a = addTap(a, s, 8, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 8, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 9) { s = sampleAt(p, 9); a = addTap(a, s, 9, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 9, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 10) { s = sampleAt(p, 10); a = addTap(a, s, 10, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 10, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 11) { s = sampleAt(p, 11); a = addTap(a, s, 11, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 11, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 12) { s = sampleAt(p, 12); a = addTap(a, s, 12, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 12, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 13) { s = sampleAt(p, 13); a = addTap(a, s, 13, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 13, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 14) { s = sampleAt(p, 14); a = addTap(a, s, 14, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 14, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 15) { s = sampleAt(p, 15); a = addTap(a, s, 15, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 15, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 16) { s = sampleAt(p, 16); a = addTap(a, s, 16, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 16, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 17) { s = sampleAt(p, 17); a = addTap(a, s, 17, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 17, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 18) { s = sampleAt(p, 18); a = addTap(a, s, 18, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 18, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 19) { s = sampleAt(p, 19); a = addTap(a, s, 19, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 19, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 20) { s = sampleAt(p, 20); a = addTap(a, s, 20, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 20, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 21) { s = sampleAt(p, 21); a = addTap(a, s, 21, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 21, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  if (2 * r + 4 >= 22) { s = sampleAt(p, 22); a = addTap(a, s, 22, r, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); b = addTap(b, s, 22, r + 4, r, kc, k1, k2, k3, k4, k5, k6, k7, k8, k9); }
  v128.store(out, a);
  v128.store(twin, a);
  v128.store(out, b, 16);
  v128.store(twin, b, 16);
}

/**
 * Output rows a (centre ring row r of the window) and b (row r + 1) of the column pass: sweeps of up
 * to RING_SWEEP_PAIRS pairs of taps, a strip of columns at a time, each adding its pairs outwards
 * (the order of the columns-first sweeps); the last adds the offset.
 */
function columnPair(window: usize, k: usize, r: i32, w: i32, a: usize, b: usize, offset: f32): void {
  const sweeps = (r + RING_SWEEP_PAIRS - 1) / RING_SWEEP_PAIRS;
  const per = (r + sweeps - 1) / sweeps;
  const whole = w & ~3;
  const vo = f32x4.splat(offset);
  for (let x0 = 0; x0 < whole; x0 += STRIP) {
    const x1 = min(whole, x0 + STRIP);
    for (let i = 1; i <= r; i += per) {
      const pairs = min(per, r - i + 1);
      const first = i == 1, last = i + pairs > r;
      // Pair i + m of a is rows r − i − m and r + i + m: lo + (pairs − 1 − m)·STRIDE and hi + m·STRIDE.
      const lo = window + <usize>(r - i - pairs + 1) * STRIDE, hi = window + <usize>(r + i) * STRIDE;
      setWeights(k, r, i, pairs);
      // `pairs`, `first` and `last` as constants: each copy of the loop has no branch inside.
      if (first) {
        if (last) ringSweepOf(pairs, true, true, lo, hi, x0, x1, a, b, vo);
        else ringSweepOf(pairs, true, false, lo, hi, x0, x1, a, b, vo);
      } else if (last) ringSweepOf(pairs, false, true, lo, hi, x0, x1, a, b, vo);
      else ringSweepOf(pairs, false, false, lo, hi, x0, x1, a, b, vo);
    }
  }
  // The last columns one sample at a time.
  for (let x = whole; x < w; x++) {
    const o = (<usize>x) << 2;
    for (let q = 0; q < 2; q++) {
      const centre = window + <usize>(r + q) * STRIDE + o;
      let acc = load<f32>(at(k, r)) * load<f32>(centre);
      for (let j = 1; j <= r; j++) acc += load<f32>(at(k, r + j)) * (load<f32>(centre - <usize>j * STRIDE) + load<f32>(centre + <usize>j * STRIDE));
      store<f32>((q == 0 ? a : b) + o, acc + offset);
    }
  }
}

/** Pairs i … i + pairs − 1's weights, then the centre's, splatted into SWEEP_WEIGHTS (see there). */
function setWeights(k: usize, r: i32, i: i32, pairs: i32): void {
  for (let m = 0; m < RING_SWEEP_PAIRS; m++) v128.store(SWEEP_WEIGHTS + <usize>(16 * m), f32x4.splat(m < pairs ? load<f32>(at(k, r + i + m)) : 0));
  v128.store(SWEEP_WEIGHTS, f32x4.splat(load<f32>(at(k, r))), 80);
}

@inline
function ringSweepOf(pairs: i32, first: bool, last: bool, lo: usize, hi: usize, x0: i32, x1: i32, a: usize, b: usize, vo: v128): void {
  if (pairs == 3) ringSweep(3, first, last, lo, hi, x0, x1, a, b, vo);
  else if (pairs == 2) ringSweep(2, first, last, lo, hi, x0, x1, a, b, vo);
  else ringSweep(1, first, last, lo, hi, x0, x1, a, b, vo);
}

/** Ring row n (a constant, 0 … 3) below or above p: the load's offset is n·STRIDE. */
@inline
function rowAt(p: usize, n: i32): v128 {
  if (n == 0) return v128.load(p);
  if (n == 1) return v128.load(p, STRIDE);
  if (n == 2) return v128.load(p, 2 * STRIDE);
  return v128.load(p, 3 * STRIDE);
}

/**
 * One sweep of `pairs` pairs for output rows a and b over columns x0 … x1: lower rows L_n = lo + n·STRIDE
 * and upper rows H_n = hi + n·STRIDE (n = 0 … pairs), pair m of a being L_(pairs−1−m) + H_m and of b
 * L_(pairs−m) + H_(m+1). The first sweep starts from the centres (a's is L_pairs, b's H_0). Each row is
 * loaded just before its first use, so that few are held at once (the weights then stay in registers).
 */
@inline
function ringSweep(pairs: i32, first: bool, last: bool, lo: usize, hi: usize, x0: i32, x1: i32, a: usize, b: usize, vo: v128): void {
  const k0 = v128.load(SWEEP_WEIGHTS), k1 = v128.load(SWEEP_WEIGHTS, 16), k2 = v128.load(SWEEP_WEIGHTS, 32);
  const kc = v128.load(SWEEP_WEIGHTS, 80);
  for (let x = x0; x < x1; x += 4) {
    const o = (<usize>x) << 2;
    const p = lo + o, q = hi + o;
    // Pair m: a takes L_(pairs−1−m) + H_m, b L_(pairs−m) + H_(m+1); L_(pairs−m) and H_m come from pair m − 1.
    let lb = rowAt(p, pairs), ha = v128.load(q);
    let sa = first ? f32x4.mul(kc, lb) : v128.load(a + o);
    let sb = first ? f32x4.mul(kc, ha) : v128.load(b + o);
    let la = rowAt(p, pairs - 1), hb = rowAt(q, 1);
    sa = f32x4.add(sa, f32x4.mul(k0, f32x4.add(la, ha)));
    sb = f32x4.add(sb, f32x4.mul(k0, f32x4.add(lb, hb)));
    if (pairs >= 2) {
      lb = la; ha = hb; la = rowAt(p, pairs - 2); hb = rowAt(q, 2);
      sa = f32x4.add(sa, f32x4.mul(k1, f32x4.add(la, ha)));
      sb = f32x4.add(sb, f32x4.mul(k1, f32x4.add(lb, hb)));
    }
    if (pairs >= 3) {
      lb = la; ha = hb; la = rowAt(p, pairs - 3); hb = rowAt(q, 3);
      sa = f32x4.add(sa, f32x4.mul(k2, f32x4.add(la, ha)));
      sb = f32x4.add(sb, f32x4.mul(k2, f32x4.add(lb, hb)));
    }
    v128.store(a + o, last ? f32x4.add(sa, vo) : sa);
    v128.store(b + o, last ? f32x4.add(sb, vo) : sb);
  }
}
