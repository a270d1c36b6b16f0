import type { PartType } from '../../shared/api/catalogue';
import type { Station } from '../../shared/api/stations';
import { AppText } from '../AppText';

/** Names the part types a station inspects, by their catalogue names where the catalogue is loaded. */
export function partTypeNames(codes: readonly string[], catalogue: readonly PartType[] | undefined): string[] {
  return codes.map((code) => catalogue?.find((p) => p.code === code)?.name ?? code);
}

/** What the station's operators are offered: the rules of its part types, or every released rule. */
export function PartTypesSummary({ station, catalogue }: { station: Station; catalogue: readonly PartType[] | undefined }) {
  if (station.partTypes.length === 0)
    return (
      <AppText variant="caption" tone="caution">
        ⚠ No part types assigned: operators here are offered every released rule.
      </AppText>
    );
  return <AppText variant="caption">{`Inspects: ${partTypeNames(station.partTypes, catalogue).join(', ')}`}</AppText>;
}
