// A separable smoothing (the Gaussian) and a gradient after it in one sweep down the image: the
// smoothed rows go into a ring of four rows, where the gradient reads them while they are in the
// cache, instead of a whole smoothed image written out and read back. Both parts run the row
// functions of the two steps' own kernels, so every sample comes out as from the two steps in turn.
import { align16, at, borderIndex, OUTSIDE, readAhead } from './border';
import { convertPhotoRows, finishPhotoRows, photoRingBytes, photoRingRows, startPhotoRows } from './photo-rows';
import { gradientRow, gradientScratchBytes, prepareGradientScratch, storeRange } from './gradient';
import { prepareSeparableScratch, separableRows, separableScratchBytes } from './separable';

/** Rows of smoothed samples kept: the gradient's three, and one more so that two can be smoothed at once. */
const RING: i32 = 4;

/** Scratch bytes `smoothedGradient` needs. */
export function smoothedGradientScratchBytes(w: i32, colLen: i32, rowLen: i32): i32 {
  return separableScratchBytes(w, colLen, rowLen) + gradientScratchBytes(w) + RING * (4 * w + 32) + 64;
}

/** Scratch bytes `smoothedGradientBytes` needs: those of smoothedGradient and its ring of source rows. */
export function smoothedGradientBytesScratchBytes(w: i32, colLen: i32, rowLen: i32): i32 {
  return smoothedGradientScratchBytes(w, colLen, rowLen) + 16 + photoRingBytes(colLen, w);
}

/**
 * dst = the gradient (output and weights a, b as `gradient`) of the separable correlation
 * column ⊗ row of src (offset 0), both with the border `mode`; the magnitude's range to `range` as `gradient` does.
 */
export function smoothedGradient(src: usize, dst: usize, w: i32, h: i32, colK: usize, colLen: i32, rowK: usize, rowLen: i32, a: f32, b: f32, output: i32, mode: i32, range: usize, scratch: usize): void {
  sweep(src, 0, 1, 0, 0, 0, 0, dst, w, h, colK, colLen, rowK, rowLen, a, b, output, mode, range, scratch);
}

/**
 * smoothedGradient of an 8-bit photo's input image (w·h·channels bytes at src; grey, or colour to luma
 * with weights kr, kg, kb in thousandths), its rows converted into a ring after the scratch as the
 * sweep needs them (photo-rows.ts); the same bits as smoothedGradient of the converted image. With
 * `quality` ≠ 0, the quality gate's sums of the converted rows go there.
 */
export function smoothedGradientBytes(src: usize, channels: i32, kr: i32, kg: i32, kb: i32, quality: usize, dst: usize, w: i32, h: i32, colK: usize, colLen: i32, rowK: usize, rowLen: i32, a: f32, b: f32, output: i32, mode: i32, range: usize, scratch: usize): void {
  sweep(0, src, channels, kr, kg, kb, quality, dst, w, h, colK, colLen, rowK, rowLen, a, b, output, mode, range, scratch);
}

function sweep(src: usize, bytes: usize, channels: i32, kr: i32, kg: i32, kb: i32, quality: usize, dst: usize, w: i32, h: i32, colK: usize, colLen: i32, rowK: usize, rowLen: i32, a: f32, b: f32, output: i32, mode: i32, range: usize, scratch: usize): void {
  const smoothing = align16(scratch);
  const gradients = align16(smoothing + <usize>separableScratchBytes(w, colLen, rowLen));
  const ring = align16(gradients + <usize>gradientScratchBytes(w));
  const slot = (<usize>(4 * w) + 31) & ~(<usize>15);
  prepareSeparableScratch(smoothing, w, colLen);
  prepareGradientScratch(gradients, w);
  const zeros = align16(gradients);
  // From bytes: source row k in slot k mod sourceRing of the rows after the smoothed ring.
  const sourceRing = bytes != 0 ? photoRingRows(colLen) : 0;
  const source = bytes != 0 ? align16(scratch + <usize>smoothedGradientScratchBytes(w, colLen, rowLen)) : src;
  const reach = colLen >> 1;
  let converted = 0;
  startPhotoRows(quality, channels);
  // Smoothed rows 0 … ready−1 exist; row k sits in slot k mod RING.
  let ready = 0;
  for (let y = 0; y < h; y++) {
    const last = min(y + 1, h - 1);
    while (ready <= last) {
      const next = (ready + 1) % RING;
      // The rows a pair starting at `ready` reads, up to row ready + 1 + r.
      if (bytes != 0) converted = convertPhotoRows(bytes, channels, kr, kg, kb, quality, source, sourceRing, w, h, converted, min(h, ready + 2 + reach));
      ready += separableRows(source, sourceRing, w, h, ready, colK, colLen, rowK, rowLen, mode, 0, smoothing, ring + <usize>(ready % RING) * slot, ring + <usize>next * slot);
    }
    const up = smoothedRow(ring, slot, y - 1, h, mode, zeros);
    const down = smoothedRow(ring, slot, y + 1, h, mode, zeros);
    const centre = ring + <usize>(y % RING) * slot;
    gradientRow(up, centre, down, at(dst, y * w), w, a, b, output, mode, gradients, readAhead ? at(dst, (y + 2 < h ? y + 2 : y) * w) : centre);
  }
  if (range != 0) storeRange(gradients, w, range);
  if (bytes != 0) finishPhotoRows(bytes, channels, quality, source, sourceRing, w, h);
}

/** The ring slot of smoothed row y (border applied: rows −1 and h map to rows 0, 1, h−2 or h−1), or the zeros row. */
@inline
function smoothedRow(ring: usize, slot: usize, y: i32, h: i32, mode: i32, zeros: usize): usize {
  const row = borderIndex(y, h, mode);
  return row == OUTSIDE ? zeros : ring + <usize>(row % RING) * slot;
}
