// How much of a second core a second pipeline finds: the SIMD standard pipeline (5 MP) in two
// separate processes pinned to CPU 0 and CPU 1 (taskset), each alone and then both at once, and an
// arithmetic loop that touches no memory, the same way. The processes share nothing but the machine,
// so a slowdown when both run comes from what the cores share (caches, memory), not from the pool.
//   npm run -s bench:cores
import { spawn, spawnSync } from 'node:child_process';
import os from 'node:os';
import path from 'node:path';
import { setEngine } from '../../shared/vision/engine';
import { createPackedMask } from '../../shared/vision/deferrable-image';
import { channelImage } from '../../shared/vision/image';
import { morphology } from '../../shared/vision/morphology';
import { gaussianGradient } from '../../shared/vision/smoothed-gradient';
import { thresholdOtsu } from '../../shared/vision/threshold';
import { ImageWorkspace } from '../../shared/vision/workspace';
import { washerPhoto } from './photos';

type Kind = 'pipeline' | 'arithmetic';
interface Timing {
  best: number;
  median: number;
}

function pipelineRun(): () => void {
  setEngine('simd');
  const width = 2592;
  const height = 1944;
  const ws = new ImageWorkspace(8);
  const input = channelImage(washerPhoto(width, height), 'luma', ws.take(width, height));
  const [a, b, c] = [ws.take(width, height), ws.take(width, height), ws.take(width, height)];
  const packed = createPackedMask(width, height);
  return () => {
    const range = { min: NaN, max: NaN };
    gaussianGradient(input, 1, 'sobel', 'magnitude', 'reflect', b, range, a);
    thresholdOtsu(b, false, a, range, packed, false);
    morphology(a, 'open', 1, 'reflect', b, c, packed);
  };
}

function arithmeticRun(): () => number {
  return () => {
    let x = 1.0001;
    let sum = 0;
    for (let i = 0; i < 3e7; i++) {
      sum += x * i;
      x = x * 0.9999999 + 1e-9;
    }
    return sum;
  };
}

function child(kind: Kind): void {
  const run = kind === 'pipeline' ? pipelineRun() : arithmeticRun();
  for (let i = 0; i < 5; i++) run();
  const times: number[] = [];
  for (let i = 0; i < 20; i++) {
    const t0 = performance.now();
    run();
    times.push(performance.now() - t0);
  }
  times.sort((p, q) => p - q);
  process.stdout.write(JSON.stringify({ best: times[0], median: times[times.length >> 1] }));
}

function pinned(kind: Kind, cpu: number): Promise<Timing> {
  return new Promise((resolve, reject) => {
    const args = ['-c', String(cpu), process.execPath, '-r', 'ts-node/register/transpile-only', __filename];
    const env = { ...process.env, KW_CORES_CHILD: kind, TS_NODE_PROJECT: path.join(__dirname, '..', '..', 'server', 'tsconfig.json') };
    const proc = spawn('taskset', args, { env, stdio: ['ignore', 'pipe', 'inherit'] });
    let out = '';
    proc.stdout.on('data', (d) => (out += d));
    proc.on('error', reject);
    proc.on('close', (code) => (code === 0 ? resolve(JSON.parse(out) as Timing) : reject(new Error(`the ${kind} process on CPU ${cpu} exited with ${code}`))));
  });
}

async function main(): Promise<void> {
  if (os.cpus().length < 2 || spawnSync('taskset', ['-c', '0', 'true']).status !== 0) {
    console.log('needs two CPUs and taskset (util-linux)');
    return;
  }
  const f = (t: Timing) => `${t.best.toFixed(1)} / ${t.median.toFixed(1)} ms`;
  console.log(`two processes pinned to CPU 0 and CPU 1, best / median of 20 runs each; load average ${os.loadavg().map((l) => l.toFixed(2)).join(' ')}`);
  for (const kind of ['pipeline', 'arithmetic'] as Kind[]) {
    const alone = [await pinned(kind, 0), await pinned(kind, 1)];
    const together = await Promise.all([pinned(kind, 0), pinned(kind, 1)]);
    const label = kind === 'pipeline' ? 'SIMD standard pipeline, 5 MP' : 'arithmetic loop, no memory';
    console.log(`${label}: alone CPU 0 ${f(alone[0])}, CPU 1 ${f(alone[1])}; both at once CPU 0 ${f(together[0])}, CPU 1 ${f(together[1])}`);
    const throughput = (1 / together[0].best + 1 / together[1].best) / Math.max(1 / alone[0].best, 1 / alone[1].best);
    console.log(`  two at once give ${throughput.toFixed(2)}x the throughput of the faster one alone (best times)`);
  }
}

if (process.env.KW_CORES_CHILD) child(process.env.KW_CORES_CHILD as Kind);
else
  main().catch((e) => {
    console.error(e);
    process.exitCode = 1;
  });
