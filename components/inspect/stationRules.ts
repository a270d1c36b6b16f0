// Which released rules an operator is offered at a station: those for the part types it inspects.
import type { RuleSummary } from '../../shared/api/rules';
import type { Station } from '../../shared/api/stations';

/** A station with no part types assigned (set up before stations named them) takes every released rule, as the server does. */
export function ruleFitsStation(rule: Pick<RuleSummary, 'partType'>, station: Pick<Station, 'partTypes'>): boolean {
  return station.partTypes.length === 0 || station.partTypes.includes(rule.partType);
}

export function rulesForStation<R extends Pick<RuleSummary, 'partType'>>(rules: readonly R[], station: Pick<Station, 'partTypes'>): R[] {
  return rules.filter((rule) => ruleFitsStation(rule, station));
}
