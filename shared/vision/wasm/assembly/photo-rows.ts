// An 8-bit photo's rows converted to float32 as a sweep first needs them, into a ring of rows
// (source row k in slot k mod ring), instead of a whole float32 image written and read back: grey
// samples as they are, colour (3 or 4 interleaved channels) to luma as lumaRgb8 with weights in
// thousandths. With `quality` ≠ 0 the quality gate's sums of the converted rows (top 255) go there,
// each row summed once the row below it is converted, while its bytes are still in the cache: grey
// ones in whole numbers from the bytes (as grey8Quality), colour ones in the order of qualitySums over
// the whole image.
import { align16, at } from './border';
import { bytesToFloats, lumaRgb8 } from './channels';
import { finishGreyQuality, greyQualityRow, startGreyQuality } from './input-quality';
import { finishQualitySums, qualityRowsWide, startQualitySums, wideRingBytes, widenRow } from './statistics';

/** Rows the ring holds for a vertical kernel of colLen taps: the 2r + 2 rows a pair of output rows reads, and at least the quality gate's three and one. */
export function photoRingRows(colLen: i32): i32 {
  return max(colLen + 1, 4);
}

/** Scratch bytes of the ring of converted rows (at `source`), and after it the quality gate's widened rows. */
export function photoRingBytes(colLen: i32, w: i32): i32 {
  return photoRingRows(colLen) * 4 * w + wideRingBytes(w);
}

/** The quality gate's widened rows, after the ring of converted rows. */
@inline
function wideRing(source: usize, ring: i32, w: i32): usize {
  return align16(source + <usize>(ring * 4 * w));
}

export function startPhotoRows(quality: usize, channels: i32): void {
  if (quality == 0) return;
  if (channels == 1) startGreyQuality();
  else startQualitySums();
}

/** Converts rows `converted` … needed−1 into the ring; returns the rows converted so far. */
export function convertPhotoRows(bytes: usize, channels: i32, kr: i32, kg: i32, kb: i32, quality: usize, source: usize, ring: i32, w: i32, h: i32, converted: i32, needed: i32): i32 {
  const rowBytes = <usize>(w * channels);
  for (; converted < needed; converted++) {
    const row = at(source, (converted % ring) * w);
    if (channels == 1) {
      bytesToFloats(bytes + <usize>converted * rowBytes, w, row);
      if (quality != 0 && converted > 0) greyQualityRow(bytes, w, h, converted - 1);
      continue;
    }
    lumaRgb8(bytes + <usize>converted * rowBytes, channels, w, row, kr, kg, kb);
    if (quality == 0) continue;
    // The gate reads each row five times (centre, up, down, left, right): widened to float64 once.
    const wide = wideRing(source, ring, w);
    widenRow(row, w, converted, wide);
    if (converted > 0) qualityRowsWide(wide, w, h, converted - 1, converted, 255);
  }
  return converted;
}

/** The last row's quality sums and the totals, once every row is converted. */
export function finishPhotoRows(bytes: usize, channels: i32, quality: usize, source: usize, ring: i32, w: i32, h: i32): void {
  if (quality == 0) return;
  if (channels == 1) {
    if (h > 0) greyQualityRow(bytes, w, h, h - 1);
    finishGreyQuality(quality);
    return;
  }
  if (h > 0) qualityRowsWide(wideRing(source, ring, w), w, h, h - 1, h, 255);
  finishQualitySums(quality);
}
