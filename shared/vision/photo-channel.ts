// The rule's input channel of a photo, as the rule runner takes it: 8-bit colour to luma through the
// SIMD kernels when they run (the same bits as channelImage), anything else through channelImage.
// With the quality gate's figures, an 8-bit grey or colour photo takes one pass over its rows.
import type { GradientOperator, InputChannel } from '../rules/schema';
import type { BorderMode } from './border';
import { simdKernels } from './engine';
import { gradientWeights } from './gradient';
import { BT601_WEIGHTS, channelImage, imageLike, type Image, type RawPhoto, type ValueRange } from './image';
import { gaussianWeights } from './kernels';
import { qualityFigures, qualityFromSums, type QualityFigures } from './quality';

export function inputChannel(photo: RawPhoto, channel: InputChannel, out?: Image): Image {
  const simd = simdKernels();
  const { channels, bitDepth, samples } = photo;
  const colour8 = channel === 'luma' && bitDepth === 8 && (channels === 3 || channels === 4) && samples instanceof Uint8Array;
  if (!simd || !colour8 || samples.length !== photo.width * photo.height * channels) return channelImage(photo, channel, out);
  return simd.lumaRgb8(samples, channels, BT601_WEIGHTS, imageLike(photo, out)) ?? channelImage(photo, channel, out);
}

/** The input channel and its quality figures (qualityFigures of inputChannel's image, the same values). */
export function inputWithQuality(photo: RawPhoto, channel: InputChannel, out?: Image): { input: Image; quality: QualityFigures } {
  const simd = simdKernels();
  const { width, height, channels, bitDepth, samples } = photo;
  const whole = bitDepth === 8 && samples instanceof Uint8Array && samples.length === width * height * channels;
  const oneChannel = channels === 1 || (channel === 'luma' && (channels === 3 || channels === 4));
  if (simd && whole && oneChannel) {
    const input = imageLike(photo, out);
    const sums = simd.photoWithQualitySums(samples, channels as 1 | 3 | 4, BT601_WEIGHTS, input);
    if (sums) return { input, quality: qualityFromSums(sums, width * height) };
  }
  const input = inputChannel(photo, channel, out);
  return { input, quality: qualityFigures(input, bitDepth) };
}

/**
 * A rule's first two steps, a Gaussian and a gradient whose smoothed image nobody reads, straight from
 * an 8-bit grey or colour photo (luma) on the SIMD engine: the quality figures, and the gradient into
 * `out` (as gaussianGradient of the input, to the bit), from the photo's bytes; `input` gets its
 * samples (channelImage's) only when something reads them. null where this does not apply: the
 * caller then converts the input (inputWithQuality).
 */
export function sweepFromPhoto(
  photo: RawPhoto,
  channel: InputChannel,
  sigma: number,
  operator: GradientOperator,
  output: 'x' | 'y' | 'magnitude',
  border: BorderMode,
  input: Image,
  out: Image,
  range?: ValueRange,
): QualityFigures | null {
  const simd = simdKernels();
  const { width, height, channels, bitDepth, samples } = photo;
  const oneChannel = channels === 1 || (channel === 'luma' && (channels === 3 || channels === 4));
  const whole = bitDepth === 8 && samples instanceof Uint8Array && samples.length === width * height * channels;
  if (!simd || !oneChannel || !whole || !simd.owns(input) || input.width !== width || input.height !== height) return null;
  const g = gaussianWeights(sigma);
  const [a, b] = gradientWeights(operator);
  const sums = simd.photoQualityAndSmoothedGradient(samples, channels as 1 | 3 | 4, BT601_WEIGHTS, width, height, g, g, a, b, output, border, out, range);
  if (!sums) return null;
  input.fillLater(() => inputChannel(photo, channel, input));
  return qualityFromSums(sums, width * height);
}
