// Separable correlation, column ⊗ row, in two 1-D passes per output row: the vertical pass writes one
// padded line (border filled by the policy), the horizontal pass reads it. Four pixels per v128,
// float32 arithmetic; symmetric kernels add the mirrored samples first (one multiply per pair).
import { align16, at, borderIndex, fillLineBorder, OUTSIDE, rowAddress, touchAhead } from './border';
import { convertPhotoRows, finishPhotoRows, photoRingBytes, photoRingRows, startPhotoRows } from './photo-rows';
import { separableLongRows, separableLongScratchBytes, takesLong } from './separable-long';

/** Scratch bytes `separable` and `laplacianOfGaussian` need for a w-wide image. */
export function separableScratchBytes(w: i32, colLen: i32, rowLen: i32): i32 {
  const rows = 4 * (colLen + 1) + 4 * w + 8 * (w + rowLen) + 8 * (w + rowLen + 4) + 160;
  return takesLong(w, colLen, true) ? max(rows, separableLongScratchBytes(w, colLen, rowLen)) : rows;
}

export function isSymmetric(k: usize, n: i32): bool {
  for (let a = 0, b = n - 1; a < b; a++, b--) if (load<f32>(at(k, a)) != load<f32>(at(k, b))) return false;
  return true;
}

/**
 * dst(x,y) = Σⱼ Σᵢ col[j]·row[i]·src(x+i−rx, y+j−ry) + offset, the weights float32 at colK and rowK
 * (odd lengths), src and dst w×h float32, mode a border mode of border.ts.
 */
export function separable(src: usize, dst: usize, w: i32, h: i32, colK: usize, colLen: i32, rowK: usize, rowLen: i32, mode: i32, offset: f32, scratch: usize): void {
  prepareSeparableScratch(scratch, w, colLen);
  for (let y = 0; y < h; ) y += separableRows(src, 0, w, h, y, colK, colLen, rowK, rowLen, mode, offset, scratch, at(dst, y * w), at(dst, (y + 1) * w));
}

/**
 * `separable` of an 8-bit photo's input image (w·h·channels bytes at src; grey, or colour to luma with
 * weights kr, kg, kb in thousandths), its rows converted into a ring after the scratch as the passes
 * need them (photo-rows.ts): the same bits as `separable` of the converted image. With `quality` ≠ 0,
 * the quality gate's sums of the converted rows go there.
 */
export function separableBytes(src: usize, channels: i32, kr: i32, kg: i32, kb: i32, quality: usize, dst: usize, w: i32, h: i32, colK: usize, colLen: i32, rowK: usize, rowLen: i32, mode: i32, offset: f32, scratch: usize): void {
  prepareSeparableScratch(scratch, w, colLen);
  const ring = photoRingRows(colLen);
  const source = align16(scratch + <usize>separableScratchBytes(w, colLen, rowLen));
  const reach = colLen >> 1;
  let converted = 0;
  startPhotoRows(quality, channels);
  for (let y = 0; y < h; ) {
    converted = convertPhotoRows(src, channels, kr, kg, kb, quality, source, ring, w, h, converted, min(h, y + 2 + reach));
    y += separableRows(source, ring, w, h, y, colK, colLen, rowK, rowLen, mode, offset, scratch, at(dst, y * w), at(dst, (y + 1) * w));
  }
  finishPhotoRows(src, channels, quality, source, ring, w, h);
}

/** Scratch bytes `separableBytes` needs: those of `separable` and its ring of source rows. */
export function separableBytesScratchBytes(w: i32, colLen: i32, rowLen: i32): i32 {
  return separableScratchBytes(w, colLen, rowLen) + 16 + photoRingBytes(colLen, w);
}

/** Readies the scratch of `separableRows` (its row of zeros) for a w-wide image. */
export function prepareSeparableScratch(scratch: usize, w: i32, colLen: i32): void {
  memory.fill(align16(at(align16(scratch), colLen)), 0, 4 * w);
}

/**
 * Output row y of the separable correlation into out and, when the column is symmetric of radius
 * 1–3 and row y + 1 exists, row y + 1 into next from the 2r+2 source rows they share (each sample
 * loaded once for both); returns the number of rows written. Every row comes out the same either way.
 * With `ring` > 0, src holds only some of the rows, source row k in slot k mod ring (rows y − r … y + 1 + r
 * must be there).
 */
export function separableRows(src: usize, ring: i32, w: i32, h: i32, y: i32, colK: usize, colLen: i32, rowK: usize, rowLen: i32, mode: i32, offset: f32, scratch: usize, out: usize, next: usize): i32 {
  const ry = colLen >> 1;
  const rx = rowLen >> 1;
  const rows = align16(scratch);
  const zeros = align16(at(rows, colLen));
  const line = align16(at(zeros, w));
  const nextLine = align16(at(line, w + rowLen + 4));
  if (takesLong(w, colLen, isSymmetric(colK, colLen))) return separableLongRows(src, ring, w, h, y, colK, colLen, rowK, rowLen, mode, offset, scratch, out, next);
  const rowSymmetric = isSymmetric(rowK, rowLen);
  const twoRows = isSymmetric(colK, colLen) && ry >= 1 && y + 1 < h;
  // The two source rows the call after next reads first, on their way from memory while this call
  // works: WebAssembly has no prefetch instruction, and these rows' first loads waited on memory.
  // (Not for one row a call, below: a single stream, which the processor fetches ahead itself.)
  if (twoRows && ring == 0) {
    if (y + ry + 4 < h) touchAhead(at(src, (y + ry + 4) * w), 4 * w);
    if (y + ry + 5 < h) touchAhead(at(src, (y + ry + 5) * w), 4 * w);
  }
  if (twoRows) {
    for (let j = 0; j <= colLen; j++) store<usize>(at(rows, j), sourceRow(src, ring, y + j - ry, h, w, mode, zeros));
    if (ry <= 3) verticalSymmetricPair(rows, colK, ry, w, at(line, rx), at(nextLine, rx));
    else verticalSymmetricPairSweeps(rows, colK, ry, w, at(line, rx), at(nextLine, rx));
    fillLineBorder(line, w, rx, mode);
    fillLineBorder(nextLine, w, rx, mode);
    if (rowSymmetric) {
      horizontalSymmetric(line, rowK, rx, w, out, offset);
      horizontalSymmetric(nextLine, rowK, rx, w, next, offset);
    } else {
      horizontalGeneral(line, rowK, rowLen, w, out, offset);
      horizontalGeneral(nextLine, rowK, rowLen, w, next, offset);
    }
    return 2;
  }
  for (let j = 0; j < colLen; j++) store<usize>(at(rows, j), sourceRow(src, ring, y + j - ry, h, w, mode, zeros));
  if (isSymmetric(colK, colLen)) verticalSymmetric(rows, colK, ry, w, at(line, rx));
  else verticalGeneral(rows, colK, colLen, w, at(line, rx));
  fillLineBorder(line, w, rx, mode);
  if (rowSymmetric) horizontalSymmetric(line, rowK, rx, w, out, offset);
  else horizontalGeneral(line, rowK, rowLen, w, out, offset);
  return 1;
}

