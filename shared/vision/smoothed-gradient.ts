// A Gaussian and a gradient after it, when nobody needs the smoothed image (the rule runner keeps
// no intermediate output): the SIMD engine sweeps down the image once, smoothing rows into a ring
// of four rows that the gradient reads while they are in the cache; the smoothed image is never
// written out and read back (two whole-image passes of memory traffic fewer). Same bits as the two
// steps in turn on that engine. The plain engine runs the two steps in turn.
import type { GradientOperator, GradientOutput } from '../rules/schema';
import type { BorderMode } from './border';
import { simdKernels } from './engine';
import { gradient, gradientWeights } from './gradient';
import type { Image, ValueRange } from './image';
import { gaussianWeights } from './kernels';
import { gaussianBlur } from './smoothing';

/** gradient(gaussianBlur(src, sigma, border), operator, output, border, out, range); `scratch` holds the smoothed image where it is computed whole (plain engine, direction). */
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
  return gradient(gaussianBlur(src, sigma, border, scratch), operator, output, border, out, range);
}
