// Turns a step's float32 output into display pixels: masks black/white, signed values centred on
// grey (0 is mid-grey, the largest magnitude is black or white), intensities scaled min..max,
// directions (degrees, -180..180) scaled over their full circle. Display only: never measured.
import type { Image } from '../../shared/vision/image';
import type { OutputKind } from '../../shared/vision/pipeline';

export interface DisplayPixels {
  width: number;
  height: number;
  /** RGBA, 4 bytes per pixel. */
  rgba: Uint8ClampedArray;
}

/** The display size that fits `maxSide`, keeping the aspect ratio; never larger than the image. */
export function fitSize(width: number, height: number, maxSide: number): { width: number; height: number } {
  const scale = Math.min(1, maxSide / Math.max(width, height));
  return { width: Math.max(1, Math.round(width * scale)), height: Math.max(1, Math.round(height * scale)) };
}

/** Nearest-neighbour sampling to the display size, then the kind's grey mapping. */
export function renderForDisplay(image: Image, kind: OutputKind, maxSide: number): DisplayPixels {
  const { width, height } = fitSize(image.width, image.height, maxSide);
  const sampled = new Float32Array(width * height);
  const xs = new Int32Array(width);
  for (let x = 0; x < width; x++) xs[x] = Math.min(image.width - 1, Math.floor(((x + 0.5) * image.width) / width));
  let min = Infinity;
  let max = -Infinity;
  for (let y = 0; y < height; y++) {
    const row = Math.min(image.height - 1, Math.floor(((y + 0.5) * image.height) / height)) * image.width;
    for (let x = 0; x < width; x++) {
      const v = image.data[row + xs[x]];
      sampled[y * width + x] = v;
      if (v < min) min = v;
      if (v > max) max = v;
    }
  }
  const grey = greyMapping(kind, min, max);
  const rgba = new Uint8ClampedArray(width * height * 4);
  for (let i = 0; i < sampled.length; i++) {
    const g = grey(sampled[i]);
    rgba[i * 4] = g;
    rgba[i * 4 + 1] = g;
    rgba[i * 4 + 2] = g;
    rgba[i * 4 + 3] = 255;
  }
  return { width, height, rgba };
}

function greyMapping(kind: OutputKind, min: number, max: number): (v: number) => number {
  switch (kind) {
    case 'mask':
      return (v) => (v > 0 ? 255 : 0);
    case 'signed': {
      const reach = Math.max(Math.abs(min), Math.abs(max)) || 1;
      return (v) => 127.5 + (127.5 * v) / reach;
    }
    case 'direction':
      return (v) => ((v + 180) / 360) * 255;
    case 'intensity': {
      const span = max - min;
      return span > 0 ? (v) => ((v - min) / span) * 255 : () => 128;
    }
  }
}
