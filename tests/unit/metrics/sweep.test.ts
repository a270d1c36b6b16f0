import { sweepLimit, type SweepInput } from '../../../shared/metrics/sweep';

// Hand-checkable example (the definitions of false reject and escape rate: REFERENCES.md §11, common practice).
const inputs: SweepInput[] = [
  { label: 'good', retake: false, value: 1, othersPass: true },
  { label: 'good', retake: false, value: 2, othersPass: true },
  { label: 'good', retake: false, value: 5, othersPass: true },
  { label: 'defective', retake: false, value: 4, othersPass: true },
  { label: 'defective', retake: false, value: 8, othersPass: true },
  { label: 'defective', retake: true, value: 0, othersPass: true },
  { label: 'retake', retake: true, value: 9, othersPass: true },
];

test('each limit trades false rejects against escapes', () => {
  const points = sweepLimit(inputs, 'max');
  const at = (limit: number) => points.find((p) => p.limit === limit)!;
  expect(at(2)).toMatchObject({ falseRejects: 1, escapes: 0, falseRejectRate: 1 / 3, escapeRate: 0 });
  expect(at(4)).toMatchObject({ falseRejects: 1, escapes: 1, escapeRate: 0.5 });
  expect(at(5)).toMatchObject({ falseRejects: 0, escapes: 1 });
  expect(at(8)).toMatchObject({ falseRejects: 0, escapes: 2, escapeRate: 1 });
  expect(points[0]).toMatchObject({ falseRejects: 3, escapes: 0 });
});

test('a lower bound fails values below the limit', () => {
  const points = sweepLimit(inputs, 'min');
  expect(points.find((p) => p.limit === 5)).toMatchObject({ falseRejects: 2, escapes: 1 });
});

test('a part failed by another gauge stays failed at every limit', () => {
  const points = sweepLimit([{ label: 'defective', retake: false, value: 0, othersPass: false }, ...inputs], 'max');
  expect(points.every((p) => p.escapes <= 2)).toBe(true);
});

test('false rejects never rise as a maximum limit rises (monotone curve)', () => {
  const points = sweepLimit(inputs, 'max');
  for (let i = 1; i < points.length; i++) {
    expect(points[i].falseRejects).toBeLessThanOrEqual(points[i - 1].falseRejects);
    expect(points[i].escapes).toBeGreaterThanOrEqual(points[i - 1].escapes);
  }
});
