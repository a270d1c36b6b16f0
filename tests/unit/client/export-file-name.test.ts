// The CSV export's file name says what it holds: the days as the list's date fields show them (To
// inclusive, sent as the next day's start), the other filters in words, and the day it was made.
import { exportFileName } from '../../../shared/api/records';

const at = new Date('2026-12-05T07:30:00Z');

test('every inspection', () => {
  expect(exportFileName({}, at)).toBe('inspections_all-days_exported-2026-12-05.csv');
});

test('whole days: To names the last day it includes', () => {
  expect(exportFileName({ from: '2026-11-01T00:00:00Z', to: '2026-12-01T00:00:00.000Z' }, at)).toBe('inspections_2026-11-01_to_2026-11-30_exported-2026-12-05.csv');
  expect(exportFileName({ from: '2026-11-01T00:00:00Z' }, at)).toBe('inspections_2026-11-01_to_now_exported-2026-12-05.csv');
  expect(exportFileName({ to: '2027-01-01T00:00:00Z' }, at)).toBe('inspections_start_to_2026-12-31_exported-2026-12-05.csv');
});

test('bounds within a day (a chart point of one shift) keep their time, in UTC', () => {
  expect(exportFileName({ from: '2026-11-03T06:00:00Z', to: '2026-11-03T14:00:00Z' }, at)).toBe('inspections_2026-11-03T0600_to_2026-11-03T1400_exported-2026-12-05.csv');
});

test('the other filters in words; ids by what they narrow, never the id itself', () => {
  const name = exportFileName(
    { verdict: 'FAIL', disputed: 'true', stationId: '6f1c0e3a-0000-4000-8000-000000000001', ruleId: '6f1c0e3a-0000-4000-8000-000000000002', partType: 'washer-m16', cause: 'Notch response', ref: '7f3a19c2' },
    at,
  );
  expect(name).toBe('inspections_all-days_FAIL_disputed_one-station_one-rule_washer-m16_cause-notch-response_record-7f3a19c2_exported-2026-12-05.csv');
  expect(name).toMatch(/^[A-Za-z0-9._-]+$/);
});