/** Address of source row y (border applied) of a whole image, or of a ring of `ring` rows; `zeros` for an outside row. */
@inline
function sourceRow(src: usize, ring: i32, y: i32, h: i32, w: i32, mode: i32, zeros: usize): usize {
  const sy = borderIndex(y, h, mode);
  if (sy == OUTSIDE) return zeros;
  return at(src, (ring > 0 ? sy % ring : sy) * w);
}

/**
 * Laplacian of Gaussian as g″ across the vertically smoothed rows plus g across the vertical second
 * derivative: both vertical sums come from the same loads. g and g2 are symmetric, 2r+1 long.
 */
export function laplacianOfGaussian(src: usize, dst: usize, w: i32, h: i32, g: usize, g2: usize, r: i32, mode: i32, scratch: usize): void {
  const taps = 2 * r + 1;
  const rows = align16(scratch);
  const zeros = align16(at(rows, taps));
  memory.fill(zeros, 0, 4 * w);
  const smooth = align16(at(zeros, w));
  const curve = align16(at(smooth, w + 2 * r + 4));
  for (let y = 0; y < h; y++) {
    for (let j = 0; j < taps; j++) store<usize>(at(rows, j), rowAddress(src, y + j - r, h, w, mode, zeros));
    verticalPair(rows, g, g2, r, w, at(smooth, r), at(curve, r));
    fillLineBorder(smooth, w, r, mode);
    fillLineBorder(curve, w, r, mode);
    horizontalPairSum(smooth, curve, g2, g, r, w, at(dst, y * w));
  }
}

function verticalSymmetric(rows: usize, k: usize, r: i32, w: i32, line: usize): void {
  const c = load<usize>(at(rows, r));
  const kc = load<f32>(at(k, r));
  const vc = f32x4.splat(kc);
  let x = 0;
  if (r == 1) {
    const a1 = load<usize>(rows), b1 = load<usize>(at(rows, 2));
    const k1 = load<f32>(at(k, 2));
    const v1 = f32x4.splat(k1);
    for (; x + 4 <= w; x += 4) {
      const o = (<usize>x) << 2;
      v128.store(line + o, f32x4.add(f32x4.mul(vc, v128.load(c + o)), f32x4.mul(v1, f32x4.add(v128.load(a1 + o), v128.load(b1 + o)))));
    }
    for (; x < w; x++) {
      const o = (<usize>x) << 2;
      store<f32>(line + o, kc * load<f32>(c + o) + k1 * (load<f32>(a1 + o) + load<f32>(b1 + o)));
    }
  } else if (r == 2) {
    const a1 = load<usize>(at(rows, 1)), b1 = load<usize>(at(rows, 3));
    const a2 = load<usize>(rows), b2 = load<usize>(at(rows, 4));
    const k1 = load<f32>(at(k, 3)), k2 = load<f32>(at(k, 4));
    const v1 = f32x4.splat(k1), v2 = f32x4.splat(k2);
    for (; x + 4 <= w; x += 4) {
      const o = (<usize>x) << 2;
      let acc = f32x4.mul(vc, v128.load(c + o));
      acc = f32x4.add(acc, f32x4.mul(v1, f32x4.add(v128.load(a1 + o), v128.load(b1 + o))));
      acc = f32x4.add(acc, f32x4.mul(v2, f32x4.add(v128.load(a2 + o), v128.load(b2 + o))));
      v128.store(line + o, acc);
    }
    for (; x < w; x++) {
      const o = (<usize>x) << 2;
      store<f32>(line + o, kc * load<f32>(c + o) + k1 * (load<f32>(a1 + o) + load<f32>(b1 + o)) + k2 * (load<f32>(a2 + o) + load<f32>(b2 + o)));
    }
  } else if (r == 3) {
    const a1 = load<usize>(at(rows, 2)), b1 = load<usize>(at(rows, 4));
    const a2 = load<usize>(at(rows, 1)), b2 = load<usize>(at(rows, 5));
    const a3 = load<usize>(rows), b3 = load<usize>(at(rows, 6));
    const k1 = load<f32>(at(k, 4)), k2 = load<f32>(at(k, 5)), k3 = load<f32>(at(k, 6));
    const v1 = f32x4.splat(k1), v2 = f32x4.splat(k2), v3 = f32x4.splat(k3);
    for (; x + 4 <= w; x += 4) {
      const o = (<usize>x) << 2;
      let acc = f32x4.mul(vc, v128.load(c + o));
      acc = f32x4.add(acc, f32x4.mul(v1, f32x4.add(v128.load(a1 + o), v128.load(b1 + o))));
      acc = f32x4.add(acc, f32x4.mul(v2, f32x4.add(v128.load(a2 + o), v128.load(b2 + o))));
      acc = f32x4.add(acc, f32x4.mul(v3, f32x4.add(v128.load(a3 + o), v128.load(b3 + o))));
      v128.store(line + o, acc);
    }
    for (; x < w; x++) {
      const o = (<usize>x) << 2;
      store<f32>(
        line + o,
        kc * load<f32>(c + o) + k1 * (load<f32>(a1 + o) + load<f32>(b1 + o)) + k2 * (load<f32>(a2 + o) + load<f32>(b2 + o)) + k3 * (load<f32>(a3 + o) + load<f32>(b3 + o)),
      );
    }
  } else {
    const per = pairsPerSweep(r, SWEEP_PAIRS);
    if (r == 0) pairSweep(line, c, kc, rows, 0, k, r, 1, 0, 0, 1, w);
    for (let i = 1; i <= r; i += per) {
      const pairs = min(per, r - i + 1);
      pairSweep(line, i == 1 ? c : 0, kc, rows, 0, k, r, i, pairs, 0, i + pairs > r ? 1 : 0, w);
    }
    x = w & ~3;
    for (; x < w; x++) {
      const o = (<usize>x) << 2;
      let acc = kc * load<f32>(c + o);
      for (let i = 1; i <= r; i++) acc += load<f32>(at(k, r + i)) * (load<f32>(load<usize>(at(rows, r - i)) + o) + load<f32>(load<usize>(at(rows, r + i)) + o));
      store<f32>(line + o, acc);
    }
  }
}

