/** A part with its defects, evaluated at a point of its own millimetre coordinates: shape and surface shade. */
import { distanceToOutline, type Hole, type Outline, type PartFamily, type SurfaceFinish } from './families';
import { latticeNoise } from './random';
import { coverage, distanceToCircle, distanceToStroke, type Point } from './shapes';
import type { Defect } from './types';

interface Segment {
  a: Point;
  b: Point;
}

/** A line drawn on the surface (scratch or crack): it scales the surface brightness by `contrast`. */
interface SurfaceMark {
  segments: Segment[];
  widthMm: number;
  contrast: number;
}

interface Bite {
  centre: Point;
  radiusMm: number;
}

interface Lump {
  segment: Segment;
  widthMm: number;
}

export interface PartModel {
  outline: Outline;
  holes: Hole[];
  bites: Bite[];
  lumps: Lump[];
  marks: SurfaceMark[];
  finish: SurfaceFinish;
}

export function chipDiscCentre(defect: Extract<Defect, { kind: 'chip' }>): Point {
  const offset = defect.radiusMm - defect.depthMm;
  return { x: defect.edge.x + defect.normal.x * offset, y: defect.edge.y + defect.normal.y * offset };
}

/** The burr is a round-ended stroke standing out of the edge along the normal by `heightMm`. */
export function burrSegment(defect: Extract<Defect, { kind: 'burr' }>): Segment {
  const inset = defect.widthMm / 2;
  const outset = defect.heightMm - defect.widthMm / 2;
  const { edge, normal } = defect;
  return {
    a: { x: edge.x - normal.x * inset, y: edge.y - normal.y * inset },
    b: { x: edge.x + normal.x * outset, y: edge.y + normal.y * outset },
  };
}

export function buildPartModel(family: PartFamily, defects: readonly Defect[]): PartModel {
  const holes: Array<Hole | undefined> = family.holes.map((hole) => ({ ...hole }));
  const model: PartModel = { outline: family.outline, holes: [], bites: [], lumps: [], marks: [], finish: family.finish };
  for (const defect of defects) {
    switch (defect.kind) {
      case 'missing-hole':
        holes[defect.hole] = undefined;
        break;
      case 'undersized-hole': {
        const hole = holes[defect.hole];
        if (hole) hole.radius = defect.radiusMm;
        break;
      }
      case 'chip':
        model.bites.push({ centre: chipDiscCentre(defect), radiusMm: defect.radiusMm });
        break;
      case 'burr':
        model.lumps.push({ segment: burrSegment(defect), widthMm: defect.widthMm });
        break;
      case 'scratch':
        model.marks.push({ segments: [{ a: defect.from, b: defect.to }], widthMm: defect.widthMm, contrast: defect.contrast });
        break;
      case 'crack': {
        const segments = defect.path.slice(1).map((b, i) => ({ a: defect.path[i], b }));
        model.marks.push({ segments, widthMm: defect.widthMm, contrast: defect.contrast });
        break;
      }
    }
  }
  model.holes = holes.filter((hole): hole is Hole => hole !== undefined);
  return model;
}

/** Signed distance in mm to the part's material (negative on the part). */
export function distanceToPart(model: PartModel, x: number, y: number): number {
  let d = distanceToOutline(model.outline, x, y);
  for (const hole of model.holes) d = Math.max(d, -distanceToCircle(x, y, hole.x, hole.y, hole.radius));
  for (const bite of model.bites) d = Math.max(d, -distanceToCircle(x, y, bite.centre.x, bite.centre.y, bite.radiusMm));
  for (const lump of model.lumps) d = Math.min(d, distanceToStroke(x, y, lump.segment.a, lump.segment.b, lump.widthMm));
  return d;
}

/** Brightness factor of scratches and cracks at a point (1 where there is none). */
export function markShade(model: PartModel, x: number, y: number, mmPerPx: number): number {
  let shade = 1;
  for (const mark of model.marks) {
    let d = Infinity;
    for (const { a, b } of mark.segments) d = Math.min(d, distanceToStroke(x, y, a, b, mark.widthMm));
    const covered = coverage(d / mmPerPx);
    if (covered > 0) shade *= 1 + (mark.contrast - 1) * covered;
  }
  return shade;
}

const ROLLING_LINE_PITCH_MM = 0.06;
const TURNING_GROOVE_PITCH_MM = 0.3;
const MOULD_GRAIN_MM = 0.08;

/** Fine surface texture in part coordinates, so that it moves with the part and blurs with defocus. */
export function finishShade(finish: SurfaceFinish, x: number, y: number): number {
  switch (finish) {
    case 'rolled':
      return 1 + 0.035 * latticeNoise(0, Math.floor(y / ROLLING_LINE_PITCH_MM), 11);
    case 'turned':
      return 1 + 0.04 * Math.sin((2 * Math.PI * Math.hypot(x, y)) / TURNING_GROOVE_PITCH_MM);
    case 'moulded':
      return 1 + 0.08 * latticeNoise(Math.floor(x / MOULD_GRAIN_MM), Math.floor(y / MOULD_GRAIN_MM), 23);
  }
}
