import { GAUGE_UNITS } from '../../../shared/rules/schema';
import { describeLimits, unitSuffix, unitSymbol } from '../../../shared/rules/units';

// Powers of a unit are written as superscripts (mm², not mm2): the SI Brochure's rules for unit symbols (BIPM), from memory; common practice on drawings.
describe('unitSymbol', () => {
  test('writes squared units with a superscript two and the others as they are', () => {
    expect(unitSymbol('mm2')).toBe('mm²');
    expect(unitSymbol('px2')).toBe('px²');
    expect(unitSymbol('mm')).toBe('mm');
    expect(unitSymbol('px')).toBe('px');
  });

  test('has a symbol for every unit a rule may name', () => {
    for (const unit of GAUGE_UNITS) expect(unitSymbol(unit)).toMatch(/^(px|mm)²?$/);
  });

  test('leaves an unknown code as it is and no unit empty', () => {
    expect(unitSymbol('N')).toBe('N');
    expect(unitSymbol('constructor')).toBe('constructor');
    expect(unitSymbol('')).toBe('');
    expect(unitSymbol(null)).toBe('');
    expect(unitSymbol(undefined)).toBe('');
  });

  test('unitSuffix puts a space before the symbol, and nothing without a unit', () => {
    expect(unitSuffix('mm2')).toBe(' mm²');
    expect(unitSuffix(null)).toBe('');
  });
});

// The operator's verdict, the engineer's rule summary, the reviewer's comparison and the PDF report
// write limits with this one function.
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
