// The limit-tuning plot's geometry: how far its axes reach and which limits share a dot.
import type { Sweep } from '../../shared/api/trials';

/** Axis ends the plot zooms to, so that a curve near 0 % does not pile its dots into one corner. */
const AXIS_ENDS = [0.05, 0.1, 0.2, 0.25, 0.5, 1];

/** The smallest axis end that holds every rate. */
export function axisEnd(largest: number): number {
  return AXIS_ENDS.find((end) => largest <= end) ?? 1;
}

type SweepPoint = Sweep['points'][number];

/**
 * Limits that give the same two rates are one dot (the same place on the plot): the one in use if
 * it is among them, else the middle one; `limits` says how many it stands for.
 */
export function dotsOf(points: readonly SweepPoint[], inUse: (limit: number) => boolean): { point: SweepPoint; first: number; last: number; limits: number }[] {
  const groups = new Map<string, SweepPoint[]>();
  for (const p of points) {
    const key = `${p.escapeRate}|${p.falseRejectRate}`;
    groups.set(key, [...(groups.get(key) ?? []), p]);
  }
  return [...groups.values()].map((group) => ({
    point: group.find((p) => inUse(p.limit)) ?? group[Math.floor((group.length - 1) / 2)],
    first: group[0].limit,
    last: group[group.length - 1].limit,
    limits: group.length,
  }));
}

/**
 * Each value as `format` writes it, with more significant digits (up to 12) where two different
 * values would read the same ("0.0338" and "0.0338" → "0.03381" and "0.03384").
 */
export function distinctLabels(values: readonly number[], format: (v: number) => string): string[] {
  const labels = values.map(format);
  for (let digits = 4; digits <= 12; digits++) {
    const clashing = new Set(labels.filter((label, i) => labels.some((other, j) => other === label && values[j] !== values[i])));
    if (clashing.size === 0) break;
    values.forEach((v, i) => {
      if (clashing.has(labels[i])) labels[i] = String(Number(v.toPrecision(digits)));
    });
  }
  return labels;
}
