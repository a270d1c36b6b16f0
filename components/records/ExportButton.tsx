import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { downloadFile } from '../../lib/api';
import { fileNameFrom, saveBlob } from '../../lib/saveFile';
import { colors, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { ErrorBanner } from '../ErrorBanner';

interface ExportButtonProps {
  label: string;
  path: string;
  query?: Record<string, string | undefined>;
  fallbackName: string;
  /** For CSV exports: the server sends the number of inspections first, so progress can be shown. */
  countHeader?: string;
  /** Why the export cannot run now (the button is disabled and says so beside it). */
  unavailable?: string;
  /** What the saved file holds, said once it is saved (default: its name). `count`: the countHeader's number. */
  describeSaved?: (fileName: string, count: number | null) => string;
}

/** Downloads an export with progress (bytes, and inspections when the server says how many). */
export function ExportButton({ label, path, query = {}, fallbackName, countHeader, unavailable, describeSaved }: ExportButtonProps) {
  const [progress, setProgress] = useState<string | null>(null);
  const [error, setError] = useState<unknown>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const run = async () => {
    setError(null);
    setSaved(null);
    setProgress('Starting…');
    try {
      const { blob, headers } = await downloadFile(path, query, (bytes, h) => {
        const total = countHeader ? h.get(countHeader) : null;
        setProgress(`${(bytes / 1e6).toFixed(1)} MB received${total ? ` (${Number(total).toLocaleString()} inspections)` : ''}`);
      });
      const fileName = fileNameFrom(headers, fallbackName);
      saveBlob(blob, fileName);
      const total = countHeader ? headers.get(countHeader) : null;
      setSaved(describeSaved ? describeSaved(fileName, total === null ? null : Number(total)) : `Saved ${fileName}.`);
      setProgress(null);
    } catch (e) {
      setError(e);
      setProgress(null);
    }
  };
  return (
    <View style={[styles.column, unavailable || saved ? styles.columnWithReason : null]}>
      <Button label={progress ? 'Exporting…' : label} variant="secondary" compact busy={progress !== null} disabled={!!unavailable} accessibilityHint={unavailable} onPress={run} />
      {unavailable ? (
        <AppText variant="caption" tone="muted" style={styles.unavailable}>
          {unavailable}
        </AppText>
      ) : null}
      {progress ? (
        <View accessibilityRole="progressbar" accessibilityLabel={`${label}: ${progress}`} style={styles.progress}>
          <AppText variant="caption" tone="muted">
            {progress}
          </AppText>
        </View>
      ) : null}
      {saved ? (
        <AppText variant="caption" tone="notice" role="status" style={styles.saved}>
          {/* A file name has no spaces: it may break after its underscores instead of running off a phone's screen. */}
          {`✓ ${saved.replace(/_/g, '_\u200b')}`}
        </AppText>
      ) : null}
      {error ? <ErrorBanner error={error} nextStep="Try the export again; narrow the filters if it keeps failing." /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  column: { gap: space.xs },
  // The reason below a disabled button wraps under it instead of widening it.
  columnWithReason: { alignItems: 'flex-start' },
  unavailable: { maxWidth: 260 },
  saved: { maxWidth: 220 },
  progress: { paddingVertical: space.xs, paddingHorizontal: space.sm, borderRadius: radius.sm, backgroundColor: colors.surfaceSunken },
});
