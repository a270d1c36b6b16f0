/** The shapes of a demo photo's description (what to draw) and of its ground truth (what was drawn). */
import type { Point } from './shapes';

export type FamilyName = 'bracket' | 'washer' | 'gasket';
export type DefectKind = 'scratch' | 'chip' | 'burr' | 'missing-hole' | 'undersized-hole' | 'crack';
export type Label = 'good' | 'defective' | 'retake';
export type RetakeReason = 'blur' | 'dark' | 'clipped';
export type ImageFormat = 'png' | 'jpeg';
export type BitDepth = 8 | 16;

/** Defect geometry in the part's own millimetre coordinates (origin at the part centre). */
export type Defect =
  | { kind: 'scratch'; from: Point; to: Point; widthMm: number; contrast: number }
  | { kind: 'crack'; path: Point[]; widthMm: number; contrast: number }
  | { kind: 'chip'; edge: Point; normal: Point; radiusMm: number; depthMm: number }
  | { kind: 'burr'; edge: Point; normal: Point; widthMm: number; heightMm: number }
  | { kind: 'missing-hole'; hole: number }
  | { kind: 'undersized-hole'; hole: number; radiusMm: number };

/** Where the part lies in the frame: its centre in pixels and its rotation. */
export interface Pose {
  centreX: number;
  centreY: number;
  angleDeg: number;
}

/** Everything about the photo that is not the part: light, optics and sensor. */
export interface Nuisance {
  /** Relative brightness change from the frame centre to the right and bottom edges. */
  gradientX: number;
  gradientY: number;
  /** Relative darkening in the frame corners. */
  vignette: number;
  /** Exposure: 1 is nominal, above 1 over-exposed, below 1 under-exposed. */
  gain: number;
  /** Gaussian blur of the optics (defocus), standard deviation in pixels. */
  blurSigmaPx: number;
  /** Sensor noise standard deviation = sqrt(readNoise^2 + shotNoise * signal), signal in 0..1. */
  readNoise: number;
  shotNoise: number;
  noiseSeed: number;
}

/** A complete description of one photo; rendering it is a pure function of this object. */
export interface PartSpec {
  family: FamilyName;
  width: number;
  height: number;
  colour: boolean;
  mmPerPx: number;
  pose: Pose;
  nuisance: Nuisance;
  defects: Defect[];
}

export interface PixelBox {
  x: number;
  y: number;
  w: number;
  h: number;
}

export interface DefectSizeMm {
  length?: number;
  width?: number;
  area?: number;
}

export interface DefectTruth {
  kind: DefectKind;
  box: PixelBox;
  sizeMm: DefectSizeMm;
}

export interface ImageTruth {
  file: string;
  family: FamilyName;
  partType: string;
  label: Label;
  retakeReason?: RetakeReason;
  defects: DefectTruth[];
  mmPerPx: number;
  width: number;
  height: number;
  bitDepth: BitDepth;
  colour: boolean;
}

export interface DatasetTruth {
  generator: string;
  seed: number;
  images: ImageTruth[];
}
