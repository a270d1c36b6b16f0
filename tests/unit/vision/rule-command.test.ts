// The rule command as a script runs it: exit status 0 PASS, 1 FAIL, 2 RETAKE, 3 invalid input;
// result.json, one PNG per step, and .npy files that parse back (NumPy format 1.0).
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { parseNpyFloat32 } from '../../../server/vision/npy';
import { runRule } from '../../../shared/vision/pipeline';
import { encodePng } from './png';

jest.setTimeout(180_000);

const ROOT = path.resolve(__dirname, '..', '..', '..');
const dir = mkdtempSync(path.join(os.tmpdir(), 'kw-rule-command-'));
const W = 48;
const H = 32;

/** A bright 8x6 block on a textured dark background. */
const samples = Array.from({ length: W * H }, (_, p) => {
  const x = p % W;
  const y = Math.floor(p / W);
  return x >= 16 && x < 24 && y >= 10 && y < 16 ? 210 : 50 + ((x * 7 + y * 11) % 13);
});
const photoFile = path.join(dir, 'part.png');
writeFileSync(photoFile, encodePng(W, H, 1, 8, samples));

const baseRule = {
  format: 'kernwright-rule/1',
  name: 'Block size',
  steps: [
    { op: 'gaussian', sigma: 0.8 },
    { op: 'threshold', method: 'otsu' },
    { op: 'open', radius: 1 },
  ],
  gauges: [{ name: 'Block area', measure: 'largest-blob-area', unit: 'mm2', limits: { max: 1 } }],
};

function writeRule(name: string, rule: unknown): string {
  const file = path.join(dir, `${name}.json`);
  writeFileSync(file, JSON.stringify(rule));
  return file;
}

function rule(...args: string[]) {
  // The same entry as `npm run -s rule`, without npm in between.
  const result = spawnSync(process.execPath, ['-r', 'ts-node/register/transpile-only', path.join(ROOT, 'server/cli/rule.ts'), ...args], {
    cwd: ROOT,
    env: { ...process.env, TS_NODE_PROJECT: path.join(ROOT, 'server/tsconfig.json') },
    encoding: 'utf8',
    timeout: 120_000,
  });
  return { status: result.status, stdout: result.stdout, stderr: result.stderr };
}

test('PASS exits 0 and writes result.json, a PNG per step and, with --npy, step-NN.npy that parse back', () => {
  const out = path.join(dir, 'pass');
  const ruleFile = writeRule('pass', baseRule);
  const result = rule('run', '--rule', ruleFile, '--image', photoFile, '--out', out, '--npy', '--station-scale', '0.1');
  expect(result.stderr).toBe('');
  expect(result.status).toBe(0);
  const doc = JSON.parse(readFileSync(path.join(out, 'result.json'), 'utf8'));
  expect(doc.verdict).toBe('PASS');
  // 8 x 6 px = 48 px² at 0.1 mm/px = 0.48 mm².
  expect(doc.measurements).toEqual([{ name: 'Block area', value: expect.closeTo(0.48, 10), unit: 'mm2', limits: { max: 1 }, pass: true }]);
  // result.json keeps the unit's code for scripts; the summary printed for people writes its symbol.
  expect(result.stdout).toMatch(/pass {2}Block area: 0\.48\d* mm²\n/);
  expect(doc.steps.map((s: { op: string }) => s.op)).toEqual(['gaussian', 'threshold', 'open']);
  expect(Object.keys(doc.quality)).toEqual(expect.arrayContaining(['focus', 'clipped', 'mean']));
  const files = readdirSync(out).sort();
  expect(files.filter((f) => f.endsWith('.npy'))).toEqual(['step-01.npy', 'step-02.npy', 'step-03.npy']);
  expect(files.filter((f) => /^step-\d\d\.png$/.test(f))).toHaveLength(3);

  // The .npy header follows NumPy format 1.0 (numpy/lib/format.py): magic, version 1.0, '<f4', C order, (h, w).
  const raw = readFileSync(path.join(out, 'step-01.npy'));
  expect(raw.subarray(0, 8)).toEqual(Buffer.from([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0]));
  expect((10 + raw.readUInt16LE(8)) % 64).toBe(0);
  const npy = parseNpyFloat32(raw);
  expect([npy.descr, npy.fortranOrder, npy.shape]).toEqual(['<f4', false, [H, W]]);
  const inProcess = runRule(baseRule, { width: W, height: H, channels: 1, bitDepth: 8, samples: Uint8Array.from(samples) }, { mmPerPx: 0.1 });
  expect(Array.from(npy.data)).toEqual(Array.from(inProcess.steps[0].output!.data));
  expect(Array.from(parseNpyFloat32(readFileSync(path.join(out, 'step-03.npy'))).data)).toEqual(Array.from(inProcess.steps[2].output!.data));
});

test('FAIL exits 1', () => {
  const ruleFile = writeRule('fail', { ...baseRule, gauges: [{ ...baseRule.gauges[0], limits: { max: 0.1 } }] });
  const result = rule('run', '--rule', ruleFile, '--image', photoFile, '--out', path.join(dir, 'fail'), '--station-scale', '0.1');
  expect(result.status).toBe(1);
  expect(JSON.parse(readFileSync(path.join(dir, 'fail', 'result.json'), 'utf8')).verdict).toBe('FAIL');
  expect(readdirSync(path.join(dir, 'fail')).some((f) => f.endsWith('.npy'))).toBe(false);
});

test('RETAKE exits 2', () => {
  const ruleFile = writeRule('retake', { ...baseRule, quality: { minMean: 200 } });
  const result = rule('run', '--rule', ruleFile, '--image', photoFile, '--out', path.join(dir, 'retake'), '--station-scale', '0.1');
  expect(result.status).toBe(2);
  expect(result.stdout).toMatch(/too dark/);
});

test('an invalid rule exits 3 and names the path', () => {
  const ruleFile = writeRule('invalid', { ...baseRule, steps: [{ op: 'gaussian', sigma: 0 }] });
  const result = rule('run', '--rule', ruleFile, '--image', photoFile, '--out', path.join(dir, 'invalid'));
  expect(result.status).toBe(3);
  expect(result.stderr).toMatch(/steps\[0\]\.sigma: sigma must be between 0.3 and 10/);
});

test('a file that is not an image exits 3 with a clear message', () => {
  const ruleFile = writeRule('ok', baseRule);
  const result = rule('run', '--rule', ruleFile, '--image', ruleFile, '--out', path.join(dir, 'notimage'), '--station-scale', '0.1');
  expect(result.status).toBe(3);
  expect(result.stderr).toMatch(/not a readable image/);
});

test('validate prints every problem with its path and exits 3; a valid rule exits 0', () => {
  const bad = writeRule('bad', { ...baseRule, steps: [{ op: 'box', size: 4 }, { op: 'kernel', matrix: [[1]], divisor: 0 }], colour: 'red' });
  const result = rule('validate', bad);
  expect(result.status).toBe(3);
  expect(result.stderr).toMatch(/steps\[0\]\.size: size must be odd/);
  expect(result.stderr).toMatch(/steps\[1\]\.divisor: divisor must not be 0/);
  expect(result.stderr).toMatch(/colour: unknown field/);
  const unknownKernel = writeRule('unknown-kernel', { ...baseRule, steps: [{ op: 'kernel', kernel: 'emboss' }] });
  expect(rule('validate', unknownKernel).stderr).toMatch(/steps\[0\]\.kernel: no kernel named "emboss"/);
  expect(rule('validate', writeRule('good', baseRule)).status).toBe(0);
});
