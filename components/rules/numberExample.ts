// The example a number field's typing error offers.
import type { NumberSpec } from './stepCatalogue';

/** A number the field accepts, for its typing error's example ("e.g. 0.5" for a share, not 1.5). */
export function exampleOf(spec: NumberSpec): string {
  if (!(spec.min > -1e9 && spec.max < 1e9)) return spec.integer ? '3' : '1.5';
  const middle = (spec.min + spec.max) / 2;
  if (spec.odd) return String(2 * Math.floor(middle / 2) + 1);
  return String(spec.integer ? Math.round(middle) : Number(middle.toPrecision(2)));
}
