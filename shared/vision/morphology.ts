// Morphology with a square structuring element of side 2r+1: erosion is the minimum over the
// square, dilation the maximum, each computed as a vertical then a horizontal 1-D pass.
// The rule's border applies: reflect and replicate never bring in a value from outside the
// square's reach, constant brings in 0 (OpenCV erode/dilate with BORDER_CONSTANT, value 0).
import type { MorphologyOp } from '../rules/schema';
import { borderTable, fillRowBorder, OUTSIDE, rowOffsetTable, type BorderMode } from './border';
import { createImage, imageLike, type Image } from './image';

export function erode(src: Image, radius: number, border: BorderMode, out?: Image): Image {
  return rankExtreme(src, radius, border, false, out);
}

export function dilate(src: Image, radius: number, border: BorderMode, out?: Image): Image {
  return rankExtreme(src, radius, border, true, out);
}

/** Opening (erode then dilate) removes specks; closing (dilate then erode) fills pinholes. */
export function morphology(src: Image, op: MorphologyOp, radius: number, border: BorderMode, out?: Image, scratch?: Image): Image {
  switch (op) {
    case 'erode':
      return erode(src, radius, border, out);
    case 'dilate':
      return dilate(src, radius, border, out);
    case 'open':
    case 'close': {
      const tmp = scratch && scratch !== out ? imageLike(src, scratch) : createImage(src.width, src.height);
      const first = op === 'open' ? erode(src, radius, border, tmp) : dilate(src, radius, border, tmp);
      return op === 'open' ? dilate(first, radius, border, out) : erode(first, radius, border, out);
    }
  }
}

function rankExtreme(src: Image, r: number, border: BorderMode, takeMax: boolean, out?: Image): Image {
  const { width: w, height: h, data } = src;
  const dst = imageLike(src, out === src ? undefined : out);
  const o = dst.data;
  const size = 2 * r + 1;
  const rowOffsets = rowOffsetTable(h, w, r, r, border);
  const colTable = borderTable(w, r, r, border);
  const line = new Float32Array(w + 2 * r);
  for (let y = 0; y < h; y++) {
    // Vertical pass into line[r … r+w−1]; rows outside a constant border are zeros.
    const first = rowOffsets[y];
    if (first === OUTSIDE) line.fill(0, r, r + w);
    else for (let x = 0; x < w; x++) line[r + x] = data[first + x];
    for (let j = 1; j < size; j++) {
      const off = rowOffsets[y + j];
      if (takeMax) {
        if (off === OUTSIDE) {
          for (let x = 0; x < w; x++) if (line[r + x] < 0) line[r + x] = 0;
        } else {
          for (let x = 0; x < w; x++) {
            const v = data[off + x];
            if (v > line[r + x]) line[r + x] = v;
          }
        }
      } else if (off === OUTSIDE) {
        for (let x = 0; x < w; x++) if (line[r + x] > 0) line[r + x] = 0;
      } else {
        for (let x = 0; x < w; x++) {
          const v = data[off + x];
          if (v < line[r + x]) line[r + x] = v;
        }
      }
    }
    fillRowBorder(line, w, r, colTable);
    // Horizontal pass.
    const base = y * w;
    if (takeMax) {
      for (let x = 0; x < w; x++) {
        let m = line[x];
        for (let i = 1; i < size; i++) {
          const v = line[x + i];
          if (v > m) m = v;
        }
        o[base + x] = m;
      }
    } else {
      for (let x = 0; x < w; x++) {
        let m = line[x];
        for (let i = 1; i < size; i++) {
          const v = line[x + i];
          if (v < m) m = v;
        }
        o[base + x] = m;
      }
    }
  }
  return dst;
}
