// Smoothing filters: Gaussian (separable) and box (sliding-window sums, constant time per pixel).
import { borderTable, fillRowBorder, OUTSIDE, rowOffsetTable, type BorderMode } from './border';
import { correlateSeparable } from './convolve';
import { imageLike, type Image } from './image';
import { gaussianWeights } from './kernels';

/** Gaussian blur, radius ceil(3σ), weights normalised to sum 1, two 1-D passes. */
export function gaussianBlur(src: Image, sigma: number, border: BorderMode, out?: Image): Image {
  const w = gaussianWeights(sigma);
  return correlateSeparable(src, w, w, border, out);
}

/**
 * Mean of the size × size neighbourhood (divisor always size², border pixels included).
 * Running column sums move down one row at a time; a running row sum moves across.
 */
export function boxFilter(src: Image, size: number, border: BorderMode, out?: Image): Image {
  const { width: w, height: h, data } = src;
  const r = (size - 1) >> 1;
  const dst = imageLike(src, out);
  const o = dst.data;
  const rowOffsets = rowOffsetTable(h, w, r, r + 1, border);
  const colTable = borderTable(w, r, r, border);
  const sums = new Float64Array(w + 2 * r);
  const scale = 1 / (size * size);
  // Column sums for output row 0: rows −r … r.
  for (let t = 0; t < size; t++) {
    const off = rowOffsets[t];
    if (off === OUTSIDE) continue;
    for (let x = 0; x < w; x++) sums[r + x] += data[off + x];
  }
  for (let y = 0; y < h; y++) {
    fillRowBorder(sums, w, r, colTable);
    let acc = 0;
    for (let i = 0; i < size; i++) acc += sums[i];
    const base = y * w;
    o[base] = acc * scale;
    for (let x = 1; x < w; x++) {
      acc += sums[x + size - 1] - sums[x - 1];
      o[base + x] = acc * scale;
    }
    if (y + 1 === h) break;
    // Slide the column sums down: add row y+r+1, drop row y−r.
    const add = rowOffsets[y + size];
    const drop = rowOffsets[y];
    if (add !== OUTSIDE) for (let x = 0; x < w; x++) sums[r + x] += data[add + x];
    if (drop !== OUTSIDE) for (let x = 0; x < w; x++) sums[r + x] -= data[drop + x];
  }
  return dst;
}
