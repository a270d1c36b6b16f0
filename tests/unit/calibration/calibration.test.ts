import { pixelQuantisationUncertaintyMm, samplingCheck, scaleFromReference } from '../../../shared/calibration';

// REFERENCES.md §8, calibration basics: a 10.00 mm reference spanning 400.0 px gives 0.025 mm/px;
// a 12-px defect is 0.300 mm and a 150-px² blob is 0.09375 mm² (worked example of the trade's formula).
test('the scale of the worked example is 0.025 mm/px and converts lengths and areas', () => {
  const s = scaleFromReference(10, 400);
  expect(s).toBeCloseTo(0.025, 12);
  expect(12 * s).toBeCloseTo(0.3, 12);
  expect(150 * s * s).toBeCloseTo(0.09375, 12);
});

test('quantisation uncertainty of one pixel is s/√12 ≈ 0.2887 s (GUM JCGM 100:2008 F.2.2.1, from memory)', () => {
  expect(pixelQuantisationUncertaintyMm(0.025)).toBeCloseTo(0.025 * 0.288675, 6);
});

test('the sampling check warns below 3 px (common practice) and refuses below 2 px (Nyquist–Shannon)', () => {
  expect(samplingCheck(0.3, 0.025).verdict).toBe('ok'); // 12 px
  expect(samplingCheck(0.06, 0.025).verdict).toBe('below-recommended'); // 2.4 px
  expect(samplingCheck(0.04, 0.025).verdict).toBe('below-nyquist'); // 1.6 px
  expect(samplingCheck(0.075, 0.025).verdict).toBe('ok'); // exactly 3 px
  expect(samplingCheck(0.04, 0.025).message).toMatch(/1\.6 px/);
});

test('non-positive inputs are refused', () => {
  expect(() => scaleFromReference(0, 400)).toThrow(RangeError);
  expect(() => scaleFromReference(10, -1)).toThrow(RangeError);
  expect(() => scaleFromReference(Number.NaN, 1)).toThrow(RangeError);
});
