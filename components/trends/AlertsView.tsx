import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { space } from '../../lib/theme';
import type { AlertState } from '../../hooks/useAlerts';
import type { TrendChoices } from '../../shared/api/trends';
import { AppText } from '../AppText';
import { ChoiceChips } from '../ChoiceChips';
import { AlertLimitsCard } from './AlertLimitsCard';
import { AlertList } from './AlertList';
import { SubscriptionSwitch } from './SubscriptionSwitch';

interface AlertsViewProps {
  choices: TrendChoices;
  isSupervisor: boolean;
  phone: boolean;
  openCount: number | undefined;
}

/** Alerts to act on and those already acknowledged; beside them, the limits that raise alerts and the e-mail setting. */
export function AlertsView({ choices, isSupervisor, phone, openCount }: AlertsViewProps) {
  const [state, setState] = useState<AlertState>('open');
  return (
    <View style={[styles.view, !phone && styles.wide]}>
      <View style={[styles.main, !phone && styles.mainWide]}>
        <AppText tone="muted">
          An alert is raised when a run rule fires for a rule at a station, or when a day passes a limit below. The checking job runs in the background; each alert is e-mailed once to the supervisors who asked for it.
        </AppText>
        <ChoiceChips<AlertState>
          label="Show"
          value={state}
          onChange={setState}
          choices={[
            { value: 'open', label: openCount ? `Open (${openCount})` : 'Open' },
            { value: 'acknowledged', label: 'Acknowledged' },
          ]}
        />
        <AlertList state={state} canAcknowledge={isSupervisor} />
      </View>
      <View style={[styles.side, !phone && styles.sideWide]}>
        {isSupervisor ? <SubscriptionSwitch /> : null}
        <AlertLimitsCard choices={choices} canEdit={isSupervisor} />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  view: { gap: space.lg },
  wide: { flexDirection: 'row', alignItems: 'flex-start' },
  main: { gap: space.md },
  mainWide: { flexGrow: 3, flexShrink: 1, flexBasis: 0, minWidth: 0 },
  side: { gap: space.lg },
  sideWide: { flexGrow: 2, flexShrink: 1, flexBasis: 0, minWidth: 0 },
});
