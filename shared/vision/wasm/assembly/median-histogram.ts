// Median of windows of 7×7 and more for integer samples (8- and 16-bit photos), with the plain
// engine's method (shared/vision/median.ts): a histogram of the window that slides along the row,
// the median tracked as it slides (T. S. Huang, G. J. Yang, G. Y. Tang, "A fast two-dimensional
// median filtering algorithm", IEEE Trans. ASSP 27(1), 1979). The median of whole numbers is one of
// them, so both engines give the same values.
import { align16, at, borderIndex, OUTSIDE } from './border';

const HISTOGRAM_LEVELS: i32 = 65536;

/** Scratch bytes `medianHistogram` needs for a w-wide image. */
export function medianHistogramScratchBytes(w: i32, size: i32): i32 {
  return 4 * HISTOGRAM_LEVELS + 4 * size + size * (4 * (w + size + 4) + 16) + 128;
}

/**
 * dst = median of the size × size neighbourhood (border by `mode`) when every sample is a whole
 * number in 0 … 65535; returns 1, or 0 without writing anything otherwise.
 */
export function medianHistogram(src: usize, dst: usize, w: i32, h: i32, size: i32, mode: i32, scratch: usize): i32 {
  const levels = integerLevels(src, w * h);
  if (levels == 0) return 0;
  const r = size >> 1;
  const hist = align16(scratch);
  memory.fill(hist, 0, 4 * levels);
  const rows = align16(at(hist, HISTOGRAM_LEVELS));
  const stride = (<usize>(4 * (w + 2 * r + 4)) + 15) & ~(<usize>15);
  const ring = align16(at(rows, size));
  // Window position t (−r … h−1+r) as whole numbers with its border columns, in ring slot (t + r) mod size.
  for (let t = -r; t < r; t++) fillLine(src, w, h, t, r, mode, ring + <usize>((t + r) % size) * stride);
  const rank = (size * size - 1) >> 1;
  let start = 0;
  for (let y = 0; y < h; y++) {
    fillLine(src, w, h, y + r, r, mode, ring + <usize>((y + 2 * r) % size) * stride);
    for (let j = 0; j < size; j++) store<usize>(at(rows, j), ring + <usize>((y + j) % size) * stride);
    // The first window of the row; `below` counts its values under the previous row's first median.
    let m = start;
    let below = 0;
    for (let j = 0; j < size; j++) {
      const line = load<usize>(at(rows, j));
      for (let i = 0; i < size; i++) {
        const v = load<i32>(at(line, i));
        bump(hist, v, 1);
        below += v < m ? 1 : 0;
      }
    }
    while (below > rank) below -= load<i32>(at(hist, --m));
    while (below + load<i32>(at(hist, m)) <= rank) below += load<i32>(at(hist, m++));
    start = m;
    const out = at(dst, y * w);
    store<f32>(out, <f32>m);
    for (let x = 1; x < w; x++) {
      for (let j = 0; j < size; j++) {
        const line = load<usize>(at(rows, j));
        const leaving = load<i32>(at(line, x - 1));
        const entering = load<i32>(at(line, x + size - 1));
        bump(hist, leaving, -1);
        bump(hist, entering, 1);
        // (v − m) >> 31 is −1 when v < m, else 0.
        below += ((leaving - m) >> 31) - ((entering - m) >> 31);
      }
      while (below > rank) below -= load<i32>(at(hist, --m));
      while (below + load<i32>(at(hist, m)) <= rank) below += load<i32>(at(hist, m++));
      store<f32>(at(out, x), <f32>m);
    }
    // Empty the histogram again: take out the row's last window.
    for (let j = 0; j < size; j++) {
      const line = load<usize>(at(rows, j));
      for (let i = w - 1; i < w - 1 + size; i++) bump(hist, load<i32>(at(line, i)), -1);
    }
  }
  return 1;
}

@inline
function bump(hist: usize, level: i32, by: i32): void {
  const address = at(hist, level);
  store<i32>(address, load<i32>(address) + by);
}

/** max + 1 when every value is a whole number in 0 … 65535, else 0 (the plain engine's test). */
function integerLevels(src: usize, n: i32): i32 {
  const top = f32x4.splat(<f32>(HISTOGRAM_LEVELS - 1));
  const zero = f32x4.splat(0);
  let ok = i32x4.splat(-1);
  let high = zero;
  let p = 0;
  for (; p + 4 <= n; p += 4) {
    const v = v128.load(at(src, p));
    ok = v128.and(ok, v128.and(f32x4.eq(f32x4.trunc(v), v), v128.and(f32x4.ge(v, zero), f32x4.le(v, top))));
    high = f32x4.pmax(high, v);
  }
  if (!i32x4.all_true(ok)) return 0;
  let max: f32 = 0;
  for (let lane = 0; lane < 4; lane++) {
    const v = f32x4.extract_lane(high, 0);
    if (v > max) max = v;
    high = v128.shuffle<f32>(high, high, 1, 2, 3, 0);
  }
  for (; p < n; p++) {
    const v = load<f32>(at(src, p));
    if (!(Mathf.trunc(v) == v && v >= 0 && v <= <f32>(HISTOGRAM_LEVELS - 1))) return 0;
    if (v > max) max = v;
  }
  return <i32>max + 1;
}

/** Window position t as whole numbers at line[r … r+w−1], its r border columns on each side; zeros outside. */
function fillLine(src: usize, w: i32, h: i32, t: i32, r: i32, mode: i32, line: usize): void {
  const row = borderIndex(t, h, mode);
  if (row == OUTSIDE) {
    memory.fill(line, 0, 4 * (w + 2 * r));
    return;
  }
  const from = at(src, row * w);
  const to = at(line, r);
  let x = 0;
  for (; x + 4 <= w; x += 4) v128.store(at(to, x), i32x4.trunc_sat_f32x4_s(v128.load(at(from, x))));
  for (; x < w; x++) store<i32>(at(to, x), <i32>load<f32>(at(from, x)));
  for (let i = 0; i < r; i++) {
    const left = borderIndex(i - r, w, mode);
    store<i32>(at(line, i), left == OUTSIDE ? 0 : load<i32>(at(to, left)));
    const right = borderIndex(w + i, w, mode);
    store<i32>(at(to, w + i), right == OUTSIDE ? 0 : load<i32>(at(to, right)));
  }
}
