/**
 * Signed distances (negative inside) of the simple shapes the parts are built from, in millimetres,
 * and the anti-aliased pixel coverage they give. Formulas after I. Quilez, "2D distance functions"
 * (iquilezles.org, common practice in procedural rendering).
 */

export interface Point {
  x: number;
  y: number;
}

export function distanceToCircle(px: number, py: number, cx: number, cy: number, radius: number): number {
  return Math.hypot(px - cx, py - cy) - radius;
}

/** Rectangle centred on the origin with half sizes (halfWidth, halfHeight) and rounded corners. */
export function distanceToRoundedRect(
  px: number,
  py: number,
  halfWidth: number,
  halfHeight: number,
  cornerRadius: number,
): number {
  const qx = Math.abs(px) - halfWidth + cornerRadius;
  const qy = Math.abs(py) - halfHeight + cornerRadius;
  const outside = Math.hypot(Math.max(qx, 0), Math.max(qy, 0));
  return outside + Math.min(Math.max(qx, qy), 0) - cornerRadius;
}

/** A segment from a to b thickened to a stroke of the given width with round ends. */
export function distanceToStroke(px: number, py: number, a: Point, b: Point, width: number): number {
  const abx = b.x - a.x;
  const aby = b.y - a.y;
  const apx = px - a.x;
  const apy = py - a.y;
  const lengthSquared = abx * abx + aby * aby;
  const t = lengthSquared === 0 ? 0 : Math.min(1, Math.max(0, (apx * abx + apy * aby) / lengthSquared));
  return Math.hypot(apx - t * abx, apy - t * aby) - width / 2;
}

/**
 * Share of a pixel covered by a shape, from its signed distance in pixels: a straight edge through a
 * pixel covers about 0.5 - d of it (common practice for anti-aliasing distance fields).
 */
export function coverage(distancePx: number): number {
  if (distancePx <= -0.5) return 1;
  if (distancePx >= 0.5) return 0;
  return 0.5 - distancePx;
}
