// A Gaussian and a gradient after it, when nobody needs the smoothed image (the rule runner keeps
// no intermediate output): the SIMD engine sweeps down the image once, smoothing rows into a ring
// of four rows that the gradient reads while they are in the cache; the smoothed image is never
// written out and read back (two whole-image passes of memory traffic fewer). Same bits as the two
// steps in turn on that engine. The plain engine sweeps the same way with its own row functions
// (`SeparableSweep`, `GradientRows`), so its output and range are those of its two steps in turn.
import type { GradientOperator, GradientOutput } from '../rules/schema';
import { borderTable, OUTSIDE, type BorderMode } from './border';
import { SEPARABLE_ROWS_AT_MOST, SeparableSweep } from './convolve';
import { simdKernels } from './engine';
import { gradient, GradientRows, gradientWeights } from './gradient';
import { imageLike, type Image, type ValueRange } from './image';
import { gaussianWeights } from './kernels';
import { gaussianBlur } from './smoothing';

/** gradient(gaussianBlur(src, sigma, border), operator, output, border, out, range); `scratch` holds the smoothed image where it is computed whole (the direction on the SIMD engine). */
export function gaussianGradient(
  src: Image,
  sigma: number,
  operator: GradientOperator,
  output: GradientOutput,
  border: BorderMode,
  out?: Image,
  range?: ValueRange,
  scratch?: Image,
): Image {
  const simd = simdKernels();
  if (simd && output !== 'direction') {
    const g = gaussianWeights(sigma);
    const [a, b] = gradientWeights(operator);
    return simd.smoothedGradient(src, g, g, a, b, output, border, out, range);
  }
  if (simd) return gradient(gaussianBlur(src, sigma, border, scratch), operator, output, border, out, range);
  return sweepPlain(src, sigma, operator, output, border, out, range);
}

/** Smoothed rows go into a ring (rows y−1 … y+2+SEPARABLE_ROWS_AT_MOST are alive: the gradient takes two rows, the sweep makes several at a time). */
const RING = 2 * SEPARABLE_ROWS_AT_MOST;

function sweepPlain(src: Image, sigma: number, operator: GradientOperator, output: GradientOutput, border: BorderMode, out?: Image, range?: ValueRange): Image {
  const { width: w, height: h } = src;
  const dst = imageLike(src, out === src ? undefined : out);
  const o = dst.data;
  const g = gaussianWeights(sigma);
  const [a, b] = gradientWeights(operator);
  const smoothing = new SeparableSweep(src, g, g, border);
  const rows = new GradientRows(w, a, b, output, border);
  // The ring's last row stays zero: the rows outside the image under the constant border.
  const ring = new Float32Array((RING + 1) * w);
  const zeros = RING * w;
  const at = (y: number) => (y % RING) * w;
  const rowTable = borderTable(h, 1, 1, border);
  let made = 0;
  for (let y = 0; y < h; y++) {
    const up = rowTable[y];
    if (y + 1 < h) {
      // Rows y−1 … y+2 (as far as they exist) are made before the gradient of rows y and y+1 reads them.
      while (made < Math.min(h, y + 3)) made += smoothing.next(ring, at);
      const below = rowTable[y + 3];
      rows.writePair(ring, up === OUTSIDE ? zeros : at(up), at(y), at(y + 1), below === OUTSIDE ? zeros : at(below), o, y * w);
      y++;
      continue;
    }
    while (made < Math.min(h, y + 2)) made += smoothing.next(ring, at);
    const down = rowTable[y + 2];
    rows.write(ring, up === OUTSIDE ? zeros : at(up), at(y), down === OUTSIDE ? zeros : at(down), o, y * w);
  }
  rows.report(range);
  return dst;
}
