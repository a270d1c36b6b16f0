import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { space } from '../../lib/theme';
import type { InspectChoice } from '../../lib/inspectChoice';
import type { RuleSummary } from '../../shared/api/rules';
import type { Line } from '../../shared/api/stations';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ChoiceChips } from '../ChoiceChips';

interface StationRulePickerProps {
  lines: Line[];
  rules: RuleSummary[];
  initial: InspectChoice | null;
  onChoose: (choice: InspectChoice) => void;
}

/** The operator's station (grouped by line) and one released rule; both are needed before the first photo. */
export function StationRulePicker({ lines, rules, initial, onChoose }: StationRulePickerProps) {
  const activeLines = lines.map((line) => ({ ...line, stations: line.stations.filter((s) => s.active) })).filter((line) => line.stations.length > 0);
  // A remembered choice counts only while it can still be used (a withdrawn rule or an idle station cannot).
  const [stationId, setStationId] = useState<string | null>(() =>
    activeLines.some((line) => line.stations.some((s) => s.id === initial?.stationId)) ? initial!.stationId : null,
  );
  const [ruleId, setRuleId] = useState<string | null>(() => (rules.some((r) => r.id === initial?.ruleId) ? initial!.ruleId : null));
  return (
    <Card style={styles.card}>
      <AppText variant="heading">Where are you inspecting?</AppText>
      {activeLines.map((line) => (
        <ChoiceChips
          key={line.id}
          label={line.name}
          choices={line.stations.map((s) => ({ value: s.id, label: s.name }))}
          value={stationId}
          onChange={setStationId}
        />
      ))}
      <AppText variant="heading">Which released rule?</AppText>
      <ChoiceChips
        label="Released rules"
        choices={rules.map((r) => ({ value: r.id, label: `${r.name} · v${r.releasedVersion?.number ?? '?'}` }))}
        value={ruleId}
        onChange={setRuleId}
      />
      <View style={styles.actions}>
        <Button
          label="Use this station and rule"
          disabled={!stationId || !ruleId}
          accessibilityHint={!stationId || !ruleId ? 'Choose a station and a rule first' : undefined}
          onPress={() => stationId && ruleId && onChoose({ stationId, ruleId })}
        />
      </View>
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  actions: { flexDirection: 'row', justifyContent: 'flex-end' },
});
