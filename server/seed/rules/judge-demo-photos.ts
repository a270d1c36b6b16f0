/** Runs rules on freshly generated demo photos, decoded the way uploads are, one photo at a time. */
import { generateDataset, type DatasetOptions, type FamilyName, type ImageTruth } from '../../demo';
import { decodePhoto } from '../../vision/decode';
import { runRule, type KernelLibrary, type RuleRun } from '../../../shared/vision/pipeline';
import type { RuleDocument } from '../../../shared/rules/schema';

export interface JudgedPhoto {
  truth: ImageTruth;
  run: RuleRun;
}

/**
 * Yields each photo's truth with the run of its family's rule. The station's calibration is the truth's
 * mm per pixel (the demo stations are calibrated to the generator's scale).
 */
export async function* judgeDemoPhotos(
  rules: Readonly<Partial<Record<FamilyName, RuleDocument>>>,
  options: DatasetOptions,
  kernels: KernelLibrary,
): AsyncGenerator<JudgedPhoto> {
  for await (const image of generateDataset(options)) {
    const rule = rules[image.truth.family];
    if (!rule) continue;
    const photo = await decodePhoto(image.buffer);
    yield { truth: image.truth, run: runRule(rule, photo, { kernels, mmPerPx: image.truth.mmPerPx, retain: 'gauged' }) };
  }
}
