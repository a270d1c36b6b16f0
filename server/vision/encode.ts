// Pictures of a run as PNG: a display image of any step's output, and the evidence image kept
// with a failed inspection.
import sharp from 'sharp';
import type { BitDepth, Image } from '../../shared/vision/image';
import type { OutputKind, RuleRun } from '../../shared/vision/pipeline';
import { displaySamples } from './display';
import { evidenceRaster, type EvidenceRaster } from './evidence';

export async function displayPng(image: Image, kind: OutputKind, bitDepth: BitDepth = 8): Promise<Buffer> {
  return sharp(displaySamples(image, kind, bitDepth), { raw: { width: image.width, height: image.height, channels: 1 } })
    .toColourspace('b-w')
    .png()
    .toBuffer();
}

/** Evidence images are written fast rather than small: a FAIL's answer waits for this. */
export function evidencePngOf(raster: EvidenceRaster): Promise<Buffer> {
  return sharp(raster.rgb, { raw: { width: raster.width, height: raster.height, channels: 3 } })
    .png({ compressionLevel: 2, adaptiveFiltering: false })
    .toBuffer();
}

/** The photo as shown to the operator, failing gauges' regions outlined in red and their blobs in amber. */
export function evidencePng(run: RuleRun): Promise<Buffer> {
  return evidencePngOf(evidenceRaster(run));
}
