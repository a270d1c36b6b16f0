import { planDataset, renderPart, type ImagePlan } from '../../../server/demo';
import { contains, countAbove, differenceMap, grow } from './pixel-difference';

// A change of two 8-bit grey levels: above float rounding, below anything a defect draws.
const VISIBLE_CHANGE = 2 / 255;

const plans = planDataset({
  count: 30,
  seed: 2024,
  sizes: [{ width: 640, height: 480 }],
  retakeShare: 0,
  defectShare: 0.75,
  colourShare: 0.5,
});
const defective = plans.filter((plan) => plan.label === 'defective');
const good = plans.filter((plan) => plan.label === 'good');

function describe_(plan: ImagePlan): string {
  return `${plan.fileName} ${plan.spec.defects.map((d) => d.kind).join('+')}`;
}

describe('demo photos: the truth matches the pixels', () => {
  it('plans defective photos of every family and every defect kind', () => {
    const kinds = new Set(defective.flatMap((plan) => plan.spec.defects.map((d) => `${plan.spec.family}:${d.kind}`)));
    expect([...kinds].sort()).toEqual(
      expect.arrayContaining([
        'bracket:burr', 'bracket:chip', 'bracket:crack', 'bracket:missing-hole', 'bracket:scratch',
        'bracket:undersized-hole', 'gasket:burr', 'gasket:chip', 'gasket:crack', 'gasket:scratch',
        'washer:burr', 'washer:chip', 'washer:crack', 'washer:scratch', 'washer:undersized-hole',
      ]),
    );
  });

  it.each(defective.map((plan) => [describe_(plan), plan] as const))(
    'every defect box of %s holds changed pixels, and no change lies outside the boxes',
    (_name, plan) => {
      const rendered = renderPart(plan.spec);
      const difference = differenceMap(rendered);
      expect(rendered.defects).toHaveLength(plan.spec.defects.length);
      for (const defect of rendered.defects) {
        expect(countAbove(difference, rendered.width, defect.box, VISIBLE_CHANGE)).toBeGreaterThan(0);
      }
      // The optics spread a change by about 3 sigma of the defocus blur beyond what was drawn.
      const spread = Math.ceil(3 * plan.spec.nuisance.blurSigmaPx) + 1;
      const allowed = rendered.defects.map((d) => grow(d.box, spread));
      let outside = 0;
      for (let y = 0; y < rendered.height; y++) {
        for (let x = 0; x < rendered.width; x++) {
          if (difference[y * rendered.width + x] > VISIBLE_CHANGE && !allowed.some((box) => contains(box, x, y))) outside++;
        }
      }
      expect(outside).toBe(0);
    },
  );

  it.each(good.map((plan) => [plan.fileName, plan] as const))(
    'the good part photo %s does not differ at all from its defect-free render',
    (_name, plan) => {
      const rendered = renderPart(plan.spec);
      expect(rendered.defects).toEqual([]);
      expect(Buffer.from(rendered.pixels.buffer).equals(Buffer.from(rendered.clean.buffer))).toBe(true);
    },
  );

  it('the sensor noise changes the photo but not the truth boxes', () => {
    const plan = defective[0];
    const otherNoise = renderPart({ ...plan.spec, nuisance: { ...plan.spec.nuisance, noiseSeed: plan.spec.nuisance.noiseSeed + 1 } });
    const original = renderPart(plan.spec);
    expect(Buffer.from(otherNoise.pixels.buffer).equals(Buffer.from(original.pixels.buffer))).toBe(false);
    expect(otherNoise.defects).toEqual(original.defects);
  });
});
