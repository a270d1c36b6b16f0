// Benchmark of the vision engine against OpenCV (WebAssembly, @techstark/opencv-js 4.5.2) and
// sharp (libvips), on photos generated in memory at 5 MP (2592x1944) and 1.3 MP (1280x1024).
// Prints ns per pixel (best of several runs), ratios, pool throughput and peak memory.
// Run: npm run bench
import os from 'node:os';
import sharp from 'sharp';
import { loadKernelLibrary } from '../../server/vision/kernel-library';
import { fftCorrelate } from '../../server/vision/fft-correlate';
import { VisionPool } from '../../server/vision/pool';
import { validateRuleDocument, type RuleDocument } from '../../shared/rules/schema';
import { createPackedMask } from '../../shared/vision/binary-morphology';
import { labelBlobs } from '../../shared/vision/blobs';
import { correlateDirect } from '../../shared/vision/convolve';
import { gradient } from '../../shared/vision/gradient';
import { channelImage, createImage, type Image, type RawPhoto } from '../../shared/vision/image';
import { kernelFromMatrix } from '../../shared/vision/kernels';
import { laplacian, laplacianOfGaussian } from '../../shared/vision/laplacian';
import { medianFilter } from '../../shared/vision/median';
import { morphology } from '../../shared/vision/morphology';
import { releaseRun, runValidatedRule } from '../../shared/vision/pipeline';
import { ImageWorkspace } from '../../shared/vision/workspace';
import { boxFilter, gaussianBlur } from '../../shared/vision/smoothing';
import { thresholdAdaptiveMean, thresholdOtsu } from '../../shared/vision/threshold';
import { washerPhoto } from './photos';

// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Cv = any;

const SIZES = [
  { label: '5 MP', width: 2592, height: 1944 },
  { label: '1.3 MP', width: 1280, height: 1024 },
];

const STANDARD_RULE: RuleDocument = (() => {
  const v = validateRuleDocument({
    format: 'kernwright-rule/1',
    name: 'Standard pipeline',
    steps: [
      { op: 'gaussian', sigma: 1 },
      { op: 'gradient', operator: 'sobel', output: 'magnitude' },
      { op: 'threshold', method: 'otsu' },
      { op: 'open', radius: 1 },
    ],
    gauges: [{ name: 'Edge share', measure: 'edge-fraction', limits: { max: 0.5 } }],
  });
  if (!v.ok) throw new Error('benchmark rule invalid');
  return v.rule;
})();

function loadOpenCv(): Promise<{ cv: Cv }> {
  return new Promise((resolve) => {
    // eslint-disable-next-line @typescript-eslint/no-require-imports
    const cv = require('@techstark/opencv-js');
    if (cv.Mat) resolve({ cv });
    else cv.onRuntimeInitialized = () => resolve({ cv });
  });
}

/** Best wall time in ms over `runs` runs after one warm-up. */
function best(runs: number, fn: () => void): number {
  fn();
  let min = Infinity;
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    min = Math.min(min, performance.now() - t0);
  }
  return min;
}

/**
 * Best wall times of ours and OpenCV's, measured in turn (ours, OpenCV, ours, …) after one
 * warm-up each, so that both see the same moments of a shared, busy machine.
 */
function alternating(runs: number, ours: () => void, opencv: () => void): { ours: number; opencv: number; oursCpu: number; opencvCpu: number } {
  ours();
  opencv();
  let a = Infinity;
  let b = Infinity;
  let aCpu = Infinity;
  let bCpu = Infinity;
  // CPU time of this process (both run on this thread): leaves out the time other processes held the core.
  const cpuMs = (since: NodeJS.CpuUsage) => {
    const used = process.cpuUsage(since);
    return (used.user + used.system) / 1000;
  };
  for (let i = 0; i < runs; i++) {
    let c0 = process.cpuUsage();
    let t0 = performance.now();
    ours();
    a = Math.min(a, performance.now() - t0);
    aCpu = Math.min(aCpu, cpuMs(c0));
    c0 = process.cpuUsage();
    t0 = performance.now();
    opencv();
    b = Math.min(b, performance.now() - t0);
    bCpu = Math.min(bCpu, cpuMs(c0));
  }
  return { ours: a, opencv: b, oursCpu: aCpu, opencvCpu: bCpu };
}

