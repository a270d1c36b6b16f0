// Applying kernels: correlation (the kernel applied as written, as imaging libraries do),
// with one border policy for every path. Rank-1 kernels run as two 1-D passes; other kernels
// run directly, or through an FFT correlator that the caller may inject for large kernels.
import { borderTable, fillRowBorder, OUTSIDE, rowOffsetTable, type BorderMode } from './border';
import { imageLike, type Image } from './image';
import { separate, type Kernel } from './kernels';

/** Correlates a whole image with a non-separable kernel of any size (e.g. through an FFT). */
export type LargeKernelCorrelator = (src: Image, kernel: Kernel, border: BorderMode) => Image;

export interface CorrelateOptions {
  out?: Image;
  /** Used for non-separable kernels with at least `largeKernelTaps` weights. */
  largeKernelCorrelator?: LargeKernelCorrelator;
  largeKernelTaps?: number;
}

/** Kernel size (weights) from which an injected FFT correlator is used; measured by tests/bench. */
export const DEFAULT_LARGE_KERNEL_TAPS = 15 * 15;

/** out(x,y) = Σⱼ Σᵢ m[j][i]·in[y+j−ry][x+i−rx] / divisor + offset, choosing the fastest exact path. */
export function correlate(src: Image, kernel: Kernel, border: BorderMode, options: CorrelateOptions = {}): Image {
  const pair = separate(kernel);
  if (pair) return correlateSeparable(src, pair.column, pair.row, border, options.out, kernel.offset);
  const taps = kernel.rows * kernel.cols;
  if (options.largeKernelCorrelator && taps >= (options.largeKernelTaps ?? DEFAULT_LARGE_KERNEL_TAPS)) {
    const result = options.largeKernelCorrelator(src, kernel, border);
    if (!options.out) return result;
    const out = imageLike(src, options.out);
    out.data.set(result.data);
    return out;
  }
  return correlateDirect(src, kernel, border, options.out);
}

function isSymmetric(w: ArrayLike<number>): boolean {
  for (let a = 0, b = w.length - 1; a < b; a++, b--) if (w[a] !== w[b]) return false;
  return true;
}

/**
 * Correlation with column ⊗ row, streaming one row at a time: the vertical pass writes one
 * row (padded on both sides by the border policy), the horizontal pass reads it. No temporary image.
 */
export function correlateSeparable(
  src: Image,
  column: ArrayLike<number>,
  row: ArrayLike<number>,
  border: BorderMode,
  out?: Image,
  offset = 0,
): Image {
  const { width: w, height: h, data } = src;
  const dst = imageLike(src, out);
  const o = dst.data;
  const ry = (column.length - 1) >> 1;
  const rx = (row.length - 1) >> 1;
  const rowOffsets = rowOffsetTable(h, w, ry, ry, border);
  const colTable = borderTable(w, rx, rx, border);
  const line = new Float64Array(w + 2 * rx);
  const col = Float64Array.from(column);
  const krow = Float64Array.from(row);
  const colSymmetric = isSymmetric(col);
  const rowSymmetric = isSymmetric(krow);

  for (let y = 0; y < h; y++) {
    verticalPass(data, w, rowOffsets, y, col, ry, colSymmetric, line, rx);
    fillRowBorder(line, w, rx, colTable);
    const base = y * w;
    if (rowSymmetric) {
      const k0 = krow[rx];
      for (let x = 0; x < w; x++) {
        const c = x + rx;
        let acc = k0 * line[c];
        for (let t = 1; t <= rx; t++) acc += krow[rx + t] * (line[c - t] + line[c + t]);
        o[base + x] = acc + offset;
      }
    } else {
      const taps = krow.length;
      for (let x = 0; x < w; x++) {
        let acc = 0;
        for (let i = 0; i < taps; i++) acc += krow[i] * line[x + i];
        o[base + x] = acc + offset;
      }
    }
  }
  return dst;
}

/** line[pad + x] = Σⱼ col[j]·src[y + j − ry][x]; rows outside a constant border add nothing. */
function verticalPass(
  data: Float32Array,
  w: number,
  rowOffsets: Int32Array,
  y: number,
  col: Float64Array,
  ry: number,
  symmetric: boolean,
  line: Float64Array,
  pad: number,
): void {
  const centre = rowOffsets[y + ry];
  const k0 = col[ry];
  for (let x = 0; x < w; x++) line[pad + x] = k0 * data[centre + x];
  if (symmetric) {
    for (let t = 1; t <= ry; t++) {
      const k = col[ry + t];
      if (k === 0) continue;
      const up = rowOffsets[y + ry - t];
      const down = rowOffsets[y + ry + t];
      if (up !== OUTSIDE && down !== OUTSIDE) {
        for (let x = 0; x < w; x++) line[pad + x] += k * (data[up + x] + data[down + x]);
      } else {
        if (up !== OUTSIDE) for (let x = 0; x < w; x++) line[pad + x] += k * data[up + x];
        if (down !== OUTSIDE) for (let x = 0; x < w; x++) line[pad + x] += k * data[down + x];
      }
    }
    return;
  }
  for (let j = 0; j < col.length; j++) {
    const k = col[j];
    const off = rowOffsets[y + j];
    if (j === ry || k === 0 || off === OUTSIDE) continue;
    for (let x = 0; x < w; x++) line[pad + x] += k * data[off + x];
  }
}

/** Direct 2-D correlation over a padded copy of the image; zero weights are skipped. */
export function correlateDirect(src: Image, kernel: Kernel, border: BorderMode, out?: Image): Image {
  const { width: w, height: h } = src;
  const { rows, cols, weights, divisor, offset } = kernel;
  const ry = (rows - 1) >> 1;
  const rx = (cols - 1) >> 1;
  const padded = padImage(src, rx, ry, border);
  const pw = w + 2 * rx;
  const dst = imageLike(src, out);
  const o = dst.data;
  const acc = new Float64Array(w);
  const scale = 1 / divisor;
  for (let y = 0; y < h; y++) {
    acc.fill(0);
    for (let j = 0; j < rows; j++) {
      for (let i = 0; i < cols; i++) {
        const k = weights[j * cols + i];
        if (k === 0) continue;
        const base = (y + j) * pw + i;
        for (let x = 0; x < w; x++) acc[x] += k * padded[base + x];
      }
    }
    const row = y * w;
    for (let x = 0; x < w; x++) o[row + x] = acc[x] * scale + offset;
  }
  return dst;
}

/** A copy of the image with rx columns and ry rows of border on each side (row-major, width w+2rx). */
export function padImage(src: Image, rx: number, ry: number, border: BorderMode): Float32Array {
  const { width: w, height: h, data } = src;
  const pw = w + 2 * rx;
  const padded = new Float32Array(pw * (h + 2 * ry));
  const colTable = borderTable(w, rx, rx, border);
  const rowTable = borderTable(h, ry, ry, border);
  const line = new Float32Array(pw);
  for (let t = 0; t < rowTable.length; t++) {
    const sy = rowTable[t];
    if (sy === OUTSIDE) continue;
    line.set(data.subarray(sy * w, sy * w + w), rx);
    fillRowBorder(line, w, rx, colTable);
    padded.set(line, t * pw);
  }
  return padded;
}
