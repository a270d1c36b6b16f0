// Direct 2-D correlation for kernels that are not rank 1. Each source row is padded once (border
// filled) into a ring of `rows` lines; every output vector sums rows × cols shifted loads against
// the kernel's weights, splatted once into a table of v128 (held in locals for 3×3).
import { align16, at, borderIndex, fillLineBorder, OUTSIDE } from './border';

/** Scratch bytes `correlate2d` needs. */
export function directScratchBytes(w: i32, rows: i32, cols: i32): i32 {
  return 16 * rows * cols + 4 * rows + rows * (4 * (w + cols) + 32) + 128;
}

/**
 * dst(x,y) = Σⱼ Σᵢ k[j][i]·src(x+i−rx, y+j−ry)·scale + offset, k float32 row-major at weights.
 */
export function correlate2d(src: usize, dst: usize, w: i32, h: i32, weights: usize, rows: i32, cols: i32, mode: i32, scale: f32, offset: f32, scratch: usize): void {
  const ry = rows >> 1;
  const rx = cols >> 1;
  const table = align16(scratch);
  for (let t = 0; t < rows * cols; t++) v128.store(table + ((<usize>t) << 4), f32x4.splat(load<f32>(at(weights, t))));
  const slots = align16(table + ((<usize>(rows * cols)) << 4));
  const lineBytes = (<usize>(4 * (w + cols) + 16)) & ~(<usize>15);
  const ring = align16(at(slots, rows));
  // Lines for source rows −ry … rows−2−ry; each output row adds the next one.
  for (let t = 0; t < rows - 1; t++) fillLine(src, w, h, t - ry, rx, mode, ring + <usize>(t % rows) * lineBytes);
  for (let y = 0; y < h; y++) {
    const t = y + rows - 1;
    fillLine(src, w, h, t - ry, rx, mode, ring + <usize>(t % rows) * lineBytes);
    for (let j = 0; j < rows; j++) store<usize>(at(slots, j), ring + <usize>((y + j) % rows) * lineBytes);
    const out = at(dst, y * w);
    if (rows == 3 && cols == 3) rows3x3(slots, table, w, out, scale, offset);
    else general(slots, table, rows, cols, w, out, scale, offset);
  }
}

/** Source row sy (border applied) into line[rx … rx+w−1], its border columns filled; zeros outside. */
function fillLine(src: usize, w: i32, h: i32, sy: i32, rx: i32, mode: i32, line: usize): void {
  const row = borderIndex(sy, h, mode);
  if (row == OUTSIDE) {
    memory.fill(line, 0, 4 * (w + 2 * rx));
    return;
  }
  memory.copy(at(line, rx), at(src, row * w), 4 * w);
  fillLineBorder(line, w, rx, mode);
}

function rows3x3(slots: usize, table: usize, w: i32, out: usize, scale: f32, offset: f32): void {
  const a = load<usize>(slots), b = load<usize>(at(slots, 1)), c = load<usize>(at(slots, 2));
  const k0 = v128.load(table), k1 = v128.load(table, 16), k2 = v128.load(table, 32);
  const k3 = v128.load(table, 48), k4 = v128.load(table, 64), k5 = v128.load(table, 80);
  const k6 = v128.load(table, 96), k7 = v128.load(table, 112), k8 = v128.load(table, 128);
  const vs = f32x4.splat(scale), vo = f32x4.splat(offset);
  let x = 0;
  for (; x + 4 <= w; x += 4) {
    const o = (<usize>x) << 2;
    let acc = f32x4.mul(k0, v128.load(a + o));
    acc = f32x4.add(acc, f32x4.mul(k1, v128.load(a + o, 4)));
    acc = f32x4.add(acc, f32x4.mul(k2, v128.load(a + o, 8)));
    acc = f32x4.add(acc, f32x4.mul(k3, v128.load(b + o)));
    acc = f32x4.add(acc, f32x4.mul(k4, v128.load(b + o, 4)));
    acc = f32x4.add(acc, f32x4.mul(k5, v128.load(b + o, 8)));
    acc = f32x4.add(acc, f32x4.mul(k6, v128.load(c + o)));
    acc = f32x4.add(acc, f32x4.mul(k7, v128.load(c + o, 4)));
    acc = f32x4.add(acc, f32x4.mul(k8, v128.load(c + o, 8)));
    v128.store(out + o, f32x4.add(f32x4.mul(acc, vs), vo));
  }
  for (; x < w; x++) scalarPixel(slots, table, 3, 3, x, out, scale, offset);
}

function general(slots: usize, table: usize, rows: i32, cols: i32, w: i32, out: usize, scale: f32, offset: f32): void {
  const vs = f32x4.splat(scale), vo = f32x4.splat(offset);
  let x = 0;
  // Four vectors per pass: each weight is loaded once for sixteen pixels, and the four sums, each
  // a chain of dependent additions, advance side by side (two chains left the adder waiting on the
  // one before: 2.5 ns/px at 5×5). Each sum keeps its order of additions, so the same bits.
  for (; x + 16 <= w; x += 16) {
    const o = (<usize>x) << 2;
    let acc0 = f32x4.splat(0);
    let acc1 = f32x4.splat(0);
    let acc2 = f32x4.splat(0);
    let acc3 = f32x4.splat(0);
    for (let j = 0; j < rows; j++) {
      const line = load<usize>(at(slots, j)) + o;
      const kj = table + ((<usize>(j * cols)) << 4);
      for (let i = 0; i < cols; i++) {
        const k = v128.load(kj + ((<usize>i) << 4));
        const p = at(line, i);
        acc0 = f32x4.add(acc0, f32x4.mul(k, v128.load(p)));
        acc1 = f32x4.add(acc1, f32x4.mul(k, v128.load(p, 16)));
        acc2 = f32x4.add(acc2, f32x4.mul(k, v128.load(p, 32)));
        acc3 = f32x4.add(acc3, f32x4.mul(k, v128.load(p, 48)));
      }
    }
    v128.store(out + o, f32x4.add(f32x4.mul(acc0, vs), vo));
    v128.store(out + o, f32x4.add(f32x4.mul(acc1, vs), vo), 16);
    v128.store(out + o, f32x4.add(f32x4.mul(acc2, vs), vo), 32);
    v128.store(out + o, f32x4.add(f32x4.mul(acc3, vs), vo), 48);
  }
  for (; x + 4 <= w; x += 4) {
    const o = (<usize>x) << 2;
    let acc = f32x4.splat(0);
    for (let j = 0; j < rows; j++) {
      const line = load<usize>(at(slots, j)) + o;
      const kj = table + ((<usize>(j * cols)) << 4);
      for (let i = 0; i < cols; i++) acc = f32x4.add(acc, f32x4.mul(v128.load(kj + ((<usize>i) << 4)), v128.load(at(line, i))));
    }
    v128.store(out + o, f32x4.add(f32x4.mul(acc, vs), vo));
  }
  for (; x < w; x++) scalarPixel(slots, table, rows, cols, x, out, scale, offset);
}

function scalarPixel(slots: usize, table: usize, rows: i32, cols: i32, x: i32, out: usize, scale: f32, offset: f32): void {
  let acc: f32 = 0;
  for (let j = 0; j < rows; j++) {
    const line = load<usize>(at(slots, j));
    for (let i = 0; i < cols; i++) acc += load<f32>(table + ((<usize>(j * cols + i)) << 4)) * load<f32>(at(line, x + i));
  }
  store<f32>(at(out, x), acc * scale + offset);
}