async function bestAsync(runs: number, fn: () => Promise<unknown>): Promise<number> {
  await fn();
  let min = Infinity;
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    await fn();
    min = Math.min(min, performance.now() - t0);
  }
  return min;
}

interface Row {
  step: string;
  ours: number;
  opencv?: number;
  sharp?: number;
  note?: string;
}

const fmt = (ms: number | undefined, pixels: number) => (ms === undefined ? '—' : ((ms * 1e6) / pixels).toFixed(2));
const ratio = (a: number, b?: number) => (b === undefined ? '—' : (a / b).toFixed(2));

function printRows(label: string, pixels: number, rows: Row[]): void {
  console.log(`\n${label} (${pixels} px) — ns per pixel, best of runs (ours and OpenCV in turn); ratio = ours / OpenCV`);
  console.log(`${'step'.padEnd(38)}${'ours'.padStart(9)}${'OpenCV'.padStart(9)}${'sharp'.padStart(9)}${'ratio'.padStart(8)}  note`);
  for (const r of rows) {
    console.log(
      `${r.step.padEnd(38)}${fmt(r.ours, pixels).padStart(9)}${fmt(r.opencv, pixels).padStart(9)}${fmt(r.sharp, pixels).padStart(9)}${ratio(r.ours, r.opencv).padStart(8)}  ${r.note ?? ''}`,
    );
  }
}

