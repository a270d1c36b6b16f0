// A gauge's unit and limits as people read them. Rule documents and exports keep the ASCII codes of GAUGE_UNITS
// (px2, mm2); screens and reports write the symbols (px², mm²).
import type { GaugeUnit } from './schema';

const SYMBOLS: Record<GaugeUnit, string> = { px: 'px', px2: 'px²', mm: 'mm', mm2: 'mm²' };

/** The unit's symbol ("mm²" for mm2); a code not in GAUGE_UNITS as it is, and no unit as ''. */
export function unitSymbol(unit: string | null | undefined): string {
  if (!unit) return '';
  return Object.prototype.hasOwnProperty.call(SYMBOLS, unit) ? SYMBOLS[unit as GaugeUnit] : unit;
}

/** " mm²" to follow a number, or '' without a unit. */
export function unitSuffix(unit: string | null | undefined): string {
  const symbol = unitSymbol(unit);
  return symbol ? ` ${symbol}` : '';
}

/** A gauge's limits in words, as the engineer entered them: "479.1 to 480.2 mm²", "at most 0.5", "no limit". */
export function describeLimits(min: number | null | undefined, max: number | null | undefined, unit: string | null | undefined): string {
  const u = unitSuffix(unit);
  const has = (n: number | null | undefined): n is number => n !== null && n !== undefined;
  if (has(min) && has(max)) return `${min} to ${max}${u}`;
  if (has(min)) return `at least ${min}${u}`;
  if (has(max)) return `at most ${max}${u}`;
  return 'no limit';
}