/** Output rows y (into line) and y+1 (into next) of a symmetric column of radius 1–3; rows[0 … 2r+1] are source rows y−r … y+1+r. */
function verticalSymmetricPair(rows: usize, k: usize, r: i32, w: i32, line: usize, next: usize): void {
  const kc = load<f32>(at(k, r)), k1 = load<f32>(at(k, r + 1));
  const k2 = r >= 2 ? load<f32>(at(k, r + 2)) : <f32>0, k3 = r == 3 ? load<f32>(at(k, r + 3)) : <f32>0;
  const vc = f32x4.splat(kc), v1 = f32x4.splat(k1), v2 = f32x4.splat(k2), v3 = f32x4.splat(k3);
  const r0 = load<usize>(rows), r1 = load<usize>(at(rows, 1)), r2 = load<usize>(at(rows, 2)), r3 = load<usize>(at(rows, 3));
  const r4 = r >= 2 ? load<usize>(at(rows, 4)) : 0, r5 = r >= 2 ? load<usize>(at(rows, 5)) : 0;
  const r6 = r == 3 ? load<usize>(at(rows, 6)) : 0, r7 = r == 3 ? load<usize>(at(rows, 7)) : 0;
  let x = 0;
  if (r == 1) {
    for (; x + 4 <= w; x += 4) {
      const o = (<usize>x) << 2;
      const a = v128.load(r0 + o), b = v128.load(r1 + o), c = v128.load(r2 + o), d = v128.load(r3 + o);
      v128.store(line + o, f32x4.add(f32x4.mul(vc, b), f32x4.mul(v1, f32x4.add(a, c))));
      v128.store(next + o, f32x4.add(f32x4.mul(vc, c), f32x4.mul(v1, f32x4.add(b, d))));
    }
  } else if (r == 2) {
    for (; x + 4 <= w; x += 4) {
      const o = (<usize>x) << 2;
      const a = v128.load(r0 + o), b = v128.load(r1 + o), c = v128.load(r2 + o), d = v128.load(r3 + o), e = v128.load(r4 + o), f = v128.load(r5 + o);
      v128.store(line + o, f32x4.add(f32x4.add(f32x4.mul(vc, c), f32x4.mul(v1, f32x4.add(b, d))), f32x4.mul(v2, f32x4.add(a, e))));
      v128.store(next + o, f32x4.add(f32x4.add(f32x4.mul(vc, d), f32x4.mul(v1, f32x4.add(c, e))), f32x4.mul(v2, f32x4.add(b, f))));
    }
  } else {
    for (; x + 4 <= w; x += 4) {
      const o = (<usize>x) << 2;
      const a = v128.load(r0 + o), b = v128.load(r1 + o), c = v128.load(r2 + o), d = v128.load(r3 + o);
      const e = v128.load(r4 + o), f = v128.load(r5 + o), g = v128.load(r6 + o), hh = v128.load(r7 + o);
      let first = f32x4.add(f32x4.mul(vc, d), f32x4.mul(v1, f32x4.add(c, e)));
      first = f32x4.add(first, f32x4.mul(v2, f32x4.add(b, f)));
      v128.store(line + o, f32x4.add(first, f32x4.mul(v3, f32x4.add(a, g))));
      let second = f32x4.add(f32x4.mul(vc, e), f32x4.mul(v1, f32x4.add(d, f)));
      second = f32x4.add(second, f32x4.mul(v2, f32x4.add(c, g)));
      v128.store(next + o, f32x4.add(second, f32x4.mul(v3, f32x4.add(b, hh))));
    }
  }
  // The last columns one row at a time, each from its own 2r+1 rows.
  for (; x < w; x++) {
    const o = (<usize>x) << 2;
    for (let q = 0; q < 2; q++) {
      let acc = kc * load<f32>(load<usize>(at(rows, r + q)) + o);
      for (let i = 1; i <= r; i++) acc += load<f32>(at(k, r + i)) * (load<f32>(load<usize>(at(rows, r + q - i)) + o) + load<f32>(load<usize>(at(rows, r + q + i)) + o));
      store<f32>((q == 0 ? line : next) + o, acc);
    }
  }
}

/** Pairs of taps per sweep when r pairs are taken in sweeps of at most `most`, all about as long (radius 9 in 5: 5 + 4). */
@inline
function pairsPerSweep(r: i32, most: i32): i32 {
  const sweeps = max(1, (r + most - 1) / most);
  return (r + sweeps - 1) / sweeps;
}

/** Most pairs of taps one sweep of `pairSweep` takes (its weights and addresses stay in registers). */
const SWEEP_PAIRS: i32 = 5;
/**
 * Where the long sweeps' splatted weights pass through memory before their loops. Splats of a
 * scalar V8 made again in every iteration (a broadcast per weight, on the vector units the sums
 * use); a value loaded from memory it keeps in a register or reloads as the product's operand.
 * σ = 3 at 5 MP, one CPU, the same bits: rows 1.21 → 1.10 ns/px, columns 1.25 → 1.19, both passes
 * 2.15 → 1.98. For σ = 1 (radius 3, its own loops) it was no faster, so those keep their splats.
 */
export const SWEEP_WEIGHTS: usize = memory.data(96, 16);

/**
 * For the whole vectors of a row: dst[x] = (centre ≠ 0 ? kc·centre[x] : dst[x]) + Σ k[r+j]·(a_j[x] + b_j[x])
 * over j = i … i + pairs − 1 (pairs ≤ SWEEP_PAIRS), in that order, plus offset when last is 1. The
 * pairs are source rows r − j and r + j of `rows`, or, when line ≠ 0, the samples j to either side
 * in a padded line (line at the centre). Sweeping a long kernel a few pairs at a time keeps each
 * sweep's weights and addresses in registers, and adds in the order of one sum: the same result.
 */