async function benchSize(cv: Cv, label: string, width: number, height: number, runs: number): Promise<{ pipelineMs: number; cvPipelineMs: number; pipelineCpuMs: number; cvPipelineCpuMs: number; fullRunMs: number; photo: RawPhoto }> {
  const photo = washerPhoto(width, height);
  const pixels = width * height;
  const input = channelImage(photo, 'luma');
  const a = createImage(width, height);
  const b = createImage(width, height);
  const c = createImage(width, height);
  const mask = thresholdOtsu(gradient(gaussianBlur(input, 1, 'reflect'), 'sobel', 'magnitude', 'reflect')).mask;
  const magnitude = gradient(gaussianBlur(input, 1, 'reflect'), 'sobel', 'magnitude', 'reflect');

  const u8 = new cv.Mat(height, width, cv.CV_8U);
  u8.data.set(photo.samples);
  const f32 = new cv.Mat();
  u8.convertTo(f32, cv.CV_32F);
  const mag32 = new cv.Mat(height, width, cv.CV_32F);
  mag32.data32F.set(magnitude.data);
  const mask8 = new cv.Mat(height, width, cv.CV_8U);
  mask8.data.set(mask.data);
  const [m1, m2, m3, m4] = [new cv.Mat(), new cv.Mat(), new cv.Mat(), new cv.Mat()];
  const stats = new cv.Mat();
  const centroids = new cv.Mat();
  const square3 = cv.getStructuringElement(cv.MORPH_RECT, new cv.Size(3, 3));
  const anchor = new cv.Point(-1, -1);
  const REFLECT = cv.BORDER_REFLECT_101;
  const raw = { raw: { width, height, channels: 1 as const } };
  const sharpRun = (build: (s: sharp.Sharp) => sharp.Sharp) => () => build(sharp(photo.samples, raw)).raw().toBuffer();

  const k5 = [[1, 2, 0, -1, 1], [0, 3, 1, -2, 0], [2, -1, 4, 0, 1], [1, 0, -2, 3, 0], [0, 1, 1, 0, 2]];
  const k15 = Array.from({ length: 15 }, (_, j) => Array.from({ length: 15 }, (_, i) => ((i * 7 + j * 3) % 5) - 2 + (i === j ? 1 : 0)));
  const cvKernel5 = cv.matFromArray(5, 5, cv.CV_32F, k5.flat());
  const cvKernel15 = cv.matFromArray(15, 15, cv.CV_32F, k15.flat());

  const rows: Row[] = [];
  // As the rule runner does it: the magnitude's range measured on the way, handed to Otsu, and
  // Otsu's mask handed to the opening in packed bits as well.
  const range = { min: NaN, max: NaN };
  const packed = createPackedMask(width, height);
  // The headline figure: twice the runs of the single steps.
  const { ours: pipelineMs, opencv: cvPipelineMs, oursCpu: pipelineCpuMs, opencvCpu: cvPipelineCpuMs } = alternating(
    2 * runs,
    () => {
      gaussianBlur(input, 1, 'reflect', a);
      gradient(a, 'sobel', 'magnitude', 'reflect', b, range);
      thresholdOtsu(b, false, a, range, packed);
      morphology(a, 'open', 1, 'reflect', b, c, packed);
    },
    () => {
      cv.GaussianBlur(f32, m1, new cv.Size(7, 7), 1, 1, REFLECT);
      cv.Sobel(m1, m2, cv.CV_32F, 1, 0, 3, 1, 0, REFLECT);
      cv.Sobel(m1, m3, cv.CV_32F, 0, 1, 3, 1, 0, REFLECT);
      cv.magnitude(m2, m3, m1);
      const mm = cv.minMaxLoc(m1);
      const scale = mm.maxVal > mm.minVal ? 255 / (mm.maxVal - mm.minVal) : 0;
      m1.convertTo(m4, cv.CV_8U, scale, -mm.minVal * scale);
      cv.threshold(m4, m2, 0, 1, cv.THRESH_BINARY | cv.THRESH_OTSU);
      cv.morphologyEx(m2, m3, cv.MORPH_OPEN, square3, anchor, 1, REFLECT);
    },
  );
  // A batch reuses the buffers of finished runs, as a trial or a worker thread does.
  const workspace = new ImageWorkspace();
  const fullRunMs = best(runs, () => {
    releaseRun(runValidatedRule(STANDARD_RULE, photo, { retain: 'gauged', workspace }), workspace);
  });
  rows.push({ step: 'standard pipeline (G1→Sobel mag→Otsu→open1)', ours: pipelineMs, opencv: cvPipelineMs, note: 'OpenCV: 32F filters, 8U Otsu and open' });
  rows.push({ step: 'whole rule run (+ luma, quality gate, gauge)', ours: fullRunMs });

  rows.push({
    step: 'gaussian sigma 1 (7 taps)',
    ...alternating(runs, () => gaussianBlur(input, 1, 'reflect', a), () => cv.GaussianBlur(f32, m1, new cv.Size(7, 7), 1, 1, REFLECT)),
    sharp: await bestAsync(runs, sharpRun((s) => s.blur(1))),
    note: 'sharp: 8-bit in/out',
  });
  rows.push({
    step: 'box 5',
    ...alternating(runs, () => boxFilter(input, 5, 'reflect', a), () => cv.blur(f32, m1, new cv.Size(5, 5), anchor, REFLECT)),
    sharp: await bestAsync(runs, sharpRun((s) => s.convolve({ width: 5, height: 5, kernel: Array(25).fill(1), scale: 25 }))),
  });
  rows.push({
    step: 'median 5',
    ...alternating(Math.max(1, runs - 2), () => medianFilter(input, 5, 'reflect', a), () => cv.medianBlur(u8, m4, 5)),
    sharp: await bestAsync(runs, sharpRun((s) => s.median(5))),
    note: 'OpenCV and sharp: 8-bit',
  });
  rows.push({
    step: 'sobel magnitude',
    ...alternating(runs, () => gradient(input, 'sobel', 'magnitude', 'reflect', a), () => {
      cv.Sobel(f32, m2, cv.CV_32F, 1, 0, 3, 1, 0, REFLECT);
      cv.Sobel(f32, m3, cv.CV_32F, 0, 1, 3, 1, 0, REFLECT);
      cv.magnitude(m2, m3, m1);
    }),
    sharp: await bestAsync(runs, sharpRun((s) => s.convolve({ width: 3, height: 3, kernel: [-1, 0, 1, -2, 0, 2, -1, 0, 1] }))),
    note: 'sharp: x only, clamped to 8 bits',
  });
  rows.push({
    step: 'sobel x',
    ...alternating(runs, () => gradient(input, 'sobel', 'x', 'reflect', a), () => cv.Sobel(f32, m2, cv.CV_32F, 1, 0, 3, 1, 0, REFLECT)),
  });
  rows.push({
    step: 'laplacian 4',
    ...alternating(runs, () => laplacian(input, 4, 'reflect', a), () => cv.Laplacian(f32, m1, cv.CV_32F, 1, 1, 0, REFLECT)),
    sharp: await bestAsync(runs, sharpRun((s) => s.convolve({ width: 3, height: 3, kernel: [0, 1, 0, 1, -4, 1, 0, 1, 0] }))),
    note: 'sharp: clamped to 8 bits',
  });
  rows.push({ step: 'LoG sigma 1.4', ours: best(runs, () => laplacianOfGaussian(input, 1.4, 'reflect', a)) });
  rows.push({
    step: 'otsu (on the float magnitude)',
    ...alternating(runs, () => thresholdOtsu(magnitude, false, a), () => {
      const mm = cv.minMaxLoc(mag32);
      const scale = 255 / (mm.maxVal - mm.minVal);
      mag32.convertTo(m4, cv.CV_8U, scale, -mm.minVal * scale);
      cv.threshold(m4, m2, 0, 1, cv.THRESH_BINARY | cv.THRESH_OTSU);
    }),
    note: 'OpenCV: scale to 8U, then Otsu',
  });
  rows.push({
    step: 'adaptive mean 15, c 5',
    ...alternating(runs, () => thresholdAdaptiveMean(input, 15, 5, 'replicate', false, a), () => cv.adaptiveThreshold(u8, m4, 1, cv.ADAPTIVE_THRESH_MEAN_C, cv.THRESH_BINARY, 15, -5)),
    note: 'OpenCV: 8-bit',
  });
  rows.push({
    step: 'open r=1 (mask)',
    ...alternating(runs, () => morphology(mask, 'open', 1, 'reflect', a, b), () => cv.morphologyEx(mask8, m1, cv.MORPH_OPEN, square3, anchor, 1, REFLECT)),
    note: 'OpenCV: 8-bit mask',
  });
  rows.push({
    step: 'kernel 5x5 non-separable (direct)',
    ...alternating(runs, () => correlateDirect(input, kernelFromMatrix(k5), 'reflect', a), () => cv.filter2D(f32, m1, cv.CV_32F, cvKernel5, anchor, 0, REFLECT)),
    sharp: await bestAsync(runs, sharpRun((s) => s.convolve({ width: 5, height: 5, kernel: k5.flat() }))),
    note: 'sharp: clamped to 8 bits',
  });
  const k15kernel = kernelFromMatrix(k15);
  rows.push({
    step: 'kernel 15x15 non-separable (direct)',
    ...alternating(1, () => correlateDirect(input, k15kernel, 'reflect', a), () => cv.filter2D(f32, m1, cv.CV_32F, cvKernel15, anchor, 0, REFLECT)),
  });
  rows.push({ step: 'kernel 15x15 non-separable (FFT)', ours: best(1, () => fftCorrelate(input, k15kernel, 'reflect')), note: 'ndarray-convolve' });
  // The largest kernel a rule may hold, where an FFT would have its best chance.
  const k31 = Array.from({ length: 31 }, (_, j) => Array.from({ length: 31 }, (_, i) => ((i * 5 + j * 11) % 7) - 3 + (i === j ? 1 : 0)));
  const k31kernel = kernelFromMatrix(k31);
  rows.push({ step: 'kernel 31x31 non-separable (direct)', ours: best(1, () => correlateDirect(input, k31kernel, 'reflect', a)) });
  rows.push({ step: 'kernel 31x31 non-separable (FFT)', ours: best(1, () => fftCorrelate(input, k31kernel, 'reflect')), note: 'ndarray-convolve' });
  rows.push({
    step: 'blobs, 8-connected',
    ...alternating(runs, () => labelBlobs(mask), () => cv.connectedComponentsWithStats(mask8, m1, stats, centroids, 8, cv.CV_32S)),
  });

  printRows(label, pixels, rows);
  [u8, f32, mag32, mask8, m1, m2, m3, m4, stats, centroids, square3, cvKernel5, cvKernel15].forEach((m) => m.delete());
  return { pipelineMs, cvPipelineMs, pipelineCpuMs, cvPipelineCpuMs, fullRunMs, photo };
}

