import { StyleSheet, View } from 'react-native';
import { space } from '../../lib/theme';
import type { TrendChoices } from '../../shared/api/trends';
import { AttributeAgreementPanel } from './AttributeAgreementPanel';
import { RepeatabilityPanel } from './RepeatabilityPanel';
import { StudyCaution } from './StudyCaution';

interface AgreementViewProps {
  choices: TrendChoices;
  canRun: boolean;
}

/**
 * Measurement system analysis of a rule: does it agree with itself, and with a qualified person?
 * The two studies stack at every width: a repeatability study's table of spreads needs the whole
 * width to show its last column, the share of the tolerance, without scrolling.
 */
export function AgreementView({ choices, canRun }: AgreementViewProps) {
  return (
    <View style={styles.view}>
      <StudyCaution />
      <RepeatabilityPanel canRun={canRun} />
      <AttributeAgreementPanel choices={choices} />
    </View>
  );
}

const styles = StyleSheet.create({
  view: { gap: space.lg },
});
