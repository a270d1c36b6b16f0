// The node flags a process running the worker pool is started with: one list in the code, the
// same in the start scripts, and a Node that knows them.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { missingPoolFlags, POOL_PROCESS_NODE_FLAGS } from '../../../server/vision/pool';

const scripts = path.join(__dirname, '..', '..', '..', 'scripts');

test('scripts/lib.sh lists the same flags as POOL_PROCESS_NODE_FLAGS', () => {
  const lib = fs.readFileSync(path.join(scripts, 'lib.sh'), 'utf8');
  const listed = /^KW_POOL_NODE_FLAGS=\(([^)]*)\)$/m.exec(lib);
  expect(listed).not.toBeNull();
  expect(listed![1].trim().split(/\s+/)).toEqual([...POOL_PROCESS_NODE_FLAGS]);
});

test('every script that starts the server or the demo seed passes the flags', () => {
  const starts: string[] = [];
  for (const file of fs.readdirSync(scripts).filter((f) => f.endsWith('.sh'))) {
    for (const line of fs.readFileSync(path.join(scripts, file), 'utf8').split('\n')) {
      if (/^\s*node\b.*dist-server\/server\/(main|cli\/prepare)\.js/.test(line)) starts.push(`${file}: ${line.trim()}`);
    }
  }
  // start.sh starts the seed and the server, demo-reset.sh the seed.
  expect(starts.length).toBeGreaterThanOrEqual(3);
  for (const start of starts) expect(start).toContain('node "${KW_POOL_NODE_FLAGS[@]}" dist-server/');
});

test('this Node accepts each flag (an unknown V8 flag stops node with "bad option")', () => {
  for (const flag of POOL_PROCESS_NODE_FLAGS) {
    const run = spawnSync(process.execPath, [flag, '-e', `process.stdout.write(String(process.execArgv.includes(${JSON.stringify(flag)})))`], { encoding: 'utf8' });
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    expect(run.stdout).toBe('true');
  }
  expect(spawnSync(process.execPath, ['--no-such-v8-flag-here', '-e', '0'], { encoding: 'utf8' }).status).not.toBe(0);
});

test('a process started with the flags runs a rule in its pool workers (the flags do not upset worker threads)', () => {
  const root = path.join(__dirname, '..', '..', '..');
  const script = `
    const { VisionPool } = require('./server/vision/pool');
    const { loadKernelLibrary } = require('./server/vision/kernel-library');
    (async () => {
      const pool = new VisionPool({ kernels: await loadKernelLibrary(), threads: 2 });
      const samples = new Uint8Array(64 * 48).map((_, p) => ((p % 64) - 32) ** 2 + (((p / 64) | 0) - 24) ** 2 < 200 ? 200 : 40);
      const photo = { width: 64, height: 48, channels: 1, bitDepth: 8, samples };
      const rule = { format: 'kernwright-rule/1', name: 'Disc', steps: [{ op: 'gaussian', sigma: 1 }, { op: 'threshold', method: 'otsu' }],
        gauges: [{ name: 'disc', measure: 'largest-blob-area', limits: { min: 100 } }] };
      const runs = await Promise.all([1, 2, 3, 4].map(() => pool.run(rule, { ...photo, samples: samples.slice() }, { images: 'none' })));
      await pool.destroy();
      process.stdout.write(JSON.stringify({ missing: require('./server/vision/pool').missingPoolFlags(), verdicts: runs.map((r) => r.verdict) }));
    })();`;
  const run = spawnSync(process.execPath, [...POOL_PROCESS_NODE_FLAGS, '-r', 'ts-node/register/transpile-only', '-e', script], {
    cwd: root,
    encoding: 'utf8',
    env: { ...process.env, TS_NODE_PROJECT: path.join(root, 'server', 'tsconfig.json') },
  });
  expect({ status: run.status, stderr: run.status === 0 ? '' : run.stderr }).toEqual({ status: 0, stderr: '' });
  expect(JSON.parse(run.stdout)).toEqual({ missing: [], verdicts: ['PASS', 'PASS', 'PASS', 'PASS'] });
}, 120_000);

test('missingPoolFlags names the flags a process was started without', () => {
  expect(missingPoolFlags([...POOL_PROCESS_NODE_FLAGS, '--enable-source-maps'])).toEqual([]);
  expect(missingPoolFlags(['--enable-source-maps'])).toEqual([...POOL_PROCESS_NODE_FLAGS]);
});
