import { calibratedPhotoSize, photoSizeProblem, pixelQuantisationUncertaintyMm, samplingCheck, scaleFromReference } from '../../../shared/calibration';

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

// Common practice: a scale in mm/px holds only for the image size it was measured in; the product's own
// rule (DESIGN.md, "Image quality gate": size) makes a photo of any other size a RETAKE.
test('a photo of another size than the calibration’s is named as the wrong size; the same size, or none recorded, passes', () => {
  const calibrated = calibratedPhotoSize({ photoWidthPx: 2592, photoHeightPx: 1944 });
  expect(calibrated).toEqual({ widthPx: 2592, heightPx: 1944 });
  expect(photoSizeProblem({ widthPx: 32, heightPx: 32 }, calibrated)).toBe('wrong size: the photo is 32×32 px; this station’s calibration holds for photos of 2592×1944 px');
  // Turned on its side, the same pixels are another size for the scale's marks.
  expect(photoSizeProblem({ widthPx: 1944, heightPx: 2592 }, calibrated)).toMatch(/^wrong size: /);
  expect(photoSizeProblem({ widthPx: 2592, heightPx: 1944 }, calibrated)).toBeNull();
  expect(calibratedPhotoSize({ photoWidthPx: null, photoHeightPx: null })).toBeNull();
  expect(photoSizeProblem({ widthPx: 32, heightPx: 32 }, null)).toBeNull();
});
