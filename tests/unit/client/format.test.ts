// A gauge's value as every screen writes it (lib/format.ts): the preview, the trial's limit sweep
// and the operator's verdict share it; a chart's bar labels are fitted to the room below their bar.
import { fitLines, formatDate, formatDateTime, formatGaugeValue } from '../../../lib/format';

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

describe('fitLines', () => {
  it('keeps a name that fits on one line as it is', () => {
    expect(fitLines('Washer area', 12, 2)).toBe('Washer area');
  });

  it('breaks between words before it cuts one', () => {
    expect(fitLines('Undersized hole', 11, 2)).toBe('Undersized\nhole');
    expect(fitLines('Bracket hole diameter', 12, 2)).toBe('Bracket hole\ndiameter');
  });

  it('ends with "…" when the name needs more lines than it has', () => {
    expect(fitLines('Gasket bead width out of range', 10, 2)).toBe('Gasket\nbead widt…');
    expect(fitLines('Circularity', 6, 1)).toBe('Circu…');
  });

  it('cuts a word longer than a line', () => {
    expect(fitLines('Eccentricity', 8, 2)).toBe('Eccentri\ncity');
  });
});

describe('formatDateTime', () => {
  it('writes a moment with the same date as formatDate and the time to the second', () => {
    const iso = '2026-12-05T10:21:12.000Z';
    const written = formatDateTime(iso);
    expect(written).toContain(formatDate(iso).split(',')[0]);
    expect(written).toMatch(/\d{1,2}:21:12/);
    expect(formatDateTime('not a date')).toBe('—');
  });
});
