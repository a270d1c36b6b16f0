// Definitions written out for the plain engine's tests, independent of shared/vision/border.ts.
import type { BorderMode } from '../../../shared/rules/schema';
import type { Image } from '../../../shared/vision/image';

/**
 * Source position for p on a line of n samples, or −1 for the constant border's zero: OpenCV's
 * BORDER_REFLECT_101 (gfedcb|abcdefgh|gfedcba, reflected again while outside), BORDER_REPLICATE
 * and BORDER_CONSTANT with value 0 (OpenCV imgproc documentation, "Image Filtering", border types; from memory).
 */
export function sourcePosition(p: number, n: number, border: BorderMode): number {
  if (p >= 0 && p < n) return p;
  if (border === 'constant') return -1;
  if (border === 'replicate' || n === 1) return p < 0 ? 0 : n - 1;
  let q = p;
  while (q < 0 || q >= n) q = q < 0 ? -q : 2 * (n - 1) - q;
  return q;
}

/** The size × size neighbourhood of (x, y), row by row, with the border's values. */
export function neighbourhood(image: Image, x: number, y: number, size: number, border: BorderMode): number[] {
  const r = (size - 1) / 2;
  const values: number[] = [];
  for (let j = -r; j <= r; j++) {
    const sy = sourcePosition(y + j, image.height, border);
    for (let i = -r; i <= r; i++) {
      const sx = sourcePosition(x + i, image.width, border);
      values.push(sy < 0 || sx < 0 ? 0 : image.data[sy * image.width + sx]);
    }
  }
  return values;
}

/** The float32 bit patterns of an image, every NaN as one value (IEEE 754 leaves an operation's NaN payload open). */
export function canonicalBits(image: Image): number[] {
  const bits = new Uint32Array(image.data.slice().buffer);
  return Array.from(bits, (b, i) => (Number.isNaN(image.data[i]) ? -1 : b));
}
