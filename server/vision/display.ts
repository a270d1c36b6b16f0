// 8-bit display samples of any step's output (no image library: the pool's worker threads use it too).
import { maxSampleValue, type BitDepth, type Image } from '../../shared/vision/image';
import type { OutputKind } from '../../shared/vision/pipeline';

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
  const { scale, shift } = displayScale(min, max, kind, bitDepth);
  for (let p = 0; p < src.length; p++) {
    const v = Math.round(src[p] * scale + shift);
    out[p] = v < 0 ? 0 : v > 255 ? 255 : v;
  }
  return out;
}

/** The sample → display byte mapping v·scale + shift of displaySamples, from the samples' smallest and largest value (NaN left out). */
export function displayScale(min: number, max: number, kind: OutputKind, bitDepth: BitDepth = 8): { scale: number; shift: number } {
  if (kind === 'signed' || kind === 'direction') {
    const reach = kind === 'direction' ? 180 : Math.max(Math.abs(min), Math.abs(max));
    return { scale: reach > 0 ? 127 / reach : 0, shift: GREY };
  }
  const top = maxSampleValue(bitDepth);
  if (min >= 0 && max <= top) return { scale: 255 / top, shift: 0 };
  const scale = max > min ? 255 / (max - min) : 0;
  return { scale, shift: -min * scale };
}
