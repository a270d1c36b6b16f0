// Buffer reuse between runs: a workspace changes no result and keeps the memory of a batch flat.
import type { RawPhoto } from '../../../shared/vision/image';
import { releaseRun, runRule } from '../../../shared/vision/pipeline';
import { ImageWorkspace } from '../../../shared/vision/workspace';
import { onEngine } from './engines';
import { STANDARD_STEPS } from '../../support/standard-steps';

const photo: RawPhoto = (() => {
  const w = 45;
  const h = 31;
  const samples = new Uint8Array(w * h);
  for (let p = 0; p < w * h; p++) samples[p] = (p % w) > 20 && Math.floor(p / w) > 10 ? 210 : 30 + ((p * 37) % 11);
  return { width: w, height: h, channels: 1, bitDepth: 8, samples };
})();

const rule = {
  format: 'kernwright-rule/1',
  name: 'Bright corner',
  steps: STANDARD_STEPS,
  gauges: [
    { name: 'edges', measure: 'edge-fraction', limits: { max: 0.5 } },
    { name: 'mean gradient', measure: 'mean', step: 2, limits: { max: 1000 } },
  ],
};

test('runs that reuse released buffers give exactly the results of fresh runs', () => {
  const fresh = runRule(rule, photo, { retain: 'all' });
  const workspace = new ImageWorkspace();
  for (let i = 0; i < 3; i++) {
    const reused = runRule(rule, photo, { retain: 'gauged', workspace });
    expect(reused.measurements).toEqual(fresh.measurements);
    expect(reused.quality).toEqual(fresh.quality);
    expect(Array.from(reused.steps[3].output!.data)).toEqual(Array.from(fresh.steps[3].output!.data));
    releaseRun(reused, workspace);
  }
});

test('a batch of runs holds at most the workspace limit of spare buffers', () => {
  const workspace = new ImageWorkspace(4);
  for (let i = 0; i < 5; i++) releaseRun(runRule(rule, photo, { retain: 'all', workspace }), workspace);
  expect(workspace.spareCount).toBe(4);
});

test('a buffer of another size is never handed out', () => {
  const workspace = new ImageWorkspace();
  releaseRun(runRule(rule, photo, { workspace }), workspace);
  expect(workspace.take(10, 10).data.length).toBe(100);
});

test('the standard pipeline (threshold then opening) runs in three image buffers, reused run after run', () => {
  const standard = { ...rule, gauges: [{ name: 'edges', measure: 'edge-fraction', limits: { max: 0.5 } }] };
  const workspace = new ImageWorkspace(8);
  releaseRun(runRule(standard, photo, { retain: 'gauged', workspace }), workspace);
  // Input, and two step outputs used in turn; the mask is opened in packed bits, without a scratch image.
  expect(workspace.spareCount).toBe(3);
  releaseRun(runRule(standard, photo, { retain: 'gauged', workspace }), workspace);
  expect(workspace.spareCount).toBe(3);
});

test('runs of different photos on one workspace (its packed mask reused) give the results of fresh runs, on both engines', () => {
  const other: RawPhoto = { ...photo, samples: photo.samples.map((v, p) => ((p % photo.width) < 15 ? 220 : v)) };
  const standard = { ...rule, gauges: [{ name: 'edges', measure: 'edge-fraction', limits: { max: 0.5 } }] };
  for (const engine of ['plain', 'simd'] as const) {
    onEngine(engine, () => {
      const workspace = new ImageWorkspace();
      for (const p of [photo, other, photo, other]) {
        const fresh = runRule(standard, p, { retain: 'all' });
        const reused = runRule(standard, p, { retain: 'gauged', workspace });
        expect(reused.measurements).toEqual(fresh.measurements);
        expect(Array.from(reused.steps[3].output!.data)).toEqual(Array.from(fresh.steps[3].output!.data));
        releaseRun(reused, workspace);
      }
    });
  }
});

test('the packed mask a workspace hands out is the same one for the same size, a new one for another', () => {
  const workspace = new ImageWorkspace();
  const a = workspace.packedMask(45, 31);
  expect(workspace.packedMask(45, 31)).toBe(a);
  const b = workspace.packedMask(31, 45);
  expect(b).not.toBe(a);
  expect([b.width, b.height, b.wordsPerRow, b.words.length]).toEqual([31, 45, 1, 45]);
});
