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
import { setKernelLoops } from '../../../shared/vision/kernel-loops';
import { morphology } from '../../../shared/vision/morphology';
import { gaussianBlur } from '../../../shared/vision/smoothing';
import { thresholdAdaptiveMean } from '../../../shared/vision/threshold';
import { isResident } from '../../../shared/vision/wasm/resident-image';
import { ImageWorkspace } from '../../../shared/vision/workspace';
import { partImage, seededRandom } from './images';

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

// The plain adaptive mean writes its mask into a workspace image as packed bits (smoothing.ts,
// boxBitsLoop); its reference is the same step into an ordinary image, which writes float32 samples
// and is checked against OpenCV.js in opencv-adaptive.test.ts.
describe('plain engine: the adaptive mean into a workspace image', () => {
  beforeAll(() => setEngine('plain'));
  afterEach(() => setKernelLoops(true));

  /** Photo-like 8-bit samples with a NaN and a −0 (the comparison is false for NaN, whatever the flip). */
  function awkwardPart(w: number, h: number): Image {
    const image = partImage(w, h, 255, w * 31 + h);
    image.data[Math.floor((w * h) / 3)] = NaN;
    image.data[w * h - 1] = -0;
    return image;
  }

  test('waits in packed bits that read back as the float path\'s samples, zero past the last column, for every border, size and flip', () => {
    for (const [w, h] of [[1, 1], [2, 9], [31, 6], [32, 5], [33, 7], [64, 4], [65, 18], [97, 3]]) {
      const src = awkwardPart(w, h);
      for (const border of ['reflect', 'replicate', 'constant'] as const) {
        for (const size of [3, 5, 15]) {
          for (const invert of [false, true]) {
            const workspace = new ImageWorkspace();
            const out = thresholdAdaptiveMean(src, size, 4.5, border, invert, workspace.take(w, h));
            const mask = pendingMask(out);
            expect(mask).not.toBeNull();
            for (let y = 0; y < h; y++) {
              const last = mask!.words[y * mask!.wordsPerRow + mask!.wordsPerRow - 1];
              const used = w - 32 * (mask!.wordsPerRow - 1);
              if (used < 32) expect(last >>> used).toBe(0);
            }
            const reference = thresholdAdaptiveMean(src, size, 4.5, border, invert, createImage(w, h));
            expect(Array.from(out.data)).toEqual(Array.from(reference.data));
          }
        }
      }
    }
  });

  test('the next step reads the bits: an opening and the blobs equal those of the written mask; a rerun into the same image leaves no stale bits', () => {
    const [w, h] = [77, 45];
    const src = awkwardPart(w, h);
    const workspace = new ImageWorkspace();
    const out = workspace.take(w, h);
    thresholdAdaptiveMean(src, 7, 2, 'reflect', false, out);
    const written = thresholdAdaptiveMean(src, 7, 2, 'reflect', false, createImage(w, h));
    const opened = morphology(out, 'open', 1, 'reflect', workspace.take(w, h));
    expect(Array.from(opened.data)).toEqual(Array.from(morphology(written, 'open', 1, 'reflect').data));
    const fromBits = labelBlobs(out);
    const fromSamples = labelBlobs(written);
    expect(fromBits.blobs).toEqual(fromSamples.blobs);
    expect(Array.from(fromBits.labels)).toEqual(Array.from(fromSamples.labels));
    // The inverted mask into the same image: every bit rewritten.
    thresholdAdaptiveMean(src, 7, 2, 'reflect', true, out);
    const inverted = thresholdAdaptiveMean(src, 7, 2, 'reflect', true, createImage(w, h));
    expect(Array.from(out.data)).toEqual(Array.from(inverted.data));
  });

  test('without the generated loops the step writes its samples (no packed bits)', () => {
    setKernelLoops(false);
    const src = awkwardPart(40, 12);
    const out = thresholdAdaptiveMean(src, 5, 1, 'replicate', false, new ImageWorkspace().take(40, 12));
    expect(pendingMask(out)).toBeNull();
    setKernelLoops(true);
    expect(Array.from(out.data)).toEqual(Array.from(thresholdAdaptiveMean(src, 5, 1, 'replicate', false, createImage(40, 12)).data));
  });
});
