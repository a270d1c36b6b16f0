// Quick per-step timing of the engine alone (no reference libraries), for profiling one change at
// a time: prints best and median ns per pixel over the runs, on the 5 MP benchmark photo, for each
// engine (plain TypeScript and WebAssembly SIMD; BENCH_ENGINES=plain or simd for one of them).
// Run: npx ts-node --transpile-only -P server/tsconfig.json tests/bench/steps.ts [step ...]
// (node --cpu-prof -r ts-node/register/transpile-only ... gives a profile of the same runs.)
import { createPackedMask } from '../../shared/vision/deferrable-image';
import { labelBlobs } from '../../shared/vision/blobs';
import { correlate, correlateDirect } from '../../shared/vision/convolve';
import { setEngine, type EngineName } from '../../shared/vision/engine';
import { gradient } from '../../shared/vision/gradient';
import type { Image } from '../../shared/vision/image';
import { kernelFromMatrix } from '../../shared/vision/kernels';
import { laplacian, laplacianOfGaussian } from '../../shared/vision/laplacian';
import { medianFilter } from '../../shared/vision/median';
import { morphology } from '../../shared/vision/morphology';
import { inputChannel } from '../../shared/vision/photo-channel';
import { boxFilter, gaussianBlur } from '../../shared/vision/smoothing';
import { gaussianGradient } from '../../shared/vision/smoothed-gradient';
import { thresholdAdaptiveMean, thresholdOtsu } from '../../shared/vision/threshold';
import { ImageWorkspace } from '../../shared/vision/workspace';
import { washerPhoto } from './photos';

const width = Number(process.env.BENCH_WIDTH ?? 2592);
const height = Number(process.env.BENCH_HEIGHT ?? 1944);
const runs = Number(process.env.BENCH_RUNS ?? 7);
// BENCH_COLD=1 writes over a buffer larger than the caches before each timed run, as the other
// contenders of the full benchmark do between the engine's runs.
const evict = process.env.BENCH_COLD === '1' ? new Float64Array(64 << 20) : null;
const engines = (process.env.BENCH_ENGINES ?? 'plain,simd').split(',') as EngineName[];
const pixels = width * height;
const photo = washerPhoto(width, height);
const k5 = kernelFromMatrix([[1, 2, 0, -1, 1], [0, 3, 1, -2, 0], [2, -1, 4, 0, 1], [1, 0, -2, 3, 0], [0, 1, 1, 0, 2]]);
const k15 = kernelFromMatrix(Array.from({ length: 15 }, (_, j) => Array.from({ length: 15 }, (_, i) => ((i * 7 + j * 3) % 5) - 2 + (i === j ? 1 : 0))));
const k31 = kernelFromMatrix(Array.from({ length: 31 }, (_, j) => Array.from({ length: 31 }, (_, i) => ((i * 5 + j * 11) % 7) - 3 + (i === j ? 1 : 0))));

/** The steps on buffers of the engine's own workspace (for SIMD: in its WebAssembly memory, as a rule run has them). */
function stepsOn(workspace: ImageWorkspace): Record<string, () => void> {
  const take = (): Image => workspace.take(width, height);
  // The rule runner's input image: on the SIMD engine an 8-bit grey photo's keeps its bytes too.
  const input = inputChannel(photo, 'luma', take());
  const [a, b, c] = [take(), take(), take()];
  const magnitude = gradient(gaussianBlur(input, 1, 'reflect', a), 'sobel', 'magnitude', 'reflect', take());
  const mask = thresholdOtsu(magnitude, false, take()).mask;
  const packed = createPackedMask(width, height);
  const labels = new Int32Array(width * height);
  return {
    // As the rule runner runs it when the intermediate outputs are not kept (see engine.ts).
    pipeline: () => {
      const range = { min: NaN, max: NaN };
      gaussianGradient(input, 1, 'sobel', 'magnitude', 'reflect', b, range, a);
      thresholdOtsu(b, false, a, range, packed, false);
      morphology(a, 'open', 1, 'reflect', b, c, packed);
    },
    gaussian: () => gaussianBlur(input, 1, 'reflect', a),
    gaussianSobel: () => gaussianGradient(input, 1, 'sobel', 'magnitude', 'reflect', b, undefined, a),
    gaussian3: () => gaussianBlur(input, 3, 'reflect', a),
    sobel: () => gradient(input, 'sobel', 'magnitude', 'reflect', a),
    sobelx: () => gradient(input, 'sobel', 'x', 'reflect', a),
    otsu: () => thresholdOtsu(magnitude, false, a),
    open: () => morphology(mask, 'open', 1, 'reflect', a, b),
    open3value: () => morphology(input, 'open', 3, 'reflect', a, b),
    box: () => boxFilter(input, 5, 'reflect', a),
    adaptive: () => thresholdAdaptiveMean(input, 15, 5, 'replicate', false, a),
    median: () => medianFilter(input, 5, 'reflect', a),
    median3: () => medianFilter(input, 3, 'reflect', a),
    median7: () => medianFilter(input, 7, 'reflect', a),
    laplacian: () => laplacian(input, 4, 'reflect', a),
    log: () => laplacianOfGaussian(input, 1.4, 'reflect', a),
    k5: () => correlateDirect(input, k5, 'reflect', a),
    k15: () => correlate(input, k15, 'reflect', a),
    k15direct: () => correlateDirect(input, k15, 'reflect', a),
    k31: () => correlate(input, k31, 'reflect', a),
    blobs: () => labelBlobs(mask, undefined, labels),
  };
}

const chosen = process.argv.slice(2);
const ns = (ms: number) => ((ms * 1e6) / pixels).toFixed(2).padStart(7);
for (const engine of engines) {
  setEngine(engine);
  const steps = stepsOn(new ImageWorkspace(16));
  for (const name of chosen.length > 0 ? chosen : Object.keys(steps)) {
    const fn = steps[name];
    if (!fn) throw new Error(`unknown step ${name}; known: ${Object.keys(steps).join(' ')}`);
    fn();
    const times: number[] = [];
    const cpu: number[] = [];
    for (let i = 0; i < runs; i++) {
      evict?.fill(i);
      const c0 = process.cpuUsage();
      const t0 = performance.now();
      fn();
      times.push(performance.now() - t0);
      const used = process.cpuUsage(c0);
      cpu.push((used.user + used.system) / 1000);
    }
    times.sort((x, y) => x - y);
    cpu.sort((x, y) => x - y);
    // CPU time leaves out the time other processes held the core (the machine is shared).
    console.log(`${name.padEnd(11)}${engine.padEnd(6)} wall best ${ns(times[0])} median ${ns(times[times.length >> 1])}   cpu best ${ns(cpu[0])} median ${ns(cpu[cpu.length >> 1])} ns/px`);
  }
}
