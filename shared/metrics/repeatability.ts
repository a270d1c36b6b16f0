// How much a rule's gauges vary when the same part is photographed again and again at one station:
// mean, sample standard deviation, range, and 6·s as a share of the tolerance (AIAG MSA 4th ed.
// %Tolerance = 6·σ/(USL − LSL), recalled from memory; REFERENCES.md §9).

export interface GaugeReading {
  name: string;
  value: number;
  unit: string | null;
  limits: { min?: number; max?: number };
}

export interface GaugeSpread {
  gauge: string;
  unit: string;
  n: number;
  mean: number;
  /** Sample standard deviation (n − 1); 0 for a single reading. */
  standardDeviation: number;
  range: number;
  limitMin: number | null;
  limitMax: number | null;
  shareOfTolerance: number | null;
}

/** One spread per gauge, in the order the gauges first appear; `photos` holds each judged photo's readings. */
export function gaugeSpreads(photos: readonly (readonly GaugeReading[])[]): GaugeSpread[] {
  const byGauge = new Map<string, GaugeReading[]>();
  for (const readings of photos) for (const r of readings) byGauge.set(r.name, [...(byGauge.get(r.name) ?? []), r]);
  return [...byGauge.entries()].map(([gauge, readings]) => {
    const values = readings.map((r) => r.value);
    const n = values.length;
    const mean = values.reduce((a, b) => a + b, 0) / n;
    const standardDeviation = n > 1 ? Math.sqrt(values.reduce((sum, v) => sum + (v - mean) ** 2, 0) / (n - 1)) : 0;
    const { min, max } = readings[0].limits;
    const tolerance = min !== undefined && max !== undefined && max > min ? max - min : null;
    return {
      gauge,
      unit: readings[0].unit ?? '',
      n,
      mean,
      standardDeviation,
      range: Math.max(...values) - Math.min(...values),
      limitMin: min ?? null,
      limitMax: max ?? null,
      shareOfTolerance: tolerance === null ? null : (6 * standardDeviation) / tolerance,
    };
  });
}
