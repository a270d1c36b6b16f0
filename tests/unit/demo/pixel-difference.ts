/** Helpers for the demo tests: where a rendered photo differs from its defect-free render. */
import type { PixelBox, RenderedPart } from '../../../server/demo';

/** Per-pixel absolute difference between photo and defect-free render, averaged over channels. */
export function differenceMap(rendered: RenderedPart): Float32Array {
  const { width, height, channels, pixels, clean } = rendered;
  const out = new Float32Array(width * height);
  for (let i = 0; i < out.length; i++) {
    let sum = 0;
    for (let c = 0; c < channels; c++) sum += Math.abs(pixels[i * channels + c] - clean[i * channels + c]);
    out[i] = sum / channels;
  }
  return out;
}

export function countAbove(difference: Float32Array, width: number, box: PixelBox, threshold: number): number {
  let count = 0;
  for (let y = box.y; y < box.y + box.h; y++) {
    for (let x = box.x; x < box.x + box.w; x++) if (difference[y * width + x] > threshold) count++;
  }
  return count;
}

export function grow(box: PixelBox, margin: number): PixelBox {
  return { x: box.x - margin, y: box.y - margin, w: box.w + 2 * margin, h: box.h + 2 * margin };
}

export function contains(box: PixelBox, x: number, y: number): boolean {
  return x >= box.x && x < box.x + box.w && y >= box.y && y < box.y + box.h;
}

export function largestValueIn(difference: Float32Array, width: number, box: PixelBox): number {
  let largest = 0;
  for (let y = box.y; y < box.y + box.h; y++) {
    for (let x = box.x; x < box.x + box.w; x++) largest = Math.max(largest, difference[y * width + x]);
  }
  return largest;
}

/** Pixel positions inside `box` whose difference exceeds `threshold`. */
export function pixelsAbove(difference: Float32Array, width: number, height: number, box: PixelBox, threshold: number) {
  const points: Array<{ x: number; y: number }> = [];
  for (let y = Math.max(0, box.y); y < Math.min(height, box.y + box.h); y++) {
    for (let x = Math.max(0, box.x); x < Math.min(width, box.x + box.w); x++) {
      if (difference[y * width + x] > threshold) points.push({ x, y });
    }
  }
  return points;
}

/** Extent of a set of pixels along its principal axis (second moments), in pixels, end pixel included. */
export function principalExtent(points: Array<{ x: number; y: number }>): number {
  const n = points.length;
  const mx = points.reduce((s, p) => s + p.x, 0) / n;
  const my = points.reduce((s, p) => s + p.y, 0) / n;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (const p of points) {
    sxx += (p.x - mx) ** 2;
    syy += (p.y - my) ** 2;
    sxy += (p.x - mx) * (p.y - my);
  }
  const angle = 0.5 * Math.atan2(2 * sxy, sxx - syy);
  const projections = points.map((p) => (p.x - mx) * Math.cos(angle) + (p.y - my) * Math.sin(angle));
  return Math.max(...projections) - Math.min(...projections) + 1;
}
