// Second-derivative operators: the discrete Laplacian (4- or 8-neighbour) and the Laplacian of Gaussian.
import { borderTable, OUTSIDE, rowOffsetTable, type BorderMode } from './border';
import { correlateSeparable } from './convolve';
import { imageLike, type Image } from './image';
import { gaussianSecondDerivativeWeights, gaussianWeights } from './kernels';

/**
 * 4-neighbour [0 1 0; 1 −4 1; 0 1 0] or 8-neighbour [1 1 1; 1 −8 1; 1 1 1] Laplacian
 * (Gonzalez & Woods, Digital Image Processing, 3rd ed., §3.6.2).
 * One pass over three rows, the horizontal neighbours kept in locals as the window slides right.
 */
export function laplacian(src: Image, neighbours: 4 | 8, border: BorderMode, out?: Image): Image {
  const { width: w, height: h, data } = src;
  const dst = imageLike(src, out === src ? undefined : out);
  const o = dst.data;
  const rowOffsets = rowOffsetTable(h, w, 1, 1, border);
  const colTable = borderTable(w, 1, 1, border);
  const leftColumn = colTable[0];
  const rightColumn = colTable[w + 1];
  const zeros = new Float32Array(w);
  const last = w - 1;
  for (let y = 0; y < h; y++) {
    const upOff = rowOffsets[y];
    const downOff = rowOffsets[y + 2];
    const up = upOff === OUTSIDE ? zeros : data.subarray(upOff, upOff + w);
    const down = downOff === OUTSIDE ? zeros : data.subarray(downOff, downOff + w);
    const centre = data.subarray(y * w, y * w + w);
    const base = y * w;
    if (neighbours === 4) {
      // Horizontal neighbours of the centre row only.
      const cRight = rightColumn === OUTSIDE ? 0 : centre[rightColumn];
      let cPrev = leftColumn === OUTSIDE ? 0 : centre[leftColumn];
      let cCur = centre[0];
      for (let x = 0; x < last; x++) {
        const cNext = centre[x + 1];
        o[base + x] = up[x] + down[x] + cPrev + cNext - 4 * cCur;
        cPrev = cCur;
        cCur = cNext;
      }
      o[base + last] = up[last] + down[last] + cPrev + cRight - 4 * cCur;
    } else {
      // Column sums v = up + centre + down; out = v(x−1) + v(x) + v(x+1) − 9·centre(x).
      const vRight = rightColumn === OUTSIDE ? 0 : up[rightColumn] + centre[rightColumn] + down[rightColumn];
      let vPrev = leftColumn === OUTSIDE ? 0 : up[leftColumn] + centre[leftColumn] + down[leftColumn];
      let vCur = up[0] + centre[0] + down[0];
      for (let x = 0; x < last; x++) {
        const vNext = up[x + 1] + centre[x + 1] + down[x + 1];
        o[base + x] = vPrev + vCur + vNext - 9 * centre[x];
        vPrev = vCur;
        vCur = vNext;
      }
      o[base + last] = vPrev + vCur + vRight - 9 * centre[last];
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
