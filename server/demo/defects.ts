/** Choosing a defect's place and size on a part, and stating its size in millimetres. */
import { pickEdgePoint, type PartFamily } from './families';
import { buildPartModel, distanceToPart } from './part-model';
import type { Random } from './random';
import type { Point } from './shapes';
import type { Defect, DefectKind, DefectSizeMm } from './types';

/**
 * Every defect spans at least this many pixels at the generated scale, so that a labelled defect is one a
 * camera can resolve (Nyquist asks for 2 samples; common practice asks 3 to 4, as the sampling check does).
 */
const MIN_DEFECT_SPAN_PX = 3;
const CRACK_CONTRAST = 0.3;
const CRACK_SEGMENTS = 5;
const PLACEMENT_ATTEMPTS = 200;

export function planDefect(kind: DefectKind, family: PartFamily, mmPerPx: number, random: Random): Defect {
  switch (kind) {
    case 'scratch':
      return planScratch(family, mmPerPx, random);
    case 'crack':
      return planCrack(family, mmPerPx, random);
    case 'chip': {
      const depthMm = Math.max(random.between(0.4, 1.1), MIN_DEFECT_SPAN_PX * mmPerPx);
      const radiusMm = Math.max(depthMm * random.between(1.2, 2), random.between(0.8, 1.8));
      const { point, normal } = pickEdgePoint(family.outline, radiusMm + 1, random);
      return { kind: 'chip', edge: point, normal, radiusMm, depthMm };
    }
    case 'burr': {
      const widthMm = Math.max(random.between(0.5, 1.4), MIN_DEFECT_SPAN_PX * mmPerPx);
      const heightMm = Math.max(random.between(0.35, 0.9), MIN_DEFECT_SPAN_PX * mmPerPx, widthMm / 2 + 0.1);
      const { point, normal } = pickEdgePoint(family.outline, widthMm + 1, random);
      return { kind: 'burr', edge: point, normal, widthMm, heightMm };
    }
    case 'missing-hole':
      return { kind: 'missing-hole', hole: requireHole(family, random) };
    case 'undersized-hole': {
      const hole = requireHole(family, random);
      const [low, high] = family.undersizedHoleRatio;
      return { kind: 'undersized-hole', hole, radiusMm: family.holes[hole].radius * random.between(low, high) };
    }
  }
}

function requireHole(family: PartFamily, random: Random): number {
  if (family.holes.length === 0) throw new Error(`Part family ${family.name} has no hole to make faulty`);
  return random.index(family.holes.length);
}

function scratchWidth(mmPerPx: number, random: Random): number {
  return Math.max(random.between(0.08, 0.25), MIN_DEFECT_SPAN_PX * mmPerPx);
}

/** A straight scratch lying wholly on the material, clear of every edge by its own width. */
function planScratch(family: PartFamily, mmPerPx: number, random: Random): Defect {
  const model = buildPartModel(family, []);
  const widthMm = scratchWidth(mmPerPx, random);
  const reach = family.reachMm;
  for (let attempt = 0; attempt < PLACEMENT_ATTEMPTS; attempt++) {
    const lengthMm = random.between(family.scratchLengthMm[0], family.scratchLengthMm[1]);
    const centre = { x: random.between(-reach, reach), y: random.between(-reach, reach) };
    const angle = random.between(0, Math.PI);
    const half = (lengthMm - widthMm) / 2;
    const from = { x: centre.x - Math.cos(angle) * half, y: centre.y - Math.sin(angle) * half };
    const to = { x: centre.x + Math.cos(angle) * half, y: centre.y + Math.sin(angle) * half };
    if (liesOnMaterial(model, from, to, widthMm + 2 * mmPerPx)) {
      return { kind: 'scratch', from, to, widthMm, contrast: family.scratchContrast };
    }
  }
  throw new Error(`No room for a scratch on a ${family.name}`);
}

function liesOnMaterial(model: ReturnType<typeof buildPartModel>, a: Point, b: Point, clearanceMm: number): boolean {
  const samples = 24;
  for (let i = 0; i <= samples; i++) {
    const t = i / samples;
    if (distanceToPart(model, a.x + (b.x - a.x) * t, a.y + (b.y - a.y) * t) > -clearanceMm) return false;
  }
  return true;
}

