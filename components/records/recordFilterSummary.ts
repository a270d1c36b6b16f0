// The records list's filters in words, for the line they fold into on a phone.

export interface RecordFilterChoice {
  verdict: 'PASS' | 'FAIL' | 'RETAKE' | null;
  stationName: string | null;
  disputed: boolean | null;
  /** Typed days, YYYY-MM-DD, or '' for open. */
  from: string;
  to: string;
  /** A record reference as typed, or '' for any. */
  reference?: string;
}

/** "FAIL only · Press 3 exit · disputed or not · 2026-11-01 to 2026-11-30" (then "record 7F3A-19C2" when one is typed). */
export function describeRecordFilters(choice: RecordFilterChoice): string {
  return [
    choice.verdict ? `${choice.verdict} only` : 'Every verdict',
    choice.stationName ?? 'all stations',
    choice.disputed === null ? 'disputed or not' : choice.disputed ? 'disputed only' : 'not disputed',
    choice.from || choice.to ? `${choice.from || '…'} to ${choice.to || '…'}` : 'any day',
    ...(choice.reference ? [`record ${choice.reference}`] : []),
  ].join(' · ');
}
