import { useEffect, useRef } from 'react';
import { Platform, StyleSheet, View } from 'react-native';
import { explainError } from '../lib/errorMessages';
import { bannerStyle, bannerText } from '../lib/theme';
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
  const shown = message ?? explained.message;
  const banner = useRef<View>(null);
  useEffect(() => {
    // A banner that appears under a dialog's or a long form's fold, below the button just pressed, is brought into sight.
    if (Platform.OS !== 'web') return;
    (banner.current as unknown as { scrollIntoView?: (options: { block: 'nearest' }) => void } | null)?.scrollIntoView?.({ block: 'nearest' });
  }, [shown]);
  return (
    <View ref={banner} accessibilityRole="alert" style={styles.banner}>
      <View style={styles.text}>
        <AppText variant="bodyStrong" tone="danger">
          {`⚠ ${shown}`}
        </AppText>
        <AppText>{nextStep ?? explained.nextStep}</AppText>
      </View>
      {onRetry ? <Button label="Try again" variant="secondary" onPress={onRetry} compact /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  banner: bannerStyle('danger'),
  text: bannerText,
});
