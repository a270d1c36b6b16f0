// Buffers crossing the thread boundary: a moved photo and released runs must not change any result.
import { evidenceRaster } from '../../../server/vision/evidence';
import { loadKernelLibrary } from '../../../server/vision/kernel-library';
import { VisionPool } from '../../../server/vision/pool';
import type { RawPhoto } from '../../../shared/vision/image';
import { runRule } from '../../../shared/vision/pipeline';

function discPhoto(): RawPhoto {
  const w = 40;
  const h = 30;
  const samples = new Uint8Array(w * h);
  for (let p = 0; p < w * h; p++) {
    const x = p % w;
    const y = Math.floor(p / w);
    samples[p] = (x - 20) ** 2 + (y - 14) ** 2 < 64 ? 200 : 40 + ((x * 31 + y * 17) % 23);
  }
  return { width: w, height: h, channels: 1, bitDepth: 8, samples };
}

const rule = {
  format: 'kernwright-rule/1',
  name: 'Disc, buffers moved',
  steps: [
    { op: 'gaussian', sigma: 1 },
    { op: 'gradient', operator: 'sobel', output: 'magnitude' },
    { op: 'threshold', method: 'otsu' },
    { op: 'open', radius: 1 },
  ],
  gauges: [{ name: 'edges', measure: 'edge-fraction', limits: { max: 0.5 } }],
};

let pool: VisionPool;
let kernels: Awaited<ReturnType<typeof loadKernelLibrary>>;
beforeAll(async () => {
  kernels = await loadKernelLibrary();
  pool = new VisionPool({ kernels, threads: 1 });
});
afterAll(async () => {
  await pool.destroy();
});

test('a moved photo gives the same run, and the caller is left with empty samples', async () => {
  const local = runRule(rule, discPhoto(), { kernels });
  const photo = discPhoto();
  const remote = await pool.run(rule, photo, { transferPhoto: true });
  expect(photo.samples.length).toBe(0);
  expect(remote.measurements).toEqual(local.measurements);
  expect(Array.from(remote.steps[3].output!.data)).toEqual(Array.from(local.steps[3].output!.data));
}, 60_000);

test('runs after released runs (their buffers reused by the worker) give the same outputs', async () => {
  const local = runRule(rule, discPhoto(), { kernels });
  for (let i = 0; i < 4; i++) {
    const remote = await pool.run(rule, discPhoto(), { retain: 'all' });
    remote.steps.forEach((s, k) => expect(Array.from(s.output!.data)).toEqual(Array.from(local.steps[k].output!.data)));
    expect(Array.from(remote.input.data)).toEqual(Array.from(local.input.data));
    pool.release(remote);
    expect(remote.input.data.length).toBe(40 * 30); // still the caller's until the next task moves it
  }
}, 60_000);

test('a run asked for no images brings back the same numbers and leaves its images in the worker', async () => {
  const local = runRule(rule, discPhoto(), { kernels });
  for (let i = 0; i < 3; i++) {
    const remote = await pool.run(rule, discPhoto(), { images: 'none' });
    expect(remote.verdict).toBe(local.verdict);
    expect(remote.measurements).toEqual(local.measurements);
    expect(remote.input.data.length).toBe(0);
    expect(remote.steps.every((s) => s.output === null)).toBe(true);
  }
});

test('images when failed: a failing run brings its images for the evidence, a passing one none', async () => {
  const failing = { ...rule, gauges: [{ name: 'edges', measure: 'edge-fraction', limits: { max: 0.001 } }] };
  const failed = await pool.run(failing, discPhoto(), { images: 'when-failed' });
  expect(failed.verdict).toBe('FAIL');
  expect(Array.from(failed.input.data)).toEqual(Array.from(runRule(failing, discPhoto(), { kernels }).input.data));
  const passed = await pool.run(rule, discPhoto(), { images: 'when-failed' });
  expect(passed.verdict).toBe('PASS');
  expect(passed.input.data.length).toBe(0);
});

test('evidence drawn in the worker: a failing run without images brings the same evidence raster as one drawn here', async () => {
  const failing = { ...rule, gauges: [{ name: 'edges', measure: 'edge-fraction', region: { shape: 'circle', cx: 0.5, cy: 0.5, r: 0.3 }, limits: { max: 0.001 } }] };
  const remote = await pool.run(failing, discPhoto(), { images: 'none', retain: 'gauged', evidence: true });
  expect(remote.verdict).toBe('FAIL');
  expect(remote.input.data.length).toBe(0);
  const here = evidenceRaster(runRule(failing, discPhoto(), { kernels, retain: 'gauged' }));
  expect(remote.evidence).toMatchObject({ width: 40, height: 30, factor: 1 });
  expect(Buffer.from(remote.evidence!.rgb).equals(Buffer.from(here.rgb))).toBe(true);
  const passed = await pool.run(rule, discPhoto(), { images: 'none', evidence: true });
  expect(passed.evidence).toBeUndefined();
});
