// The worker-thread pool returns what the in-process engine returns.
import { loadKernelLibrary } from '../../../server/vision/kernel-library';
import { VisionPool } from '../../../server/vision/pool';
import type { RawPhoto } from '../../../shared/vision/image';
import { RuleRunError, runRule } from '../../../shared/vision/pipeline';
import { onEngine } from './engines';

const photo: RawPhoto = (() => {
  const w = 64;
  const h = 48;
  const samples = new Uint16Array(w * h);
  for (let p = 0; p < w * h; p++) {
    const x = p % w;
    const y = Math.floor(p / w);
    samples[p] = (x - 30) ** 2 + (y - 20) ** 2 < 100 ? 52000 : 9000 + ((x * 131 + y * 71) % 997);
  }
  return { width: w, height: h, channels: 1, bitDepth: 16, samples };
})();

const rule = {
  format: 'kernwright-rule/1',
  name: 'Disc in the pool',
  steps: [
    { op: 'kernel', kernel: 'gaussian-5' },
    { op: 'gradient', operator: 'scharr', output: 'magnitude' },
    { op: 'threshold', method: 'otsu' },
    { op: 'close', radius: 1 },
  ],
  gauges: [
    { name: 'edges', measure: 'edge-fraction', limits: { max: 0.5 } },
    { name: 'rim', measure: 'largest-blob-length', unit: 'mm', limits: { max: 3 } },
  ],
};

let pool: VisionPool;
let kernels: Awaited<ReturnType<typeof loadKernelLibrary>>;
beforeAll(async () => {
  kernels = await loadKernelLibrary();
  pool = new VisionPool({ kernels, threads: 2 });
});
afterAll(async () => {
  await pool.destroy();
});

test('a run in a worker equals the same run in this thread: verdict, measurements and every step output', async () => {
  const local = runRule(rule, photo, { kernels, mmPerPx: 0.05 });
  const remote = await pool.run(rule, photo, { mmPerPx: 0.05 });
  expect(remote.verdict).toBe(local.verdict);
  expect(remote.measurements).toEqual(local.measurements);
  expect(remote.quality).toEqual(local.quality);
  remote.steps.forEach((s, i) => expect(Array.from(s.output!.data)).toEqual(Array.from(local.steps[i].output!.data)));
}, 60_000);

test('several runs at once all come back right', async () => {
  const local = runRule(rule, photo, { kernels, mmPerPx: 0.05 });
  const runs = await Promise.all([1, 2, 3, 4].map(() => pool.run(rule, photo, { mmPerPx: 0.05, retain: 'gauged' })));
  for (const r of runs) expect(r.measurements).toEqual(local.measurements);
}, 60_000);

test('a rule that cannot run rejects with RuleRunError and its code', async () => {
  await expect(pool.run({ ...rule, steps: [{ op: 'kernel', kernel: 'emboss' }] }, photo)).rejects.toMatchObject({
    name: 'RuleRunError',
    code: 'unknown_kernel',
  });
  await expect(pool.run(rule, photo)).rejects.toBeInstanceOf(RuleRunError);
}, 60_000);

test('workers given the plain engine compute what the plain engine computes here, bit for bit', async () => {
  const plainPool = new VisionPool({ kernels, threads: 1, engine: 'plain' });
  try {
    const local = onEngine('plain', () => runRule(rule, photo, { kernels, mmPerPx: 0.05 }));
    const remote = await plainPool.run(rule, photo, { mmPerPx: 0.05 });
    expect(remote.measurements).toEqual(local.measurements);
    remote.steps.forEach((s, i) => expect(Array.from(s.output!.data)).toEqual(Array.from(local.steps[i].output!.data)));
  } finally {
    await plainPool.destroy();
  }
}, 60_000);
