/** Draws a part photo from its description: the scene in float, then optics, then sensor. */
import { blurImage } from './blur';
import { PART_FAMILIES, type PartFamily, type Rgb } from './families';
import { buildPartModel, distanceToPart, finishShade, markShade, type PartModel } from './part-model';
import { defectReachMm, defectSizeMm } from './defects';
import { createRandom, latticeNoise } from './random';
import { coverage } from './shapes';
import type { Defect, DefectTruth, PartSpec, PixelBox, Pose } from './types';

export interface Photo {
  width: number;
  height: number;
  channels: 1 | 3;
  /** Interleaved samples in 0..1 (row by row, channel fastest), clipped like a sensor. */
  pixels: Float32Array;
}

export interface RenderedPart extends Photo {
  /** The same photo of the same part without its defects: same pose, light, blur and noise. */
  clean: Float32Array;
  defects: DefectTruth[];
}

/** ITU-R BT.601 luma weights, the camera response of the monochrome variant. */
const LUMA_WEIGHTS: Rgb = [0.299, 0.587, 0.114];
const BOARD_GRAIN = 0.04;
const BOARD_GRAIN_SALT = 5;
/** A pixel counts as changed by a defect above this change of coverage or shade (well below one 16-bit step ratio). */
const FOOTPRINT_TOLERANCE = 1e-4;

export function renderPart(spec: PartSpec): RenderedPart {
  const photo = renderPhoto(spec);
  const clean = renderPhoto({ ...spec, defects: [] }).pixels;
  return { ...photo, clean, defects: describeDefects(spec) };
}

/** Each defect's kind, the box of pixels it changes and its size in mm, from the description alone. */
export function describeDefects(spec: PartSpec): DefectTruth[] {
  const family = PART_FAMILIES[spec.family];
  return spec.defects.map((defect) => ({
    kind: defect.kind,
    box: defectFootprint(spec, family, defect),
    sizeMm: defectSizeMm(defect, family),
  }));
}

export function renderPhoto(spec: PartSpec): Photo {
  const family = PART_FAMILIES[spec.family];
  const { width, height } = spec;
  const channels = spec.colour ? 3 : 1;
  const { alpha, shade } = drawPart(spec, family, buildPartModel(family, spec.defects));
  const pixels = composeScene(spec, family, channels, alpha, shade);
  blurImage(pixels, width, height, channels, spec.nuisance.blurSigmaPx);
  addSensorNoise(pixels, spec);
  return { width, height, channels, pixels };
}

function partToPixel(pose: Pose, mmPerPx: number) {
  const angle = (pose.angleDeg * Math.PI) / 180;
  const cos = Math.cos(angle);
  const sin = Math.sin(angle);
  return (x: number, y: number) => ({
    x: pose.centreX + (x * cos - y * sin) / mmPerPx - 0.5,
    y: pose.centreY + (x * sin + y * cos) / mmPerPx - 0.5,
  });
}

