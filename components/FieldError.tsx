// A field's error under it, announced to screen readers as it appears; nothing when there is none.
import { AppText } from './AppText';

export function FieldError({ error }: { error?: string | null }) {
  if (!error) return null;
  return (
    <AppText variant="caption" tone="danger" accessibilityRole="alert">
      {`⚠ ${error}`}
    </AppText>
  );
}
