import { useEffect, useRef, useState } from 'react';
import { Platform, Pressable, StyleSheet, View } from 'react-native';
import { useLayout } from '../../hooks/useLayout';
import { colors, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';

interface PhotographButtonProps {
  label: string;
  hint: string;
  disabled?: boolean;
  onPress: () => void;
  /** Wide screens on the web also take a photo file dropped on the button. */
  onDropFile?: (file: File) => void;
}

/** The one large button of the inspection loop; on a wide web screen it is also a drop target. */
export function PhotographButton({ label, hint, disabled = false, onPress, onDropFile }: PhotographButtonProps) {
  const layout = useLayout();
  const target = useRef<View>(null);
  const [dragging, setDragging] = useState(false);
  const acceptsDrop = Platform.OS === 'web' && layout === 'wide' && Boolean(onDropFile) && !disabled;

  useEffect(() => {
    // react-native-web renders a View as a DOM element; drag-and-drop needs its native events.
    const element = target.current as unknown as HTMLElement | null;
    if (!acceptsDrop || !element?.addEventListener) return;
    const over = (event: DragEvent) => {
      event.preventDefault();
      setDragging(true);
    };
    const leave = () => setDragging(false);
    const drop = (event: DragEvent) => {
      event.preventDefault();
      setDragging(false);
      const file = Array.from(event.dataTransfer?.files ?? []).find((f) => f.type.startsWith('image/'));
      if (file) onDropFile?.(file);
    };
    element.addEventListener('dragover', over);
    element.addEventListener('dragleave', leave);
    element.addEventListener('drop', drop);
    return () => {
      element.removeEventListener('dragover', over);
      element.removeEventListener('dragleave', leave);
      element.removeEventListener('drop', drop);
    };
  }, [acceptsDrop, onDropFile]);

  return (
    <View ref={target} style={[styles.zone, dragging && styles.zoneDragging]}>
      <Pressable
        accessibilityRole="button"
        accessibilityLabel={label}
        accessibilityHint={hint}
        accessibilityState={{ disabled }}
        disabled={disabled}
        onPress={onPress}
        style={({ pressed }) => [styles.button, pressed && styles.pressed, disabled && styles.disabled]}
      >
        <View style={styles.lens} aria-hidden>
          <View style={styles.lensInner} />
        </View>
        <AppText variant="title" tone="onSteel">
          {label}
        </AppText>
        <AppText variant="caption" tone="onSteel" style={styles.hint}>
          {acceptsDrop ? `${hint} Or drop a photo file here.` : hint}
        </AppText>
      </Pressable>
    </View>
  );
}

const styles = StyleSheet.create({
  zone: { borderRadius: radius.lg + 4, borderWidth: 3, borderColor: 'transparent', borderStyle: 'dashed', padding: 2 },
  zoneDragging: { borderColor: colors.focus },
  button: {
    minHeight: 160,
    borderRadius: radius.lg,
    backgroundColor: colors.steel,
    alignItems: 'center',
    justifyContent: 'center',
    gap: space.sm,
    padding: space.xl,
  },
  pressed: { backgroundColor: colors.steelPressed },
  disabled: { opacity: 0.55 },
  lens: { width: 44, height: 44, borderRadius: 22, borderWidth: 3, borderColor: colors.onSteel, alignItems: 'center', justifyContent: 'center' },
  lensInner: { width: 16, height: 16, borderRadius: 8, backgroundColor: colors.onSteel },
  hint: { textAlign: 'center' },
});
