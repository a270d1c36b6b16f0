// The packed-bit morphology reads float32 bit patterns; values that are 0 or 1 as numbers but not
// as the usual patterns (−0) must still count as a mask, and anything else must go the value way.
import { imageFromSamples } from '../../../shared/vision/image';
import { morphology, valueMorphology } from '../../../shared/vision/morphology';

test('a mask holding −0 is opened like the same mask with +0', () => {
  const values = [1, 1, 1, -0, 1, 1, 1, 1, 0, 1, 1, 1, -0, -0, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 0];
  const withMinusZero = imageFromSamples(12, 3, values);
  const plain = valueMorphology(imageFromSamples(12, 3, values.map((v) => (v === 0 ? 0 : v))), 'open', 1, 'reflect');
  expect(Array.from(morphology(withMinusZero, 'open', 1, 'reflect').data)).toEqual(Array.from(plain.data));
});

test('a value just above 1 (same high bits as 1.0) is not taken for a mask pixel', () => {
  const img = imageFromSamples(4, 1, [1, 1.0000001, 1, 0]);
  // Dilation is the maximum over each pixel and its neighbours (replicate edge): 1.0000001 spreads.
  expect(Array.from(morphology(img, 'dilate', 1, 'replicate').data)).toEqual(Array.from(valueMorphology(img, 'dilate', 1, 'replicate').data));
  expect(morphology(img, 'dilate', 1, 'replicate').data[0]).toBeCloseTo(1.0000001, 6);
});
