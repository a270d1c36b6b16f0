// A gauge edit measured again on a run's kept images (remeasureRun, what the live preview does for
// gauges, limits, regions and quality limits) must give what a new run of the edited rule gives, on
// both engines and with the run's images in a workspace; any change to the pipeline needs a new run.
import type { RuleDocumentInput } from '../../../shared/rules/schema';
import type { RawPhoto } from '../../../shared/vision/image';
import { releaseRun, remeasureRun, RuleRunError, runRule, type RuleRun } from '../../../shared/vision/pipeline';
import { ImageWorkspace } from '../../../shared/vision/workspace';
import { ENGINES, useEngine } from './engines';
import { partImage } from './images';
import { STANDARD_STEPS } from '../../support/standard-steps';

const [W, H] = [97, 61];
const photo: RawPhoto = { width: W, height: H, channels: 1, bitDepth: 8, samples: Uint8Array.from(partImage(W, H, 255, 7).data) };

const base: RuleDocumentInput = {
  format: 'kernwright-rule/1',
  name: 'Disc edges',
  steps: STANDARD_STEPS,
  gauges: [
    { name: 'Edge share', measure: 'edge-fraction', limits: { max: 0.5 } },
    { name: 'Marks', measure: 'blob-count', limits: { max: 40 } },
  ],
};

/** The edits a gauge editor makes, none of which changes an image. */
const edits: [string, RuleDocumentInput][] = [
  ['a tighter limit', { ...base, gauges: [{ ...base.gauges[0], limits: { max: 0.01 } }, base.gauges[1]] }],
  ['a rectangular region', { ...base, gauges: [base.gauges[0], { ...base.gauges[1], region: { shape: 'rect', x: 0.1, y: 0.2, w: 0.5, h: 0.6 } }] }],
  ['a circular region on the smoothed image', { ...base, gauges: [...base.gauges, { name: 'Mean', measure: 'mean', step: 1, region: { shape: 'circle', cx: 0.4, cy: 0.5, r: 0.3 }, limits: { min: 10 } }] }],
  ['a gauge on the gradient instead', { ...base, gauges: [{ name: 'Edge strength', measure: 'mean', step: 2, limits: { min: 1, max: 200 } }] }],
  ['a quality limit the photo fails', { ...base, quality: { minFocus: 1e9 } }],
  ['a gauge in mm² with calibration', { ...base, gauges: [{ name: 'Largest', measure: 'largest-blob-area', unit: 'mm2', limits: { max: 4 } }] }],
];

const comparable = (run: RuleRun) => ({ verdict: run.verdict, quality: run.quality, measurements: run.measurements, rule: run.rule });

describe.each(ENGINES)('%s engine', (engine) => {
  useEngine(engine);

  test.each(edits)('%s: the same measurements, quality and verdict as a new run', (_, edited) => {
    const workspace = new ImageWorkspace();
    const run = runRule(base, photo, { workspace, retain: 'all', mmPerPx: 0.05 });
    const again = remeasureRun(run, edited, { mmPerPx: 0.05 });
    expect(again).not.toBeNull();
    expect(again!.steps).toBe(run.steps);
    const fresh = runRule(edited, photo, { retain: 'all', mmPerPx: 0.05 });
    expect(comparable(again!)).toEqual(comparable(fresh));
    releaseRun(again!, workspace);
  });

  test('a changed step, channel or border, or a document that does not validate, needs a new run', () => {
    const run = runRule(base, photo, { retain: 'all' });
    expect(remeasureRun(run, { ...base, steps: [{ op: 'gaussian', sigma: 1.5 }, ...base.steps.slice(1)] })).toBeNull();
    expect(remeasureRun(run, { ...base, border: 'constant' })).toBeNull();
    expect(remeasureRun(run, { ...base, input: { channel: 'red' } })).toBeNull();
    expect(remeasureRun(run, { ...base, gauges: [{ name: 'Edge share', measure: 'edge-fraction', limits: { max: 'x' } }] })).toBeNull();
  });

  test('a gauge on an image the run did not keep needs a new run; mm without calibration is refused as runRule refuses it', () => {
    const gauged = runRule(base, photo, { retain: 'gauged' });
    expect(remeasureRun(gauged, { ...base, gauges: [{ name: 'Mean', measure: 'mean', step: 1, limits: {} }] })).toBeNull();
    const kept = runRule(base, photo, { retain: 'all' });
    const mm: RuleDocumentInput = { ...base, gauges: [{ name: 'Largest', measure: 'largest-blob-area', unit: 'mm2', limits: { max: 4 } }] };
    expect(() => remeasureRun(kept, mm)).toThrow(RuleRunError);
    expect(() => runRule(mm, photo)).toThrow(RuleRunError);
  });
});
