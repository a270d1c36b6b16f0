// A trial's escapes (defective parts judged PASS) are the cautions shown before submitting and
// releasing a rule. Escape rate = defective judged PASS ÷ all labelled defective: the miss rate
// of a confusion table (common practice in acceptance testing of inspection systems).
import { trialCautions } from '../../../shared/rules/trial-cautions';

const escapes = (count: number, of: number) => ({ escapeRate: { count, of, rate: of ? count / of : null, low: null, high: null } });

test('no escapes among labelled defective parts: no caution', () => {
  expect(trialCautions(escapes(0, 20))).toEqual([]);
});

test('every escape is reported with its count and rate', () => {
  expect(trialCautions(escapes(20, 20))).toEqual(['In its trial the rule passed 20 of 20 defective parts (escape rate 100.0 %): released as it is, it would ship parts like them.']);
  expect(trialCautions(escapes(1, 1))[0]).toMatch(/^In its trial the rule passed 1 of 1 defective part \(escape rate 100\.0 %\)/);
  expect(trialCautions(escapes(1, 8))[0]).toContain('(escape rate 12.5 %)');
});

test('a trial without defective photos cannot show that the rule catches a defect', () => {
  expect(trialCautions(escapes(0, 0))).toEqual(['The trial had no photos labelled defective: it cannot show that the rule catches a defect.']);
});
