import { StyleSheet, View } from 'react-native';
import { calloutStyle } from '../../lib/theme';
import { AppText } from '../AppText';

/** Where a figure can decide about a part, a person or a rule: what it is for, and what it is not. */
export function StudyCaution() {
  return (
    <View style={styles.note} accessibilityRole="text">
      <AppText variant="caption">
        These figures support, and do not replace, the plant’s quality procedures and the judgement of a qualified person. A study covers only the parts,
        photos and conditions it was run on; decide on a rule’s use for the line with the people responsible for it.
      </AppText>
    </View>
  );
}

const styles = StyleSheet.create({
  note: calloutStyle('caution'),
});
