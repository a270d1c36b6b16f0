// The limit-tuning plot: its axes zoom to the rates the trial reached, and limits with the same two
// rates share one dot that still names the limit in use.
import { axisEnd, distinctLabels, dotsOf } from '../../../components/trials/sweepDots';

test('an axis ends at the smallest of 5, 10, 20, 25, 50 and 100 % that holds every rate', () => {
  expect(axisEnd(0)).toBe(0.05);
  expect(axisEnd(0.05)).toBe(0.05);
  expect(axisEnd(0.051)).toBe(0.1);
  expect(axisEnd(0.22)).toBe(0.25);
  expect(axisEnd(0.5)).toBe(0.5);
  expect(axisEnd(0.8)).toBe(1);
  expect(axisEnd(1)).toBe(1);
});

test('limits with the same rates are one dot: the one in use, else the middle one', () => {
  const point = (limit: number, escapeRate: number, falseRejectRate: number) => ({ limit, escapeRate, falseRejectRate, falseRejects: 0, escapes: 0 });
  const points = [point(10, 0, 0.2), point(11, 0, 0.2), point(12, 0, 0.2), point(13, 0.05, 0.1), point(14, 0.1, 0)];
  const dots = dotsOf(points, () => false);
  expect(dots.map((d) => [d.point.limit, d.first, d.last, d.limits])).toEqual([
    [11, 10, 12, 3],
    [13, 13, 13, 1],
    [14, 14, 14, 1],
  ]);
  expect(dotsOf(points, (limit) => limit === 12)[0].point.limit).toBe(12);
});

test('limits that would read the same get the digits that tell them apart; equal ones stay equal', () => {
  const format = (v: number) => v.toPrecision(3);
  expect(distinctLabels([0.03381, 0.03384, 0.5], format)).toEqual(['0.03381', '0.03384', '0.500']);
  expect(distinctLabels([1712.41, 1712.44, 1712.41], (v) => v.toFixed(1))).toEqual(['1712.41', '1712.44', '1712.41']);
  expect(distinctLabels([2, 3], String)).toEqual(['2', '3']);
});
