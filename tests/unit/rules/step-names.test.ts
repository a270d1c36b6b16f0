// The names a gauge's "Measured on" choice gives the steps: plain where titles differ, with each
// step's summary where two share a title (two kernel steps, say).
import { stepNames } from '../../../components/rules/stepCatalogue';

describe('stepNames', () => {
  test('steps of different kinds are named by number and title', () => {
    expect(stepNames([{ op: 'median', size: 3 }, { op: 'threshold', method: 'otsu' }])).toEqual(['Step 1: Median', 'Step 2: Threshold']);
  });

  test('steps that share a title also carry their summary', () => {
    expect(
      stepNames([
        { op: 'kernel', kernel: 'gaussian-5' },
        { op: 'kernel', kernel: 'sharpen' },
        { op: 'threshold', method: 'otsu' },
      ]),
    ).toEqual(['Step 1: Kernel, library kernel “gaussian-5”', 'Step 2: Kernel, library kernel “sharpen”', 'Step 3: Threshold']);
  });

  test('no steps, no names', () => {
    expect(stepNames([])).toEqual([]);
  });
});
