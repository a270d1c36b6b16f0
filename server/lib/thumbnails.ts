import sharp from 'sharp';

/** A small JPEG for lists and strips, made once on upload. */
export function makeThumbnail(bytes: Buffer, maxSide = 320): Promise<Buffer> {
  return sharp(bytes).rotate().resize({ width: maxSide, height: maxSide, fit: 'inside', withoutEnlargement: true }).jpeg({ quality: 80 }).toBuffer();
}
