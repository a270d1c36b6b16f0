/** The fictional plant's part families: their nominal geometry, materials, camera framing and likely defects. */
import type { Random } from './random';
import { distanceToRoundedRect, type Point } from './shapes';
import type { DefectKind, FamilyName } from './types';

export type Rgb = readonly [number, number, number];

export type Outline =
  | { shape: 'rounded-rect'; halfWidth: number; halfHeight: number; cornerRadius: number }
  | { shape: 'disc'; radius: number };

export interface Hole {
  x: number;
  y: number;
  radius: number;
}

/** How the surface looks up close: rolling lines on sheet, turning grooves, or moulded speckle. */
export type SurfaceFinish = 'rolled' | 'turned' | 'moulded';

export interface PartFamily {
  name: FamilyName;
  partType: string;
  outline: Outline;
  holes: readonly Hole[];
  /** Radius in mm of a circle around the part centre that holds the part and any edge defect. */
  reachMm: number;
  /** Width of the camera's field of view in mm at the station (the frame is 4:3). */
  fieldOfViewMm: number;
  partColour: Rgb;
  backgroundColour: Rgb;
  finish: SurfaceFinish;
  defectKinds: readonly DefectKind[];
  scratchLengthMm: readonly [number, number];
  crackLengthMm: readonly [number, number];
  /** Brightness factor of a scratch: below 1 darker (metal), above 1 lighter (scuffed rubber). */
  scratchContrast: number;
  undersizedHoleRatio: readonly [number, number];
}

/** Pressed steel bracket, zinc plated, with two M6 clearance holes (6.6 mm, ISO 273 medium series, from memory). */
const bracket: PartFamily = {
  name: 'bracket',
  partType: 'KW-BR-6030',
  outline: { shape: 'rounded-rect', halfWidth: 30, halfHeight: 15, cornerRadius: 4 },
  holes: [
    { x: -20, y: 0, radius: 3.3 },
    { x: 20, y: 0, radius: 3.3 },
  ],
  reachMm: 34,
  fieldOfViewMm: 100,
  partColour: [0.66, 0.68, 0.72],
  backgroundColour: [0.17, 0.19, 0.2],
  finish: 'rolled',
  defectKinds: ['scratch', 'chip', 'burr', 'missing-hole', 'undersized-hole', 'crack'],
  scratchLengthMm: [5, 16],
  crackLengthMm: [3, 8],
  scratchContrast: 0.55,
  undersizedHoleRatio: [0.55, 0.8],
};

/** Turned M16 flat washer, 17 mm bore and 30 mm outside (ISO 7089 dimensions, from memory). */
const washer: PartFamily = {
  name: 'washer',
  partType: 'KW-WA-M16',
  outline: { shape: 'disc', radius: 15 },
  holes: [{ x: 0, y: 0, radius: 8.5 }],
  reachMm: 17,
  fieldOfViewMm: 56,
  partColour: [0.62, 0.61, 0.58],
  backgroundColour: [0.13, 0.16, 0.24],
  finish: 'turned',
  defectKinds: ['scratch', 'chip', 'burr', 'undersized-hole', 'crack'],
  scratchLengthMm: [2.5, 5],
  crackLengthMm: [2, 4],
  scratchContrast: 0.55,
  undersizedHoleRatio: [0.75, 0.9],
};

/** Moulded rubber gasket ring, 50 mm outside and 38 mm inside: dark part on a light board. */
const gasket: PartFamily = {
  name: 'gasket',
  partType: 'KW-GR-5038',
  outline: { shape: 'disc', radius: 25 },
  holes: [{ x: 0, y: 0, radius: 19 }],
  reachMm: 27,
  fieldOfViewMm: 90,
  partColour: [0.1, 0.1, 0.11],
  backgroundColour: [0.56, 0.54, 0.49],
  finish: 'moulded',
  defectKinds: ['scratch', 'chip', 'burr', 'crack'],
  scratchLengthMm: [2, 4.5],
  crackLengthMm: [2, 4],
  scratchContrast: 2.2,
  undersizedHoleRatio: [1, 1],
};

export const PART_FAMILIES: Readonly<Record<FamilyName, PartFamily>> = { bracket, washer, gasket };
export const FAMILY_NAMES: readonly FamilyName[] = ['bracket', 'washer', 'gasket'];

export function isFamilyName(name: string): name is FamilyName {
  return (FAMILY_NAMES as readonly string[]).includes(name);
}

/** Signed distance in mm to the nominal outline, before holes are cut. */
export function distanceToOutline(outline: Outline, x: number, y: number): number {
  if (outline.shape === 'disc') return Math.hypot(x, y) - outline.radius;
  return distanceToRoundedRect(x, y, outline.halfWidth, outline.halfHeight, outline.cornerRadius);
}

export interface EdgePoint {
  point: Point;
  /** Unit vector pointing out of the part. */
  normal: Point;
}

/** A random point on the outer edge, away from corners by at least `clearanceMm`. */
export function pickEdgePoint(outline: Outline, clearanceMm: number, random: Random): EdgePoint {
  if (outline.shape === 'disc') {
    const angle = random.between(0, 2 * Math.PI);
    const normal = { x: Math.cos(angle), y: Math.sin(angle) };
    return { point: { x: normal.x * outline.radius, y: normal.y * outline.radius }, normal };
  }
  const { halfWidth, halfHeight, cornerRadius } = outline;
  const straightX = halfWidth - cornerRadius - clearanceMm;
  const straightY = halfHeight - cornerRadius - clearanceMm;
  const onLongSide = random.chance(straightX / (straightX + straightY));
  const sign = random.chance(0.5) ? 1 : -1;
  if (onLongSide) {
    return { point: { x: random.between(-straightX, straightX), y: sign * halfHeight }, normal: { x: 0, y: sign } };
  }
  return { point: { x: sign * halfWidth, y: random.between(-straightY, straightY) }, normal: { x: sign, y: 0 } };
}
