// A plain-engine worker thread never detaches an ArrayBuffer in a numbers-only run, evidence included:
// the first detached buffer of a thread makes V8 drop its "ArrayBufferDetaching" protector for good,
// and the plain engine's typed-array loops then run slower in that thread (server/vision/worker.ts).
// `node --trace-protector-invalidation` (a V8 flag) prints the moment it happens.
import { spawnSync } from 'node:child_process';
import path from 'node:path';

const root = path.join(__dirname, '..', '..', '..');
const INVALIDATED = 'Invalidating protector cell ArrayBufferDetaching';

function runTraced(script: string): { status: number | null; stdout: string; stderr: string } {
  return spawnSync(process.execPath, ['--trace-protector-invalidation', '-r', 'ts-node/register/transpile-only', '-e', script], {
    cwd: root,
    encoding: 'utf8',
    env: { ...process.env, TS_NODE_PROJECT: path.join(root, 'server', 'tsconfig.json') },
  });
}

test('the trace shows a detached buffer (the check below can fail)', () => {
  const run = runTraced('structuredClone(new ArrayBuffer(8), { transfer: [] }); const b = new ArrayBuffer(8); structuredClone(b, { transfer: [b] }); process.stdout.write("done")');
  expect(run.status).toBe(0);
  expect(run.stdout).toContain(INVALIDATED);
});

test('a failing numbers-only run with its evidence image detaches nothing in the plain worker', () => {
  const script = `
    const { VisionPool } = require('./server/vision/pool');
    const { loadKernelLibrary } = require('./server/vision/kernel-library');
    (async () => {
      const pool = new VisionPool({ kernels: await loadKernelLibrary(), threads: 1, engine: 'plain' });
      const samples = new Uint8Array(64 * 48).map((_, p) => ((p % 64) - 32) ** 2 + (((p / 64) | 0) - 24) ** 2 < 200 ? 200 : 40);
      const photo = { width: 64, height: 48, channels: 1, bitDepth: 8, samples };
      const rule = { format: 'kernwright-rule/1', name: 'Disc', steps: [{ op: 'gaussian', sigma: 1 }, { op: 'threshold', method: 'otsu' }],
        gauges: [{ name: 'disc', measure: 'largest-blob-area', limits: { min: 100000 } }] };
      const runs = [];
      for (let i = 0; i < 3; i++) runs.push(await pool.run(rule, photo, { images: 'none', retain: 'gauged', evidence: true }));
      await pool.destroy();
      process.stdout.write('RESULT ' + JSON.stringify(runs.map((r) => ({ verdict: r.verdict, evidence: r.evidence ? r.evidence.rgb.length : 0 }))) + '\\n');
    })();`;
  const run = runTraced(script);
  expect({ status: run.status, stderr: run.status === 0 ? '' : run.stderr }).toEqual({ status: 0, stderr: '' });
  const result = /^RESULT (.*)$/m.exec(run.stdout);
  expect(result).not.toBeNull();
  const runs = JSON.parse(result![1]) as { verdict: string; evidence: number }[];
  expect(runs.map((r) => r.verdict)).toEqual(['FAIL', 'FAIL', 'FAIL']);
  for (const r of runs) expect(r.evidence).toBeGreaterThan(0);
  // The photo is not moved (no transferPhoto), so nothing detaches in the main thread either.
  expect(run.stdout).not.toContain(INVALIDATED);
}, 120_000);
