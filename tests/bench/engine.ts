// Benchmark of the vision engine, both its paths (plain TypeScript and WebAssembly SIMD), against
// OpenCV (WebAssembly, @techstark/opencv-js 4.5.2) and sharp (libvips), on photos generated in memory
// at 5 MP (2592x1944) and 1.3 MP (1280x1024). Prints ns per pixel (best and median of the runs,
// every contender timed in turn; the standard pipeline also with each contender's runs back to
// back, caches warm), the ratios to OpenCV, ns per 1-D pass of the convolutions, the
// whole rule run, the worker pool's throughput against one thread, the photo-received-to-verdict
// split of a 5 MP JPEG, peak memory, and the machine's load before and after (it is shared).
// The plain engine is timed in a process of its own, with OpenCV in turn (plainInOwnProcess).
// Run: npm run bench   (BENCH_RUNS=9 for more runs, BENCH_SIZES=5 for the 5 MP photo only)
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import sharp from 'sharp';
import { decodePhoto } from '../../server/vision/decode';
import { fftCorrelate as ndarrayFftCorrelate } from './ndarray-fft';
import { loadKernelLibrary } from '../../server/vision/kernel-library';
import { POOL_PROCESS_NODE_FLAGS, VisionPool } from '../../server/vision/pool';
import { cpuSince, threadCpuMs } from './thread-cpu';
import { validateRuleDocument, type RuleDocument } from '../../shared/rules/schema';
import { createPackedMask } from '../../shared/vision/deferrable-image';
import { labelBlobs } from '../../shared/vision/blobs';
import { correlate, correlateDirect } from '../../shared/vision/convolve';
import { measuredReadAhead, setEngine, type EngineName } from '../../shared/vision/engine';
import { measurePixels, regionSpans } from '../../shared/vision/gauges';
import { gradient } from '../../shared/vision/gradient';
import type { Image, RawPhoto } from '../../shared/vision/image';
import { kernelFromMatrix } from '../../shared/vision/kernels';
import { laplacian, laplacianOfGaussian } from '../../shared/vision/laplacian';
import { medianFilter } from '../../shared/vision/median';
import { morphology } from '../../shared/vision/morphology';
import { inputChannel, inputWithQuality } from '../../shared/vision/photo-channel';
import { releaseRun, runValidatedRule } from '../../shared/vision/pipeline';
import { gaussianGradient } from '../../shared/vision/smoothed-gradient';
import { boxFilter, gaussianBlur } from '../../shared/vision/smoothing';
import { thresholdAdaptiveMean, thresholdOtsu } from '../../shared/vision/threshold';
import { ImageWorkspace } from '../../shared/vision/workspace';
import { builtServerDir } from './built-server';
import { washerPhoto } from './photos';

// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Cv = any;

/**
 * The plain engine runs in a process of its own (KW_BENCH_PLAIN_CHILD), which never starts the SIMD
 * engine. Growing a WebAssembly memory detaches its old ArrayBuffer, and the first detached buffer in a
 * JavaScript isolate makes V8 drop an assumption its compiled code relies on for every typed-array
 * access (its "ArrayBufferDetaching" protector, `node --trace-protector-invalidation` shows the moment):
 * timed after the SIMD engine, the plain steps ran 15–70 % slower in the same process. A process of
 * the product runs one engine.
 */
const PLAIN_CHILD_OUT = process.env.KW_BENCH_PLAIN_CHILD;
const ENGINES: EngineName[] = PLAIN_CHILD_OUT ? ['plain'] : ['simd'];
const SIZES = [
  { label: '5 MP', width: 2592, height: 1944 },
  { label: '1.3 MP', width: 1280, height: 1024 },
].filter((s) => !process.env.BENCH_SIZES || process.env.BENCH_SIZES.split(',').some((m) => s.label.startsWith(m)));

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

/** OpenCV's WebAssembly memory from the start: growing it would detach a buffer (see ENGINES). */
const OPENCV_MEMORY_BYTES = 512 * 1024 * 1024;

function loadOpenCv(): Promise<{ cv: Cv }> {
  return new Promise((resolve) => {
    // The Emscripten module takes its settings from a global `Module` (128 MB of memory without one).
    (globalThis as { Module?: object }).Module = { TOTAL_MEMORY: OPENCV_MEMORY_BYTES };
    // eslint-disable-next-line @typescript-eslint/no-require-imports
    const cv = require('@techstark/opencv-js');
    if (cv.Mat) resolve({ cv });
    else cv.onRuntimeInitialized = () => resolve({ cv });
  });
}

/** Wall and CPU time of one contender, ms: best and median over the runs. */
interface Timing {
  best: number;
  median: number;
  cpuBest: number;
  cpuMedian: number;
}

function summary(wall: number[], cpu: number[]): Timing {
  const sorted = (a: number[]) => [...a].sort((x, y) => x - y);
  const w = sorted(wall);
  const c = sorted(cpu);
  return { best: w[0], median: w[w.length >> 1], cpuBest: c[0], cpuMedian: c[c.length >> 1] };
}

/**
 * Runs before a contender is timed. The plain engine compiles a loop for each kernel's weights, and
 * V8 runs it optimised only from about the fourth call on a 5 MP image (the plain 5×5 kernel in a
 * fresh process: 25, 18 and 22 ns/px, then 4.9); with one warm-up a round in a loaded minute timed
 * it unoptimised every time (16 ns/px). The server's workers run a rule on every photo, so the
 * benchmark states the speed they reach.
 */
const WARM_UP_RUNS = 3;

/**
 * Times every contender once per round, in turn, after warming each up, so that all of them see the
 * same moments of a shared, busy machine. CPU time is this process's (all run on this thread): it
 * leaves out the time other processes held the core.
 */
function inTurn(runs: number, contenders: Record<string, () => unknown>): Record<string, Timing> {
  const names = Object.keys(contenders);
  for (let i = 0; i < WARM_UP_RUNS; i++) for (const name of names) contenders[name]();
  const wall: Record<string, number[]> = {};
  const cpu: Record<string, number[]> = {};
  for (const name of names) (wall[name] = []), (cpu[name] = []);
  for (let i = 0; i < runs; i++) for (const name of names) timeOnce(contenders[name], wall[name], cpu[name]);
  return Object.fromEntries(names.map((n) => [n, summary(wall[n], cpu[n])]));
}

/** Runs `run` once, adding its wall time and this process's CPU time (ms) to the lists. */
function timeOnce(run: () => unknown, wall: number[], cpu: number[]): void {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  run();
  wall.push(performance.now() - t0);
  const used = process.cpuUsage(c0);
  cpu.push((used.user + used.system) / 1000);
}

