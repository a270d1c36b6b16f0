/** Turning a rendered photo into file bytes with sharp, with fixed options so the bytes repeat exactly. */
import sharp from 'sharp';
import type { Photo } from './render';
import type { BitDepth, ImageFormat } from './types';

const PNG_OPTIONS = { compressionLevel: 6, adaptiveFiltering: false, palette: false } as const;
const JPEG_OPTIONS = { quality: 92, chromaSubsampling: '4:4:4', progressive: false, mozjpeg: false } as const;

export function quantise(pixels: Float32Array, bitDepth: BitDepth): Uint8Array | Uint16Array {
  const max = bitDepth === 16 ? 65535 : 255;
  const out = bitDepth === 16 ? new Uint16Array(pixels.length) : new Uint8Array(pixels.length);
  for (let i = 0; i < pixels.length; i++) out[i] = Math.round(Math.min(1, Math.max(0, pixels[i])) * max);
  return out;
}

export async function encodePhoto(photo: Photo, format: ImageFormat, bitDepth: BitDepth): Promise<Buffer> {
  if (format === 'jpeg' && bitDepth !== 8) throw new Error('JPEG photos are 8-bit only');
  const { width, height, channels } = photo;
  const colourspace = channels === 3 ? (bitDepth === 16 ? 'rgb16' : 'srgb') : bitDepth === 16 ? 'grey16' : 'b-w';
  const image = sharp(quantise(photo.pixels, bitDepth), { raw: { width, height, channels } }).toColourspace(colourspace);
  return format === 'jpeg' ? image.jpeg(JPEG_OPTIONS).toBuffer() : image.png(PNG_OPTIONS).toBuffer();
}
