// The rule's input channel of a photo, as the rule runner takes it: 8-bit colour to luma through the
// SIMD kernels when they run (the same bits as channelImage), anything else through channelImage.
import type { InputChannel } from '../rules/schema';
import { simdKernels } from './engine';
import { BT601_WEIGHTS, channelImage, imageLike, type Image, type RawPhoto } from './image';

export function inputChannel(photo: RawPhoto, channel: InputChannel, out?: Image): Image {
  const simd = simdKernels();
  const { channels, bitDepth, samples } = photo;
  const colour8 = channel === 'luma' && bitDepth === 8 && (channels === 3 || channels === 4) && samples instanceof Uint8Array;
  if (!simd || !colour8 || samples.length !== photo.width * photo.height * channels) return channelImage(photo, channel, out);
  return simd.lumaRgb8(samples, channels, BT601_WEIGHTS, imageLike(photo, out)) ?? channelImage(photo, channel, out);
}
