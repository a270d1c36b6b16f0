// Morphology with a square structuring element of side 2r+1: erosion is the minimum over the
// square, dilation the maximum, each computed as a vertical then a horizontal 1-D pass.
// The rule's border applies: reflect and replicate never bring in a value from outside the
// square's reach, constant brings in 0 (OpenCV erode/dilate with BORDER_CONSTANT, value 0).
// Masks (every value 0 or 1) go through packed bits (binary-morphology.ts); this file is the
// path for any other values.
import type { MorphologyOp } from '../rules/schema';
import { binaryMorphology, type PackedMask } from './binary-morphology';
import { borderTable, fillRowBorder, OUTSIDE, rowOffsetTable, type BorderMode } from './border';
import { simdKernels } from './engine';
import { createImage, imageLike, type Image } from './image';

export function erode(src: Image, radius: number, border: BorderMode, out?: Image): Image {
  return binaryMorphology(src, 'erode', radius, border, out) ?? extremeFilter(src, radius, border, false, out);
}

export function dilate(src: Image, radius: number, border: BorderMode, out?: Image): Image {
  return binaryMorphology(src, 'dilate', radius, border, out) ?? extremeFilter(src, radius, border, true, out);
}

/**
 * Opening (erode then dilate) removes specks; closing (dilate then erode) fills pinholes.
 * `packed`: the same mask already in packed bits, from the step that wrote it.
 */
export function morphology(src: Image, op: MorphologyOp, radius: number, border: BorderMode, out?: Image, scratch?: Image, packed?: PackedMask): Image {
  return binaryMorphology(src, op, radius, border, out, packed) ?? valueMorphology(src, op, radius, border, out, scratch);
}

/** The value path of every operation, for any image (the reference the packed mask path is tested against). */
export function valueMorphology(src: Image, op: MorphologyOp, radius: number, border: BorderMode, out?: Image, scratch?: Image): Image {
  switch (op) {
    case 'erode':
      return extremeFilter(src, radius, border, false, out);
    case 'dilate':
      return extremeFilter(src, radius, border, true, out);
    case 'open':
    case 'close': {
      const tmp = scratch && scratch !== out ? imageLike(src, scratch) : createImage(src.width, src.height);
      const first = extremeFilter(src, radius, border, op !== 'open', tmp);
      return extremeFilter(first, radius, border, op === 'open', out);
    }
  }
}

/** Minimum (erosion) or maximum (dilation) over the square of side 2r+1, vertical then horizontal. */
function extremeFilter(src: Image, r: number, border: BorderMode, takeMax: boolean, out?: Image): Image {
  const simd = simdKernels();
  if (simd) return simd.extreme(src, r, border, takeMax, out);
  const { width: w, height: h, data } = src;
  const dst = imageLike(src, out === src ? undefined : out);
  const o = dst.data;
  const size = 2 * r + 1;
  const rowOffsets = rowOffsetTable(h, w, r, r, border);
  const colTable = borderTable(w, r, r, border);
  const line = new Float32Array(w + 2 * r);
  const zeros = new Float32Array(w);
  const rows: Float32Array[] = new Array(size);
  for (let y = 0; y < h; y++) {
    for (let j = 0; j < size; j++) {
      const off = rowOffsets[y + j];
      rows[j] = off === OUTSIDE ? zeros : data.subarray(off, off + w);
    }
    // Vertical pass into line[r … r+w−1], then the border, then the horizontal pass.
    if (takeMax) verticalMax(rows, w, line, r);
    else verticalMin(rows, w, line, r);
    fillRowBorder(line, w, r, colTable);
    if (takeMax) horizontalMax(line, size, w, o, y * w);
    else horizontalMin(line, size, w, o, y * w);
  }
  return dst;
}

function verticalMin(rows: Float32Array[], w: number, line: Float32Array, pad: number): void {
  if (rows.length === 3) {
    const a = rows[0], b = rows[1], c = rows[2];
    for (let x = 0; x < w; x++) {
      const u = a[x], v = b[x], t = c[x];
      const m = u < v ? u : v;
      line[pad + x] = m < t ? m : t;
    }
    return;
  }
  line.set(rows[0], pad);
  for (let j = 1; j < rows.length; j++) {
    const row = rows[j];
    for (let x = 0; x < w; x++) if (row[x] < line[pad + x]) line[pad + x] = row[x];
  }
}

function verticalMax(rows: Float32Array[], w: number, line: Float32Array, pad: number): void {
  if (rows.length === 3) {
    const a = rows[0], b = rows[1], c = rows[2];
    for (let x = 0; x < w; x++) {
      const u = a[x], v = b[x], t = c[x];
      const m = u > v ? u : v;
      line[pad + x] = m > t ? m : t;
    }
    return;
  }
  line.set(rows[0], pad);
  for (let j = 1; j < rows.length; j++) {
    const row = rows[j];
    for (let x = 0; x < w; x++) if (row[x] > line[pad + x]) line[pad + x] = row[x];
  }
}

function horizontalMin(line: Float32Array, size: number, w: number, o: Float32Array, base: number): void {
  if (size === 3) {
    for (let x = 0; x < w; x++) {
      const u = line[x], v = line[x + 1], t = line[x + 2];
      const m = u < v ? u : v;
      o[base + x] = m < t ? m : t;
    }
    return;
  }
  for (let x = 0; x < w; x++) {
    let m = line[x];
    for (let i = 1; i < size; i++) if (line[x + i] < m) m = line[x + i];
    o[base + x] = m;
  }
}

function horizontalMax(line: Float32Array, size: number, w: number, o: Float32Array, base: number): void {
  if (size === 3) {
    for (let x = 0; x < w; x++) {
      const u = line[x], v = line[x + 1], t = line[x + 2];
      const m = u > v ? u : v;
      o[base + x] = m > t ? m : t;
    }
    return;
  }
  for (let x = 0; x < w; x++) {
    let m = line[x];
    for (let i = 1; i < size; i++) if (line[x + i] > m) m = line[x + i];
    o[base + x] = m;
  }
}