async function benchPool(photo: RawPhoto, singleRunMs: number, cvPipelineMs: number): Promise<void> {
  const kernels = await loadKernelLibrary();
  const threads = 2;
  const pool = new VisionPool({ kernels, threads });
  const tasks = 8;
  // As a station does: a freshly decoded photo per inspection, moved to the worker; the run's
  // images handed back once the evidence is made, so that workers compute into them again.
  const inspect = async () => {
    const fresh: RawPhoto = { ...photo, samples: photo.samples.slice() };
    pool.release(await pool.run(STANDARD_RULE, fresh, { retain: 'gauged', transferPhoto: true }));
  };
  try {
    // Two stations at once, each sending its next photo when the previous verdict is back.
    const stations = (photos: number) => Promise.all(Array.from({ length: threads }, async () => {
      for (let i = 0; i < photos / threads; i++) await inspect();
    }));
    await stations(4);
    let bestMs = Infinity;
    let cpuMs = Infinity;
    for (let round = 0; round < 3; round++) {
      const c0 = process.cpuUsage();
      const t0 = performance.now();
      await stations(tasks);
      bestMs = Math.min(bestMs, performance.now() - t0);
      const used = process.cpuUsage(c0);
      cpuMs = Math.min(cpuMs, (used.user + used.system) / 1000);
    }
    const perImage = bestMs / tasks;
    console.log(`\nworker pool (${threads} threads, ${os.cpus().length} cores, 5 MP whole rule runs, ${tasks} photos from ${threads} stations)`);
    console.log(`  ${(1000 / perImage).toFixed(1)} images/s, ${perImage.toFixed(1)} ms per image (${((perImage * 1e6) / (photo.width * photo.height)).toFixed(2)} ns/px)`);
    console.log(`  CPU time of all threads ${(cpuMs / tasks).toFixed(1)} ms per image (includes the main thread's photo copies)`);
    console.log(`  single thread whole run ${singleRunMs.toFixed(1)} ms; speed-up ${(singleRunMs / perImage).toFixed(2)}x`);
    console.log(`  pool time per image / OpenCV standard pipeline: ${(perImage / cvPipelineMs).toFixed(2)} (target ≤ 0.35)`);
  } finally {
    await pool.destroy();
  }
}

