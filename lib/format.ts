// Dates and counts as people on the line read them.
const dateFormat = new Intl.DateTimeFormat(undefined, { year: 'numeric', month: 'short', day: 'numeric' });

export function formatDate(iso: string): string {
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? '—' : dateFormat.format(date);
}

/** "21–40 of 57" for a page of a list. */
export function describePage(offset: number, shown: number, total: number): string {
  if (total === 0 || shown === 0) return `0 of ${total}`;
  return `${offset + 1}–${offset + shown} of ${total}`;
}

/** A share 0..1 as "12.5 %" (or with `digits` decimals), or "—" when there is none. */
export function formatPercent(share: number | null | undefined, digits = 1): string {
  return share === null || share === undefined || Number.isNaN(share) ? '—' : `${(share * 100).toFixed(digits)} %`;
}

/** A station as the screens name it: "Line 1 — stamping · Press 3 exit". */
export function stationTitle(station: { lineName: string; name: string }): string {
  return `${station.lineName} · ${station.name}`;
}
