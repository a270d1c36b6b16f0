// The plain engine's blob labelling (runs of set bits after a packing pre-pass) against the
// definition, written out here as a flood fill: 8-connected groups of non-zero pixels inside the
// region's spans, numbered in raster order of their first pixel (as OpenCV's
// connectedComponentsWithStats numbers them; from memory), with area and bounding box; NaN counts
// as non-zero and −0 as zero (the comparison v !== 0).
import fc from 'fast-check';
import { findBlobs, labelBlobs, wholeImageSpans, type RowSpans } from '../../../shared/vision/blobs';
import { imageFromSamples, type Image } from '../../../shared/vision/image';
import { setKernelLoops } from '../../../shared/vision/kernel-loops';
import { ENGINES, onEngine, sampleImage, seed, type SampleKind } from './engines';
import { seededRandom } from './images';

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

/**
 * Rows of runs (1–80 pixels) of one value each: whole words of zeros, of ones and of one other pattern
 * (NaN, a subnormal, −0, negative), which the generated packing loop answers without its bit loop.
 */
function runsImage(width: number, height: number, s: number): Image {
  const rand = seededRandom(s);
  const values = [0, 0, -0, 1, 1, NaN, 1e-45, -3, 2.5];
  const samples: number[] = [];
  while (samples.length < width * height) {
    const v = values[Math.floor(rand() * values.length)];
    const run = 1 + Math.floor(rand() * 80);
    for (let i = 0; i < run && samples.length < width * height; i++) samples.push(v);
  }
  return imageFromSamples(width, height, samples);
}

test('plain blob labels from the generated packing loop and from the general one equal a flood fill, also into a reused array of labels', () => {
  const wide = fc.tuple(fc.integer({ min: 32, max: 200 }), fc.integer({ min: 1, max: 12 }));
  fc.assert(
    fc.property(wide, seed, ([w, h], s) => {
      const image = runsImage(w, h, s);
      const spans = wholeImageSpans(w, h);
      const expected = floodFill(image, spans);
      const reused = new Int32Array(w * h).fill(-7);
      const generated = onEngine('plain', () => labelBlobs(image, spans, reused));
      expect(generated.labels).toBe(reused);
      expect(Array.from(generated.labels)).toEqual(expected.labels);
      expect(generated.blobs).toEqual(expected.blobs);
      setKernelLoops(false);
      try {
        const general = onEngine('plain', () => labelBlobs(image, spans));
        expect(Array.from(general.labels)).toEqual(expected.labels);
        expect(general.blobs).toEqual(expected.blobs);
      } finally {
        setKernelLoops(true);
      }
    }),
    { numRuns: 200 },
  );
});
