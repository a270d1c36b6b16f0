// First-derivative operators (Sobel, Scharr, Prewitt): x, y, magnitude and direction in one pass.
// Each operator is smoothing ⊗ difference; the x kernel is [a b a]ᵀ ⊗ [−1 0 1], the y kernel its
// transpose, unnormalised, positive where the image gets brighter to the right / downwards.
import type { GradientOperator, GradientOutput } from '../rules/schema';
import { borderTable, OUTSIDE, rowOffsetTable, type BorderMode } from './border';
import { imageLike, type Image, type ValueRange } from './image';
import { PREWITT_SMOOTHING, SCHARR_SMOOTHING, SOBEL_SMOOTHING } from './kernels';
import { simdKernels } from './engine';

const SMOOTHING: Record<GradientOperator, readonly number[]> = {
  sobel: SOBEL_SMOOTHING,
  scharr: SCHARR_SMOOTHING,
  prewitt: PREWITT_SMOOTHING,
};

const DEGREES_PER_RADIAN = 180 / Math.PI;

/** The operator's smoothing weights [a, b] of [a b a]. */
export function gradientWeights(operator: GradientOperator): readonly [number, number] {
  const [a, b] = SMOOTHING[operator];
  return [a, b];
}

/**
 * magnitude = sqrt(gx² + gy²); direction = atan2(gy, gx) in degrees, (−180, 180].
 * With `range`, the magnitude's minimum and maximum (as stored, float32) are written to it on the
 * way, so that a following Otsu threshold need not read the image once more for them (NaN for
 * the other outputs: not known).
 * One pass over three rows: per column, the vertical smoothing s = a·up + b·centre + a·down and
 * difference t = down − up; then gx = s(x+1) − s(x−1) and gy = a·t(x−1) + b·t(x) + a·t(x+1),
 * with the three columns kept in locals as the window slides right.
 */
export function gradient(
  src: Image,
  operator: GradientOperator,
  output: GradientOutput,
  border: BorderMode,
  out?: Image,
  range?: ValueRange,
): Image {
  const [a, b] = SMOOTHING[operator];
  // Direction (atan2) has no SIMD kernel: it runs below, on the same buffers.
  const simd = output !== 'direction' ? simdKernels() : null;
  if (simd && output !== 'direction') return simd.gradient(src, a, b, output, border, out, range);
  const { width: w, height: h, data } = src;
  const dst = imageLike(src, out === src ? undefined : out);
  const o = dst.data;
  const rowOffsets = rowOffsetTable(h, w, 1, 1, border);
  const colTable = borderTable(w, 1, 1, border);
  const leftColumn = colTable[0];
  const rightColumn = colTable[w + 1];
  const zeros = new Float32Array(w);
  let lo = Infinity;
  let hi = -Infinity;

  for (let y = 0; y < h; y++) {
    const upOff = rowOffsets[y];
    const downOff = rowOffsets[y + 2];
    const up = upOff === OUTSIDE ? zeros : data.subarray(upOff, upOff + w);
    const down = downOff === OUTSIDE ? zeros : data.subarray(downOff, downOff + w);
    const centre = data.subarray(y * w, y * w + w);
    const base = y * w;
    // Columns −1 and w from the border policy (0 for the constant border).
    const sLeft = leftColumn === OUTSIDE ? 0 : a * (up[leftColumn] + down[leftColumn]) + b * centre[leftColumn];
    const tLeft = leftColumn === OUTSIDE ? 0 : down[leftColumn] - up[leftColumn];
    const sRight = rightColumn === OUTSIDE ? 0 : a * (up[rightColumn] + down[rightColumn]) + b * centre[rightColumn];
    const tRight = rightColumn === OUTSIDE ? 0 : down[rightColumn] - up[rightColumn];
    let sPrev = sLeft;
    let tPrev = tLeft;
    let sCur = a * (up[0] + down[0]) + b * centre[0];
    let tCur = down[0] - up[0];
    const last = w - 1;
    switch (output) {
      case 'x':
        for (let x = 0; x < last; x++) {
          const sNext = a * (up[x + 1] + down[x + 1]) + b * centre[x + 1];
          o[base + x] = sNext - sPrev;
          sPrev = sCur;
          sCur = sNext;
        }
        o[base + last] = sRight - sPrev;
        break;
      case 'y':
        for (let x = 0; x < last; x++) {
          const tNext = down[x + 1] - up[x + 1];
          o[base + x] = a * (tPrev + tNext) + b * tCur;
          tPrev = tCur;
          tCur = tNext;
        }
        o[base + last] = a * (tPrev + tRight) + b * tCur;
        break;
      case 'magnitude': {
        for (let x = 0; x < last; x++) {
          const u = up[x + 1];
          const v = down[x + 1];
          const sNext = a * (u + v) + b * centre[x + 1];
          const tNext = v - u;
          const gx = sNext - sPrev;
          const gy = a * (tPrev + tNext) + b * tCur;
          const m = Math.sqrt(gx * gx + gy * gy);
          o[base + x] = m;
          // New extremes are rare, so these branches are well predicted (and skip NaN, as Otsu's own range does).
          if (m < lo) lo = m;
          if (m > hi) hi = m;
          sPrev = sCur;
          sCur = sNext;
          tPrev = tCur;
          tCur = tNext;
        }
        const gx = sRight - sPrev;
        const gy = a * (tPrev + tRight) + b * tCur;
        const m = Math.sqrt(gx * gx + gy * gy);
        o[base + last] = m;
        if (m < lo) lo = m;
        if (m > hi) hi = m;
        break;
      }
      case 'direction': {
        for (let x = 0; x < last; x++) {
          const u = up[x + 1];
          const v = down[x + 1];
          const sNext = a * (u + v) + b * centre[x + 1];
          const tNext = v - u;
          o[base + x] = Math.atan2(a * (tPrev + tNext) + b * tCur, sNext - sPrev) * DEGREES_PER_RADIAN;
          sPrev = sCur;
          sCur = sNext;
          tPrev = tCur;
          tCur = tNext;
        }
        o[base + last] = Math.atan2(a * (tPrev + tRight) + b * tCur, sRight - sPrev) * DEGREES_PER_RADIAN;
        break;
      }
    }
  }
  if (range) {
    // float32 rounding is monotonic, so the range of the stored values is the rounded range.
    const known = output === 'magnitude';
    range.min = known ? Math.fround(lo) : NaN;
    range.max = known ? Math.fround(hi) : NaN;
  }
  return dst;
}
