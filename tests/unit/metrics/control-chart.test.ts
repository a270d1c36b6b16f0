import { pChart } from '../../../shared/metrics/control-chart';
import { runRuleSignals, type RunRuleSetName } from '../../../shared/metrics/run-rules';

// NIST/SEMATECH e-Handbook of Statistical Methods §6.3.3.2 (pmc332), p-chart of 30 wafers × 50 chips
// (REFERENCES.md §7): "The average of the proportions is .2313"; UCL 0.41024, LCL 0.05243 recomputed from
// the formula; samples 15 (0.44) and 23 (0.48) are out of control. The counts are quoted in the README of
// npm process-control-charts-es6 (also Montgomery, Introduction to SQC, Example 7.1, from memory).
const NIST_DEFECTIVES = [12, 15, 8, 10, 4, 7, 16, 9, 14, 10, 5, 6, 17, 12, 22, 8, 10, 5, 13, 11, 20, 18, 24, 15, 9, 12, 7, 13, 9, 6];
const nist = NIST_DEFECTIVES.map((defectives) => ({ n: 50, defectives }));

describe('p-chart (NIST/SEMATECH e-Handbook §6.3.3.2)', () => {
  test('the wafer example has the handbook centre line and limits', () => {
    const chart = pChart(nist);
    expect(chart.center).toBeCloseTo(0.2313, 4); // NIST: .2313
    expect(chart.center).toBeCloseTo(347 / 1500, 12);
    for (const point of chart.points) {
      expect(point.ucl).toBeCloseTo(0.41024, 5); // REFERENCES.md §7 [C]
      expect(point.lcl).toBeCloseTo(0.05243, 5);
    }
  });

  test('the wafer example has samples 15 and 23 outside the limits, and Western Electric rule 1 fires there', () => {
    const chart = pChart(nist);
    const outside = chart.points.flatMap((p, i) => (p.p > p.ucl || p.p < p.lcl ? [i + 1] : []));
    expect(outside).toEqual([15, 23]); // NIST: samples 15 (0.44) and 23 (0.48)
    const we1 = runRuleSignals(chart.points.map((p) => p.z), 'western-electric').filter((s) => s.rule === 'WE1');
    expect(we1.map((s) => s.pointIndex + 1)).toEqual([15, 23]);
    expect(we1[0].description).toBe('1 point beyond 3 sigma on the high side');
  });

  test('with samples 15 and 23 dropped, the revised limits put sample 21 above the UCL (Montgomery §7.2, procedure from memory)', () => {
    const kept = nist.map((s, i) => ({ ...s, sample: i + 1 })).filter((s) => s.sample !== 15 && s.sample !== 23);
    const chart = pChart(kept);
    expect(chart.center).toBeCloseTo(0.215, 10); // 301/1400, REFERENCES.md §7
    expect(chart.points[0].ucl).toBeCloseTo(0.3893, 4);
    expect(chart.points[0].lcl).toBeCloseTo(0.0407, 4);
    expect(chart.points.filter((p) => p.p > p.ucl).map((p) => p.sample)).toEqual([21]);
  });

  test('limits vary with the subgroup size: p̄ ± 3·sqrt(p̄(1−p̄)/n_i), LCL floored at 0 (values worked by hand)', () => {
    // p̄ = (10 + 8 + 12)/(100 + 50 + 200) = 0.0857143; p̄(1−p̄) = 0.0783673.
    // n = 100: sigma = 0.0279942, UCL = 0.1696968, LCL = 0.0017318
    // n = 50:  sigma = 0.0395897, UCL = 0.2044835, LCL = 0.0857143 − 0.1187692 < 0 → 0
    // n = 200: sigma = 0.0197949, UCL = 0.1450989, LCL = 0.0263297
    const chart = pChart([
      { n: 100, defectives: 10 },
      { n: 50, defectives: 8 },
      { n: 200, defectives: 12 },
    ]);
    expect(chart.center).toBeCloseTo(0.0857143, 7);
    expect(chart.points.map((p) => p.sigma)).toEqual([expect.closeTo(0.0279942, 7), expect.closeTo(0.0395897, 7), expect.closeTo(0.0197949, 7)]);
    expect(chart.points.map((p) => p.ucl)).toEqual([expect.closeTo(0.1696968, 6), expect.closeTo(0.2044835, 6), expect.closeTo(0.1450989, 6)]);
    expect(chart.points.map((p) => p.lcl)).toEqual([expect.closeTo(0.0017318, 6), 0, expect.closeTo(0.0263297, 6)]);
    // z = (p − p̄)/sigma = (0.16 − 0.0857143)/0.0395897 = 1.87639
    expect(chart.points[1].z).toBeCloseTo(1.87639, 4);
  });

  test('the UCL is capped at 1 and subgroups without judged parts are left out', () => {
    const chart = pChart([
      { n: 2, defectives: 2 },
      { n: 0, defectives: 0 },
      { n: 2, defectives: 1 },
    ]);
    expect(chart.points).toHaveLength(2);
    expect(chart.center).toBe(0.75);
    expect(chart.points[0].ucl).toBe(1);
  });

  test('a chart with nothing judged has no centre line; counts that make no sense are refused', () => {
    expect(pChart([{ n: 0, defectives: 0 }])).toEqual({ center: null, points: [] });
    expect(() => pChart([{ n: 5, defectives: 6 }])).toThrow(RangeError);
    expect(() => pChart([{ n: 5, defectives: 1.5 }])).toThrow(RangeError);
  });

  test('when every part passed there is no spread: points have no z and no rule fires, not even 15 in a row near the centre', () => {
    const chart = pChart(Array.from({ length: 20 }, () => ({ n: 40, defectives: 0 })));
    expect(chart.center).toBe(0);
    expect(chart.points.every((p) => p.z === null && p.ucl === 0 && p.lcl === 0)).toBe(true);
    expect(runRuleSignals(chart.points.map((p) => p.z), 'nelson')).toEqual([]);
  });
});

