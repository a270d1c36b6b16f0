// Second-derivative operators: the discrete Laplacian (4- or 8-neighbour) and the Laplacian of Gaussian.
import { borderTable, fillRowBorder, OUTSIDE, rowOffsetTable, type BorderMode } from './border';
import { correlateSeparable } from './convolve';
import { imageLike, type Image } from './image';
import { gaussianSecondDerivativeWeights, gaussianWeights } from './kernels';

/**
 * 4-neighbour [0 1 0; 1 −4 1; 0 1 0] or 8-neighbour [1 1 1; 1 −8 1; 1 1 1] Laplacian
 * (Gonzalez & Woods, Digital Image Processing, 3rd ed., §3.6.2).
 */
export function laplacian(src: Image, neighbours: 4 | 8, border: BorderMode, out?: Image): Image {
  const { width: w, height: h, data } = src;
  const dst = imageLike(src, out);
  const o = dst.data;
  const rowOffsets = rowOffsetTable(h, w, 1, 1, border);
  const colTable = borderTable(w, 1, 1, border);
  const zeros = new Float32Array(w);
  // v = up + down (4) or up + centre + down (8), padded by one column each side; c = centre row padded.
  const v = new Float64Array(w + 2);
  const c = new Float64Array(w + 2);
  for (let y = 0; y < h; y++) {
    const upOff = rowOffsets[y];
    const downOff = rowOffsets[y + 2];
    const up = upOff === OUTSIDE ? zeros : data.subarray(upOff, upOff + w);
    const down = downOff === OUTSIDE ? zeros : data.subarray(downOff, downOff + w);
    const base = y * w;
    for (let x = 0; x < w; x++) c[x + 1] = data[base + x];
    fillRowBorder(c, w, 1, colTable);
    if (neighbours === 4) {
      for (let x = 0; x < w; x++) o[base + x] = up[x] + down[x] + c[x] + c[x + 2] - 4 * c[x + 1];
    } else {
      for (let x = 0; x < w; x++) v[x + 1] = up[x] + down[x] + c[x + 1];
      fillRowBorder(v, w, 1, colTable);
      for (let x = 0; x < w; x++) o[base + x] = v[x] + v[x + 1] + v[x + 2] - 9 * c[x + 1];
    }
  }
  return dst;
}

/**
 * Laplacian of Gaussian: ∂²/∂x² + ∂²/∂y² of the Gaussian-smoothed image, as two separable passes
 * (g″ ⊗ g + g ⊗ g″), the construction of scipy.ndimage.gaussian_laplace, with radius ceil(3σ).
 * Negative at the centre of a bright spot.
 */
export function laplacianOfGaussian(src: Image, sigma: number, border: BorderMode, out?: Image): Image {
  const g = gaussianWeights(sigma);
  const g2 = gaussianSecondDerivativeWeights(sigma);
  const dst = correlateSeparable(src, g, g2, border, imageLike(src, out));
  const yy = correlateSeparable(src, g2, g, border);
  const o = dst.data;
  const t = yy.data;
  for (let p = 0; p < o.length; p++) o[p] += t[p];
  return dst;
}