function pairSweep(dst: usize, centre: usize, kc: f32, rows: usize, line: usize, k: usize, r: i32, i: i32, pairs: i32, offset: f32, last: i32, w: i32): void {
  const a1 = below(rows, line, r, i, 1, pairs), b1 = above(rows, line, r, i, 1, pairs);
  const a2 = below(rows, line, r, i, 2, pairs), b2 = above(rows, line, r, i, 2, pairs);
  const a3 = below(rows, line, r, i, 3, pairs), b3 = above(rows, line, r, i, 3, pairs);
  const a4 = below(rows, line, r, i, 4, pairs), b4 = above(rows, line, r, i, 4, pairs);
  const a5 = below(rows, line, r, i, 5, pairs), b5 = above(rows, line, r, i, 5, pairs);
  // Pairs 0 (radius 0): centre only.
  const k1 = weight(k, r, i, 1, pairs), k2 = weight(k, r, i, 2, pairs), k3 = weight(k, r, i, 3, pairs);
  const k4 = weight(k, r, i, 4, pairs), k5 = weight(k, r, i, 5, pairs);
  // The first sweep starts from kc·centre, the others from dst·1 (exact); only the last adds the offset.
  const start = centre ? centre : dst;
  const vs = f32x4.splat(centre ? kc : 1);
  const vo = f32x4.splat(offset);
  if (line && pairs > 0) {
    // Along a line every sample of the sweep is a constant offset from one of two addresses: the
    // lowest below and the nearest above (ten addresses would not all stay in registers).
    const la = line - ((<usize>(i + pairs - 1)) << 2), lb = line + ((<usize>i) << 2);
    // The first sweep starts from kc·centre; the others from dst itself, with no multiply by 1.
    // The weights pass through memory (SWEEP_WEIGHTS).
    v128.store(SWEEP_WEIGHTS, k1);
    v128.store(SWEEP_WEIGHTS, k2, 16);
    v128.store(SWEEP_WEIGHTS, k3, 32);
    v128.store(SWEEP_WEIGHTS, k4, 48);
    v128.store(SWEEP_WEIGHTS, k5, 64);
    v128.store(SWEEP_WEIGHTS, vs, 80);
    const w1 = v128.load(SWEEP_WEIGHTS), w2 = v128.load(SWEEP_WEIGHTS, 16), w3 = v128.load(SWEEP_WEIGHTS, 32);
    const w4 = v128.load(SWEEP_WEIGHTS, 48), w5 = v128.load(SWEEP_WEIGHTS, 64), ws = v128.load(SWEEP_WEIGHTS, 80);
    if (centre) sweepLine(dst, start, ws, la, lb, w1, w2, w3, w4, w5, pairs, last, true, vo, w);
    else sweepLine(dst, start, ws, la, lb, w1, w2, w3, w4, w5, pairs, last, false, vo, w);
    return;
  }
  if (pairs == 0) sweepPairs(dst, start, vs, a1, b1, k1, a2, b2, k2, a3, b3, k3, a4, b4, k4, a5, b5, k5, 0, 1, vo, w);
  else if (last) {
    if (pairs == 5) sweepPairs(dst, start, vs, a1, b1, k1, a2, b2, k2, a3, b3, k3, a4, b4, k4, a5, b5, k5, 5, 1, vo, w);
    else if (pairs == 4) sweepPairs(dst, start, vs, a1, b1, k1, a2, b2, k2, a3, b3, k3, a4, b4, k4, a5, b5, k5, 4, 1, vo, w);
    else if (pairs == 3) sweepPairs(dst, start, vs, a1, b1, k1, a2, b2, k2, a3, b3, k3, a4, b4, k4, a5, b5, k5, 3, 1, vo, w);
    else if (pairs == 2) sweepPairs(dst, start, vs, a1, b1, k1, a2, b2, k2, a3, b3, k3, a4, b4, k4, a5, b5, k5, 2, 1, vo, w);
    else sweepPairs(dst, start, vs, a1, b1, k1, a2, b2, k2, a3, b3, k3, a4, b4, k4, a5, b5, k5, 1, 1, vo, w);
  } else if (pairs == 5) sweepPairs(dst, start, vs, a1, b1, k1, a2, b2, k2, a3, b3, k3, a4, b4, k4, a5, b5, k5, 5, 0, vo, w);
  else if (pairs == 4) sweepPairs(dst, start, vs, a1, b1, k1, a2, b2, k2, a3, b3, k3, a4, b4, k4, a5, b5, k5, 4, 0, vo, w);
  else if (pairs == 3) sweepPairs(dst, start, vs, a1, b1, k1, a2, b2, k2, a3, b3, k3, a4, b4, k4, a5, b5, k5, 3, 0, vo, w);
  else if (pairs == 2) sweepPairs(dst, start, vs, a1, b1, k1, a2, b2, k2, a3, b3, k3, a4, b4, k4, a5, b5, k5, 2, 0, vo, w);
  else sweepPairs(dst, start, vs, a1, b1, k1, a2, b2, k2, a3, b3, k3, a4, b4, k4, a5, b5, k5, 1, 0, vo, w);
}

/** Address of the lower sample of pair i + n − 1 (row r − j, or j to the left of the line's centre); 0 past the sweep. */
@inline
function below(rows: usize, line: usize, r: i32, i: i32, n: i32, pairs: i32): usize {
  const j = i + n - 1;
  return n > pairs ? 0 : line ? line - ((<usize>j) << 2) : load<usize>(at(rows, r - j));
}

/** Address of the upper sample of pair i + n − 1 (row r + j, or j to the right of the line's centre); 0 past the sweep. */
@inline
function above(rows: usize, line: usize, r: i32, i: i32, n: i32, pairs: i32): usize {
  const j = i + n - 1;
  return n > pairs ? 0 : line ? line + ((<usize>j) << 2) : load<usize>(at(rows, r + j));
}

@inline
function weight(k: usize, r: i32, i: i32, n: i32, pairs: i32): v128 {
  return f32x4.splat(n > pairs ? 0 : load<f32>(at(k, r + i + n - 1)));
}

/** pairSweep's loop, inlined with pairs and last constant so that each copy has no branch inside. */
@inline
function sweepPairs(
  dst: usize, start: usize, vs: v128,
  a1: usize, b1: usize, k1: v128, a2: usize, b2: usize, k2: v128, a3: usize, b3: usize, k3: v128,
  a4: usize, b4: usize, k4: v128, a5: usize, b5: usize, k5: v128,
  pairs: i32, last: i32, vo: v128, w: i32,
): void {
  for (let x = 0; x + 4 <= w; x += 4) {
    const o = (<usize>x) << 2;
    let acc = f32x4.mul(vs, v128.load(start + o));
    if (pairs >= 1) acc = f32x4.add(acc, f32x4.mul(k1, f32x4.add(v128.load(a1 + o), v128.load(b1 + o))));
    if (pairs >= 2) acc = f32x4.add(acc, f32x4.mul(k2, f32x4.add(v128.load(a2 + o), v128.load(b2 + o))));
    if (pairs >= 3) acc = f32x4.add(acc, f32x4.mul(k3, f32x4.add(v128.load(a3 + o), v128.load(b3 + o))));
    if (pairs >= 4) acc = f32x4.add(acc, f32x4.mul(k4, f32x4.add(v128.load(a4 + o), v128.load(b4 + o))));
    if (pairs >= 5) acc = f32x4.add(acc, f32x4.mul(k5, f32x4.add(v128.load(a5 + o), v128.load(b5 + o))));
    v128.store(dst + o, last ? f32x4.add(acc, vo) : acc);
  }
}

