import { StyleSheet, View } from 'react-native';
import { explainError } from '../lib/errorMessages';
import { colors, radius, space } from '../lib/theme';
import { AppText } from './AppText';
import { Button } from './Button';

interface ErrorBannerProps {
  error: unknown;
  /** Replaces the API's message, e.g. a clearer sentence for a refused sign-in. */
  message?: string;
  nextStep?: string;
  onRetry?: () => void;
}

/** A failure that belongs to no single field: what happened, and what to do next. */
export function ErrorBanner({ error, message, nextStep, onRetry }: ErrorBannerProps) {
  const explained = explainError(error);
  return (
    <View accessibilityRole="alert" style={styles.banner}>
      <View style={styles.text}>
        <AppText variant="bodyStrong" tone="danger">
          {`⚠ ${message ?? explained.message}`}
        </AppText>
        <AppText>{nextStep ?? explained.nextStep}</AppText>
      </View>
      {onRetry ? <Button label="Try again" variant="secondary" onPress={onRetry} compact /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  banner: {
    flexDirection: 'row',
    flexWrap: 'wrap',
    alignItems: 'center',
    gap: space.md,
    padding: space.md,
    borderRadius: radius.md,
    borderWidth: 1,
    borderLeftWidth: 4,
    borderColor: colors.danger,
    backgroundColor: colors.dangerTint,
  },
  text: { flexGrow: 1, flexShrink: 1, flexBasis: 220, gap: space.xxs },
});