// Run rules in sigma units. Wording of each rule: REFERENCES.md §7 (Western Electric Statistical Quality
// Control Handbook, 1956, pp. 25–28 per secondary citation; Nelson, J. Quality Technology 16(4), 1984;
// rule list as in MathWorks controlrules and the qcc R documentation).
const fired = (z: number[], set: RunRuleSetName, rule: string) => runRuleSignals(z, set).filter((s) => s.rule === rule);

describe('Western Electric rules', () => {
  test('WE1: one point beyond 3 sigma', () => {
    expect(fired([0, 0.5, 3.2, 0, -3.4], 'western-electric', 'WE1')).toEqual([
      { rule: 'WE1', pointIndex: 2, pointIndices: [2], description: '1 point beyond 3 sigma on the high side' },
      { rule: 'WE1', pointIndex: 4, pointIndices: [4], description: '1 point beyond 3 sigma on the low side' },
    ]);
    expect(fired([0, 2.9, -2.99, 3.0], 'western-electric', 'WE1')).toEqual([]); // exactly 3 is on the limit, not beyond
  });

  test('WE2: two of three consecutive points beyond 2 sigma on the same side', () => {
    expect(fired([0, 2.5, 0.3, 2.2], 'western-electric', 'WE2')).toEqual([
      { rule: 'WE2', pointIndex: 3, pointIndices: [1, 3], description: '2 of 3 points beyond 2 sigma on the high side' },
    ]);
    expect(fired([2.5, 0.3, 0.1, 2.2], 'western-electric', 'WE2')).toEqual([]); // three apart
    expect(fired([2.5, -2.4, 0.2], 'western-electric', 'WE2')).toEqual([]); // opposite sides
  });

  test('WE3: four of five consecutive points beyond 1 sigma on the same side', () => {
    expect(fired([-1.5, -0.2, -1.2, -1.8, -1.1], 'western-electric', 'WE3')).toEqual([
      { rule: 'WE3', pointIndex: 4, pointIndices: [0, 2, 3, 4], description: '4 of 5 points beyond 1 sigma on the low side' },
    ]);
    expect(fired([1.5, 0.2, 1.2, 0.8, 1.1, -1.3], 'western-electric', 'WE3')).toEqual([]);
  });

  test('WE4: eight consecutive points on one side of the centre line, fired at every point that completes a run', () => {
    const ten = [0.1, 0.4, 0.2, 0.9, 0.3, 0.5, 0.1, 0.2, 0.6, 0.3];
    const signals = fired(ten, 'western-electric', 'WE4');
    expect(signals.map((s) => s.pointIndex)).toEqual([7, 8, 9]);
    expect(signals[0]).toEqual({ rule: 'WE4', pointIndex: 7, pointIndices: [0, 1, 2, 3, 4, 5, 6, 7], description: '8 points in a row above the centre line' });
    expect(fired([0.1, 0.4, 0.2, 0.9, 0.3, 0.5, 0.1, 0, 0.2], 'western-electric', 'WE4')).toEqual([]); // a point on the line breaks it
    expect(fired([0.1, 0.4, 0.2, 0.9, 0.3, 0.5, 0.1], 'western-electric', 'WE4')).toEqual([]); // seven
  });

  test('a point that breaks no rule raises nothing', () => {
    expect(runRuleSignals([0.3, -0.8, 1.4, -0.2, 0.9, -1.1, 0.4, -0.6], 'western-electric')).toEqual([]);
  });
});

