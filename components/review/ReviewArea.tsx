import { StyleSheet, View } from 'react-native';
import { space } from '../../lib/theme';
import { AppText } from '../AppText';
import { Screen } from '../Screen';
import { DisputeQueue } from './DisputeQueue';
import { ReleasedVersions } from './ReleasedVersions';
import { ReviewQueue } from './ReviewQueue';

/** The supervisor's desk: rule versions to release or send back, and disputed verdicts to judge. */
export function ReviewArea() {
  return (
    <Screen title="Review" subtitle="Nobody releases a version they wrote or edited.">
      <View style={styles.section}>
        <AppText variant="heading">Rule versions in review</AppText>
        <ReviewQueue />
      </View>
      <View style={styles.section}>
        <AppText variant="heading">Disputed verdicts</AppText>
        <DisputeQueue />
      </View>
      <View style={styles.section}>
        <AppText variant="heading">Released versions</AppText>
        <AppText tone="muted">Open one to see its signatures and trial, or to withdraw it from the line.</AppText>
        <ReleasedVersions />
      </View>
    </Screen>
  );
}

const styles = StyleSheet.create({
  section: { gap: space.md },
});
