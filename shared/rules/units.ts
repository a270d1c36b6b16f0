// A gauge's unit as people read it. Rule documents and exports keep the ASCII codes of GAUGE_UNITS
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
