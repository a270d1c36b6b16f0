// A separable smoothing (the Gaussian) and a gradient after it in one sweep down the image: the
// smoothed rows go into a ring of four rows, where the gradient reads them while they are in the
// cache, instead of a whole smoothed image written out and read back. Both parts run the row
// functions of the two steps' own kernels, so every sample comes out as from the two steps in turn.
import { align16, at, borderIndex, OUTSIDE } from './border';
import { bytesToFloats, lumaRgb8 } from './channels';
import { finishQualitySums, qualityRows, startQualitySums } from './statistics';
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
  return smoothedGradientScratchBytes(w, colLen, rowLen) + 16 + sourceRingRows(colLen) * 4 * w;
}

/** Source rows kept as float32 by `smoothedGradientBytes`: the 2r + 2 rows a pair of smoothed rows reads (and at least the quality gate's three and one). */
function sourceRingRows(colLen: i32): i32 {
  return max(colLen + 1, 4);
}

/**
 * dst = the gradient (output and weights a, b as `gradient`) of the separable correlation
 * column ⊗ row of src (offset 0), both with the border `mode`; the magnitude's range to `range` as `gradient` does.
 */
export function smoothedGradient(src: usize, dst: usize, w: i32, h: i32, colK: usize, colLen: i32, rowK: usize, rowLen: i32, a: f32, b: f32, output: i32, mode: i32, range: usize, scratch: usize): void {
  sweep(src, 0, 1, 0, 0, 0, 0, dst, w, h, colK, colLen, rowK, rowLen, a, b, output, mode, range, scratch);
}

/**
 * smoothedGradient of an 8-bit photo's samples as float32 (w·h·channels bytes at src): grey (channels
 * 1), or colour (3 or 4, interleaved) to luma as lumaRgb8 with weights kr, kg, kb in thousandths. Each
 * source row is converted when the sweep first needs it, into a ring of rows after the scratch, instead
 * of a whole float32 image written and read back; the same bits as smoothedGradient of the converted
 * image. With `quality` ≠ 0 (colour), the quality gate's sums of the converted rows go there as
 * qualitySums(…, 255) gives them, rows summed in the same order.
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
  const sourceRing = bytes != 0 ? sourceRingRows(colLen) : 0;
  const source = bytes != 0 ? align16(scratch + <usize>smoothedGradientScratchBytes(w, colLen, rowLen)) : src;
  const reach = colLen >> 1;
  const rowBytes = <usize>(w * channels);
  let converted = 0;
  if (quality != 0) startQualitySums();
  // Smoothed rows 0 … ready−1 exist; row k sits in slot k mod RING.
  let ready = 0;
  for (let y = 0; y < h; y++) {
    const last = min(y + 1, h - 1);
    while (ready <= last) {
      const next = (ready + 1) % RING;
      if (bytes != 0) {
        // The rows a pair starting at `ready` reads, up to row ready + 1 + r.
        const needed = min(h, ready + 2 + reach);
        for (; converted < needed; converted++) {
          const row = at(source, (converted % sourceRing) * w);
          if (channels == 1) bytesToFloats(bytes + <usize>converted * rowBytes, w, row);
          else lumaRgb8(bytes + <usize>converted * rowBytes, channels, w, row, kr, kg, kb);
          // A row's quality sums need the row below it.
          if (quality != 0 && converted > 0) qualityRows(source, sourceRing, w, h, converted - 1, converted, 255);
        }
      }
      ready += separableRows(source, sourceRing, w, h, ready, colK, colLen, rowK, rowLen, mode, 0, smoothing, ring + <usize>(ready % RING) * slot, ring + <usize>next * slot);
    }
    const up = smoothedRow(ring, slot, y - 1, h, mode, zeros);
    const down = smoothedRow(ring, slot, y + 1, h, mode, zeros);
    gradientRow(up, ring + <usize>(y % RING) * slot, down, at(dst, y * w), w, a, b, output, mode, gradients);
  }
  if (range != 0) storeRange(gradients, w, range);
  if (quality != 0) {
    if (h > 0) qualityRows(source, sourceRing, w, h, h - 1, h, 255);
    finishQualitySums(quality);
  }
}

/** The ring slot of smoothed row y (border applied: rows −1 and h map to rows 0, 1, h−2 or h−1), or the zeros row. */
@inline
function smoothedRow(ring: usize, slot: usize, y: i32, h: i32, mode: i32, zeros: usize): usize {
  const row = borderIndex(y, h, mode);
  return row == OUTSIDE ? zeros : ring + <usize>(row % RING) * slot;
}
