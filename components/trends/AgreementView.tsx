import { StyleSheet, View } from 'react-native';
import { space } from '../../lib/theme';
import type { TrendChoices } from '../../shared/api/trends';
import { AttributeAgreementPanel } from './AttributeAgreementPanel';
import { RepeatabilityPanel } from './RepeatabilityPanel';
import { StudyCaution } from './StudyCaution';

interface AgreementViewProps {
  choices: TrendChoices;
  canRun: boolean;
  phone: boolean;
}

/** Measurement system analysis of a rule: does it agree with itself, and with a qualified person? */
export function AgreementView({ choices, canRun, phone }: AgreementViewProps) {
  return (
    <View style={styles.view}>
      <StudyCaution />
      <View style={[styles.panels, !phone && styles.sideBySide]}>
        <View style={!phone ? styles.column : undefined}>
          <RepeatabilityPanel canRun={canRun} />
        </View>
        <View style={!phone ? styles.column : undefined}>
          <AttributeAgreementPanel choices={choices} />
        </View>
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  view: { gap: space.lg },
  panels: { gap: space.lg },
  sideBySide: { flexDirection: 'row', alignItems: 'flex-start' },
  column: { flexGrow: 1, flexShrink: 1, flexBasis: 0, minWidth: 0 },
});