/**
 * Times each contender's runs one after another (after the warm-up runs), so that every run starts with
 * the caches as the same contender's previous run left them, as a stream of photos through one
 * worker does. In turn (inTurn) the others' runs come between and evict its buffers.
 */
function backToBack(runs: number, contenders: Record<string, () => unknown>): Record<string, Timing> {
  const times: Record<string, Timing> = {};
  for (const [name, run] of Object.entries(contenders)) {
    for (let i = 0; i < WARM_UP_RUNS; i++) run();
    const wall: number[] = [];
    const cpu: number[] = [];
    for (let i = 0; i < runs; i++) timeOnce(run, wall, cpu);
    times[name] = summary(wall, cpu);
  }
  return times;
}

async function timeAsync(runs: number, fn: () => Promise<unknown>): Promise<Timing> {
  await fn();
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < runs; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    await fn();
    wall.push(performance.now() - t0);
    const used = process.cpuUsage(c0);
    cpu.push((used.user + used.system) / 1000);
  }
  return summary(wall, cpu);
}

/** The same step on each engine: the engine is switched before each call (a cheap assignment). */
function onEngines(buffers: Record<EngineName, Buffers>, step: (b: Buffers) => unknown): Record<string, () => unknown> {
  return Object.fromEntries(
    ENGINES.map((engine) => [
      engine,
      () => {
        setEngine(engine);
        return step(buffers[engine]);
      },
    ]),
  );
}

/** Inputs and outputs of one engine, where that engine computes (SIMD: its WebAssembly memory, as a rule run has them). */
interface Buffers {
  input: Image;
  a: Image;
  b: Image;
  c: Image;
  magnitude: Image;
  mask: Image;
  /** The blobs' image of labels, reused as OpenCV reuses its output Mat. */
  labels: Int32Array;
}

function buffersFor(engine: EngineName, photo: RawPhoto): Buffers {
  setEngine(engine);
  const workspace = new ImageWorkspace(16);
  const take = () => workspace.take(photo.width, photo.height);
  // The rule runner's input image: on the SIMD engine an 8-bit grey photo's keeps the bytes too, which
  // the direct kernels (the Laplacian, the 5×5 kernel) read instead of its float32 samples.
  const input = inputChannel(photo, 'luma', take());
  const magnitude = gradient(gaussianBlur(input, 1, 'reflect', take()), 'sobel', 'magnitude', 'reflect', take());
  return { input, a: take(), b: take(), c: take(), magnitude, mask: thresholdOtsu(magnitude, false, take()).mask, labels: new Int32Array(photo.width * photo.height) };
}

interface Row {
  step: string;
  times: Record<string, Timing>;
  /** 1-D passes over the image of a convolution step (for ns per pass). */
  passes?: number;
  note?: string;
}

const nsPerPx = (ms: number | undefined, pixels: number) => (ms === undefined ? '—' : ((ms * 1e6) / pixels).toFixed(2));
const ratio = (a?: Timing, b?: Timing) => (a && b ? (a.best / b.best).toFixed(2) : '—');

function printRows(label: string, pixels: number, rows: Row[]): void {
  console.log(`\n${label} (${pixels} px): ns per pixel, best / median wall time of the runs (all contenders in turn)`);
  console.log('plain: timed in a process of its own, with OpenCV in turn there; plain/CV is against that OpenCV time');
  const head = ['plain', 'simd', 'OpenCV', 'sharp'];
  console.log(`${'step'.padEnd(40)}${head.map((h) => h.padStart(14)).join('')}${'simd/CV'.padStart(9)}${'plain/CV'.padStart(9)}${'simd/pass'.padStart(10)}  note`);
  for (const r of rows) {
    const cell = (name: string) => {
      const t = r.times[name.toLowerCase()];
      return (t ? `${nsPerPx(t.best, pixels)}/${nsPerPx(t.median, pixels)}` : '—').padStart(14);
    };
    const perPass = r.passes && r.times.simd ? ((r.times.simd.best * 1e6) / pixels / r.passes).toFixed(2) : '—';
    console.log(
      `${r.step.padEnd(40)}${head.map(cell).join('')}${ratio(r.times.simd, r.times.opencv).padStart(9)}${ratio(r.times.plain, r.times.opencvForPlain ?? r.times.opencv).padStart(9)}${perPass.padStart(10)}  ${r.note ?? ''}`,
    );
  }
}

interface SizeResult {
  label: string;
  pipeline: Record<string, Timing>;
  fullRun: Partial<Record<EngineName, Timing>>;
  photo: RawPhoto;
  /** The plain engine's rows, timed in its own process with OpenCV in turn (their `opencv` is that process's). */
  rows: Row[];
}

/** What the plain engine's process hands back: its rows per size and its photo-to-verdict line. */
interface PlainResults {
  sizes: Record<string, Row[]>;
  verdict: string;
}

