import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, space } from '../../lib/theme';
import type { InspectChoice } from '../../lib/inspectChoice';
import type { PartType } from '../../shared/api/catalogue';
import type { RuleSummary } from '../../shared/api/rules';
import type { Line } from '../../shared/api/stations';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ChoiceChips } from '../ChoiceChips';
import { partTypeNames } from '../stations/PartTypesSummary';
import { ruleFitsStation, rulesForStation } from './stationRules';

interface StationRulePickerProps {
  lines: Line[];
  rules: RuleSummary[];
  /** The part type catalogue, for names instead of codes (codes are shown while it loads). */
  partTypes?: readonly PartType[];
  initial: InspectChoice | null;
  onChoose: (choice: InspectChoice) => void;
}

/** The operator's station (grouped by line), then one of the released rules for the part types it inspects. */
export function StationRulePicker({ lines, rules, partTypes, initial, onChoose }: StationRulePickerProps) {
  const activeLines = lines.map((line) => ({ ...line, stations: line.stations.filter((s) => s.active) })).filter((line) => line.stations.length > 0);
  // A remembered choice counts only while it can still be used (a withdrawn rule or an idle station cannot).
  const activeStations = activeLines.flatMap((line) => line.stations);
  const [stationId, setStationId] = useState<string | null>(() => activeStations.find((s) => s.id === initial?.stationId)?.id ?? null);
  // The remembered rule is kept only while it is released and fits the remembered station.
  const [ruleId, setRuleId] = useState<string | null>(() => {
    const remembered = rules.find((r) => r.id === initial?.ruleId);
    const rememberedStation = activeStations.find((s) => s.id === initial?.stationId);
    return remembered && rememberedStation && ruleFitsStation(remembered, rememberedStation) ? remembered.id : null;
  });
  const station = activeStations.find((s) => s.id === stationId);
  const offered = station ? rulesForStation(rules, station) : [];
  // A rule that does not fit the chosen station (remembered, or chosen before the station changed) is dropped.
  const chosenRuleId = offered.some((r) => r.id === ruleId) ? ruleId : null;
  const names = station ? partTypeNames(station.partTypes, partTypes) : [];
  const chooseStation = (id: string | null) => {
    setStationId(id);
    // The rule chosen so far is dropped when the new station does not inspect its part type.
    const next = activeStations.find((s) => s.id === id);
    const rule = rules.find((r) => r.id === ruleId);
    if (!next || !rule || !ruleFitsStation(rule, next)) setRuleId(null);
  };
  return (
    <Card style={styles.card}>
      <AppText variant="heading">Where are you inspecting?</AppText>
      {activeLines.map((line) => (
        <ChoiceChips
          key={line.id}
          label={line.name}
          choices={line.stations.map((s) => ({ value: s.id, label: s.name }))}
          value={stationId}
          onChange={chooseStation}
        />
      ))}
      <AppText variant="heading">Which released rule?</AppText>
      {!station ? (
        <AppText tone="muted">Choose your station first: you are offered the released rules for the parts it inspects.</AppText>
      ) : station.partTypes.length === 0 ? (
        <View style={styles.note} role="note">
          <AppText variant="caption">No part types assigned to this station yet: every released rule is offered. A supervisor can assign them under Stations.</AppText>
        </View>
      ) : null}
      {station && offered.length === 0 ? (
        <View style={styles.empty} role="status">
          <AppText variant="bodyStrong">{`No released rule for ${names.join(', ')} yet`}</AppText>
          <AppText>
            {`${station.name} inspects ${names.join(', ')}, ${names.length === 1 ? 'which has no released rule yet' : 'none of which has a released rule yet'}. Ask your supervisor which rule to use, or choose another station.`}
          </AppText>
        </View>
      ) : null}
      {offered.length > 0 ? (
        <ChoiceChips
          label={station!.partTypes.length ? `Released rules for ${names.join(', ')}` : 'Released rules'}
          choices={offered.map((r) => ({ value: r.id, label: `${r.name} · v${r.releasedVersion?.number ?? '?'}` }))}
          value={chosenRuleId}
          onChange={setRuleId}
        />
      ) : null}
      <View style={styles.actions}>
        <Button
          label="Use this station and rule"
          disabled={!stationId || !chosenRuleId}
          accessibilityHint={!stationId || !chosenRuleId ? 'Choose a station and a rule first' : undefined}
          onPress={() => stationId && chosenRuleId && onChoose({ stationId, ruleId: chosenRuleId })}
        />
      </View>
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  note: { borderLeftWidth: 4, borderLeftColor: colors.control, paddingLeft: space.sm },
  empty: { gap: space.xs, borderLeftWidth: 4, borderLeftColor: colors.caution, paddingLeft: space.sm },
  actions: { flexDirection: 'row', justifyContent: 'flex-end' },
});
