// Connected components: blobs are the 8-connected groups of non-zero pixels, optionally restricted
// to a region given as one span of columns per row. Two-pass labelling with union-find
// (Rosenfeld & Pfaltz, "Sequential operations in digital picture processing", JACM 13(4), 1966).
import { simdKernels } from './engine';
import type { Image } from './image';
import { labelRuns } from './run-labels';

/** Per row y, the region holds columns start[y] ≤ x < end[y] (empty when start ≥ end). */
export interface RowSpans {
  readonly start: Int32Array;
  readonly end: Int32Array;
}

export interface Blob {
  readonly area: number;
  readonly minX: number;
  readonly minY: number;
  readonly maxX: number;
  readonly maxY: number;
}

export interface BlobLabels {
  /** Label per pixel: 0 background, 1 … count for blobs (numbered in raster order of first pixel). */
  readonly labels: Int32Array;
  readonly blobs: Blob[];
}

export function wholeImageSpans(width: number, height: number): RowSpans {
  return { start: new Int32Array(height), end: new Int32Array(height).fill(width) };
}

function find(parent: Int32Array, a: number): number {
  while (parent[a] !== a) {
    parent[a] = parent[parent[a]];
    a = parent[a];
  }
  return a;
}

function union(parent: Int32Array, a: number, b: number): number {
  const ra = find(parent, a);
  const rb = find(parent, b);
  if (ra === rb) return ra;
  if (ra < rb) {
    parent[rb] = ra;
    return ra;
  }
  parent[ra] = rb;
  return rb;
}

export function labelBlobs(image: Image, spans: RowSpans = wholeImageSpans(image.width, image.height)): BlobLabels {
  const simd = simdKernels();
  if (simd) return labelRuns(simd.nonZeroWords(image), image.width, image.height, spans);
  const { width: w, height: h, data } = image;
  const labels = new Int32Array(w * h);
  let parent = new Int32Array(1024);
  let next = 1;

  for (let y = 0; y < h; y++) {
    const x0 = Math.max(0, spans.start[y]);
    const x1 = Math.min(w, spans.end[y]);
    const row = y * w;
    for (let x = x0; x < x1; x++) {
      if (data[row + x] === 0) continue;
      // Already-visited 8-neighbours: west, north-west, north, north-east. Pixels outside the
      // region are never labelled, so they read as background.
      let label = 0;
      const west = x > 0 ? labels[row + x - 1] : 0;
      if (west) label = west;
      if (y > 0) {
        const up = row - w;
        for (let dx = -1; dx <= 1; dx++) {
          const nx = x + dx;
          if (nx < 0 || nx >= w) continue;
          const n = labels[up + nx];
          if (n) label = label ? union(parent, label, n) : n;
        }
      }
      if (!label) {
        if (next >= parent.length) {
          const grown = new Int32Array(parent.length * 2);
          grown.set(parent);
          parent = grown;
        }
        parent[next] = next;
        label = next++;
      }
      labels[row + x] = label;
    }
  }

  // Second pass: resolve each provisional label to a final number and gather statistics.
  const final = new Int32Array(next);
  const blobs: { area: number; minX: number; minY: number; maxX: number; maxY: number }[] = [];
  for (let y = 0; y < h; y++) {
    const row = y * w;
    for (let x = Math.max(0, spans.start[y]); x < Math.min(w, spans.end[y]); x++) {
      const provisional = labels[row + x];
      if (!provisional) continue;
      const root = find(parent, provisional);
      let id = final[root];
      if (!id) {
        blobs.push({ area: 0, minX: x, minY: y, maxX: x, maxY: y });
        id = final[root] = blobs.length;
      }
      labels[row + x] = id;
      const b = blobs[id - 1];
      b.area++;
      if (x < b.minX) b.minX = x;
      if (x > b.maxX) b.maxX = x;
      if (y > b.maxY) b.maxY = y;
    }
  }
  return { labels, blobs };
}
