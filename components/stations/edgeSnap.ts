// Moving a calibration mark onto the target's edge: a tap is only as precise as a finger, so each
// mark moves to the strongest change of brightness along the line through both marks, near the tap.

export interface ImagePoint {
  x: number;
  y: number;
}

/** One brightness value per pixel, row by row. */
export interface GreyImage {
  width: number;
  height: number;
  data: ArrayLike<number>;
}

/** Distance between two points in the photo's own pixels. */
export function pixelDistance(a: ImagePoint, b: ImagePoint): number {
  return Math.hypot(b.x - a.x, b.y - a.y);
}

/**
 * Brightness at a point by bilinear interpolation; pixel (i, j) covers [i, i+1) × [j, j+1), so its
 * centre is (i + 0.5, j + 0.5), the convention the marks use. Points outside take the nearest pixel.
 */
export function sampleBilinear(image: GreyImage, x: number, y: number): number {
  const clamp = (v: number, max: number) => Math.min(Math.max(v, 0), max);
  const fx = clamp(x - 0.5, image.width - 1);
  const fy = clamp(y - 0.5, image.height - 1);
  const x0 = Math.floor(fx);
  const y0 = Math.floor(fy);
  const x1 = Math.min(x0 + 1, image.width - 1);
  const y1 = Math.min(y0 + 1, image.height - 1);
  const tx = fx - x0;
  const ty = fy - y0;
  const at = (i: number, j: number) => image.data[j * image.width + i];
  const top = at(x0, y0) * (1 - tx) + at(x1, y0) * tx;
  const bottom = at(x0, y1) * (1 - tx) + at(x1, y1) * tx;
  return top * (1 - ty) + bottom * ty;
}

/**
 * Fractional index of the strongest step in a profile: the largest |central difference|, refined by
 * the vertex of the parabola through it and its two neighbours (three-point peak interpolation).
 * Null when no step reaches minStep (brightness per sample).
 */
export function strongestStep(profile: ArrayLike<number>, minStep: number): number | null {
  const slope = (i: number) => Math.abs(profile[i + 1] - profile[i - 1]) / 2;
  let best = -1;
  let bestSlope = 0;
  for (let i = 1; i < profile.length - 1; i++) {
    const s = slope(i);
    if (s > bestSlope) {
      bestSlope = s;
      best = i;
    }
  }
  if (best < 0 || bestSlope < minStep) return null;
  if (best < 2 || best > profile.length - 3) return best;
  const before = slope(best - 1);
  const after = slope(best + 1);
  const curvature = before - 2 * bestSlope + after;
  return curvature === 0 ? best : best + (before - after) / (2 * curvature);
}

/** Brightness change per pixel below which a mark stays where it was tapped (no clear edge there). */
export const MIN_EDGE_STEP = 6;

/**
 * The mark moved along the line towards `other` (both ways, at most `reach` pixels) onto the
 * strongest edge there, or null when there is no clear edge within reach.
 */
export function snapToEdge(image: GreyImage, mark: ImagePoint, other: ImagePoint, reach: number): ImagePoint | null {
  const length = pixelDistance(mark, other);
  if (length === 0) return null;
  const ux = (other.x - mark.x) / length;
  const uy = (other.y - mark.y) / length;
  const steps = Math.max(2, Math.ceil(reach));
  const profile = new Float64Array(2 * steps + 1);
  for (let k = -steps; k <= steps; k++) profile[k + steps] = sampleBilinear(image, mark.x + k * ux, mark.y + k * uy);
  const index = strongestStep(profile, MIN_EDGE_STEP);
  if (index === null) return null;
  const shift = index - steps;
  return { x: mark.x + shift * ux, y: mark.y + shift * uy };
}
