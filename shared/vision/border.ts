// Border policy shared by every neighbourhood step: which source pixel stands in for a position
// outside the image. Index tables are built once per call, so inner loops never test borders.
import type { BorderMode } from '../rules/schema';

export type { BorderMode };

/** Marks a position whose value is the constant 0 (border "constant"). */
export const OUTSIDE = -1;

/**
 * Source index for position `i` of a line of `n` samples.
 * reflect:   gfedcb|abcdefgh|gfedcba (edge not repeated; OpenCV BORDER_REFLECT_101, NumPy 'reflect'),
 *            repeated as often as needed when the reach exceeds the line, as OpenCV's borderInterpolate does;
 * replicate: aaaaaa|abcdefgh|hhhhhhh;
 * constant:  OUTSIDE (the value 0).
 */
export function borderIndex(i: number, n: number, mode: BorderMode): number {
  if (i >= 0 && i < n) return i;
  if (mode === 'constant') return OUTSIDE;
  if (mode === 'replicate' || n === 1) return i < 0 ? 0 : n - 1;
  const period = 2 * n - 2;
  let k = i % period;
  if (k < 0) k += period;
  return k < n ? k : period - k;
}

/** Table of source indices for positions -before … n-1+after; entry t is position t - before. */
export function borderTable(n: number, before: number, after: number, mode: BorderMode): Int32Array {
  const table = new Int32Array(before + n + after);
  for (let t = 0; t < table.length; t++) table[t] = borderIndex(t - before, n, mode);
  return table;
}

/**
 * Fills the `pad` positions on each side of a row already stored at row[pad … pad+n-1],
 * following `table` (built with borderTable(n, pad, pad, mode)).
 */
export function fillRowBorder(row: Float32Array | Float64Array | Int32Array, n: number, pad: number, table: Int32Array): void {
  for (let t = 0; t < pad; t++) {
    const left = table[t];
    row[t] = left === OUTSIDE ? 0 : row[pad + left];
    const right = table[pad + n + t];
    row[pad + n + t] = right === OUTSIDE ? 0 : row[pad + right];
  }
}

/** Row offsets (row index × width) for rows -before … height-1+after; OUTSIDE rows read as zeros. */
export function rowOffsetTable(height: number, width: number, before: number, after: number, mode: BorderMode): Int32Array {
  const table = borderTable(height, before, after, mode);
  for (let t = 0; t < table.length; t++) if (table[t] !== OUTSIDE) table[t] *= width;
  return table;
}

/** True when the `count` rows from table entry t on are rows of the image one after the other (no border row among them). */
export function isStrided(rowOffsets: Int32Array, t: number, count: number, w: number): boolean {
  const first = rowOffsets[t];
  if (first === OUTSIDE) return false;
  for (let j = 1; j < count; j++) if (rowOffsets[t + j] !== first + j * w) return false;
  return true;
}
