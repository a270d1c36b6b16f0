// The records list's date fields: a day written YYYY-MM-DD (ISO 8601's calendar date, extended
// format) is used; anything else is reported, never dropped in silence. Calendar facts from the
// Gregorian leap-year rule (common practice): 2028 is a leap year, 2026 and 2100 are not.
import { dayAfterIso, dayStartIso, rangeProblem, readDay } from '../../../components/records/dateFilter';

test('an empty field sets no bound and has no problem', () => {
  expect(readDay('', true)).toEqual({ day: null, problem: null });
  expect(readDay('   ', true)).toEqual({ day: null, problem: null });
});

test.each(['2026-11-05', '2028-02-29', '2026-12-31', ' 2026-01-01 '])('%s is a day', (text) => {
  expect(readDay(text, true)).toEqual({ day: text.trim(), problem: null });
});

test.each(['2026-02-29', '2100-02-29', '2026-13-01', '2026-04-31', '2026-00-10'])('%s is refused as no day of the calendar', (text) => {
  expect(readDay(text, false)).toEqual({ day: null, problem: `${text} is not a day of the calendar.` });
});

test.each(['05/11/2026', '5.11.2026', '11-05-2026', '5/11/26'])('%s (day and month in an unknown order) is refused at once', (text) => {
  expect(readDay(text, false)).toEqual({ day: null, problem: `Write the day as YYYY-MM-DD: ${text} could be day/month or month/day.` });
});

test('a date part-way typed waits while the field has the focus, and is reported once it is left', () => {
  for (const text of ['2', '2026', '2026-', '2026-1', '2026-11', '2026-11-', '2026-11-0']) {
    expect(readDay(text, false)).toEqual({ day: null, problem: null });
    expect(readDay(text, true)).toEqual({ day: null, problem: 'Write the day as YYYY-MM-DD, for example 2026-11-05.' });
  }
});

test('words are refused at once', () => {
  expect(readDay('yesterday', false).problem).toBe('Write the day as YYYY-MM-DD, for example 2026-11-05.');
});

test('From after To selects nothing and says so; the same day or an open end is fine', () => {
  expect(rangeProblem('2026-11-30', '2026-11-01')).toBe('From (2026-11-30) is after To (2026-11-01): no day lies between them.');
  expect(rangeProblem('2026-11-05', '2026-11-05')).toBeNull();
  expect(rangeProblem('2026-11-05', null)).toBeNull();
  expect(rangeProblem(null, '2026-11-05')).toBeNull();
});

test('To is inclusive: its bound is the start of the next day, across a month and a year end (UTC)', () => {
  expect(dayStartIso('2026-11-05')).toBe('2026-11-05T00:00:00Z');
  expect(dayAfterIso('2026-11-30')).toBe('2026-12-01T00:00:00.000Z');
  expect(dayAfterIso('2026-12-31')).toBe('2027-01-01T00:00:00.000Z');
  expect(dayAfterIso('2028-02-28')).toBe('2028-02-29T00:00:00.000Z');
});
