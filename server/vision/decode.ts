// Decodes an uploaded photo with sharp into the engine's raw samples: JPEG, PNG, TIFF or WebP,
// 8- or 16-bit, grey or colour (channel conversion, including BT.601 luma, is the engine's).
// EXIF orientation is applied, so the image is seen as the camera operator saw it.
import sharp from 'sharp';
import type { RawPhoto } from '../../shared/vision/image';

/** Largest photo accepted: 50 megapixels (a 5 MP station camera leaves ample room). */
export const DEFAULT_MAX_PIXELS = 50_000_000;

export const ACCEPTED_FORMATS = ['jpeg', 'png', 'tiff', 'webp'] as const;
export type PhotoFormat = (typeof ACCEPTED_FORMATS)[number];

export type PhotoDecodeErrorCode = 'empty_file' | 'not_an_image' | 'unsupported_format' | 'corrupt_image' | 'too_many_pixels';

const STATUS: Record<PhotoDecodeErrorCode, 400 | 413 | 415> = {
  empty_file: 400,
  corrupt_image: 400,
  not_an_image: 415,
  unsupported_format: 415,
  too_many_pixels: 413,
};

/** A photo that cannot be inspected; `status` is the HTTP status the API answers with. */
export class PhotoDecodeError extends Error {
  readonly status: 400 | 413 | 415;
  constructor(readonly code: PhotoDecodeErrorCode, message: string) {
    super(message);
    this.name = 'PhotoDecodeError';
    this.status = STATUS[code];
  }
}

export interface DecodedPhoto extends RawPhoto {
  readonly format: PhotoFormat;
}

export interface DecodeOptions {
  maxPixels?: number;
}

export async function decodePhoto(input: Uint8Array, options: DecodeOptions = {}): Promise<DecodedPhoto> {
  const maxPixels = options.maxPixels ?? DEFAULT_MAX_PIXELS;
  if (input.length === 0) throw new PhotoDecodeError('empty_file', 'the file is empty');
  let meta: sharp.Metadata;
  try {
    meta = await sharp(input, { limitInputPixels: false }).metadata();
  } catch {
    throw new PhotoDecodeError('not_an_image', 'the file is not a readable image (JPEG, PNG, TIFF or WebP expected)');
  }
  const format = meta.format as string | undefined;
  if (!format || !(ACCEPTED_FORMATS as readonly string[]).includes(format)) {
    throw new PhotoDecodeError('unsupported_format', `${format ?? 'unknown'} images are not accepted; use JPEG, PNG, TIFF or WebP`);
  }
  const width = meta.width ?? 0;
  const height = meta.height ?? 0;
  if (width < 1 || height < 1) throw new PhotoDecodeError('corrupt_image', 'the image has no pixels');
  if (width * height > maxPixels) {
    throw new PhotoDecodeError(
      'too_many_pixels',
      `the image has ${width}x${height} = ${width * height} pixels; at most ${maxPixels} are accepted`,
    );
  }
  const sixteenBit = meta.depth === 'ushort' || meta.depth === 'short';
  const grey = (meta.channels ?? 3) <= 2 && meta.space !== 'cmyk';
  // Keep the stored interpretation: without an explicit colour space sharp would widen grey to
  // sRGB and reduce 16-bit samples to 8-bit ones.
  const space = grey ? (sixteenBit ? 'grey16' : 'b-w') : sixteenBit ? 'rgb16' : 'srgb';
  try {
    const { data, info } = await sharp(input, { limitInputPixels: maxPixels, failOn: 'error' })
      .rotate()
      .toColourspace(space)
      .raw({ depth: sixteenBit ? 'ushort' : 'uchar' })
      .toBuffer({ resolveWithObject: true });
    const channels = info.channels as 1 | 2 | 3 | 4;
    // Copied out of sharp's buffer, whose memory V8 cannot move to another thread: handed to the
    // worker pool, it was cloned instead (a copy on each side, 7 ms for a 5 MP colour photo here),
    // where a buffer of our own moves for nothing.
    const samples = sixteenBit
      ? new Uint16Array(data.buffer, data.byteOffset, data.byteLength / 2).slice()
      : new Uint8Array(data.buffer, data.byteOffset, data.byteLength).slice();
    return { width: info.width, height: info.height, channels, bitDepth: sixteenBit ? 16 : 8, samples, format: format as PhotoFormat };
  } catch (e) {
    throw new PhotoDecodeError('corrupt_image', `the ${format} image is damaged or truncated (${(e as Error).message.split('\n')[0]})`);
  }
}