/** A crack that starts at the outer edge and wanders inwards in a few straight pieces. */
function planCrack(family: PartFamily, mmPerPx: number, random: Random): Defect {
  const model = buildPartModel(family, []);
  const widthMm = Math.max(random.between(0.05, 0.12), MIN_DEFECT_SPAN_PX * mmPerPx);
  for (let attempt = 0; attempt < PLACEMENT_ATTEMPTS; attempt++) {
    const lengthMm = random.between(family.crackLengthMm[0], family.crackLengthMm[1]);
    const { point, normal } = pickEdgePoint(family.outline, 1.5, random);
    let heading = Math.atan2(-normal.y, -normal.x) + random.between(-0.35, 0.35);
    // Starting on the edge itself: the round end of the stroke opens the crack at the edge.
    const path: Point[] = [{ x: point.x, y: point.y }];
    const step = lengthMm / CRACK_SEGMENTS;
    for (let i = 0; i < CRACK_SEGMENTS; i++) {
      heading += random.between(-0.45, 0.45);
      const last = path[path.length - 1];
      path.push({ x: last.x + Math.cos(heading) * step, y: last.y + Math.sin(heading) * step });
    }
    const inside = path.slice(1).every((p, i) => liesOnMaterial(model, i === 0 ? p : path[i], p, widthMm));
    if (inside) return { kind: 'crack', path, widthMm, contrast: CRACK_CONTRAST };
  }
  throw new Error(`No room for a crack on a ${family.name}`);
}

/** Area of the circular segment cut off a disc of radius r by a chord at depth h from its rim. */
function circularSegmentArea(r: number, h: number): number {
  return r * r * Math.acos((r - h) / r) - (r - h) * Math.sqrt(2 * r * h - h * h);
}

/**
 * Size of a defect in mm and mm². Edge defects (chip, burr): length along the edge, width across it.
 * Lines (scratch, crack): length end to end along the line, width across it. Holes: length is the
 * diameter (nominal for a missing hole, as drawn for an undersized one), area the material left in.
 */
export function defectSizeMm(defect: Defect, family: PartFamily): DefectSizeMm {
  switch (defect.kind) {
    case 'scratch':
      return {
        length: Math.hypot(defect.to.x - defect.from.x, defect.to.y - defect.from.y) + defect.widthMm,
        width: defect.widthMm,
      };
    case 'crack': {
      let length = 0;
      for (let i = 1; i < defect.path.length; i++) {
        length += Math.hypot(defect.path[i].x - defect.path[i - 1].x, defect.path[i].y - defect.path[i - 1].y);
      }
      return { length, width: defect.widthMm };
    }
    case 'chip': {
      const r = defect.radiusMm;
      const h = defect.depthMm;
      return { length: 2 * Math.sqrt(2 * r * h - h * h), width: h, area: circularSegmentArea(r, h) };
    }
    case 'burr': {
      const w = defect.widthMm;
      return { length: w, width: defect.heightMm, area: w * (defect.heightMm - w / 2) + (Math.PI * w * w) / 8 };
    }
    case 'missing-hole': {
      const r = family.holes[defect.hole].radius;
      return { length: 2 * r, area: Math.PI * r * r };
    }
    case 'undersized-hole': {
      const nominal = family.holes[defect.hole].radius;
      return { length: 2 * defect.radiusMm, area: Math.PI * (nominal * nominal - defect.radiusMm * defect.radiusMm) };
    }
  }
}

/** Corners of a rectangle in part millimetres that holds everything the defect changes. */
export function defectReachMm(defect: Defect, family: PartFamily): { min: Point; max: Point } {
  const around = (points: Point[], margin: number) => ({
    min: { x: Math.min(...points.map((p) => p.x)) - margin, y: Math.min(...points.map((p) => p.y)) - margin },
    max: { x: Math.max(...points.map((p) => p.x)) + margin, y: Math.max(...points.map((p) => p.y)) + margin },
  });
  switch (defect.kind) {
    case 'scratch':
      return around([defect.from, defect.to], defect.widthMm);
    case 'crack':
      return around(defect.path, defect.widthMm);
    case 'chip':
      return around([defect.edge], defect.radiusMm * 2);
    case 'burr':
      return around([defect.edge], defect.heightMm + defect.widthMm);
    case 'missing-hole':
    case 'undersized-hole': {
      const hole = family.holes[defect.hole];
      return around([hole], hole.radius);
    }
  }
}
