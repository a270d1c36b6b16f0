/** Producing a demo set one photo at a time, and writing it to a folder with its truth.json. */
import { mkdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { encodePhoto } from './encode';
import { PART_FAMILIES } from './families';
import { planDataset, type DatasetOptions, type ImagePlan } from './plan';
import { describeDefects, renderPhoto } from './render';
import type { DatasetTruth, DefectTruth, ImageTruth } from './types';

export const GENERATOR_NAME = 'kernwright-demo-images/1';

export interface GeneratedImage {
  fileName: string;
  buffer: Buffer;
  truth: ImageTruth;
}

/** Millimetre figures are kept to 0.1 µm; more digits would only be rendering noise. */
function roundMm(value: number): number {
  return Math.round(value * 1e4) / 1e4;
}

function truthOf(plan: ImagePlan, defects: DefectTruth[]): ImageTruth {
  const { spec } = plan;
  return {
    file: plan.fileName,
    family: spec.family,
    partType: PART_FAMILIES[spec.family].partType,
    label: plan.label,
    ...(plan.retakeReason ? { retakeReason: plan.retakeReason } : {}),
    defects: defects.map(({ kind, box, sizeMm }) => ({
      kind,
      box,
      sizeMm: Object.fromEntries(Object.entries(sizeMm).map(([key, value]) => [key, roundMm(value)])),
    })),
    mmPerPx: spec.mmPerPx,
    width: spec.width,
    height: spec.height,
    bitDepth: plan.bitDepth,
    colour: spec.colour,
  };
}

/** Yields the photos in order; only one photo's pixels are held at a time. */
export async function* generateDataset(options: DatasetOptions): AsyncGenerator<GeneratedImage> {
  for (const plan of planDataset(options)) {
    const photo = renderPhoto(plan.spec);
    const buffer = await encodePhoto(photo, plan.format, plan.bitDepth);
    yield { fileName: plan.fileName, buffer, truth: truthOf(plan, describeDefects(plan.spec)) };
  }
}

export type ProgressListener = (done: number, total: number, image: GeneratedImage) => void;

/** Writes every photo into `dir` (created if needed) and then `truth.json`; returns the truth. */
export async function writeDataset(
  dir: string,
  options: DatasetOptions,
  onProgress?: ProgressListener,
): Promise<DatasetTruth> {
  await mkdir(dir, { recursive: true });
  const truth: DatasetTruth = { generator: GENERATOR_NAME, seed: options.seed, images: [] };
  for await (const image of generateDataset(options)) {
    await writeFile(path.join(dir, image.fileName), image.buffer);
    truth.images.push(image.truth);
    onProgress?.(truth.images.length, options.count, image);
  }
  await writeFile(path.join(dir, 'truth.json'), `${JSON.stringify(truth, null, 2)}\n`);
  return truth;
}
