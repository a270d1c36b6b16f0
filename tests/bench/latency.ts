// Latency figures for benchmarks: percentiles of a sample of times and the phases a server reports
// in its Server-Timing header.

/** The p-th percentile by the nearest-rank method: the smallest value with at least p % of the sample at or below it. */
export function percentile(values: readonly number[], p: number): number {
  if (values.length === 0) return Number.NaN;
  const sorted = [...values].sort((a, b) => a - b);
  const rank = Math.max(1, Math.ceil((p / 100) * sorted.length));
  return sorted[rank - 1];
}

export function mean(values: readonly number[]): number {
  return values.length === 0 ? Number.NaN : values.reduce((sum, v) => sum + v, 0) / values.length;
}

export interface TimingMetric {
  name: string;
  description?: string;
  ms: number;
}

/** Metrics of a Server-Timing header (W3C Server Timing: `name;desc="...";dur=12.3, ...`). */
export function parseServerTiming(header: string | null): TimingMetric[] {
  if (!header) return [];
  // Commas separate metrics, except inside a quoted description.
  return (header.match(/(?:[^,"]|"[^"]*")+/g) ?? [])
    .map((part) => part.trim())
    .filter(Boolean)
    .map((part) => {
      const [name, ...params] = (part.match(/(?:[^;"]|"[^"]*")+/g) ?? []).map((s) => s.trim());
      const metric: TimingMetric = { name, ms: Number.NaN };
      for (const param of params) {
        const at = param.indexOf('=');
        const key = at < 0 ? param : param.slice(0, at);
        const value = at < 0 ? '' : param.slice(at + 1).replace(/^"|"$/g, '');
        if (key === 'dur') metric.ms = Number(value);
        if (key === 'desc') metric.description = value;
      }
      return metric;
    });
}

/** A row of figures in ms, one decimal, padded for a fixed-width table. */
export function formatRow(label: string, figures: number[], labelWidth = 28, cellWidth = 9): string {
  return label.padEnd(labelWidth) + figures.map((f) => (Number.isFinite(f) ? f.toFixed(1) : '—').padStart(cellWidth)).join('');
}
