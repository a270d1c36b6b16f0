// The evidence image kept with a failed inspection: the photo in grey with the failing gauges'
// regions outlined in red, and in amber their blobs or a ring around the pixel of a failing min or max. Drawn where the run's images are (the pool's
// worker thread), at a size a screen shows, so that a FAIL costs no copy of full-size images.
import { labelBlobs, type RowSpans } from '../../shared/vision/blobs';
import { regionSpans } from '../../shared/vision/gauges';
import { simdKernels } from '../../shared/vision/engine';
import { createImage, type BitDepth, type Image } from '../../shared/vision/image';
import type { RuleRun } from '../../shared/vision/pipeline';
import { displayScale, displaySamples } from './display';

export interface EvidenceRaster {
  width: number;
  height: number;
  /** Photo pixels per evidence pixel along each side (1 = full size). */
  factor: number;
  /** 8-bit RGB, row by row. */
  rgb: Uint8Array;
}

/** The longest side of an evidence image: a wide screen shows no more, and a 5 MP photo halves to 1296 × 972. */
export const EVIDENCE_MAX_SIDE = 1600;

const REGION_COLOUR = [230, 30, 30] as const;
const BLOB_COLOUR = [255, 170, 0] as const;

/**
 * The evidence raster of a run, shrunk by the smallest whole factor that brings the longest side
 * to maxSide or less (each pixel the mean of a factor × factor block). Outlines are found at full
 * size and each outline pixel paints the evidence pixel it falls in, so a one-pixel outline stays
 * visible after shrinking.
 */
export function evidenceRaster(run: RuleRun, maxSide: number = EVIDENCE_MAX_SIDE): EvidenceRaster {
  const { input, bitDepth } = run;
  const { width: w, height: h } = input;
  const factor = Math.max(1, Math.ceil(Math.max(w, h) / maxSide));
  const { width: sw, height: sh, rgb } = greyBackground(input, factor, bitDepth);
  const paint = (colour: readonly number[]) => (p: number) => {
    const x = p % w;
    const y = (p - x) / w;
    const q = 3 * (((y / factor) | 0) * sw + ((x / factor) | 0));
    rgb[q] = colour[0];
    rgb[q + 1] = colour[1];
    rgb[q + 2] = colour[2];
  };

  run.rule.gauges.forEach((gauge, i) => {
    const m = run.measurements[i];
    if (m.pass) return;
    const spans = regionSpans(w, h, gauge.region);
    const measured = m.step === 0 ? input : run.steps[m.step - 1].output;
    if (measured && (gauge.measure === 'blob-count' || gauge.measure === 'largest-blob-area' || gauge.measure === 'largest-blob-length')) {
      outlineBlobs(measured, spans, gauge.measure !== 'blob-count', paint(BLOB_COLOUR));
    }
    if (measured && (gauge.measure === 'max' || gauge.measure === 'min')) {
      const p = extremeAt(measured, spans, gauge.measure);
      if (p >= 0) ringAround(((p % w) + 0.5) / factor, (Math.floor(p / w) + 0.5) / factor, sw, sh, rgb);
    }
    if (gauge.region) outlineSpans(spans, w, paint(REGION_COLOUR));
  });
  return { width: sw, height: sh, factor, rgb };
}

/**
 * The photo shrunk by `factor`, in grey as RGB bytes. The SIMD kernels give the same bytes as the plain
 * loops, which run too seldom (a FAIL) for V8 to make them fast: 35–39 ms for a 5 MP photo here,
 * against 5–9 in the kernels.
 */
export function greyBackground(input: Image, factor: number, bitDepth: BitDepth): { width: number; height: number; rgb: Uint8Array } {
  const simd = simdKernels();
  if (simd) return simd.shrinkToGreyRgb(input, factor, (min, max) => displayScale(min, max, 'intensity', bitDepth));
  const shrunk = factor === 1 ? input : blockMean(input, factor);
  const grey = displaySamples(shrunk, 'intensity', bitDepth);
  const rgb = new Uint8Array(grey.length * 3);
  for (let p = 0; p < grey.length; p++) rgb[3 * p] = rgb[3 * p + 1] = rgb[3 * p + 2] = grey[p];
  return { width: shrunk.width, height: shrunk.height, rgb };
}

