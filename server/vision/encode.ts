// Pictures of a run: a display PNG of any step's output, and the evidence image kept with an
// inspection (the photo with failing regions and blobs outlined).
import sharp from 'sharp';
import { labelBlobs, type RowSpans } from '../../shared/vision/blobs';
import { regionSpans } from '../../shared/vision/gauges';
import { maxSampleValue, type BitDepth, type Image } from '../../shared/vision/image';
import type { OutputKind, RuleRun } from '../../shared/vision/pipeline';

const GREY = 128;

/**
 * 8-bit display samples: masks black/white; signed outputs centred on grey (0 → 128, the largest
 * magnitude → 0 or 255); direction −180…180° over 1…255; intensities within the photo's range
 * keep their brightness (0 … 255 or 0 … 65535 → 0 … 255), others are stretched min … max.
 */
export function displaySamples(image: Image, kind: OutputKind, bitDepth: BitDepth = 8): Uint8Array {
  const src = image.data;
  const out = new Uint8Array(src.length);
  if (kind === 'mask') {
    for (let p = 0; p < src.length; p++) out[p] = src[p] !== 0 ? 255 : 0;
    return out;
  }
  let min = Infinity;
  let max = -Infinity;
  for (let p = 0; p < src.length; p++) {
    const v = src[p];
    if (v < min) min = v;
    if (v > max) max = v;
  }
  let scale: number;
  let shift: number;
  if (kind === 'signed' || kind === 'direction') {
    const reach = kind === 'direction' ? 180 : Math.max(Math.abs(min), Math.abs(max));
    scale = reach > 0 ? 127 / reach : 0;
    shift = GREY;
  } else {
    const top = maxSampleValue(bitDepth);
    if (min >= 0 && max <= top) {
      scale = 255 / top;
      shift = 0;
    } else {
      scale = max > min ? 255 / (max - min) : 0;
      shift = -min * scale;
    }
  }
  for (let p = 0; p < src.length; p++) {
    const v = Math.round(src[p] * scale + shift);
    out[p] = v < 0 ? 0 : v > 255 ? 255 : v;
  }
  return out;
}

export async function displayPng(image: Image, kind: OutputKind, bitDepth: BitDepth = 8): Promise<Buffer> {
  return sharp(displaySamples(image, kind, bitDepth), { raw: { width: image.width, height: image.height, channels: 1 } })
    .toColourspace('b-w')
    .png()
    .toBuffer();
}

const REGION_COLOUR = [230, 30, 30] as const;
const BLOB_COLOUR = [255, 170, 0] as const;

/** RGB samples of the evidence image; see evidencePng. */
export function evidenceSamples(run: RuleRun): Uint8Array {
  const { input, bitDepth } = run;
  const { width: w, height: h } = input;
  const grey = displaySamples(input, 'intensity', bitDepth);
  const rgb = new Uint8Array(w * h * 3);
  for (let p = 0; p < w * h; p++) rgb[3 * p] = rgb[3 * p + 1] = rgb[3 * p + 2] = grey[p];
  const paint = (p: number, colour: readonly number[]) => {
    rgb[3 * p] = colour[0];
    rgb[3 * p + 1] = colour[1];
    rgb[3 * p + 2] = colour[2];
  };

  run.rule.gauges.forEach((gauge, i) => {
    const m = run.measurements[i];
    if (m.pass) return;
    const spans = regionSpans(w, h, gauge.region);
    const measured = m.step === 0 ? input : run.steps[m.step - 1].output;
    if (measured && (gauge.measure === 'blob-count' || gauge.measure === 'largest-blob-area' || gauge.measure === 'largest-blob-length')) {
      outlineBlobs(measured, spans, gauge.measure !== 'blob-count', (p) => paint(p, BLOB_COLOUR));
    }
    if (gauge.region) outlineSpans(spans, w, (p) => paint(p, REGION_COLOUR));
  });
  return rgb;
}

/** The photo as shown to the operator, failing gauges' regions outlined in red and their blobs in amber. */
export async function evidencePng(run: RuleRun): Promise<Buffer> {
  const { width, height } = run.input;
  return sharp(evidenceSamples(run), { raw: { width, height, channels: 3 } }).png().toBuffer();
}

/** Calls paint for each region pixel with a 4-neighbour outside the region. */
function outlineSpans(spans: RowSpans, width: number, paint: (p: number) => void): void {
  const h = spans.start.length;
  const inside = (x: number, y: number) => y >= 0 && y < h && x >= spans.start[y] && x < spans.end[y];
  for (let y = 0; y < h; y++) {
    for (let x = spans.start[y]; x < spans.end[y]; x++) {
      if (!inside(x - 1, y) || !inside(x + 1, y) || !inside(x, y - 1) || !inside(x, y + 1)) paint(y * width + x);
    }
  }
}

/** Outlines every blob in the region, or only the largest. */
function outlineBlobs(mask: Image, spans: RowSpans, largestOnly: boolean, paint: (p: number) => void): void {
  const { width: w, height: h } = mask;
  const { labels, blobs } = labelBlobs(mask, spans);
  let largest = 0;
  blobs.forEach((b, i) => {
    if (largest === 0 || b.area > blobs[largest - 1].area) largest = i + 1;
  });
  const wanted = (label: number) => label !== 0 && (!largestOnly || label === largest);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const p = y * w + x;
      const label = labels[p];
      if (!wanted(label)) continue;
      const edge =
        x === 0 || y === 0 || x === w - 1 || y === h - 1 ||
        labels[p - 1] !== label || labels[p + 1] !== label || labels[p - w] !== label || labels[p + w] !== label;
      if (edge) paint(p);
    }
  }
}
