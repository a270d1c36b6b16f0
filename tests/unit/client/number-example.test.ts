// A number field's typing error offers an example the field accepts: within its range, whole and
// odd where it must be (our own rule for the editor's messages).
import { exampleOf } from '../../../components/rules/numberExample';
import { BOX_SIZE_SPEC, SIGMA_SPEC } from '../../../components/rules/stepCatalogue';

const accepts = (spec: typeof SIGMA_SPEC, v: number) => v >= spec.min && v <= spec.max && (!spec.integer || Number.isInteger(v)) && (!spec.odd || v % 2 === 1);

test('a share from 0 to 1 is offered 0.5, not 1.5', () => {
  expect(exampleOf({ label: 'Share clipped', min: 0, max: 1, unit: '', step: 0.01 })).toBe('0.5');
});

test('every example is a value its field accepts', () => {
  for (const spec of [SIGMA_SPEC, BOX_SIZE_SPEC, { label: 'Radius', min: 1, max: 8, unit: 'px', integer: true, step: 1 }, { label: 'Window', min: 3, max: 255, unit: 'px', integer: true, odd: true, step: 2 }]) {
    expect(accepts(spec, Number(exampleOf(spec)))).toBe(true);
  }
});

test('an open range keeps the plain example', () => {
  expect(exampleOf({ label: 'Lowest allowed', min: -1e9, max: 1e9, unit: 'mm', step: 1 })).toBe('1.5');
});
