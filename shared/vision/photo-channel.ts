// The rule's input channel of a photo, as the rule runner takes it: 8-bit colour to luma through the
// SIMD kernels when they run (the same bits as channelImage), anything else through channelImage.
// With the quality gate's figures, an 8-bit grey or colour photo takes one pass over its rows.
import type { GradientOperator, InputChannel } from '../rules/schema';
import type { BorderMode } from './border';
import { simdKernels } from './engine';
import { gradientWeights } from './gradient';
import { BT601_WEIGHTS, channelImage, imageLike, type Image, type RawPhoto, type ValueRange } from './image';
import { gaussianWeights, type Kernel } from './kernels';
import { qualityFigures, qualityFromSums, type QualityFigures, type QualitySums } from './quality';
import type { ResidentImage } from './wasm/resident-image';

export function inputChannel(photo: RawPhoto, channel: InputChannel, out?: Image): Image {
  const simd = simdKernels();
  const { channels, bitDepth, samples } = photo;
  // An 8-bit grey photo's image in the module keeps the bytes too, for the kernels that read them.
  if (simd && out && simd.owns(out) && out.width === photo.width && out.height === photo.height && eightBitSource(photo, channel)?.channels === 1) {
    return simd.greyInput(samples as Uint8Array, out);
  }
  const colour8 = channel === 'luma' && bitDepth === 8 && (channels === 3 || channels === 4) && samples instanceof Uint8Array;
  if (!simd || !colour8 || samples.length !== photo.width * photo.height * channels) return channelImage(photo, channel, out);
  return simd.lumaRgb8(samples, channels, BT601_WEIGHTS, imageLike(photo, out)) ?? channelImage(photo, channel, out);
}

/** The input channel and its quality figures (qualityFigures of inputChannel's image, the same values). */
export function inputWithQuality(photo: RawPhoto, channel: InputChannel, out?: Image): { input: Image; quality: QualityFigures } {
  const simd = simdKernels();
  const bytes = eightBitSource(photo, channel);
  if (simd && bytes) {
    const input = imageLike(photo, out);
    const sums = simd.photoWithQualitySums(bytes.samples, bytes.channels, BT601_WEIGHTS, input);
    if (sums) return { input, quality: qualityFromSums(sums, photo.width * photo.height) };
  }
  const input = inputChannel(photo, channel, out);
  return { input, quality: qualityFigures(input, photo.bitDepth) };
}

/** The photo's bytes when the kernels can read the channel from them: 8-bit grey, or 8-bit colour for luma. */
function eightBitSource(photo: RawPhoto, channel: InputChannel): { samples: Uint8Array; channels: 1 | 3 | 4 } | null {
  const { width, height, channels, bitDepth, samples } = photo;
  const oneChannel = channels === 1 || (channel === 'luma' && (channels === 3 || channels === 4));
  const whole = bitDepth === 8 && samples instanceof Uint8Array && samples.length === width * height * channels;
  return oneChannel && whole ? { samples: samples as Uint8Array, channels: channels as 1 | 3 | 4 } : null;
}

/** A rule's first step as far as reading the input's 8-bit copy goes: a correlation, or a median. */
export type EightBitReader = { kernel: Kernel } | { medianSize: number };

/**
 * The quality figures of an 8-bit grey photo on the SIMD engine from its bytes, for a rule whose first
 * step reads the input's 8-bit copy (SimdKernels.readsEightBit, medianReadsEightBit). `input` keeps the
 * bytes and gets its float32 samples only when something reads them. null where this does not apply:
 * the caller then converts the input (inputWithQuality).
 */
export function eightBitInputFromPhoto(photo: RawPhoto, channel: InputChannel, input: Image, first: EightBitReader): QualityFigures | null {
  const direct = directPhoto(photo, channel, input);
  if (!direct || direct.channels !== 1) return null;
  if (!('kernel' in first ? direct.simd.readsEightBit(first.kernel) : direct.simd.medianReadsEightBit(first.medianSize))) return null;
  return qualityFromSums(direct.simd.greyQualityLater(direct.samples, direct.input), photo.width * photo.height);
}

/**
 * A rule's first two steps, a Gaussian and a gradient whose smoothed image nobody reads, straight from
 * an 8-bit grey or colour photo (luma) on the SIMD engine: the quality figures, and the gradient into
 * `out` (as gaussianGradient of the input, to the bit), from the photo's bytes; `input` gets its
 * samples (inputChannel's) only when something reads them. null where this does not apply: the
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
  const direct = directPhoto(photo, channel, input);
  if (!direct) return null;
  const g = gaussianWeights(sigma);
  const [a, b] = gradientWeights(operator);
  const sums = direct.simd.photoQualityAndSmoothedGradient(direct.samples, direct.channels, BT601_WEIGHTS, g, g, a, b, output, border, out, range);
  return opened(sums, photo, channel, direct.input);
}

/** As sweepFromPhoto, for a rule opening with a separable step (column ⊗ row + offset: correlateSeparable of the input, to the bit). */
export function separableFromPhoto(
  photo: RawPhoto,
  channel: InputChannel,
  column: ArrayLike<number>,
  row: ArrayLike<number>,
  offset: number,
  border: BorderMode,
  input: Image,
  out: Image,
): QualityFigures | null {
  const direct = directPhoto(photo, channel, input);
  if (!direct) return null;
  const sums = direct.simd.photoQualityAndSeparable(direct.samples, direct.channels, BT601_WEIGHTS, column, row, border, offset, out);
  return opened(sums, photo, channel, direct.input);
}

/** The SIMD kernels, and the photo's bytes as one channel or colour for luma, when a step can read them directly. */
function directPhoto(photo: RawPhoto, channel: InputChannel, input: Image) {
  const simd = simdKernels();
  const bytes = eightBitSource(photo, channel);
  if (!simd || !bytes || !simd.owns(input) || input.width !== photo.width || input.height !== photo.height) return null;
  return { simd, ...bytes, input };
}

function opened(sums: QualitySums | null, photo: RawPhoto, channel: InputChannel, input: ResidentImage): QualityFigures | null {
  if (!sums) return null;
  input.fillLater(() => inputChannel(photo, channel, input));
  return qualityFromSums(sums, photo.width * photo.height);
}