/** sweepLinePairs with pairs and last as constants in each copy (fromCentre a constant already). */
@inline
function sweepLine(
  dst: usize, start: usize, vs: v128, la: usize, lb: usize,
  k1: v128, k2: v128, k3: v128, k4: v128, k5: v128,
  pairs: i32, last: i32, fromCentre: bool, vo: v128, w: i32,
): void {
  if (last) {
    if (pairs == 5) sweepLinePairs(dst, start, vs, la, lb, k1, k2, k3, k4, k5, 5, 1, fromCentre, vo, w);
    else if (pairs == 4) sweepLinePairs(dst, start, vs, la, lb, k1, k2, k3, k4, k5, 4, 1, fromCentre, vo, w);
    else if (pairs == 3) sweepLinePairs(dst, start, vs, la, lb, k1, k2, k3, k4, k5, 3, 1, fromCentre, vo, w);
    else if (pairs == 2) sweepLinePairs(dst, start, vs, la, lb, k1, k2, k3, k4, k5, 2, 1, fromCentre, vo, w);
    else sweepLinePairs(dst, start, vs, la, lb, k1, k2, k3, k4, k5, 1, 1, fromCentre, vo, w);
  } else if (pairs == 5) sweepLinePairs(dst, start, vs, la, lb, k1, k2, k3, k4, k5, 5, 0, fromCentre, vo, w);
  else if (pairs == 4) sweepLinePairs(dst, start, vs, la, lb, k1, k2, k3, k4, k5, 4, 0, fromCentre, vo, w);
  else if (pairs == 3) sweepLinePairs(dst, start, vs, la, lb, k1, k2, k3, k4, k5, 3, 0, fromCentre, vo, w);
  else if (pairs == 2) sweepLinePairs(dst, start, vs, la, lb, k1, k2, k3, k4, k5, 2, 0, fromCentre, vo, w);
  else sweepLinePairs(dst, start, vs, la, lb, k1, k2, k3, k4, k5, 1, 0, fromCentre, vo, w);
}

/** sweepPairs along a padded line: pair n's samples at la + 4·(pairs − n) and lb + 4·(n − 1). */
@inline
function sweepLinePairs(
  dst: usize, start: usize, vs: v128, la: usize, lb: usize,
  k1: v128, k2: v128, k3: v128, k4: v128, k5: v128,
  pairs: i32, last: i32, fromCentre: bool, vo: v128, w: i32,
): void {
  for (let x = 0; x + 4 <= w; x += 4) {
    const o = (<usize>x) << 2;
    const a = la + o, b = lb + o;
    let acc = fromCentre ? f32x4.mul(vs, v128.load(start + o)) : v128.load(start + o);
    if (pairs >= 1) acc = f32x4.add(acc, f32x4.mul(k1, f32x4.add(v128.load(a + <usize>(4 * (pairs - 1))), v128.load(b))));
    if (pairs >= 2) acc = f32x4.add(acc, f32x4.mul(k2, f32x4.add(v128.load(a + <usize>(4 * (pairs - 2))), v128.load(b + 4))));
    if (pairs >= 3) acc = f32x4.add(acc, f32x4.mul(k3, f32x4.add(v128.load(a + <usize>(4 * (pairs - 3))), v128.load(b + 8))));
    if (pairs >= 4) acc = f32x4.add(acc, f32x4.mul(k4, f32x4.add(v128.load(a + <usize>(4 * (pairs - 4))), v128.load(b + 12))));
    if (pairs >= 5) acc = f32x4.add(acc, f32x4.mul(k5, f32x4.add(v128.load(a), v128.load(b + 16))));
    v128.store(dst + o, last ? f32x4.add(acc, vo) : acc);
  }
}

/**
 * Columns a strip of `verticalSymmetricPairSweeps` takes through all its sweeps before the next: the
 * two output lines' partial sums then stay in the first-level cache from one sweep to the next, where
 * sweeps across a whole 5 MP row took them out (σ = 3, both passes, one CPU: 2.45–2.81 → 2.29–2.47
 * ns/px, four rounds of two builds in turn; 256 and 1024 columns within the noise of 512).
 */
const STRIP: i32 = 512;

/** Most pairs of taps one sweep of `verticalSymmetricPairSweeps` takes. */
const PAIR_SWEEP_PAIRS: i32 = 3;

/**
 * Output rows y (into line) and y+1 (into next) of a symmetric column of radius r > 3, rows[0 … 2r+1]
 * source rows y−r … y+1+r, in sweeps of a few pairs of taps: one sweep loads each source row it
 * touches once for both outputs (2q + 2 loads for 2q pairs), so a long column reads its rows from the
 * cache half as often. Each output adds in the order of verticalSymmetric: the same result.
 */
function verticalSymmetricPairSweeps(rows: usize, k: usize, r: i32, w: i32, line: usize, next: usize): void {
  const per = pairsPerSweep(r, PAIR_SWEEP_PAIRS);
  const whole = w & ~3;
  for (let x0 = 0; x0 < whole; x0 += STRIP) {
    const x1 = min(whole, x0 + STRIP);
    for (let i = 1; i <= r; i += per) {
      const pairs = min(per, r - i + 1);
      // `first` and `pairs` as constants: each copy of the loop has no branch inside.
      if (i == 1) {
        if (pairs == 3) pairRowsSweep(rows, k, r, i, 3, true, x0, x1, line, next);
        else if (pairs == 2) pairRowsSweep(rows, k, r, i, 2, true, x0, x1, line, next);
        else pairRowsSweep(rows, k, r, i, 1, true, x0, x1, line, next);
      } else if (pairs == 3) pairRowsSweep(rows, k, r, i, 3, false, x0, x1, line, next);
      else if (pairs == 2) pairRowsSweep(rows, k, r, i, 2, false, x0, x1, line, next);
      else pairRowsSweep(rows, k, r, i, 1, false, x0, x1, line, next);
    }
  }
  // The last columns one row at a time, each from its own 2r+1 rows.
  for (let x = w & ~3; x < w; x++) {
    const o = (<usize>x) << 2;
    for (let q = 0; q < 2; q++) {
      let acc = load<f32>(at(k, r)) * load<f32>(load<usize>(at(rows, r + q)) + o);
      for (let i = 1; i <= r; i++) acc += load<f32>(at(k, r + i)) * (load<f32>(load<usize>(at(rows, r + q - i)) + o) + load<f32>(load<usize>(at(rows, r + q + i)) + o));
      store<f32>((q == 0 ? line : next) + o, acc);
    }
  }
}

/**
 * Pairs i … i+pairs−1 of both rows: line += Σ k[r+j]·(R[r−j] + R[r+j]) and next += Σ k[r+j]·(R[r+1−j] + R[r+1+j]),
 * starting from kc·R[r] and kc·R[r+1] when first. Rows R[r−i−pairs+1 … r−i+1] and R[r+i … r+i+pairs] serve both.
 */