async function main(): Promise<void> {
  sharp.concurrency(1);
  const runs = Number(process.env.BENCH_RUNS ?? 5);
  console.log(`Kernwright vision benchmark — Node ${process.version}, ${os.cpus()[0]?.model ?? 'cpu'}, load ${os.loadavg().map((l) => l.toFixed(1)).join(' ')}`);
  console.log('ours: shared/vision (single thread, float32); OpenCV: @techstark/opencv-js 4.5.2 (WebAssembly); sharp 0.35 with concurrency 1');
  const { cv } = await loadOpenCv();
  const results: Awaited<ReturnType<typeof benchSize>>[] = [];
  for (const size of SIZES) results.push(await benchSize(cv, size.label, size.width, size.height, runs));
  console.log('\nstandard pipeline summary (ours / OpenCV, target ≤ 0.6):');
  SIZES.forEach((s, i) => {
    const r = results[i];
    console.log(`  ${s.label}: ours ${r.pipelineMs.toFixed(1)} ms, OpenCV ${r.cvPipelineMs.toFixed(1)} ms, ratio ${(r.pipelineMs / r.cvPipelineMs).toFixed(2)}; whole rule run ${r.fullRunMs.toFixed(1)} ms`);
    console.log(`  ${s.label} CPU time: ours ${r.pipelineCpuMs.toFixed(1)} ms, OpenCV ${r.cvPipelineCpuMs.toFixed(1)} ms, ratio ${(r.pipelineCpuMs / r.cvPipelineCpuMs).toFixed(2)}`);
  });
  await benchPool(results[0].photo, results[0].fullRunMs, results[0].cvPipelineMs);
  const mem = process.memoryUsage();
  const mb = (n: number) => (n / 1048576).toFixed(0);
  console.log(`\nmemory: rss ${mb(mem.rss)} MB, heap ${mb(mem.heapUsed)} MB, array buffers ${mb(mem.arrayBuffers)} MB, peak rss (maxRSS) ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB`);
}

main().catch((e) => {
  console.error(e);
  process.exitCode = 1;
});
