// The date range of the trend charts: whole UTC days, so that a chart asked for twice in a day is the same chart.
const DAY_MS = 86_400_000;

export type RangePreset = '7d' | '30d' | '90d' | 'custom';

export const PRESET_DAYS: Record<Exclude<RangePreset, 'custom'>, number> = { '7d': 7, '30d': 30, '90d': 90 };

export interface RangeChoice {
  preset: RangePreset;
  /** YYYY-MM-DD as typed, used when the preset is custom; `to` is inclusive. */
  customFrom: string;
  customTo: string;
}

export interface IsoRange {
  from: string;
  to: string;
}

function startOfUtcDay(ms: number): number {
  return Math.floor(ms / DAY_MS) * DAY_MS;
}

/** YYYY-MM-DD typed by a person → the start of that day in UTC, or null while incomplete or not a date. */
export function parseDay(text: string): number | null {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(text)) return null;
  const ms = Date.parse(`${text}T00:00:00Z`);
  return Number.isNaN(ms) ? null : ms;
}

/** The last N whole days up to the end of today (UTC), or the typed days; null while a typed range is unusable. */
export function rangeFor(choice: RangeChoice, nowMs: number): IsoRange | null {
  if (choice.preset !== 'custom') {
    const end = startOfUtcDay(nowMs) + DAY_MS;
    return { from: new Date(end - PRESET_DAYS[choice.preset] * DAY_MS).toISOString(), to: new Date(end).toISOString() };
  }
  const from = parseDay(choice.customFrom);
  const to = parseDay(choice.customTo);
  if (from === null || to === null || to < from) return null;
  return { from: new Date(from).toISOString(), to: new Date(to + DAY_MS).toISOString() };
}

/** What is wrong with a typed range, in words, or null when it is usable. */
export function rangeProblem(choice: RangeChoice): string | null {
  if (choice.preset !== 'custom') return null;
  const from = parseDay(choice.customFrom);
  const to = parseDay(choice.customTo);
  if (from === null) return 'Type the first day as YYYY-MM-DD.';
  if (to === null) return 'Type the last day as YYYY-MM-DD.';
  if (to < from) return 'The last day comes before the first.';
  return null;
}

/** "28 Nov 2026 06:00 – 14:00 UTC" or "28 Nov – 4 Dec 2026 (UTC)" for a subgroup or range. */
export function describeSpan(fromIso: string, toIso: string): string {
  const from = new Date(fromIso);
  const to = new Date(toIso);
  const wholeDays = from.getUTCHours() === 0 && from.getUTCMinutes() === 0 && to.getUTCHours() === 0 && to.getUTCMinutes() === 0;
  const day = (d: Date) => d.toLocaleDateString(undefined, { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
  const time = (d: Date) => d.toISOString().slice(11, 16);
  if (wholeDays) {
    const lastDay = new Date(to.getTime() - DAY_MS);
    return lastDay.getTime() <= from.getTime() ? `${day(from)} (UTC)` : `${day(from)} – ${day(lastDay)} (UTC)`;
  }
  return from.toISOString().slice(0, 10) === to.toISOString().slice(0, 10) || to.getTime() - from.getTime() <= DAY_MS
    ? `${day(from)} ${time(from)} – ${time(to)} UTC`
    : `${day(from)} ${time(from)} – ${day(to)} ${time(to)} UTC`;
}