async function benchSize(cv: Cv, label: string, width: number, height: number, runs: number, plainRows?: Row[]): Promise<SizeResult> {
  const photo = washerPhoto(width, height);
  const pixels = width * height;
  const buffers = Object.fromEntries(ENGINES.map((engine) => [engine, buffersFor(engine, photo)])) as Record<EngineName, Buffers>;
  const { magnitude: ownMagnitude, mask: ownMask } = buffers[ENGINES[0]];
  // sharp's figures do not depend on the engine: timed in the main process only.
  const sharpTimes = async (fn: () => Promise<unknown>): Promise<Record<string, Timing>> => (PLAIN_CHILD_OUT ? {} : { sharp: await timeAsync(runs, fn) });

  const u8 = new cv.Mat(height, width, cv.CV_8U);
  u8.data.set(photo.samples);
  const f32 = new cv.Mat();
  u8.convertTo(f32, cv.CV_32F);
  const mag32 = new cv.Mat(height, width, cv.CV_32F);
  mag32.data32F.set(ownMagnitude.data);
  const mask8 = new cv.Mat(height, width, cv.CV_8U);
  mask8.data.set(ownMask.data);
  const [m1, m2, m3, m4] = [new cv.Mat(), new cv.Mat(), new cv.Mat(), new cv.Mat()];
  const stats = new cv.Mat();
  const centroids = new cv.Mat();
  const square3 = cv.getStructuringElement(cv.MORPH_RECT, new cv.Size(3, 3));
  const square7 = cv.getStructuringElement(cv.MORPH_RECT, new cv.Size(7, 7));
  const anchor = new cv.Point(-1, -1);
  const REFLECT = cv.BORDER_REFLECT_101;
  const raw = { raw: { width, height, channels: 1 as const } };
  const sharpRun = (build: (s: sharp.Sharp) => sharp.Sharp) => () => build(sharp(photo.samples, raw)).raw().toBuffer();

  const k5 = [[1, 2, 0, -1, 1], [0, 3, 1, -2, 0], [2, -1, 4, 0, 1], [1, 0, -2, 3, 0], [0, 1, 1, 0, 2]];
  const k15 = Array.from({ length: 15 }, (_, j) => Array.from({ length: 15 }, (_, i) => ((i * 7 + j * 3) % 5) - 2 + (i === j ? 1 : 0)));
  const k31 = Array.from({ length: 31 }, (_, j) => Array.from({ length: 31 }, (_, i) => ((i * 5 + j * 11) % 7) - 3 + (i === j ? 1 : 0)));
  const [k5kernel, k15kernel, k31kernel] = [k5, k15, k31].map((k) => kernelFromMatrix(k));
  const cvKernel5 = cv.matFromArray(5, 5, cv.CV_32F, k5.flat());
  const cvKernel15 = cv.matFromArray(15, 15, cv.CV_32F, k15.flat());
  const cvKernel31 = cv.matFromArray(31, 31, cv.CV_32F, k31.flat());

  const rows: Row[] = [];
  // As the rule runner does it when the intermediate outputs are not kept: the Gaussian and the
  // gradient in one sweep on the SIMD engine (in turn on the plain one), the magnitude's range
  // measured on the way and handed to Otsu, Otsu's mask handed to the opening in packed bits only.
  const packed = createPackedMask(width, height);
  const openCvPipeline = () => {
    cv.GaussianBlur(f32, m1, new cv.Size(7, 7), 1, 1, REFLECT);
    cv.Sobel(m1, m2, cv.CV_32F, 1, 0, 3, 1, 0, REFLECT);
    cv.Sobel(m1, m3, cv.CV_32F, 0, 1, 3, 1, 0, REFLECT);
    cv.magnitude(m2, m3, m1);
    const mm = cv.minMaxLoc(m1);
    const scale = mm.maxVal > mm.minVal ? 255 / (mm.maxVal - mm.minVal) : 0;
    m1.convertTo(m4, cv.CV_8U, scale, -mm.minVal * scale);
    cv.threshold(m4, m2, 0, 1, cv.THRESH_BINARY | cv.THRESH_OTSU);
    cv.morphologyEx(m2, m3, cv.MORPH_OPEN, square3, anchor, 1, REFLECT);
  };
  const pipelines = {
    ...onEngines(buffers, ({ input, a, b, c }) => {
      const range = { min: NaN, max: NaN };
      gaussianGradient(input, 1, 'sobel', 'magnitude', 'reflect', b, range, a);
      // Only the opening reads Otsu's mask, in packed bits: the rule runner then writes no float32 mask.
      thresholdOtsu(b, false, a, range, packed, false);
      morphology(a, 'open', 1, 'reflect', b, c, packed);
    }),
    opencv: openCvPipeline,
  };
  // The headline figure: twice the runs of the single steps.
  const pipeline = inTurn(2 * runs, pipelines);
  rows.push({ step: 'standard pipeline (G1→Sobel mag→Otsu→open1)', times: pipeline, note: 'OpenCV: 32F filters, 8U Otsu and open' });
  rows.push({ step: 'the same, each one\'s runs back to back', times: backToBack(2 * runs, pipelines), note: 'caches as its own last run left them' });

  // A batch reuses the buffers of finished runs, as a trial, a worker thread or the preview does.
  const workspaces = { plain: new ImageWorkspace(), simd: new ImageWorkspace() };
  const fullRun = inTurn(
    runs,
    Object.fromEntries(
      ENGINES.map((engine) => [
        engine,
        () => {
          setEngine(engine);
          releaseRun(runValidatedRule(STANDARD_RULE, photo, { retain: 'gauged', workspace: workspaces[engine] }), workspaces[engine]);
        },
      ]),
    ),
  ) as Partial<Record<EngineName, Timing>>;
  rows.push({ step: 'whole rule run (+ luma, quality gate, gauge)', times: fullRun });

  rows.push({
    step: 'gaussian sigma 1 (7 taps)',
    passes: 2,
    times: {
      ...inTurn(runs, { ...onEngines(buffers, ({ input, a }) => gaussianBlur(input, 1, 'reflect', a)), opencv: () => cv.GaussianBlur(f32, m1, new cv.Size(7, 7), 1, 1, REFLECT) }),
      ...(await sharpTimes(sharpRun((s) => s.blur(1)))),
    },
    note: 'sharp: 8-bit in/out',
  });
  rows.push({
    step: 'gaussian sigma 3 (19 taps)',
    passes: 2,
    times: inTurn(runs, { ...onEngines(buffers, ({ input, a }) => gaussianBlur(input, 3, 'reflect', a)), opencv: () => cv.GaussianBlur(f32, m1, new cv.Size(19, 19), 3, 3, REFLECT) }),
  });
  rows.push({
    step: 'box 5',
    times: {
      ...inTurn(runs, { ...onEngines(buffers, ({ input, a }) => boxFilter(input, 5, 'reflect', a)), opencv: () => cv.blur(f32, m1, new cv.Size(5, 5), anchor, REFLECT) }),
      ...(await sharpTimes(sharpRun((s) => s.convolve({ width: 5, height: 5, kernel: Array(25).fill(1), scale: 25 })))),
    },
  });
  rows.push({
    step: 'median 3',
    times: {
      ...inTurn(runs, { ...onEngines(buffers, ({ input, a }) => medianFilter(input, 3, 'reflect', a)), opencv: () => cv.medianBlur(u8, m4, 3) }),
      ...(await sharpTimes(sharpRun((s) => s.median(3)))),
    },
    note: 'simd: reads the 8-bit copy; OpenCV and sharp: 8-bit',
  });
  rows.push({
    step: 'median 5',
    times: {
      ...inTurn(Math.max(1, runs - 2), { ...onEngines(buffers, ({ input, a }) => medianFilter(input, 5, 'reflect', a)), opencv: () => cv.medianBlur(u8, m4, 5) }),
      ...(await sharpTimes(sharpRun((s) => s.median(5)))),
    },
    note: 'simd: reads the 8-bit copy; OpenCV and sharp: 8-bit',
  });
  rows.push({
    step: 'median 7',
    times: inTurn(Math.max(1, runs - 2), { ...onEngines(buffers, ({ input, a }) => medianFilter(input, 7, 'reflect', a)), opencv: () => cv.medianBlur(u8, m4, 7) }),
    note: 'OpenCV: 8-bit (its only depth from 7x7)',
  });
  rows.push({
    step: 'sobel magnitude',
    passes: 2,
    times: {
      ...inTurn(runs, {
        ...onEngines(buffers, ({ input, a }) => gradient(input, 'sobel', 'magnitude', 'reflect', a)),
        opencv: () => {
          cv.Sobel(f32, m2, cv.CV_32F, 1, 0, 3, 1, 0, REFLECT);
          cv.Sobel(f32, m3, cv.CV_32F, 0, 1, 3, 1, 0, REFLECT);
          cv.magnitude(m2, m3, m1);
        },
      }),
      ...(await sharpTimes(sharpRun((s) => s.convolve({ width: 3, height: 3, kernel: [-1, 0, 1, -2, 0, 2, -1, 0, 1] })))),
    },
    note: 'sharp: x only, clamped to 8 bits',
  });
  rows.push({
    step: 'gaussian sigma 1 → sobel magnitude',
    passes: 4,
    times: inTurn(runs, {
      ...onEngines(buffers, ({ input, a, b }) => gaussianGradient(input, 1, 'sobel', 'magnitude', 'reflect', b, undefined, a)),
      opencv: () => {
        cv.GaussianBlur(f32, m1, new cv.Size(7, 7), 1, 1, REFLECT);
        cv.Sobel(m1, m2, cv.CV_32F, 1, 0, 3, 1, 0, REFLECT);
        cv.Sobel(m1, m3, cv.CV_32F, 0, 1, 3, 1, 0, REFLECT);
        cv.magnitude(m2, m3, m1);
      },
    }),
    note: 'simd: one sweep (smoothed-gradient.ts); plain: in turn',
  });
  rows.push({
    step: 'sobel x',
    passes: 2,
    times: inTurn(runs, { ...onEngines(buffers, ({ input, a }) => gradient(input, 'sobel', 'x', 'reflect', a)), opencv: () => cv.Sobel(f32, m2, cv.CV_32F, 1, 0, 3, 1, 0, REFLECT) }),
  });
  rows.push({
    step: 'laplacian 4',
    passes: 1,
    times: {
      ...inTurn(runs, { ...onEngines(buffers, ({ input, a }) => laplacian(input, 4, 'reflect', a)), opencv: () => cv.Laplacian(f32, m1, cv.CV_32F, 1, 1, 0, REFLECT) }),
      ...(await sharpTimes(sharpRun((s) => s.convolve({ width: 3, height: 3, kernel: [0, 1, 0, 1, -4, 1, 0, 1, 0] })))),
    },
    note: 'simd: reads the 8-bit copy; OpenCV: 32F in (its 8U in is slower); sharp: clamped to 8 bits',
  });
  rows.push({ step: 'LoG sigma 1.4 (11 taps)', passes: 4, times: inTurn(runs, onEngines(buffers, ({ input, a }) => laplacianOfGaussian(input, 1.4, 'reflect', a))) });
  rows.push({
    step: 'otsu (on the float magnitude)',
    times: inTurn(runs, {
      ...onEngines(buffers, ({ magnitude, a }) => thresholdOtsu(magnitude, false, a)),
      opencv: () => {
        const mm = cv.minMaxLoc(mag32);
        const scale = 255 / (mm.maxVal - mm.minVal);
        mag32.convertTo(m4, cv.CV_8U, scale, -mm.minVal * scale);
        cv.threshold(m4, m2, 0, 1, cv.THRESH_BINARY | cv.THRESH_OTSU);
      },
    }),
    note: 'OpenCV: scale to 8U, then Otsu',
  });
  rows.push({
    step: 'adaptive mean 15, c 5',
    times: inTurn(runs, {
      ...onEngines(buffers, ({ input, a }) => thresholdAdaptiveMean(input, 15, 5, 'replicate', false, a)),
      opencv: () => cv.adaptiveThreshold(u8, m4, 1, cv.ADAPTIVE_THRESH_MEAN_C, cv.THRESH_BINARY, 15, -5),
    }),
    note: 'OpenCV: 8-bit; plain: mask left in packed bits',
  });
  rows.push({
    step: 'open r=1 (mask)',
    times: inTurn(runs, { ...onEngines(buffers, ({ mask, a, b }) => morphology(mask, 'open', 1, 'reflect', a, b)), opencv: () => cv.morphologyEx(mask8, m1, cv.MORPH_OPEN, square3, anchor, 1, REFLECT) }),
    note: 'OpenCV: 8-bit mask',
  });
  rows.push({
    step: 'open r=3 (any values)',
    passes: 4,
    times: inTurn(runs, { ...onEngines(buffers, ({ input, a, b }) => morphology(input, 'open', 3, 'reflect', a, b)), opencv: () => cv.morphologyEx(f32, m1, cv.MORPH_OPEN, square7, anchor, 1, REFLECT) }),
    note: 'OpenCV: 32F',
  });
  rows.push({
    step: 'kernel 5x5 non-separable (direct)',
    passes: 1,
    times: {
      ...inTurn(runs, { ...onEngines(buffers, ({ input, a }) => correlateDirect(input, k5kernel, 'reflect', a)), opencv: () => cv.filter2D(f32, m1, cv.CV_32F, cvKernel5, anchor, 0, REFLECT) }),
      ...(await sharpTimes(sharpRun((s) => s.convolve({ width: 5, height: 5, kernel: k5.flat() })))),
    },
    note: 'simd: reads the 8-bit copy; OpenCV: 32F in (its 8U in is slower); sharp: clamped to 8 bits',
  });
  rows.push({
    step: 'kernel 15x15 non-separable (FFT)',
    passes: 1,
    times: inTurn(runs, { ...onEngines(buffers, ({ input, a }) => correlate(input, k15kernel, 'reflect', a)), opencv: () => cv.filter2D(f32, m1, cv.CV_32F, cvKernel15, anchor, 0, REFLECT) }),
    note: 'FFT in 128x128 tiles on both engines; OpenCV: its DFT from 11x11',
  });
  rows.push({
    step: 'kernel 31x31 non-separable (FFT)',
    passes: 1,
    times: inTurn(runs, { ...onEngines(buffers, ({ input, a }) => correlate(input, k31kernel, 'reflect', a)), opencv: () => cv.filter2D(f32, m1, cv.CV_32F, cvKernel31, anchor, 0, REFLECT) }),
  });
  rows.push({
    step: 'kernel 31x31 (ndarray-convolve FFT)',
    // Timed in the plain engine's process, beside its column.
    times: buffers.plain ? { plain: inTurn(1, { fft: () => ndarrayFftCorrelate(buffers.plain.input, k31kernel, 'reflect') }).fft } : {},
    note: 'npm package, whole image; the engine used it from 27x27 before its own FFT',
  });
  rows.push({
    step: 'blobs, 8-connected',
    times: inTurn(runs, { ...onEngines(buffers, ({ mask, labels }) => labelBlobs(mask, undefined, labels)), opencv: () => cv.connectedComponentsWithStats(mask8, m1, stats, centroids, 8, cv.CV_32S) }),
  });

  [u8, f32, mag32, mask8, m1, m2, m3, m4, stats, centroids, square3, square7, cvKernel5, cvKernel15, cvKernel31].forEach((m) => m.delete());
  if (plainRows) {
    for (const row of rows) {
      const own = plainRows.find((r) => r.step === row.step);
      if (own?.times.plain) Object.assign(row.times, { plain: own.times.plain }, own.times.opencv ? { opencvForPlain: own.times.opencv } : {});
    }
  }
  if (!PLAIN_CHILD_OUT) printRows(label, pixels, rows);
  return { label, pipeline: rows[0].times, fullRun, photo, rows };
}