/** The first pixel in the region holding its largest (or smallest) value; -1 for an empty region. */
function extremeAt(image: Image, spans: RowSpans, which: 'max' | 'min'): number {
  const simd = simdKernels();
  if (simd) return simd.firstExtreme(image, spans.start, spans.end, which);
  const { width: w, data } = image;
  const sign = which === 'max' ? 1 : -1;
  let best = -Infinity;
  let at = -1;
  for (let y = 0; y < spans.start.length; y++) {
    for (let x = spans.start[y]; x < spans.end[y]; x++) {
      const v = sign * data[y * w + x];
      if (v > best) {
        best = v;
        at = y * w + x;
      }
    }
  }
  return at;
}

/** A two-pixel ring in the blob colour around (cx, cy), big enough to find on a phone's screen. */
function ringAround(cx: number, cy: number, width: number, height: number, rgb: Uint8Array): void {
  const radius = Math.max(6, Math.round(Math.min(width, height) / 30));
  const reach = radius + 2;
  for (let y = Math.max(0, Math.floor(cy - reach)); y <= Math.min(height - 1, Math.ceil(cy + reach)); y++) {
    for (let x = Math.max(0, Math.floor(cx - reach)); x <= Math.min(width - 1, Math.ceil(cx + reach)); x++) {
      const d = Math.hypot(x + 0.5 - cx, y + 0.5 - cy);
      if (d < radius || d >= radius + 2) continue;
      const q = 3 * (y * width + x);
      rgb[q] = BLOB_COLOUR[0];
      rgb[q + 1] = BLOB_COLOUR[1];
      rgb[q + 2] = BLOB_COLOUR[2];
    }
  }
}

/** Each output pixel the mean of a factor × factor block (blocks at the right and bottom edges may be smaller). */
function blockMean(image: Image, factor: number): Image {
  const { width: w, height: h, data } = image;
  const sw = Math.ceil(w / factor);
  const sh = Math.ceil(h / factor);
  const sums = new Float64Array(sw);
  const out = createImage(sw, sh);
  for (let by = 0; by < sh; by++) {
    sums.fill(0);
    const y0 = by * factor;
    const y1 = Math.min(h, y0 + factor);
    for (let y = y0; y < y1; y++) {
      const row = y * w;
      for (let x = 0; x < w; x++) sums[(x / factor) | 0] += data[row + x];
    }
    for (let bx = 0; bx < sw; bx++) {
      const cols = Math.min(w, (bx + 1) * factor) - bx * factor;
      out.data[by * sw + bx] = sums[bx] / (cols * (y1 - y0));
    }
  }
  return out;
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
  const outline = (label: number, x0: number, y0: number, x1: number, y1: number) => {
    for (let y = y0; y <= y1; y++) {
      for (let x = x0; x <= x1; x++) {
        const p = y * w + x;
        const at = labels[p];
        if (at === 0 || (label !== 0 && at !== label) || (largestOnly && at !== largest)) continue;
        const edge =
          x === 0 || y === 0 || x === w - 1 || y === h - 1 ||
          labels[p - 1] !== at || labels[p + 1] !== at || labels[p - w] !== at || labels[p + w] !== at;
        if (edge) paint(p);
      }
    }
  };
  // Each wanted blob within its bounding box (a 5 MP mask's blobs cover a small part of it), or the
  // whole image once when the boxes together are larger.
  const chosen = largestOnly ? (largest > 0 ? [largest] : []) : blobs.map((_, i) => i + 1);
  const boxArea = chosen.reduce((sum, label) => {
    const b = blobs[label - 1];
    return sum + (b.maxX - b.minX + 1) * (b.maxY - b.minY + 1);
  }, 0);
  if (boxArea > w * h) return outline(0, 0, 0, w - 1, h - 1);
  for (const label of chosen) {
    const { minX, maxX, minY, maxY } = blobs[label - 1];
    outline(label, minX, minY, maxX, maxY);
  }
}