@inline
function pairRowsSweep(rows: usize, k: usize, r: i32, i: i32, pairs: i32, first: bool, x0: i32, x1: i32, line: usize, next: usize): void {
  // lo_n = R[r − i − n + 1] (n = 0 … pairs), hi_n = R[r + i + n] (n = 0 … pairs).
  const lo0 = load<usize>(at(rows, r - i + 1)), hi0 = load<usize>(at(rows, r + i));
  const lo1 = load<usize>(at(rows, r - i)), hi1 = load<usize>(at(rows, r + i + 1));
  const lo2 = pairs >= 2 ? load<usize>(at(rows, r - i - 1)) : 0, hi2 = pairs >= 2 ? load<usize>(at(rows, r + i + 2)) : 0;
  const lo3 = pairs >= 3 ? load<usize>(at(rows, r - i - 2)) : 0, hi3 = pairs >= 3 ? load<usize>(at(rows, r + i + 3)) : 0;
  // The splats pass through memory (SWEEP_WEIGHTS).
  v128.store(SWEEP_WEIGHTS, f32x4.splat(load<f32>(at(k, r + i))));
  v128.store(SWEEP_WEIGHTS, f32x4.splat(pairs >= 2 ? load<f32>(at(k, r + i + 1)) : 0), 16);
  v128.store(SWEEP_WEIGHTS, f32x4.splat(pairs >= 3 ? load<f32>(at(k, r + i + 2)) : 0), 32);
  v128.store(SWEEP_WEIGHTS, f32x4.splat(load<f32>(at(k, r))), 48);
  const k1 = v128.load(SWEEP_WEIGHTS), k2 = v128.load(SWEEP_WEIGHTS, 16), k3 = v128.load(SWEEP_WEIGHTS, 32), kc = v128.load(SWEEP_WEIGHTS, 48);
  const c0 = load<usize>(at(rows, r)), c1 = load<usize>(at(rows, r + 1));
  for (let x = x0; x < x1; x += 4) {
    const o = (<usize>x) << 2;
    // Pair i of line is lo1 + hi0, of next lo0 + hi1; and so on outwards.
    let a = first ? f32x4.mul(kc, v128.load(c0 + o)) : v128.load(line + o);
    let b = first ? f32x4.mul(kc, v128.load(c1 + o)) : v128.load(next + o);
    const l0 = v128.load(lo0 + o), l1 = v128.load(lo1 + o), h0 = v128.load(hi0 + o), h1 = v128.load(hi1 + o);
    a = f32x4.add(a, f32x4.mul(k1, f32x4.add(l1, h0)));
    b = f32x4.add(b, f32x4.mul(k1, f32x4.add(l0, h1)));
    if (pairs >= 2) {
      const l2 = v128.load(lo2 + o), h2 = v128.load(hi2 + o);
      a = f32x4.add(a, f32x4.mul(k2, f32x4.add(l2, h1)));
      b = f32x4.add(b, f32x4.mul(k2, f32x4.add(l1, h2)));
      if (pairs >= 3) {
        const l3 = v128.load(lo3 + o), h3 = v128.load(hi3 + o);
        a = f32x4.add(a, f32x4.mul(k3, f32x4.add(l3, h2)));
        b = f32x4.add(b, f32x4.mul(k3, f32x4.add(l2, h3)));
      }
    }
    v128.store(line + o, a);
    v128.store(next + o, b);
  }
}

/** Any column: Σⱼ k[j]·rows[j]. */
function verticalGeneral(rows: usize, k: usize, n: i32, w: i32, line: usize): void {
  let x = 0;
  for (; x + 4 <= w; x += 4) {
    const o = (<usize>x) << 2;
    let acc = f32x4.mul(f32x4.splat(load<f32>(k)), v128.load(load<usize>(rows) + o));
    for (let j = 1; j < n; j++) acc = f32x4.add(acc, f32x4.mul(f32x4.splat(load<f32>(at(k, j))), v128.load(load<usize>(at(rows, j)) + o)));
    v128.store(line + o, acc);
  }
  for (; x < w; x++) {
    const o = (<usize>x) << 2;
    let acc = load<f32>(k) * load<f32>(load<usize>(rows) + o);
    for (let j = 1; j < n; j++) acc += load<f32>(at(k, j)) * load<f32>(load<usize>(at(rows, j)) + o);
    store<f32>(line + o, acc);
  }
}

/** out[x] = Σᵢ k[i]·line[x+i] + offset for a symmetric row (line padded by r on each side). */
function horizontalSymmetric(line: usize, k: usize, r: i32, w: i32, out: usize, offset: f32): void {
  const kc = load<f32>(at(k, r));
  const vc = f32x4.splat(kc);
  const vo = f32x4.splat(offset);
  let x = 0;
  if (r == 0) {
    for (; x + 4 <= w; x += 4) v128.store(at(out, x), f32x4.add(f32x4.mul(vc, v128.load(at(line, x))), vo));
    for (; x < w; x++) store<f32>(at(out, x), kc * load<f32>(at(line, x)) + offset);
  } else if (r == 1) {
    const k1 = load<f32>(at(k, 2));
    const v1 = f32x4.splat(k1);
    for (; x + 4 <= w; x += 4) {
      const p = at(line, x);
      const acc = f32x4.add(f32x4.mul(vc, v128.load(p, 4)), f32x4.mul(v1, f32x4.add(v128.load(p), v128.load(p, 8))));
      v128.store(at(out, x), f32x4.add(acc, vo));
    }
    for (; x < w; x++) {
      const p = at(line, x);
      store<f32>(at(out, x), kc * load<f32>(p, 4) + k1 * (load<f32>(p) + load<f32>(p, 8)) + offset);
    }
  } else if (r == 2) {
    const k1 = load<f32>(at(k, 3)), k2 = load<f32>(at(k, 4));
    const v1 = f32x4.splat(k1), v2 = f32x4.splat(k2);
    for (; x + 4 <= w; x += 4) {
      const p = at(line, x);
      let acc = f32x4.mul(vc, v128.load(p, 8));
      acc = f32x4.add(acc, f32x4.mul(v1, f32x4.add(v128.load(p, 4), v128.load(p, 12))));
      acc = f32x4.add(acc, f32x4.mul(v2, f32x4.add(v128.load(p), v128.load(p, 16))));
      v128.store(at(out, x), f32x4.add(acc, vo));
    }
    for (; x < w; x++) {
      const p = at(line, x);
      store<f32>(at(out, x), kc * load<f32>(p, 8) + k1 * (load<f32>(p, 4) + load<f32>(p, 12)) + k2 * (load<f32>(p) + load<f32>(p, 16)) + offset);
    }
  } else if (r == 3) {
    const k1 = load<f32>(at(k, 4)), k2 = load<f32>(at(k, 5)), k3 = load<f32>(at(k, 6));
    const v1 = f32x4.splat(k1), v2 = f32x4.splat(k2), v3 = f32x4.splat(k3);
    for (; x + 4 <= w; x += 4) {
      const p = at(line, x);
      let acc = f32x4.mul(vc, v128.load(p, 12));
      acc = f32x4.add(acc, f32x4.mul(v1, f32x4.add(v128.load(p, 8), v128.load(p, 16))));
      acc = f32x4.add(acc, f32x4.mul(v2, f32x4.add(v128.load(p, 4), v128.load(p, 20))));
      acc = f32x4.add(acc, f32x4.mul(v3, f32x4.add(v128.load(p), v128.load(p, 24))));
      v128.store(at(out, x), f32x4.add(acc, vo));
    }
    for (; x < w; x++) {
      const p = at(line, x);
      store<f32>(
        at(out, x),
        kc * load<f32>(p, 12) + k1 * (load<f32>(p, 8) + load<f32>(p, 16)) + k2 * (load<f32>(p, 4) + load<f32>(p, 20)) + k3 * (load<f32>(p) + load<f32>(p, 24)) + offset,
      );
    }
  } else {
    const per = pairsPerSweep(r, SWEEP_PAIRS);
    for (let i = 1; i <= r; i += per) {
      const pairs = min(per, r - i + 1);
      pairSweep(out, i == 1 ? at(line, r) : 0, kc, 0, at(line, r), k, r, i, pairs, offset, i + pairs > r ? 1 : 0, w);
    }
    x = w & ~3;
    for (; x < w; x++) {
      const p = at(line, x + r);
      let acc = kc * load<f32>(p);
      for (let i = 1; i <= r; i++) {
        const d = (<usize>i) << 2;
        acc += load<f32>(at(k, r + i)) * (load<f32>(p - d) + load<f32>(p + d));
      }
      store<f32>(at(out, x), acc + offset);
    }
  }
}

