// First-derivative operators (Sobel, Scharr, Prewitt): x, y, magnitude and direction in one pass.
// Each operator is smoothing ⊗ difference; the x kernel is [a b a]ᵀ ⊗ [−1 0 1], the y kernel its
// transpose, unnormalised, positive where the image gets brighter to the right / downwards.
import type { GradientOperator, GradientOutput } from '../rules/schema';
import { borderTable, fillRowBorder, OUTSIDE, rowOffsetTable, type BorderMode } from './border';
import { imageLike, type Image } from './image';
import { PREWITT_SMOOTHING, SCHARR_SMOOTHING, SOBEL_SMOOTHING } from './kernels';

const SMOOTHING: Record<GradientOperator, readonly number[]> = {
  sobel: SOBEL_SMOOTHING,
  scharr: SCHARR_SMOOTHING,
  prewitt: PREWITT_SMOOTHING,
};

const DEGREES_PER_RADIAN = 180 / Math.PI;

/** magnitude = sqrt(gx² + gy²); direction = atan2(gy, gx) in degrees, (−180, 180]. */
export function gradient(src: Image, operator: GradientOperator, output: GradientOutput, border: BorderMode, out?: Image): Image {
  const { width: w, height: h, data } = src;
  const [a, b] = SMOOTHING[operator];
  const dst = imageLike(src, out);
  const o = dst.data;
  const rowOffsets = rowOffsetTable(h, w, 1, 1, border);
  const colTable = borderTable(w, 1, 1, border);
  // Per row: s = vertical smoothing a·up + b·centre + a·down, d = vertical difference down − up.
  const s = new Float64Array(w + 2);
  const d = new Float64Array(w + 2);
  const zeros = new Float32Array(w);

  const wantX = output !== 'y';
  const wantY = output !== 'x';
  for (let y = 0; y < h; y++) {
    const upOff = rowOffsets[y];
    const downOff = rowOffsets[y + 2];
    const up = upOff === OUTSIDE ? zeros : data.subarray(upOff, upOff + w);
    const down = downOff === OUTSIDE ? zeros : data.subarray(downOff, downOff + w);
    const centre = data.subarray(y * w, y * w + w);
    if (wantX && wantY) {
      for (let x = 0; x < w; x++) {
        const u = up[x];
        const v = down[x];
        s[x + 1] = a * (u + v) + b * centre[x];
        d[x + 1] = v - u;
      }
      fillRowBorder(s, w, 1, colTable);
      fillRowBorder(d, w, 1, colTable);
    } else if (wantX) {
      for (let x = 0; x < w; x++) s[x + 1] = a * (up[x] + down[x]) + b * centre[x];
      fillRowBorder(s, w, 1, colTable);
    } else {
      for (let x = 0; x < w; x++) d[x + 1] = down[x] - up[x];
      fillRowBorder(d, w, 1, colTable);
    }
    const base = y * w;
    switch (output) {
      case 'x':
        for (let x = 0; x < w; x++) o[base + x] = s[x + 2] - s[x];
        break;
      case 'y':
        for (let x = 0; x < w; x++) o[base + x] = a * (d[x] + d[x + 2]) + b * d[x + 1];
        break;
      case 'magnitude':
        for (let x = 0; x < w; x++) {
          const gx = s[x + 2] - s[x];
          const gy = a * (d[x] + d[x + 2]) + b * d[x + 1];
          o[base + x] = Math.sqrt(gx * gx + gy * gy);
        }
        break;
      case 'direction':
        for (let x = 0; x < w; x++) {
          const gx = s[x + 2] - s[x];
          const gy = a * (d[x] + d[x + 2]) + b * d[x + 1];
          o[base + x] = Math.atan2(gy, gx) * DEGREES_PER_RADIAN;
        }
        break;
    }
  }
  return dst;
}
