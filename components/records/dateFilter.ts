// The records list's date fields: a day typed as YYYY-MM-DD (UTC), or a plain-words reason why the
// text is not one, so that a filter is never dropped in silence.

export interface DayReading {
  /** The day, YYYY-MM-DD, when the text is one. */
  day: string | null;
  /** Why the text is not a day, or null (empty, a day, or still being typed and not yet left). */
  problem: string | null;
}

const ISO_DAY = /^\d{4}-\d{2}-\d{2}$/;
/** What a YYYY-MM-DD date looks like part-way through typing it. */
const ISO_PREFIX = /^\d{1,4}(-\d{0,2}(-\d{0,1})?)?$/;
/** 05/11/2026, 5.11.2026, 11-05-2026: day and month in an order this field cannot know. */
const DAY_MONTH_YEAR = /^\d{1,2}[./-]\d{1,2}[./-]\d{2,4}$/;

const EXAMPLE = 'for example 2026-11-05';

/** `finished`: the person has left the field, so a part-typed date is reported too. */
export function readDay(text: string, finished: boolean): DayReading {
  const typed = text.trim();
  if (typed === '') return { day: null, problem: null };
  if (ISO_DAY.test(typed)) {
    // Date.parse accepts 2026-02-30 as 2 March: the day must survive the round trip.
    const time = Date.parse(`${typed}T00:00:00Z`);
    if (!Number.isNaN(time) && new Date(time).toISOString().slice(0, 10) === typed) return { day: typed, problem: null };
    return { day: null, problem: `${typed} is not a day of the calendar.` };
  }
  if (DAY_MONTH_YEAR.test(typed)) return { day: null, problem: `Write the day as YYYY-MM-DD: ${typed} could be day/month or month/day.` };
  if (ISO_PREFIX.test(typed) && !finished) return { day: null, problem: null };
  return { day: null, problem: `Write the day as YYYY-MM-DD, ${EXAMPLE}.` };
}

/** Why a From day after the To day selects nothing, or null. */
export function rangeProblem(from: string | null, to: string | null): string | null {
  return from && to && from > to ? `From (${from}) is after To (${to}): no day lies between them.` : null;
}

/** The start of a day in UTC, as the API's bounds are written. */
export function dayStartIso(day: string): string {
  return `${day}T00:00:00Z`;
}

/** The start of the next day in UTC: To is inclusive. */
export function dayAfterIso(day: string): string {
  return new Date(Date.parse(`${day}T00:00:00Z`) + 86_400_000).toISOString();
}
