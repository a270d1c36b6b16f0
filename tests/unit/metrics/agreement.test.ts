import { cohensKappa, confusionTable, trialFigures, wilsonInterval, type TruthLabel, type VerdictValue } from '../../../shared/metrics/agreement';

describe('Wilson score interval', () => {
  // R. G. Newcombe, "Two-sided confidence intervals for the single proportion: comparison of seven
  // methods", Statistics in Medicine 17:857–872 (1998), Table I, method 3 (score): 81/263 → 0.2553–0.3662;
  // 15/148 → 0.0624–0.1605; 0/20 → 0–0.1611; 1/29 → 0.0061–0.1718 (from memory).
  test.each([
    [81, 263, 0.2553, 0.3662],
    [15, 148, 0.0624, 0.1605],
    [0, 20, 0, 0.1611],
    [1, 29, 0.0061, 0.1718],
  ])('%i of %i gives %f to %f (Newcombe 1998)', (k, n, low, high) => {
    const w = wilsonInterval(k, n);
    expect(w.low).toBeCloseTo(low, 4);
    expect(w.high).toBeCloseTo(high, 4);
  });

  test('no observations give no interval', () => {
    expect(wilsonInterval(0, 0)).toMatchObject({ rate: null, low: null, high: null });
  });
});

describe("Cohen's kappa", () => {
  // REFERENCES.md §9: a 2×2 table [[20,5],[10,15]] gives p_o = 0.70, p_e = 0.50, κ = 0.40 (worked example).
  test('the 2×2 worked example gives 0.40', () => {
    expect(cohensKappa([[20, 5], [10, 15]])).toBeCloseTo(0.4, 10);
  });
  // REFERENCES.md §9: AIAG-style A-vs-B cross-tab [[44,6],[3,97]] gives κ = 0.8629 (AIAG reports 0.86; table from memory).
  test('the AIAG attribute example gives 0.86', () => {
    expect(cohensKappa([[44, 6], [3, 97]])).toBeCloseTo(0.8629, 4);
  });
  test('perfect agreement is 1; an empty table has no kappa', () => {
    expect(cohensKappa([[5, 0], [0, 5]])).toBe(1);
    expect(cohensKappa([[0, 0], [0, 0]])).toBeNull();
  });
});

describe('trial figures', () => {
  // REFERENCES.md §11 worked numbers: 1000 parts, 50 defective; TP=45, FN=5, FP=19, TN=931 →
  // false-reject rate 19/950 = 2.0 %, escape rate 5/50 = 10.0 %, accuracy 0.976, κ against truth 0.77695.
  const pairs: { label: TruthLabel; verdict: VerdictValue }[] = [
    ...Array.from({ length: 45 }, () => ({ label: 'defective' as const, verdict: 'FAIL' as const })),
    ...Array.from({ length: 5 }, () => ({ label: 'defective' as const, verdict: 'PASS' as const })),
    ...Array.from({ length: 19 }, () => ({ label: 'good' as const, verdict: 'FAIL' as const })),
    ...Array.from({ length: 931 }, () => ({ label: 'good' as const, verdict: 'PASS' as const })),
  ];
  const figures = trialFigures(confusionTable(pairs));

  test('false reject and escape rates match the worked numbers', () => {
    expect(figures.falseRejectRate.rate).toBeCloseTo(0.02, 10);
    expect(figures.escapeRate.rate).toBeCloseTo(0.1, 10);
    expect(figures.agreement.rate).toBeCloseTo(0.976, 10);
  });

  test('kappa against the labels matches 0.77695', () => {
    expect(figures.kappa).toBeCloseTo(0.77695, 5);
  });

  test('each rate carries a Wilson interval around it', () => {
    expect(figures.escapeRate.low!).toBeLessThan(0.1);
    expect(figures.escapeRate.high!).toBeGreaterThan(0.1);
  });

  test('retakes are counted apart from false rejects and escapes', () => {
    const withRetakes = trialFigures(confusionTable([...pairs, { label: 'good', verdict: 'RETAKE' }, { label: 'retake', verdict: 'RETAKE' }]));
    expect(withRetakes.falseRejectRate.of).toBe(950);
    expect(withRetakes.retakeRate.count).toBe(1);
    expect(withRetakes.images).toBe(1002);
  });
});
