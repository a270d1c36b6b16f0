import { PART_FAMILIES, planDataset, renderPart, type DefectTruth, type FamilyName } from '../../../server/demo';
import { differenceMap, grow, largestValueIn, pixelsAbove, principalExtent } from './pixel-difference';

const FRAME = { width: 1024, height: 768 };

/** Nominal material area in mm² of each family's drawing, from plane geometry. */
const NOMINAL_AREA_MM2: Record<FamilyName, number> = {
  // 60 x 30 mm plate with 4 mm corner radii, less two 6.6 mm holes (M6 clearance, ISO 273 medium, from memory).
  bracket: 60 * 30 - (4 - Math.PI) * 4 * 4 - 2 * Math.PI * 3.3 * 3.3,
  // M16 flat washer, 17 mm bore, 30 mm outside (ISO 7089, from memory).
  washer: Math.PI * (15 * 15 - 8.5 * 8.5),
  // Our own 50 / 38 mm gasket ring.
  gasket: Math.PI * (25 * 25 - 19 * 19),
};

describe('demo photos are drawn at the scale their truth states', () => {
  it.each(['bracket', 'washer', 'gasket'] as const)(
    'the %s covers its nominal area in mm² at the stated mm per pixel',
    (family) => {
      const [plan] = planDataset({ count: 1, seed: 5, families: [family], sizes: [FRAME], retakeShare: 0, defectShare: 0, colourShare: 0 });
      const rendered = renderPart(plan.spec);
      const [board, part] = [PART_FAMILIES[family].backgroundColour, PART_FAMILIES[family].partColour].map(
        (rgb) => 0.299 * rgb[0] + 0.587 * rgb[1] + 0.114 * rgb[2],
      );
      const threshold = (board + part) / 2;
      let partPixels = 0;
      for (const value of rendered.clean) if (part > board ? value > threshold : value < threshold) partPixels++;
      const areaMm2 = partPixels * plan.spec.mmPerPx ** 2;
      expect(Math.abs(areaMm2 - NOMINAL_AREA_MM2[family]) / NOMINAL_AREA_MM2[family]).toBeLessThan(0.015);
    },
  );

  it('one station per family: the field of view in mm is the same at every frame size', () => {
    const plans = planDataset({ count: 30, seed: 3, retakeShare: 0 });
    for (const family of ['bracket', 'washer', 'gasket'] as const) {
      const views = new Set(plans.filter((p) => p.spec.family === family).map((p) => (p.spec.mmPerPx * p.spec.width).toFixed(9)));
      expect(views.size).toBe(1);
    }
  });
});

describe('defect sizes in mm agree with the pixels they change', () => {
  const plans = planDataset({
    count: 36,
    seed: 11,
    sizes: [{ width: 640, height: 480 }],
    retakeShare: 0,
    defectShare: 1,
    colourShare: 0,
  }).filter((plan) => plan.spec.defects.length === 1);

  const cases = plans.map((plan) => [`${plan.fileName} ${plan.spec.defects[0].kind}`, plan] as const);

  it.each(cases)('%s', (_name, plan) => {
    const rendered = renderPart(plan.spec);
    const [defect]: DefectTruth[] = rendered.defects;
    const s = plan.spec.mmPerPx;
    const difference = differenceMap(rendered);
    const region = grow(defect.box, Math.ceil(3 * plan.spec.nuisance.blurSigmaPx) + 1);
    // Half of the strongest change marks the drawn edge of the defect (an anti-aliased edge is half covered there).
    const halfMaximum = largestValueIn(difference, rendered.width, region) / 2;
    const changed = pixelsAbove(difference, rendered.width, rendered.height, region, halfMaximum);
    const { length = 0, width = 0, area = 0 } = defect.sizeMm;
    switch (defect.kind) {
      case 'scratch':
        // length_mm = mmPerPx * length_px, within two pixels for the rounded ends and the blur.
        expect(Math.abs(principalExtent(changed) * s - length)).toBeLessThan(2 * s + 0.05 * length);
        expect(width).toBeGreaterThan(0);
        break;
      case 'crack': {
        // A wandering crack is at most as long end to end as along its path.
        const extent = principalExtent(changed) * s;
        expect(extent).toBeLessThan(length + 3 * s);
        expect(extent).toBeGreaterThan(0.5 * length);
        break;
      }
      case 'missing-hole':
      case 'undersized-hole':
      case 'chip':
      case 'burr': {
        // area_mm2 = mmPerPx^2 * area_px2; the edge pixels of the outline give the tolerance.
        const measured = changed.length * s * s;
        const boundaryPixels = 2 * Math.sqrt(Math.PI * (area / (s * s)));
        expect(Math.abs(measured - area)).toBeLessThan(0.05 * area + boundaryPixels * s * s);
        break;
      }
    }
  });

  it('covers every kind of defect', () => {
    const kinds = new Set(plans.flatMap((plan) => plan.spec.defects.map((d) => d.kind)));
    expect([...kinds].sort()).toEqual(['burr', 'chip', 'crack', 'missing-hole', 'scratch', 'undersized-hole']);
  });
});
