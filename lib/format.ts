// Dates, counts and gauge values as people on the line read them.
const dateFormat = new Intl.DateTimeFormat(undefined, { year: 'numeric', month: 'short', day: 'numeric' });

export function formatDate(iso: string): string {
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? '—' : dateFormat.format(date);
}

const dateTimeFormat = new Intl.DateTimeFormat(undefined, { year: 'numeric', month: 'short', day: 'numeric', hour: 'numeric', minute: '2-digit', second: '2-digit' });

/** A moment as every list and page writes it ("Dec 5, 2026, 10:21:12 AM" in an English browser). */
export function formatDateTime(iso: string): string {
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? '—' : dateTimeFormat.format(date);
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

/**
 * A gauge's value as every screen shows it (preview, trial, verdict, record): whole numbers as they
 * are, one decimal from 100, three from 1, three significant digits below 1, and powers of ten where
 * fixed decimals would hide the value (below 0.001, from a million).
 */
export function formatGaugeValue(value: number): string {
  if (!Number.isFinite(value) || Number.isInteger(value)) return String(value);
  const magnitude = Math.abs(value);
  if (magnitude < 0.001 || magnitude >= 1e6) return value.toExponential(2);
  return magnitude >= 100 ? value.toFixed(1) : magnitude >= 1 ? value.toFixed(3) : value.toPrecision(3);
}

/**
 * `text` in at most `lines` lines of `perLine` characters, joined by line breaks: words kept whole
 * where they fit, a word longer than a line cut, and "…" at the end when the text does not fit.
 */
export function fitLines(text: string, perLine: number, lines: number): string {
  const out: string[] = [];
  let rest = text.trim();
  while (rest.length > 0 && out.length < lines) {
    if (rest.length <= perLine) {
      out.push(rest);
      rest = '';
    } else {
      const space = rest.lastIndexOf(' ', perLine);
      const cut = space > 0 ? space : perLine;
      out.push(rest.slice(0, cut).trimEnd());
      rest = rest.slice(cut).trimStart();
    }
  }
  if (rest.length > 0 && out.length > 0) out[out.length - 1] = `${out[out.length - 1].slice(0, Math.max(1, perLine - 1))}…`;
  return out.join('\n');
}