/** out[x] = Σᵢ k[i]·line[x+i] + offset for any row of n taps (line padded by n >> 1 on each side). */
export function horizontalAny(line: usize, k: usize, n: i32, w: i32, out: usize, offset: f32): void {
  if (isSymmetric(k, n)) horizontalSymmetric(line, k, n >> 1, w, out, offset);
  else horizontalGeneral(line, k, n, w, out, offset);
}

/** Any row: out[x] = Σᵢ k[i]·line[x+i] + offset. */
function horizontalGeneral(line: usize, k: usize, n: i32, w: i32, out: usize, offset: f32): void {
  const vo = f32x4.splat(offset);
  let x = 0;
  for (; x + 4 <= w; x += 4) {
    const p = at(line, x);
    let acc = f32x4.mul(f32x4.splat(load<f32>(k)), v128.load(p));
    for (let i = 1; i < n; i++) acc = f32x4.add(acc, f32x4.mul(f32x4.splat(load<f32>(at(k, i))), v128.load(at(p, i))));
    v128.store(at(out, x), f32x4.add(acc, vo));
  }
  for (; x < w; x++) {
    const p = at(line, x);
    let acc = load<f32>(k) * load<f32>(p);
    for (let i = 1; i < n; i++) acc += load<f32>(at(k, i)) * load<f32>(at(p, i));
    store<f32>(at(out, x), acc + offset);
  }
}

/** smooth = Σ g·rows and curve = Σ g2·rows down the column, from the same loads (both symmetric, radius r). */
function verticalPair(rows: usize, g: usize, g2: usize, r: i32, w: i32, smooth: usize, curve: usize): void {
  const c = load<usize>(at(rows, r));
  const gc = load<f32>(at(g, r)), g2c = load<f32>(at(g2, r));
  // Sweeps of up to three pairs of rows, each sweep's weights and rows in registers (as pairSweep).
  const per = pairsPerSweep(r, 3);
  if (r == 0) logVerticalSweep(rows, g, g2, r, 1, 0, true, w, smooth, curve, c, gc, g2c);
  for (let i = 1; i <= r; i += per) {
    const pairs = min(per, r - i + 1);
    const first = i == 1;
    // Literal pairs and first, so that each inlined copy's loop has no branch inside.
    if (first) {
      if (pairs == 3) logVerticalSweep(rows, g, g2, r, i, 3, true, w, smooth, curve, c, gc, g2c);
      else if (pairs == 2) logVerticalSweep(rows, g, g2, r, i, 2, true, w, smooth, curve, c, gc, g2c);
      else logVerticalSweep(rows, g, g2, r, i, 1, true, w, smooth, curve, c, gc, g2c);
    } else if (pairs == 3) logVerticalSweep(rows, g, g2, r, i, 3, false, w, smooth, curve, c, gc, g2c);
    else if (pairs == 2) logVerticalSweep(rows, g, g2, r, i, 2, false, w, smooth, curve, c, gc, g2c);
    else logVerticalSweep(rows, g, g2, r, i, 1, false, w, smooth, curve, c, gc, g2c);
  }
  let x = w & ~3;
  for (; x < w; x++) {
    const o = (<usize>x) << 2;
    const v = load<f32>(c + o);
    let s = gc * v;
    let t = g2c * v;
    for (let i = 1; i <= r; i++) {
      const pair = load<f32>(load<usize>(at(rows, r - i)) + o) + load<f32>(load<usize>(at(rows, r + i)) + o);
      s += load<f32>(at(g, r + i)) * pair;
      t += load<f32>(at(g2, r + i)) * pair;
    }
    store<f32>(smooth + o, s);
    store<f32>(curve + o, t);
  }
}

/** out[x] = Σᵢ ka[i]·a[x+i] + kb[i]·b[x+i] for symmetric ka, kb of radius r (lines padded by r). */
function horizontalPairSum(a: usize, b: usize, ka: usize, kb: usize, r: i32, w: i32, out: usize): void {
  const kac = load<f32>(at(ka, r)), kbc = load<f32>(at(kb, r));
  const per = pairsPerSweep(r, 3);
  if (r == 0) logHorizontalSweep(a, b, ka, kb, r, 1, 0, true, w, out, kac, kbc);
  for (let i = 1; i <= r; i += per) {
    const pairs = min(per, r - i + 1);
    const first = i == 1;
    if (first) {
      if (pairs == 3) logHorizontalSweep(a, b, ka, kb, r, i, 3, true, w, out, kac, kbc);
      else if (pairs == 2) logHorizontalSweep(a, b, ka, kb, r, i, 2, true, w, out, kac, kbc);
      else logHorizontalSweep(a, b, ka, kb, r, i, 1, true, w, out, kac, kbc);
    } else if (pairs == 3) logHorizontalSweep(a, b, ka, kb, r, i, 3, false, w, out, kac, kbc);
    else if (pairs == 2) logHorizontalSweep(a, b, ka, kb, r, i, 2, false, w, out, kac, kbc);
    else logHorizontalSweep(a, b, ka, kb, r, i, 1, false, w, out, kac, kbc);
  }
  let x = w & ~3;
  for (; x < w; x++) {
    const pa = at(a, x + r);
    const pb = at(b, x + r);
    let acc = kac * load<f32>(pa) + kbc * load<f32>(pb);
    for (let i = 1; i <= r; i++) {
      const d = (<usize>i) << 2;
      acc += load<f32>(at(ka, r + i)) * (load<f32>(pa - d) + load<f32>(pa + d)) + load<f32>(at(kb, r + i)) * (load<f32>(pb - d) + load<f32>(pb + d));
    }
    store<f32>(at(out, x), acc);
  }
}

