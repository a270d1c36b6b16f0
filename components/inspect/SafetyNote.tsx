import { StyleSheet, View } from 'react-native';
import { colors, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';

/** What a verdict is and is not (DESIGN.md, "Safety"): shown wherever a verdict gates a part. */
export function SafetyNote() {
  return (
    <View style={styles.note} accessibilityRole="text">
      <AppText variant="caption" tone="muted">
        A verdict is a decision aid, validated on the rule’s reference set. Limits must follow the part’s drawing and the plant’s
        quality procedures. Disputed or safety-critical parts go to a qualified person.
      </AppText>
    </View>
  );
}

const styles = StyleSheet.create({
  note: { padding: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.surfaceMuted },
});
