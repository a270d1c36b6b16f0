// A mask the packed-bit morphology writes into a workspace image keeps its samples in packed bits
// until something reads them, on both engines (shared/vision/wasm/resident-image.ts for SIMD,
// shared/vision/deferrable-image.ts for plain): the edge fraction and the blobs read the bits. Every
// figure must equal the one from the written samples, the samples must appear when read, and a
// buffer given back must never show a stale mask.
import { labelBlobs } from '../../../shared/vision/blobs';
import { pendingMask } from '../../../shared/vision/deferrable-image';
import { setEngine, simdKernels, type EngineName } from '../../../shared/vision/engine';
import { measurePixels, regionSpans } from '../../../shared/vision/gauges';
import { createImage, imageLike, type Image } from '../../../shared/vision/image';
import { morphology } from '../../../shared/vision/morphology';
import { gaussianBlur } from '../../../shared/vision/smoothing';
import { isResident } from '../../../shared/vision/wasm/resident-image';
import { ImageWorkspace } from '../../../shared/vision/workspace';
import { seededRandom } from './images';

afterAll(() => setEngine('auto'));

/** True while the image's samples wait in packed bits. */
function deferred(image: Image): boolean {
  return isResident(image) ? image.packedMask !== null : pendingMask(image) !== null;
}

/** A 0/1 mask of blobs and noise, 77 columns (not a multiple of 32, so rows end inside a word). */
function noisyMask(width: number, height: number, seed: number): Float32Array {
  const rand = seededRandom(seed);
  return Float32Array.from({ length: width * height }, (_, p) => {
    const x = p % width, y = Math.floor(p / width);
    const inBlob = (x - 20) ** 2 + (y - 15) ** 2 < 80 || (x > 50 && x < 70 && y > 30);
    return inBlob || rand() < 0.08 ? 1 : 0;
  });
}

/**
 * A noisy 77×45 mask in a workspace opened (r = 1) into another workspace image, and the same
 * opening written into ordinary memory at once (the reference).
 */
function openedInWorkspace(seed: number) {
  const [w, h] = [77, 45];
  const workspace = new ImageWorkspace();
  const source = workspace.take(w, h);
  source.data.set(noisyMask(w, h, seed));
  const out = workspace.take(w, h);
  const opened = morphology(source, 'open', 1, 'reflect', out);
  const written = morphology(createImage(w, h, source.data.slice()), 'open', 1, 'reflect');
  return { w, h, workspace, source, out, opened, written };
}

describe.each<EngineName>(['simd', 'plain'])('%s engine', (engine) => {
  beforeAll(() => setEngine(engine));

  test('edge fraction from the bits in spans that start and end on and beside word boundaries equals the count of the written samples', () => {
    const { h, opened, written } = openedInWorkspace(13);
    const edges = [0, 1, 31, 32, 33, 63, 64, 65, 76, 77];
    const rand = seededRandom(21);
    for (let trial = 0; trial < 20; trial++) {
      const pick = () => edges[Math.floor(rand() * edges.length)];
      const start = Int32Array.from({ length: h }, pick);
      const end = Int32Array.from({ length: h }, pick);
      const spans = { start, end };
      expect(measurePixels(opened, 'edge-fraction', spans)).toBe(measurePixels(written, 'edge-fraction', spans));
    }
    expect(deferred(opened)).toBe(true);
  });

  test('the opening of a mask in a workspace: edge fraction, blobs and samples equal those of the same opening written out', () => {
    expect(simdKernels() !== null).toBe(engine === 'simd');
    const { w, h, out, opened, written } = openedInWorkspace(5);
    expect(opened).toBe(out);
    expect(deferred(opened)).toBe(true);
    for (const region of [undefined, { shape: 'rect' as const, x: 0.13, y: 0.2, w: 0.61, h: 0.5 }, { shape: 'circle' as const, cx: 0.5, cy: 0.5, r: 0.3 }]) {
      const spans = regionSpans(w, h, region);
      expect(measurePixels(opened, 'edge-fraction', spans)).toBe(measurePixels(written, 'edge-fraction', spans));
      expect(labelBlobs(opened, spans)).toEqual(labelBlobs(written, spans));
    }
    // Counting from the bits wrote no samples; reading them does.
    expect(deferred(opened)).toBe(true);
    expect(Array.from(opened.data)).toEqual(Array.from(written.data));
    expect(deferred(opened)).toBe(false);
  });

  test('a deferred mask read by the next step, and a buffer given back while deferred, show no stale samples', () => {
    const { w, h, workspace, source, opened, written } = openedInWorkspace(9);
    // Closing straight from the opening's bits equals closing its written samples.
    const closed = morphology(opened, 'close', 2, 'reflect', workspace.take(w, h));
    const expected = morphology(written, 'close', 2, 'reflect');
    expect(Array.from(closed.data)).toEqual(Array.from(expected.data));
    // A Gaussian of the deferred opening reads its samples.
    const opened2 = morphology(source, 'open', 1, 'reflect', workspace.take(w, h));
    const blurred = gaussianBlur(opened2, 1, 'reflect', workspace.take(w, h));
    const blurredExpected = gaussianBlur(written, 1, 'reflect');
    expect(Array.from(blurred.data)).toEqual(Array.from(blurredExpected.data));
    // Given back deferred, then reused as another step's output: that step's samples, not the mask.
    const heap = engine === 'simd' ? (source as unknown as { heap: { blocksInUse: number } }).heap : null;
    const stale = morphology(source, 'dilate', 3, 'reflect', workspace.take(w, h));
    expect(deferred(stale)).toBe(true);
    const inUse = heap?.blocksInUse ?? 0;
    workspace.give(stale);
    expect(deferred(stale)).toBe(false);
    if (heap) expect(heap.blocksInUse).toBe(inUse - 1);
    const reused = gaussianBlur(source, 2, 'reflect', workspace.take(w, h));
    expect(Array.from(reused.data)).toEqual(Array.from(gaussianBlur(createImage(w, h, source.data.slice()), 2, 'reflect').data));
  });

  test('a step writing into an image that still holds a deferred mask drops the bits unwritten and writes its own samples', () => {
    const { w, h, source, out, written } = openedInWorkspace(17);
    expect(deferred(out)).toBe(true);
    // Every output-taking step of the engine asks imageLike for its output first (image.ts).
    const raw = isResident(out) ? null : (out as unknown as { samples: Float32Array }).samples;
    raw?.fill(NaN);
    expect(imageLike(source, out)).toBe(out);
    expect(deferred(out)).toBe(false);
    // Dropped, not written: the plain buffer still holds what was there before (NaN), not the mask.
    if (raw) expect(raw.every(Number.isNaN)).toBe(true);
    // A step's output there equals the same step's output in fresh memory, whatever the engine.
    const opened = morphology(source, 'open', 1, 'reflect', out);
    const blurred = gaussianBlur(written, 1.5, 'reflect', opened);
    expect(Array.from(blurred.data)).toEqual(Array.from(gaussianBlur(written, 1.5, 'reflect').data));
    // The image a step reads is never its own output: imageLike(src, src) keeps src's deferred samples.
    const again = morphology(source, 'open', 1, 'reflect', out);
    expect(imageLike(again, again)).toBe(again);
    expect(deferred(again)).toBe(true);
    expect(Array.from(again.data)).toEqual(Array.from(written.data));
  });
});
