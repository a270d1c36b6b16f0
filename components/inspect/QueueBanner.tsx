import { StyleSheet, View } from 'react-native';
import { bannerStyle, bannerText } from '../../lib/theme';
import { AppText } from '../AppText';
import { Button } from '../Button';

interface QueueBannerProps {
  count: number;
  sending: boolean;
  onSendNow: () => void;
}

/** How many photos wait on this device for the server; nothing when none do. */
export function QueueBanner({ count, sending, onSendNow }: QueueBannerProps) {
  if (count === 0) return null;
  const photos = count === 1 ? '1 photo waits' : `${count} photos wait`;
  return (
    <View style={styles.banner} role="status" aria-live="polite" testID="queue-banner">
      <View style={styles.text}>
        <AppText variant="bodyStrong" tone="caution">{`◷ ${photos} on this device`}</AppText>
        <AppText variant="caption">
          The server could not be reached. They are sent by themselves when it answers again, each counted once. Keep the parts aside
          until their verdicts arrive.
        </AppText>
      </View>
      <Button label={sending ? 'Sending…' : 'Send now'} variant="secondary" compact busy={sending} onPress={onSendNow} accessibilityLabel="Send the waiting photos now" />
    </View>
  );
}

const styles = StyleSheet.create({
  banner: bannerStyle('caution'),
  text: bannerText,
});
