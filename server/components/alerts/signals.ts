// What one rule at one station should be alerted about: the Western Electric rules on its daily p-chart,
// and the days whose defect fraction is above the supervisor's limit.
import { pChart } from '../../../shared/metrics/control-chart';
import { runRuleSignals } from '../../../shared/metrics/run-rules';
import type { DailyCount } from '../trends/service';
import type { AlertKind } from './entities';

const DAY_MS = 86_400_000;

export interface AlertCandidate {
  kind: AlertKind;
  signal: string;
  periodStart: Date;
  periodEnd: Date;
  description: string;
}

export interface ApplicableLimit {
  maxDefectFraction: number;
  /** The limit is this station's own, or one for every station. */
  scope: 'station' | 'every station';
}

const percent = (p: number) => `${(100 * p).toFixed(1)} %`;
const dayOf = (d: Date) => d.toISOString().slice(0, 10);

/**
 * The firings of the Western Electric rules on the daily p-chart of one rule at one station (days in
 * order): every one on the high side (more defective parts), and those on the low side that end on the
 * latest day. The centre line is taken over the days checked, so when a station drifts upwards its
 * earlier, ordinary days fall below the line; their low-side patterns say nothing new and are left to
 * the chart. A low run that lasts to the latest day is reported: a rule that suddenly fails fewer parts
 * may have stopped seeing a defect.
 */
export function runRuleAlerts(days: readonly DailyCount[]): AlertCandidate[] {
  const chart = pChart(days);
  if (chart.center === null) return [];
  const center = chart.center;
  const latest = chart.points.length - 1;
  const z = chart.points.map((p) => p.z);
  return runRuleSignals(z, 'western-electric')
    .filter((signal) => (z[signal.pointIndex] ?? 0) > 0 || signal.pointIndex === latest)
    .map((signal) => {
      const point = chart.points[signal.pointIndex];
      return {
        kind: 'run-rule' as const,
        signal: signal.rule,
        periodStart: point.day,
        periodEnd: new Date(point.day.getTime() + DAY_MS),
        description:
          `${signal.rule}: ${signal.description}, ending ${dayOf(point.day)} ` +
          `(${percent(point.p)} defective, ${point.defectives} of ${point.n}; centre line ${percent(center)} over the ${chart.points.length} days checked)`,
      };
    });
}

/** The days whose defect fraction is above the limit. */
export function limitAlerts(days: readonly DailyCount[], limit: ApplicableLimit | null): AlertCandidate[] {
  if (!limit) return [];
  return days
    .filter((d) => d.n > 0 && d.defectives / d.n > limit.maxDefectFraction)
    .map((d) => ({
      kind: 'limit' as const,
      signal: 'limit',
      periodStart: d.day,
      periodEnd: new Date(d.day.getTime() + DAY_MS),
      description: `Defect fraction ${percent(d.defectives / d.n)} (${d.defectives} of ${d.n}) on ${dayOf(d.day)} is above the limit of ${percent(limit.maxDefectFraction)} set for ${limit.scope === 'station' ? 'this station' : 'every station'}`,
    }));
}