interface Window {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

function windowAround(spec: PartSpec, min: { x: number; y: number }, max: { x: number; y: number }): Window {
  const toPixel = partToPixel(spec.pose, spec.mmPerPx);
  const corners = [toPixel(min.x, min.y), toPixel(max.x, min.y), toPixel(min.x, max.y), toPixel(max.x, max.y)];
  const margin = 2;
  return {
    x0: Math.max(0, Math.floor(Math.min(...corners.map((c) => c.x))) - margin),
    y0: Math.max(0, Math.floor(Math.min(...corners.map((c) => c.y))) - margin),
    x1: Math.min(spec.width - 1, Math.ceil(Math.max(...corners.map((c) => c.x))) + margin),
    y1: Math.min(spec.height - 1, Math.ceil(Math.max(...corners.map((c) => c.y))) + margin),
  };
}

/** Calls `visit` for every pixel of the window with the pixel centre in part millimetre coordinates. */
function forEachPixelOnPart(
  spec: PartSpec,
  area: Window,
  visit: (index: number, x: number, y: number, u: number, v: number) => void,
): void {
  const { pose, mmPerPx, width } = spec;
  const angle = (pose.angleDeg * Math.PI) / 180;
  const cos = Math.cos(angle);
  const sin = Math.sin(angle);
  for (let y = area.y0; y <= area.y1; y++) {
    const dy = (y + 0.5 - pose.centreY) * mmPerPx;
    for (let x = area.x0; x <= area.x1; x++) {
      const dx = (x + 0.5 - pose.centreX) * mmPerPx;
      visit(y * width + x, x, y, dx * cos + dy * sin, -dx * sin + dy * cos);
    }
  }
}

/** Coverage of the part per pixel (anti-aliased) and its surface shade where it is present. */
function drawPart(spec: PartSpec, family: PartFamily, model: PartModel) {
  const { width, height, mmPerPx } = spec;
  const alpha = new Float32Array(width * height);
  const shade = new Float32Array(width * height);
  const reach = family.reachMm;
  const area = windowAround(spec, { x: -reach, y: -reach }, { x: reach, y: reach });
  forEachPixelOnPart(spec, area, (i, _x, _y, u, v) => {
    const covered = coverage(distanceToPart(model, u, v) / mmPerPx);
    if (covered === 0) return;
    alpha[i] = covered;
    shade[i] = finishShade(model.finish, u, v) * markShade(model, u, v, mmPerPx);
  });
  return { alpha, shade };
}

function cameraResponse(colour: Rgb, channels: 1 | 3): number[] {
  if (channels === 3) return [...colour];
  return [colour[0] * LUMA_WEIGHTS[0] + colour[1] * LUMA_WEIGHTS[1] + colour[2] * LUMA_WEIGHTS[2]];
}

/** Part over a grainy matte board, lit unevenly (gradient and vignette) and exposed with the spec's gain. */
function composeScene(
  spec: PartSpec,
  family: PartFamily,
  channels: 1 | 3,
  alpha: Float32Array,
  shade: Float32Array,
): Float32Array {
  const { width, height, nuisance } = spec;
  const part = cameraResponse(family.partColour, channels);
  const board = cameraResponse(family.backgroundColour, channels);
  const pixels = new Float32Array(width * height * channels);
  for (let y = 0; y < height; y++) {
    const ny = ((y + 0.5) / height) * 2 - 1;
    for (let x = 0; x < width; x++) {
      const nx = ((x + 0.5) / width) * 2 - 1;
      const light =
        (1 + nuisance.gradientX * nx + nuisance.gradientY * ny) *
        (1 - (nuisance.vignette * (nx * nx + ny * ny)) / 2) *
        nuisance.gain;
      const i = y * width + x;
      const a = alpha[i];
      const grain = 1 + BOARD_GRAIN * latticeNoise(x, y, BOARD_GRAIN_SALT);
      const partShade = a * shade[i];
      for (let c = 0; c < channels; c++) {
        pixels[i * channels + c] = (board[c] * grain * (1 - a) + part[c] * partShade) * light;
      }
    }
  }
  return pixels;
}

const NORMAL_TABLE_BITS = 16;
const NORMAL_TABLE_MASK = (1 << NORMAL_TABLE_BITS) - 1;
const NORMAL_TABLE_SEED = 0x5e1f;
let normalTable: Float32Array | undefined;

/** A fixed table of standard normal draws: two per 32-bit random number is much cheaper than Box-Muller per pixel. */
function standardNormalTable(): Float32Array {
  if (!normalTable) {
    const random = createRandom(NORMAL_TABLE_SEED);
    normalTable = new Float32Array(1 << NORMAL_TABLE_BITS);
    for (let i = 0; i < normalTable.length; i++) normalTable[i] = random.normal();
  }
  return normalTable;
}

/** Signal-dependent Gaussian noise, then the sensor's clipping to 0..1. Same seed, same draws. */
function addSensorNoise(pixels: Float32Array, spec: PartSpec): void {
  const { readNoise, shotNoise, noiseSeed } = spec.nuisance;
  const random = createRandom(noiseSeed);
  const table = standardNormalTable();
  const readVariance = readNoise * readNoise;
  let bits = 0;
  for (let i = 0; i < pixels.length; i++) {
    if ((i & 1) === 0) bits = random.nextUint32();
    else bits >>>= NORMAL_TABLE_BITS;
    const signal = pixels[i] > 0 ? pixels[i] : 0;
    const noisy = signal + table[bits & NORMAL_TABLE_MASK] * Math.sqrt(readVariance + shotNoise * signal);
    pixels[i] = noisy < 0 ? 0 : noisy > 1 ? 1 : noisy;
  }
}

/** The pixels a defect alone changes on the otherwise nominal part, as a bounding box. */
function defectFootprint(spec: PartSpec, family: PartFamily, defect: Defect): PixelBox {
  const reach = defectReachMm(defect, family);
  const area = windowAround(spec, reach.min, reach.max);
  const nominal = buildPartModel(family, []);
  const faulty = buildPartModel(family, [defect]);
  const s = spec.mmPerPx;
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  forEachPixelOnPart(spec, area, (_i, x, y, u, v) => {
    const before = coverage(distanceToPart(nominal, u, v) / s);
    const after = coverage(distanceToPart(faulty, u, v) / s);
    const shadeChange = Math.abs(after * markShade(faulty, u, v, s) - before * markShade(nominal, u, v, s));
    if (Math.abs(after - before) > FOOTPRINT_TOLERANCE || shadeChange > FOOTPRINT_TOLERANCE) {
      minX = Math.min(minX, x);
      minY = Math.min(minY, y);
      maxX = Math.max(maxX, x);
      maxY = Math.max(maxY, y);
    }
  });
  if (minX === Infinity) throw new Error(`A ${defect.kind} on a ${family.name} changes no pixel`);
  return { x: minX, y: minY, w: maxX - minX + 1, h: maxY - minY + 1 };
}