/**
 * verticalPair's pairs i … i+pairs−1 for the whole vectors of a row: smooth += Σ g·(a + b) and
 * curve += Σ g2·(a + b) over the pairs (starting from gc·centre and g2c·centre when first), in the
 * order of one loop over all pairs.
 */
@inline
function logVerticalSweep(rows: usize, g: usize, g2: usize, r: i32, i: i32, pairs: i32, first: bool, w: i32, smooth: usize, curve: usize, c: usize, gc: f32, g2c: f32): void {
  const a1 = pairs >= 1 ? load<usize>(at(rows, r - i)) : 0, b1 = pairs >= 1 ? load<usize>(at(rows, r + i)) : 0;
  const a2 = pairs >= 2 ? load<usize>(at(rows, r - i - 1)) : 0, b2 = pairs >= 2 ? load<usize>(at(rows, r + i + 1)) : 0;
  const a3 = pairs >= 3 ? load<usize>(at(rows, r - i - 2)) : 0, b3 = pairs >= 3 ? load<usize>(at(rows, r + i + 2)) : 0;
  const s1 = f32x4.splat(pairs >= 1 ? load<f32>(at(g, r + i)) : 0), t1 = f32x4.splat(pairs >= 1 ? load<f32>(at(g2, r + i)) : 0);
  const s2 = f32x4.splat(pairs >= 2 ? load<f32>(at(g, r + i + 1)) : 0), t2 = f32x4.splat(pairs >= 2 ? load<f32>(at(g2, r + i + 1)) : 0);
  const s3 = f32x4.splat(pairs >= 3 ? load<f32>(at(g, r + i + 2)) : 0), t3 = f32x4.splat(pairs >= 3 ? load<f32>(at(g2, r + i + 2)) : 0);
  const vgc = f32x4.splat(gc), vg2c = f32x4.splat(g2c);
  for (let x = 0; x + 4 <= w; x += 4) {
    const o = (<usize>x) << 2;
    let sm: v128, cu: v128;
    if (first) {
      const v = v128.load(c + o);
      sm = f32x4.mul(vgc, v);
      cu = f32x4.mul(vg2c, v);
    } else {
      sm = v128.load(smooth + o);
      cu = v128.load(curve + o);
    }
    if (pairs >= 1) {
      const pair = f32x4.add(v128.load(a1 + o), v128.load(b1 + o));
      sm = f32x4.add(sm, f32x4.mul(s1, pair));
      cu = f32x4.add(cu, f32x4.mul(t1, pair));
    }
    if (pairs >= 2) {
      const pair = f32x4.add(v128.load(a2 + o), v128.load(b2 + o));
      sm = f32x4.add(sm, f32x4.mul(s2, pair));
      cu = f32x4.add(cu, f32x4.mul(t2, pair));
    }
    if (pairs >= 3) {
      const pair = f32x4.add(v128.load(a3 + o), v128.load(b3 + o));
      sm = f32x4.add(sm, f32x4.mul(s3, pair));
      cu = f32x4.add(cu, f32x4.mul(t3, pair));
    }
    v128.store(smooth + o, sm);
    v128.store(curve + o, cu);
  }
}

/**
 * horizontalPairSum's taps i … i+pairs−1 on both lines for the whole vectors: out += Σ ka·(a₋ + a₊) + kb·(b₋ + b₊),
 * starting from kac·a + kbc·b when first, in the order of one loop over all taps.
 */
@inline
function logHorizontalSweep(a: usize, b: usize, ka: usize, kb: usize, r: i32, i: i32, pairs: i32, first: bool, w: i32, out: usize, kac: f32, kbc: f32): void {
  const ka1 = f32x4.splat(pairs >= 1 ? load<f32>(at(ka, r + i)) : 0), kb1 = f32x4.splat(pairs >= 1 ? load<f32>(at(kb, r + i)) : 0);
  const ka2 = f32x4.splat(pairs >= 2 ? load<f32>(at(ka, r + i + 1)) : 0), kb2 = f32x4.splat(pairs >= 2 ? load<f32>(at(kb, r + i + 1)) : 0);
  const ka3 = f32x4.splat(pairs >= 3 ? load<f32>(at(ka, r + i + 2)) : 0), kb3 = f32x4.splat(pairs >= 3 ? load<f32>(at(kb, r + i + 2)) : 0);
  const d1 = (<usize>i) << 2, d2 = (<usize>(i + 1)) << 2, d3 = (<usize>(i + 2)) << 2;
  const vkac = f32x4.splat(kac), vkbc = f32x4.splat(kbc);
  for (let x = 0; x + 4 <= w; x += 4) {
    const pa = at(a, x + r), pb = at(b, x + r);
    let acc = first ? f32x4.add(f32x4.mul(vkac, v128.load(pa)), f32x4.mul(vkbc, v128.load(pb))) : v128.load(at(out, x));
    if (pairs >= 1) {
      acc = f32x4.add(acc, f32x4.mul(ka1, f32x4.add(v128.load(pa - d1), v128.load(pa + d1))));
      acc = f32x4.add(acc, f32x4.mul(kb1, f32x4.add(v128.load(pb - d1), v128.load(pb + d1))));
    }
    if (pairs >= 2) {
      acc = f32x4.add(acc, f32x4.mul(ka2, f32x4.add(v128.load(pa - d2), v128.load(pa + d2))));
      acc = f32x4.add(acc, f32x4.mul(kb2, f32x4.add(v128.load(pb - d2), v128.load(pb + d2))));
    }
    if (pairs >= 3) {
      acc = f32x4.add(acc, f32x4.mul(ka3, f32x4.add(v128.load(pa - d3), v128.load(pa + d3))));
      acc = f32x4.add(acc, f32x4.mul(kb3, f32x4.add(v128.load(pb - d3), v128.load(pb + d3))));
    }
    v128.store(at(out, x), acc);
  }
}
