// The plain engine's blob labelling (runs of set bits after a packing pre-pass) against the
// definition, written out here as a flood fill: 8-connected groups of non-zero pixels inside the
// region's spans, numbered in raster order of their first pixel (as OpenCV's
// connectedComponentsWithStats numbers them; from memory), with area and bounding box; NaN counts
// as non-zero and −0 as zero (the comparison v !== 0).
import fc from 'fast-check';
import { findBlobs, labelBlobs, type RowSpans } from '../../../shared/vision/blobs';
import type { Image } from '../../../shared/vision/image';
import { ENGINES, onEngine, sampleImage, seed, type SampleKind } from './engines';

function floodFill(image: Image, spans: RowSpans): { labels: number[]; blobs: { area: number; minX: number; minY: number; maxX: number; maxY: number }[] } {
  const { width: w, height: h, data } = image;
  const inside = (x: number, y: number) => x >= 0 && y >= 0 && x < w && y < h && x >= spans.start[y] && x < spans.end[y] && data[y * w + x] !== 0;
  const labels = new Array<number>(w * h).fill(0);
  const blobs: { area: number; minX: number; minY: number; maxX: number; maxY: number }[] = [];
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      if (!inside(x, y) || labels[y * w + x]) continue;
      const blob = { area: 0, minX: x, minY: y, maxX: x, maxY: y };
      blobs.push(blob);
      const stack = [[x, y]];
      labels[y * w + x] = blobs.length;
      while (stack.length > 0) {
        const [px, py] = stack.pop()!;
        blob.area++;
        blob.minX = Math.min(blob.minX, px);
        blob.maxX = Math.max(blob.maxX, px);
        blob.minY = Math.min(blob.minY, py);
        blob.maxY = Math.max(blob.maxY, py);
        for (let dy = -1; dy <= 1; dy++) {
          for (let dx = -1; dx <= 1; dx++) {
            const nx = px + dx;
            const ny = py + dy;
            if (inside(nx, ny) && !labels[ny * w + nx]) {
              labels[ny * w + nx] = blobs.length;
              stack.push([nx, ny]);
            }
          }
        }
      }
    }
  }
  return { labels, blobs };
}

const size = fc.oneof(fc.constantFrom([1, 1], [1, 40], [40, 1], [33, 3], [64, 5], [65, 7]), fc.tuple(fc.integer({ min: 1, max: 70 }), fc.integer({ min: 1, max: 30 })));

test('plain blob labels, areas and boxes equal a flood fill of the 8-connected non-zero pixels, inside any row spans', () => {
  fc.assert(
    fc.property(size, fc.constantFrom<SampleKind>('mask', 'awkward', '8-bit'), seed, fc.boolean(), ([w, h], kind, s, cut) => {
      const image = sampleImage(w, h, kind, s);
      const spans: RowSpans = {
        start: Int32Array.from({ length: h }, (_, y) => (cut ? ((y * 7) % (w + 1)) - 1 : 0)),
        end: Int32Array.from({ length: h }, (_, y) => (cut ? w + 1 - ((y * 3) % (w + 1)) : w)),
      };
      const ours = onEngine('plain', () => labelBlobs(image, spans));
      const expected = floodFill(image, spans);
      expect(Array.from(ours.labels)).toEqual(expected.labels);
      expect(ours.blobs).toEqual(expected.blobs);
      // The gauges' way, without the image of labels: the same blobs, on either engine.
      for (const engine of ENGINES) expect(onEngine(engine, () => findBlobs(image, spans))).toEqual(expected.blobs);
    }),
    { numRuns: 300 },
  );
});
