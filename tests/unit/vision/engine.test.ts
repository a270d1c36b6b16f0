// Choosing the engine, and the SIMD engine's memory: images that live in its WebAssembly memory
// keep their samples when it grows, and a workspace reuses them run after run.
import { activeEngine, engineChoice, prepareEngine, setEngine, simdKernels } from '../../../shared/vision/engine';
import type { RawPhoto } from '../../../shared/vision/image';
import { releaseRun, runRule } from '../../../shared/vision/pipeline';
import { isResident } from '../../../shared/vision/wasm/resident-image';
import { simdSupported } from '../../../shared/vision/wasm/simd-support';
import { ImageWorkspace } from '../../../shared/vision/workspace';
import { engineSetting } from '../../../server/vision/engine-setting';

afterEach(() => setEngine('auto'));

const photo: RawPhoto = (() => {
  const w = 29;
  const h = 19;
  const samples = new Uint8Array(w * h);
  for (let p = 0; p < w * h; p++) samples[p] = (p % w) > 12 ? 190 + (p % 7) : 40 + (p % 5);
  return { width: w, height: h, channels: 1, bitDepth: 8, samples };
})();

const rule = {
  format: 'kernwright-rule/1',
  name: 'Edge',
  steps: [
    { op: 'gaussian', sigma: 1 },
    { op: 'gradient', operator: 'sobel', output: 'magnitude' },
    { op: 'threshold', method: 'otsu' },
    { op: 'open', radius: 1 },
  ],
  gauges: [{ name: 'edges', measure: 'edge-fraction', limits: { max: 0.5 } }],
};

test('Node 20 validates WebAssembly SIMD, so auto runs the SIMD kernels', async () => {
  expect(simdSupported()).toBe(true);
  expect(engineChoice()).toBe('auto');
  expect(activeEngine()).toBe('simd');
  await expect(prepareEngine()).resolves.toBe('simd');
});

test('plain and simd force an engine; anything else is refused with the choices named', () => {
  setEngine('plain');
  expect(activeEngine()).toBe('plain');
  expect(simdKernels()).toBeNull();
  setEngine('simd');
  expect(activeEngine()).toBe('simd');
  expect(() => setEngine('fast' as never)).toThrow('unknown engine "fast": expected one of auto, simd, plain');
});

test('the server reads KW_ENGINE (auto when unset) and refuses an unknown value', () => {
  expect(engineSetting({})).toBe('auto');
  expect(engineSetting({ KW_ENGINE: 'plain' })).toBe('plain');
  expect(() => engineSetting({ KW_ENGINE: 'gpu' })).toThrow('KW_ENGINE must be one of auto, simd, plain; got "gpu"');
});

test('an image in the WebAssembly memory keeps its samples when the memory grows', () => {
  const simd = simdKernels()!;
  const image = simd.takeImage(300, 200);
  image.data.fill(7.5);
  image.data[0] = -1;
  const before = simd.heap.memoryBytes;
  // A block larger than all the memory so far makes it grow (and drops every older view of it).
  const big = simd.heap.alloc(before + 1_000_000);
  expect(simd.heap.memoryBytes).toBeGreaterThan(before);
  expect(image.data.length).toBe(300 * 200);
  expect(image.data[0]).toBe(-1);
  expect(image.data[59_999]).toBe(7.5);
  simd.heap.release(big);
  simd.heap.release(image.address);
});

test('a run with a workspace computes in the WebAssembly memory and reuses the same blocks run after run', () => {
  const simd = simdKernels()!;
  const workspace = new ImageWorkspace();
  const first = runRule(rule, photo, { retain: 'all', workspace });
  expect(isResident(first.input)).toBe(true);
  const addresses = [first.input, ...first.steps.map((s) => s.output!)].map((i) => (isResident(i) ? i.address : -1)).sort();
  const outputs = first.steps.map((s) => Array.from(s.output!.data));
  releaseRun(first, workspace);
  const second = runRule(rule, photo, { retain: 'all', workspace });
  const again = [second.input, ...second.steps.map((s) => s.output!)].map((i) => (isResident(i) ? i.address : -1)).sort();
  expect(again).toEqual(addresses);
  expect(second.steps.map((s) => Array.from(s.output!.data))).toEqual(outputs);
  releaseRun(second, workspace);
  workspace.dispose();
  expect(simd.heap.blocksInUse).toBe(0);
});

test('a run without a workspace returns its images in ordinary memory and leaves no block in use', () => {
  const simd = simdKernels()!;
  const run = runRule(rule, photo, { retain: 'all' });
  expect(isResident(run.input)).toBe(false);
  expect(run.steps.every((s) => !isResident(s.output!))).toBe(true);
  expect(simd.heap.blocksInUse).toBe(0);
});

test('the same run on the plain engine uses ordinary buffers and gives the same mask', () => {
  const simdRun = runRule(rule, photo, { retain: 'all' });
  setEngine('plain');
  const workspace = new ImageWorkspace();
  const plainRun = runRule(rule, photo, { retain: 'all', workspace });
  expect(isResident(plainRun.input)).toBe(false);
  expect(Array.from(plainRun.steps[3].output!.data)).toEqual(Array.from(simdRun.steps[3].output!.data));
});
