// The one image type of the engine: a single channel of float32 samples, row-major, no padding.
// 8- and 16-bit inputs are converted once, keeping their values (0–255 or 0–65535).
import type { InputChannel } from '../rules/schema';

export interface Image {
  readonly width: number;
  readonly height: number;
  readonly data: Float32Array;
}

export type BitDepth = 8 | 16;

/** Smallest and largest value of an image, NaN samples left out; NaN fields: not known. */
export interface ValueRange {
  min: number;
  max: number;
}

/** Decoded samples of a photo as the decoder gives them: interleaved channels, 8- or 16-bit. */
export interface RawPhoto {
  readonly width: number;
  readonly height: number;
  /** 1 grey, 2 grey + alpha, 3 RGB, 4 RGB + alpha. */
  readonly channels: 1 | 2 | 3 | 4;
  readonly bitDepth: BitDepth;
  readonly samples: Uint8Array | Uint16Array;
}

/** ITU-R BT.601 luma weights (Rec. ITU-R BT.601-7, §2.5.1: E'Y = 0.299 E'R + 0.587 E'G + 0.114 E'B). */
export const BT601_WEIGHTS = { red: 0.299, green: 0.587, blue: 0.114 } as const;

export function createImage(width: number, height: number, data?: Float32Array): Image {
  if (!Number.isInteger(width) || !Number.isInteger(height) || width < 1 || height < 1) {
    throw new RangeError(`an image needs a positive whole width and height, got ${width}x${height}`);
  }
  const pixels = width * height;
  if (data && data.length !== pixels) {
    throw new RangeError(`a ${width}x${height} image needs ${pixels} samples, got ${data.length}`);
  }
  return { width, height, data: data ?? new Float32Array(pixels) };
}

/** An image from any array of samples (8-bit, 16-bit, plain numbers), values kept as they are. */
export function imageFromSamples(width: number, height: number, samples: ArrayLike<number>): Image {
  const image = createImage(width, height);
  image.data.set(samples);
  return image;
}

export function cloneImage(image: Image): Image {
  return createImage(image.width, image.height, image.data.slice());
}

export function maxSampleValue(bitDepth: BitDepth): number {
  return bitDepth === 16 ? 65535 : 255;
}

/** Reuses `out` when it has the right size; otherwise allocates. */
export function imageLike(src: { width: number; height: number }, out?: Image): Image {
  if (out && out.width === src.width && out.height === src.height) {
    // The step overwrites every sample of its output: samples a workspace image still holds in
    // packed bits (or waits to fill) are dropped unwritten, as the SIMD kernels drop them.
    if (out !== src && holdsDeferredSamples(out)) out.discard();
    return out;
  }
  return createImage(src.width, src.height);
}

/** A workspace image whose samples may wait until first read (deferrable-image.ts, wasm/resident-image.ts). */
interface DeferringImage extends Image {
  discard(): void;
}

function holdsDeferredSamples(image: Image): image is DeferringImage {
  return typeof (image as Partial<DeferringImage>).discard === 'function';
}

/**
 * The rule's input channel of a photo. Luma uses the BT.601 weights on the stored (gamma-encoded)
 * samples, computed in double precision and kept unrounded as float32. A grey photo is its own
 * luma, red, green and blue. Alpha is ignored.
 */
export function channelImage(photo: RawPhoto, channel: InputChannel, out?: Image): Image {
  const { width, height, channels, samples } = photo;
  const pixels = width * height;
  if (samples.length !== pixels * channels) {
    throw new RangeError(`a ${width}x${height} photo with ${channels} channel(s) needs ${pixels * channels} samples, got ${samples.length}`);
  }
  const dst = imageLike(photo, out);
  const data = dst.data;
  if (channels === 1) {
    data.set(samples);
    return dst;
  }
  if (channels === 2) {
    for (let p = 0, s = 0; p < pixels; p++, s += channels) data[p] = samples[s];
    return dst;
  }
  if (channel !== 'luma') {
    const offset = channel === 'red' ? 0 : channel === 'green' ? 1 : 2;
    for (let p = 0, s = offset; p < pixels; p++, s += channels) data[p] = samples[s];
    return dst;
  }
  if (samples instanceof Uint8Array) {
    if (channels === 3) lumaOf8(samples, data, 3);
    else lumaOf8(samples, data, 4);
  } else {
    lumaOf16(samples, data, channels);
  }
  return dst;
}

// Luma in loops of their own for 8-bit and for 16-bit samples: one loop reading both array types
// loads through either (5 MP colour, one CPU: 4.0 → 2.8 ns/px). Indices are truncated with | 0, so
// that V8 adds them without an overflow check (2.9 → 2.7). Each pixel is the same
// wr·R + wg·G + wb·B in double precision, rounded once to float32.
function lumaOf8(samples: Uint8Array, data: Float32Array, channels: 3 | 4): void {
  const wr = BT601_WEIGHTS.red, wg = BT601_WEIGHTS.green, wb = BT601_WEIGHTS.blue;
  for (let p = 0, s = 0; p < data.length; p = (p + 1) | 0, s = (s + channels) | 0) {
    data[p] = wr * samples[s] + wg * samples[(s + 1) | 0] + wb * samples[(s + 2) | 0];
  }
}

function lumaOf16(samples: Uint16Array, data: Float32Array, channels: number): void {
  const wr = BT601_WEIGHTS.red, wg = BT601_WEIGHTS.green, wb = BT601_WEIGHTS.blue;
  for (let p = 0, s = 0; p < data.length; p = (p + 1) | 0, s = (s + channels) | 0) {
    data[p] = wr * samples[s] + wg * samples[(s + 1) | 0] + wb * samples[(s + 2) | 0];
  }
}