describe('Nelson rules', () => {
  test('N1: one point beyond 3 sigma', () => {
    expect(fired([0, 3.1], 'nelson', 'N1').map((s) => s.pointIndex)).toEqual([1]);
    expect(fired([0, 2.8], 'nelson', 'N1')).toEqual([]);
  });

  test('N2: nine points in a row on the same side', () => {
    expect(fired(Array(9).fill(-0.2), 'nelson', 'N2')).toEqual([
      { rule: 'N2', pointIndex: 8, pointIndices: [0, 1, 2, 3, 4, 5, 6, 7, 8], description: '9 points in a row below the centre line' },
    ]);
    expect(fired([...Array(8).fill(-0.2), 0.1], 'nelson', 'N2')).toEqual([]);
  });

  test('N3: six points in a row steadily increasing or decreasing', () => {
    expect(fired([-1, -0.6, -0.2, 0.1, 0.5, 0.9], 'nelson', 'N3')).toEqual([
      { rule: 'N3', pointIndex: 5, pointIndices: [0, 1, 2, 3, 4, 5], description: '6 points in a row steadily increasing' },
    ]);
    expect(fired([0.9, 0.5, 0.1, -0.2, -0.6, -1], 'nelson', 'N3')[0].description).toBe('6 points in a row steadily decreasing');
    expect(fired([-1, -0.6, -0.2, 0.1, 0.5, 0.5], 'nelson', 'N3')).toEqual([]); // the last one is level
  });

  test('N4: fourteen points in a row alternating up and down', () => {
    const zigzag = Array.from({ length: 14 }, (_, i) => (i % 2 ? -0.5 : 0.5) + i * 0.01);
    expect(fired(zigzag, 'nelson', 'N4')).toEqual([
      { rule: 'N4', pointIndex: 13, pointIndices: Array.from({ length: 14 }, (_, i) => i), description: '14 points in a row alternating up and down' },
    ]);
    expect(fired(zigzag.slice(0, 13), 'nelson', 'N4')).toEqual([]);
    const broken = [...zigzag];
    broken[7] = broken[6] + 0.1; // two rises in a row
    expect(fired(broken, 'nelson', 'N4')).toEqual([]);
  });

  test('N5: two of three points beyond 2 sigma on the same side', () => {
    expect(fired([2.1, 0, 2.6], 'nelson', 'N5')).toEqual([
      { rule: 'N5', pointIndex: 2, pointIndices: [0, 2], description: '2 of 3 points beyond 2 sigma on the high side' },
    ]);
    expect(fired([2.1, 0, 0, 2.6], 'nelson', 'N5')).toEqual([]);
  });

  test('N6: four of five points beyond 1 sigma on the same side', () => {
    expect(fired([1.2, 1.3, 0.5, 1.1, 1.9], 'nelson', 'N6').map((s) => s.pointIndices)).toEqual([[0, 1, 3, 4]]);
    expect(fired([1.2, 1.3, 0.5, -1.1, 1.9], 'nelson', 'N6')).toEqual([]);
  });

  test('N7: fifteen points in a row within 1 sigma, either side', () => {
    const hugging = [0.2, -0.4, 0.1, 0.6, -0.3, -0.7, 0.5, 0.2, -0.1, 0.3, 0.9, -0.5, 0.4, -0.2, 0.1];
    expect(fired(hugging, 'nelson', 'N7')).toEqual([
      { rule: 'N7', pointIndex: 14, pointIndices: Array.from({ length: 15 }, (_, i) => i), description: '15 points in a row within 1 sigma of the centre line' },
    ]);
    const oneOut = [...hugging];
    oneOut[7] = 1.2;
    expect(fired(oneOut, 'nelson', 'N7')).toEqual([]);
  });

  test('N8: eight points in a row beyond 1 sigma, on either side', () => {
    const avoiding = [1.5, -1.5, 1.2, -1.1, 1.3, -2.1, 1.4, -1.6];
    expect(fired(avoiding, 'nelson', 'N8')).toEqual([
      { rule: 'N8', pointIndex: 7, pointIndices: [0, 1, 2, 3, 4, 5, 6, 7], description: '8 points in a row beyond 1 sigma, on either side' },
    ]);
    const oneIn = [...avoiding];
    oneIn[3] = -0.9;
    expect(fired(oneIn, 'nelson', 'N8')).toEqual([]);
  });

  test('the Western Electric set never reports a Nelson-only pattern, and the reverse', () => {
    const trend = [-1, -0.6, -0.2, 0.1, 0.5, 0.9];
    expect(runRuleSignals(trend, 'western-electric')).toEqual([]);
    expect(runRuleSignals(trend, 'nelson').map((s) => s.rule)).toEqual(['N3']);
    expect(runRuleSignals(Array(8).fill(0.3), 'nelson')).toEqual([]); // WE4 needs 8; Nelson's rule 2 needs 9
    expect(runRuleSignals(Array(8).fill(0.3), 'western-electric').map((s) => s.rule)).toEqual(['WE4']);
  });
});