/** The pool as the built server runs it, its workers on compiled JavaScript (built-server.ts; BENCH_POOL_FROM_SOURCE=1: from the sources). */
let builtPool: typeof VisionPool | null = null;
function poolClass(): typeof VisionPool {
  if (process.env.BENCH_POOL_FROM_SOURCE === '1') return VisionPool;
  if (builtPool) return builtPool;
  const compiled = path.join(builtServerDir(), 'server', 'vision', 'pool.js');
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  builtPool = (require(compiled) as typeof import('../../server/vision/pool')).VisionPool;
  return builtPool;
}

/**
 * The standard pipeline alone (as the rule runner runs it when it keeps no intermediate image) in
 * two worker threads at once against one of them alone: how the engine itself scales on two cores,
 * without the pool's messages, the photo's move or the rest of a rule run. Workers load the
 * compiled engine (builtServerDir) and keep their buffers; each round times one thread running N
 * pipelines, then both running N each.
 */
async function benchPipelineThreads(size: SizeResult, engine: EngineName, runs: number, rounds: number): Promise<void> {
  const { width, height, samples } = size.photo;
  const source = `const { parentPort, workerData } = require('node:worker_threads');
    const at = (m) => require(workerData.dir + '/shared/vision/' + m);
    at('engine').setEngine(workerData.engine);
    const ws = new (at('workspace').ImageWorkspace)(8);
    const { width, height } = workerData;
    const input = at('image').channelImage({ width, height, channels: 1, bitDepth: 8, samples: workerData.samples }, 'luma', ws.take(width, height));
    const [a, b, c] = [ws.take(width, height), ws.take(width, height), ws.take(width, height)];
    const packed = at('deferrable-image').createPackedMask(width, height);
    const run = () => {
      const range = { min: NaN, max: NaN };
      at('smoothed-gradient').gaussianGradient(input, 1, 'sobel', 'magnitude', 'reflect', b, range, a);
      at('threshold').thresholdOtsu(b, false, a, range, packed, false);
      at('morphology').morphology(a, 'open', 1, 'reflect', b, c, packed);
    };
    for (let i = 0; i < 3; i++) run();
    parentPort.on('message', (n) => { const t0 = performance.now(); for (let i = 0; i < n; i++) run(); parentPort.postMessage(performance.now() - t0); });
    parentPort.postMessage('ready');`;
  const workerData = { dir: builtServerDir(), engine, width, height, samples };
  const workers = [0, 1].map(() => new Worker(source, { eval: true, workerData }));
  const reply = (w: Worker, n?: number) =>
    new Promise<number | string>((resolve, reject) => {
      w.once('message', resolve).once('error', reject);
      if (n !== undefined) w.postMessage(n);
    });
  try {
    await Promise.all(workers.map((w) => reply(w)));
    const alone: number[] = [];
    const together: number[] = [];
    for (let round = 0; round < rounds; round++) {
      alone.push(((await reply(workers[0], runs)) as number) / runs);
      const t0 = performance.now();
      await Promise.all(workers.map((w) => reply(w, runs)));
      together.push((performance.now() - t0) / (2 * runs));
    }
    const one = summary(alone, alone);
    const two = summary(together, together);
    const cv = size.pipeline.opencv;
    console.log(`\nstandard pipeline alone in worker threads, ${engine} engine, ${size.label} (${runs} pipelines per thread, ${rounds} rounds)`);
    console.log(`  one thread ${one.best.toFixed(1)} ms per image best, ${one.median.toFixed(1)} median; two at once ${two.best.toFixed(1)} / ${two.median.toFixed(1)} ms per image: ${(one.best / two.best).toFixed(2)}x the throughput (best), ${(one.median / two.median).toFixed(2)}x (median)`);
    console.log(`  against OpenCV's pipeline on one thread: one thread ${(one.best / cv.best).toFixed(2)}, two threads ${(two.best / cv.best).toFixed(2)} (best); ${(two.median / cv.median).toFixed(2)} (median)${engine === 'plain' ? '; plain engine targets ≤ 0.6 and ≤ 0.35' : ''}`);
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
}

/** What the pool's lines need of a size's results: its photo, and OpenCV's standard pipeline time for the ratio. */
interface PoolTarget {
  label: string;
  photo: RawPhoto;
  opencv: Timing;
}

interface PoolChildTask {
  engine: EngineName;
  images: 'none' | 'retained';
  label: string;
  width: number;
  height: number;
  opencv: Timing;
}

/**
 * benchPool in a process of its own, started as the server is (POOL_PROCESS_NODE_FLAGS) and holding
 * what a server holds, not this benchmark's OpenCV module and images: with them in the heap, this
 * thread's collections took a share of the two cores from the workers (1.3× one thread, against
 * 1.7–1.8× from a process of its own).
 */
function poolInOwnProcess(size: SizeResult, engine: EngineName, images: 'none' | 'retained'): void {
  const task: PoolChildTask = { engine, images, label: size.label, width: size.photo.width, height: size.photo.height, opencv: size.pipeline.opencv };
  const env = {
    ...process.env,
    KW_BENCH_POOL_CHILD: JSON.stringify(task),
    KW_BENCH_BUILT_SERVER: builtServerDir(),
    TS_NODE_PROJECT: path.join(__dirname, '..', '..', 'server', 'tsconfig.json'),
  };
  const child = spawnSync(process.execPath, [...POOL_PROCESS_NODE_FLAGS, '-r', 'ts-node/register/transpile-only', __filename], { stdio: 'inherit', env });
  if (child.status !== 0) throw new Error(`the pool benchmark's process exited with ${child.status}`);
}

async function poolChild(task: PoolChildTask): Promise<void> {
  await benchPool({ label: task.label, photo: washerPhoto(task.width, task.height), opencv: task.opencv }, task.engine, task.images);
}

/**
 * Two stations per thread feeding a pool of two worker threads, against the same runs in this thread
 * and against the same pool with one worker (its messages and the photo's move included). `images`: 'none'
 * as every server caller asks (numbers only), 'retained' to see the cost of moving the images back.
 */
async function benchPool(target: PoolTarget, engine: EngineName, images: 'none' | 'retained'): Promise<void> {
  const { photo } = target;
  const kernels = await loadKernelLibrary();
  const threads = 2;
  const Pool = poolClass();
  const pool = new Pool({ kernels, threads, engine });
  // The same pool with one worker: the pool's own scaling, its messages and the photo's move on both sides.
  const onePool = new Pool({ kernels, threads: 1, engine });
  // Enough photos per round that the last ones, when one worker may be idle, weigh little (half a
  // run per thread: 2 % of a round of 48).
  const tasks = engine === 'simd' ? 48 : 16;
  const rounds = 3;
  // As a station does: a freshly decoded photo per inspection (copied before the round starts, as
  // the decoder's threads would have written it), moved to the worker; the run's images handed back
  // once the verdict is in, so that workers reuse their buffers.
  let fresh: RawPhoto[] = [];
  const freshPhotos = (n: number) => {
    fresh = Array.from({ length: n }, () => ({ ...photo, samples: photo.samples.slice() }));
  };
  // Each run's own time (RuleRun.ms, measured where it ran), to split a pooled photo's time into the
  // run and the rest (the photo's move, the messages, the worker's collections, waiting).
  let runMs: number[] = [];
  const inspect = async (through = pool) => {
    const run = await through.run(STANDARD_RULE, fresh.pop()!, { retain: 'gauged', transferPhoto: true, images });
    runMs.push(run.ms);
    through.release(run);
  };
  // The same runs one after another in this thread, timed in turn with the pool's rounds so that
  // both see the same moments of the shared machine.
  const workspace = new ImageWorkspace();
  const oneThread = () => {
    setEngine(engine);
    for (let i = 0; i < tasks; i++) {
      const run = runValidatedRule(STANDARD_RULE, fresh.pop()!, { retain: 'gauged', workspace });
      runMs.push(run.ms);
      releaseRun(run, workspace);
    }
  };
  const medianRun = () => {
    const sorted = [...runMs].sort((a, b) => a - b);
    runMs = [];
    return sorted[sorted.length >> 1];
  };
  try {
    // Two stations per thread, each sending its next photo when its previous verdict is back, so
    // that a photo waits whenever a worker finishes (a line has more stations than the server cores).
    const stationCount = 2 * threads;
    const stations = (photos: number, through = pool, count = stationCount) => Promise.all(Array.from({ length: count }, async () => {
      for (let i = 0; i < photos / count; i++) await inspect(through);
    }));
    freshPhotos(8);
    await stations(8);
    freshPhotos(8);
    await stations(8, onePool, 2);
    freshPhotos(tasks);
    oneThread();
    const poolMs: number[] = [];
    const poolCpu: number[] = [];
    const singleMs: number[] = [];
    const onePoolMs: number[] = [];
    const singleRun: number[] = [];
    const onePoolRun: number[] = [];
    const poolRun: number[] = [];
    /** CPU per photo of the pool's rounds: the main thread's, and the other threads' (the workers' above all). */
    const poolThreadCpu: { main: number; others: number }[] = [];
    medianRun();
    for (let round = 0; round < rounds; round++) {
      freshPhotos(tasks);
      let t0 = performance.now();
      oneThread();
      singleMs.push((performance.now() - t0) / tasks);
      singleRun.push(medianRun());
      freshPhotos(tasks);
      t0 = performance.now();
      await stations(tasks, onePool, 2);
      onePoolMs.push((performance.now() - t0) / tasks);
      onePoolRun.push(medianRun());
      freshPhotos(tasks);
      const c0 = process.cpuUsage();
      const threads0 = threadCpuMs();
      t0 = performance.now();
      await stations(tasks);
      poolMs.push((performance.now() - t0) / tasks);
      const used = process.cpuUsage(c0);
      poolCpu.push((used.user + used.system) / 1000 / tasks);
      if (threads0) {
        const { main, others } = cpuSince(threads0);
        poolThreadCpu.push({ main: main / tasks, others: others / tasks });
      }
      poolRun.push(medianRun());
    }
    const pooled = summary(poolMs, poolCpu);
    const single = summary(singleMs, singleMs);
    const onePooled = summary(onePoolMs, onePoolMs);
    const from = Pool === VisionPool ? 'workers from the TypeScript sources' : 'workers from the built server';
    const flags = process.execArgv.filter((a) => a.startsWith('--')).join(' ') || 'no node flags';
    console.log(`\nworker pool, ${engine} engine, images ${images} (${threads} threads, ${os.cpus().length} cores, ${from}, a process of its own with ${flags}, ${target.label} whole rule runs, ${tasks} photos from ${stationCount} stations, ${rounds} rounds)`);
    console.log(`  ${(1000 / pooled.best).toFixed(1)} images/s; ${pooled.best.toFixed(1)} ms per image best, ${pooled.median.toFixed(1)} median; CPU time of all threads ${pooled.cpuBest.toFixed(1)} ms per image`);
    // This thread moves the photos to the workers, so it has detached buffers: its plain runs are slower than in a thread that never has (see ENGINES).
    const detachedNote = engine === 'plain' ? ' (this thread has moved photos, which slows its plain runs: compare with the one-worker pool)' : '';
    console.log(`  one thread, the same runs in turn with the pool's rounds: ${single.best.toFixed(1)} ms per image best, ${single.median.toFixed(1)} median${detachedNote}`);
    console.log(`  throughput against one thread: ${(single.best / pooled.best).toFixed(2)}x (best against best), ${(single.median / pooled.median).toFixed(2)}x (median against median); target ≥ 1.8`);
    console.log(`  the same pool with one worker (two stations): ${onePooled.best.toFixed(1)} ms per image best, ${onePooled.median.toFixed(1)} median; two workers ${(onePooled.best / pooled.best).toFixed(2)}x its throughput (best), ${(onePooled.median / pooled.median).toFixed(2)}x (median)`);
    // Where a pooled photo's time goes, in the round of the best pool time: the run itself (beside
    // another worker, alone, and in this thread) and the rest of a worker's time.
    const bestRound = poolMs.indexOf(pooled.best);
    const [two, lone, here] = [poolRun[bestRound], onePoolRun[bestRound], singleRun[bestRound]];
    console.log(`  each run's own time (median, round of the best pool time): ${two.toFixed(1)} ms in a worker beside another, ${lone.toFixed(1)} ms in the lone worker, ${here.toFixed(1)} ms in this thread; a worker's time per photo outside its run (the photo's move, the messages, its collections, waiting): ${(threads * poolMs[bestRound] - two).toFixed(1)} ms with two, ${(onePoolMs[bestRound] - lone).toFixed(1)} ms alone`);
    // Two cores give at most 2 × one thread's time per photo over the pool's CPU per photo.
    const threadCpu = poolThreadCpu[bestRound];
    if (threadCpu) {
      const ceiling = (threads * singleMs[bestRound]) / (threadCpu.main + threadCpu.others);
      console.log(`  CPU per photo in that round: the main thread ${threadCpu.main.toFixed(2)} ms, the other threads ${threadCpu.others.toFixed(1)} ms (a worker's run ${two.toFixed(1)} ms of wall time), against ${singleMs[bestRound].toFixed(1)} ms a photo in this thread: on ${threads} cores at most ${ceiling.toFixed(2)}x`);
    }
    // Issue 3's pool target compares the standard pipeline with OpenCV's; a whole run does more (luma, quality gate, gauge), so this ratio is an upper bound.
    const cv = target.opencv;
    console.log(`  per image through the pool (whole run) against OpenCV's standard pipeline on one thread: ${(pooled.best / cv.best).toFixed(2)} best, ${(pooled.median / cv.median).toFixed(2)} median${engine === 'plain' ? ' (the plain engine\'s target for the pipeline alone: ≤ 0.35)' : ''}`);
  } finally {
    await Promise.all([pool.destroy(), onePool.destroy()]);
  }
}

/**
 * Copying a 20 MB float32 image with one thread, then with two threads at once: how much of the
 * memory system a second worker finds left (whole-image passes are bound by it once two working
 * sets no longer fit the shared cache).
 */
async function memoryBandwidth(): Promise<void> {
  const source = `const { parentPort } = require('node:worker_threads');
    const a = new Float32Array(5_000_000).fill(1), b = new Float32Array(5_000_000);
    for (let i = 0; i < 5; i++) b.set(a);
    const t0 = performance.now(); for (let i = 0; i < 40; i++) b.set(a);
    parentPort.postMessage((performance.now() - t0) / 40);`;
  const copy = () => new Promise<number>((resolve, reject) => new Worker(source, { eval: true }).once('message', resolve).once('error', reject));
  const one = await copy();
  const two = await Promise.all([copy(), copy()]);
  const rate = (ms: number) => `${(40e6 / ms / 1e6).toFixed(1)} GB/s`;
  console.log(`\nmemory: copying 20 MB (read + write) ${rate(one)} with one thread, ${two.map(rate).join(' and ')} with two at once`);
  const cold = coldCopy();
  console.log(`  with the caches emptied first (as in turn): copying a 5 MP float32 image ${cold.toFixed(2)} ns per pixel, about the least a pass that reads and writes such an image once can take in turn`);
}

/** Best of nine copies of a 5 MP float32 image, each after a 512 MB write (ns per pixel). */
function coldCopy(): number {
  const pixels = 2592 * 1944;
  const a = new Float32Array(pixels).fill(1), b = new Float32Array(pixels);
  const evict = new Float64Array(64 << 20);
  let fastest = Infinity;
  for (let i = 0; i < 9; i++) {
    evict.fill(i);
    const t0 = performance.now();
    b.set(a);
    fastest = Math.min(fastest, performance.now() - t0);
  }
  return (fastest * 1e6) / pixels;
}

/**
 * Photo received → verdict for a 5 MP JPEG, in this process: decode, then the rule run as the server
 * runs it (luma, quality gate, the four steps, the gauge), its steps' share, and the gauge and the
 * luma with the quality gate timed again alone (on the SIMD engine the run does the luma and the
 * quality gate inside the opening Gaussian-and-gradient sweep, whose time its steps show).
 */
async function photoToVerdict(photo: RawPhoto, runs: number): Promise<{ header: string; lines: string[] }> {
  const jpeg = await sharp(photo.samples, { raw: { width: photo.width, height: photo.height, channels: 1 } }).jpeg({ quality: 90 }).toBuffer();
  const spans = regionSpans(photo.width, photo.height, undefined);
  const channels = (await sharp(jpeg).metadata()).channels;
  const header = `\nphoto received → verdict, 5 MP JPEG (${(jpeg.length / 1e6).toFixed(2)} MB, decoded with ${channels} channels), ${runs} runs each, ms best / median`;
  const lines: string[] = [];
  for (const engine of ENGINES) {
    setEngine(engine);
    const workspace = new ImageWorkspace();
    const phases: Record<string, number[]> = { decode: [], 'rule run': [], 'its steps': [], 'gauge alone': [], 'luma + quality gate alone': [] };
    for (let i = 0; i <= runs; i++) {
      const t0 = performance.now();
      const decoded = await decodePhoto(jpeg);
      const t1 = performance.now();
      const run = runValidatedRule(STANDARD_RULE, decoded, { retain: 'gauged', workspace });
      const t2 = performance.now();
      const steps = run.steps.reduce((sum, s) => sum + s.ms, 0);
      const last = run.steps[run.steps.length - 1].output!;
      const t3 = performance.now();
      measurePixels(last, 'edge-fraction', spans);
      const t4 = performance.now();
      releaseRun(run, workspace);
      const alone = workspace.take(decoded.width, decoded.height);
      const t5 = performance.now();
      const { input } = inputWithQuality(decoded, 'luma', alone);
      const t6 = performance.now();
      workspace.give(input);
      if (i === 0) continue;
      phases.decode.push(t1 - t0);
      phases['rule run'].push(t2 - t1);
      phases['its steps'].push(steps);
      phases['gauge alone'].push(t4 - t3);
      phases['luma + quality gate alone'].push(t6 - t5);
    }
    const figures = Object.entries(phases).map(([name, values]) => {
      const sorted = [...values].sort((a, b) => a - b);
      return `${name} ${sorted[0].toFixed(1)} / ${sorted[sorted.length >> 1].toFixed(1)}`;
    });
    lines.push(`  ${engine.padEnd(6)} ${figures.join('; ')}`);
  }
  return { header, lines };
}

/** The plain engine's step rows and photo-to-verdict line, timed in a process of its own (see ENGINES). */
function plainInOwnProcess(): PlainResults {
  const out = path.join(os.tmpdir(), `kernwright-bench-plain-${process.pid}.json`);
  const env = { ...process.env, KW_BENCH_PLAIN_CHILD: out, TS_NODE_PROJECT: path.join(__dirname, '..', '..', 'server', 'tsconfig.json') };
  const child = spawnSync(process.execPath, ['-r', 'ts-node/register/transpile-only', __filename], { stdio: 'inherit', env });
  if (child.status !== 0) throw new Error(`the plain engine's benchmark process exited with ${child.status}`);
  try {
    return JSON.parse(fs.readFileSync(out, 'utf8')) as PlainResults;
  } finally {
    fs.rmSync(out, { force: true });
  }
}

async function plainChild(out: string, runs: number): Promise<void> {
  const { cv } = await loadOpenCv();
  const results: PlainResults = { sizes: {}, verdict: '' };
  let fiveMp: RawPhoto | undefined;
  for (const size of SIZES) {
    const result = await benchSize(cv, size.label, size.width, size.height, runs);
    results.sizes[size.label] = result.rows;
    if (size.label === '5 MP') fiveMp = result.photo;
  }
  if (fiveMp) results.verdict = (await photoToVerdict(fiveMp, runs)).lines.join('\n');
  fs.writeFileSync(out, JSON.stringify(results));
}

/** Which read-ahead the SIMD kernels took at load on this processor (shared/vision/wasm/read-ahead.ts), and why. */
function readAheadLine(): string {
  const choice = measuredReadAhead();
  if (!choice) return 'simd: the kernels cannot run here, so nothing was probed';
  const { on, off, ratio } = choice.timing;
  return `simd: single-stream passes read ahead ${choice.readAhead ? 'on' : 'off'} (the probe at load: off took ${ratio.toFixed(2)} of on's time at the median of its pairs; best samples on ${on.toFixed(2)} ms, off ${off.toFixed(2)} ms)`;
}

function load(): string {
  return os.loadavg().map((l) => l.toFixed(2)).join(' ');
}

async function main(): Promise<void> {
  if (process.env.KW_BENCH_POOL_CHILD) return poolChild(JSON.parse(process.env.KW_BENCH_POOL_CHILD) as PoolChildTask);
  sharp.concurrency(1);
  const runs = Number(process.env.BENCH_RUNS ?? 5);
  if (PLAIN_CHILD_OUT) return plainChild(PLAIN_CHILD_OUT, runs);
  console.log(`Kernwright vision benchmark — Node ${process.version}, ${os.cpus()[0]?.model ?? 'cpu'} × ${os.cpus().length}, load average (1, 5, 15 min) ${load()}`);
  console.log('plain: shared/vision in TypeScript; simd: its WebAssembly SIMD kernels; both single thread, float32.');
  console.log('OpenCV: @techstark/opencv-js 4.5.2 (WebAssembly, no SIMD); sharp 0.35 with concurrency 1.');
  console.log(readAheadLine());
  const plain = plainInOwnProcess();
  const { cv } = await loadOpenCv();
  const results: SizeResult[] = [];
  for (const size of SIZES) results.push(await benchSize(cv, size.label, size.width, size.height, runs, plain.sizes[size.label]));
  console.log('\nstandard pipeline summary (ms, best / median; target simd / OpenCV ≤ 0.15; plain against the OpenCV of its own process):');
  for (const r of results) {
    const t = r.pipeline;
    const f = (x: Timing) => `${x.best.toFixed(1)} / ${x.median.toFixed(1)}`;
    const cvPlain = t.opencvForPlain;
    console.log(`  ${r.label}: plain ${f(t.plain)} (OpenCV there ${f(cvPlain)}), simd ${f(t.simd)}, OpenCV ${f(t.opencv)}; simd/OpenCV ${(t.simd.best / t.opencv.best).toFixed(3)} best, ${(t.simd.median / t.opencv.median).toFixed(3)} median; plain/OpenCV ${(t.plain.best / cvPlain.best).toFixed(2)} best, ${(t.plain.median / cvPlain.median).toFixed(2)} median`);
    console.log(`  ${r.label} CPU time: plain ${t.plain.cpuBest.toFixed(1)} (OpenCV there ${cvPlain.cpuBest.toFixed(1)}), simd ${t.simd.cpuBest.toFixed(1)}, OpenCV ${t.opencv.cpuBest.toFixed(1)}; simd/OpenCV ${(t.simd.cpuBest / t.opencv.cpuBest).toFixed(3)}`);
    const warm = r.rows.find((row) => row.step.startsWith('the same, each'))!.times;
    console.log(`  ${r.label} back to back: plain ${f(warm.plain)} (OpenCV there ${f(warm.opencvForPlain)}), simd ${f(warm.simd)}, OpenCV ${f(warm.opencv)}; simd/OpenCV ${(warm.simd.best / warm.opencv.best).toFixed(3)} best, ${(warm.simd.median / warm.opencv.median).toFixed(3)} median; plain/OpenCV ${(warm.plain.best / warm.opencvForPlain.best).toFixed(2)} best`);
    const whole = r.rows.find((row) => row.step.startsWith('whole rule run'))!.times;
    console.log(`  ${r.label} whole rule run: plain ${f(whole.plain)}, simd ${f(whole.simd)}`);
  }
  await memoryBandwidth();
  for (const r of results) {
    if (r.label !== '5 MP') continue;
    await benchPipelineThreads(r, 'plain', 6, 4);
    await benchPipelineThreads(r, 'simd', 20, 4);
  }
  for (const r of results) {
    // Every server caller (inspections, trials, the preview check, repeatability studies) takes the numbers only.
    if (r.label === '5 MP') poolInOwnProcess(r, 'plain', 'none');
    poolInOwnProcess(r, 'simd', 'none');
  }
  const fiveMp = results.find((r) => r.label === '5 MP');
  if (fiveMp) {
    const { header, lines } = await photoToVerdict(fiveMp.photo, runs);
    console.log([header, plain.verdict, ...lines].join('\n'));
    console.log('  database (store the inspection, its measurements and audit event): tests/bench/inspection.ts measures it through the HTTP route');
  }
  const mem = process.memoryUsage();
  const mb = (n: number) => (n / 1048576).toFixed(0);
  console.log(`\nmemory: rss ${mb(mem.rss)} MB, heap ${mb(mem.heapUsed)} MB, array buffers ${mb(mem.arrayBuffers)} MB, peak rss (maxRSS) ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB`);
  console.log(`load average at the end ${load()}`);
}

main().catch((e) => {
  console.error(e);
  process.exitCode = 1;
});
