// The one-line summaries that folded filter panels show on a phone: every choice said in words,
// the defaults as "every …" rather than left out, so that the line alone tells what the list holds.
import { describeRecordFilters } from '../../../components/records/recordFilterSummary';
import { describeRuleFilters } from '../../../components/rules/ruleFilterSummary';

const word = (state: string) => ({ 'in-review': 'In review', released: 'Released' })[state] ?? state;
const partTypeName = (code: string) => (code === 'bracket-60x30' ? 'Stamped bracket 60×30' : code);

describe('describeRuleFilters', () => {
  test('the defaults', () => {
    expect(describeRuleFilters({ mine: false, state: null, partType: null }, word, partTypeName)).toBe('Everyone’s rules · latest version in any state · every part type');
  });

  test('every choice made', () => {
    expect(describeRuleFilters({ mine: true, state: 'in-review', partType: 'bracket-60x30' }, word, partTypeName)).toBe('Rules I created or edited · latest version in review · Stamped bracket 60×30');
  });
});

describe('describeRecordFilters', () => {
  const open = { verdict: null, stationName: null, disputed: null, from: '', to: '' } as const;

  test('the defaults', () => {
    expect(describeRecordFilters(open)).toBe('Every verdict · all stations · disputed or not · any day');
  });

  test('every choice made, one day bound typed', () => {
    expect(describeRecordFilters({ verdict: 'FAIL', stationName: 'Press 3 exit', disputed: true, from: '2026-11-01', to: '' })).toBe('FAIL only · Press 3 exit · disputed only · 2026-11-01 to …');
    expect(describeRecordFilters({ ...open, disputed: false, to: '2026-11-30' })).toBe('Every verdict · all stations · not disputed · … to 2026-11-30');
    expect(describeRecordFilters({ ...open, reference: '7F3A-19C2' })).toBe('Every verdict · all stations · disputed or not · any day · record 7F3A-19C2');
  });
});
