// A gauge's value and limits as every screen writes them (lib/format.ts): the preview, the trial's
// limit sweep, the operator's verdict and the engineer's rule summary share these two functions.
import { describeLimits, formatGaugeValue } from '../../../lib/format';

describe('formatGaugeValue', () => {
  it('keeps whole numbers whole and gives decimals by size', () => {
    expect(formatGaugeValue(1730)).toBe('1730');
    expect(formatGaugeValue(540.1234)).toBe('540.1');
    expect(formatGaugeValue(12.34567)).toBe('12.346');
    expect(formatGaugeValue(0.123456)).toBe('0.123');
    expect(formatGaugeValue(-2.5)).toBe('-2.500');
  });

  it('switches to powers of ten where fixed decimals would hide the value', () => {
    expect(formatGaugeValue(0.00012345)).toBe('1.23e-4');
    expect(formatGaugeValue(2345678.9)).toBe('2.35e+6');
    expect(formatGaugeValue(0)).toBe('0');
  });

  it('names what is not a number rather than printing a figure', () => {
    expect(formatGaugeValue(Number.NaN)).toBe('NaN');
    expect(formatGaugeValue(Number.POSITIVE_INFINITY)).toBe('Infinity');
  });
});

describe('describeLimits', () => {
  it('writes the limits as entered, with the unit', () => {
    expect(describeLimits(479.1, 480.2, 'mm2')).toBe('479.1 to 480.2 mm²');
    expect(describeLimits(0.5, undefined, null)).toBe('at least 0.5');
    expect(describeLimits(null, 0.5, 'px')).toBe('at most 0.5 px');
  });

  it('says so when a gauge has no limit (a record from a measuring-only gauge)', () => {
    expect(describeLimits(null, null, 'mm')).toBe('no limit');
  });
});
