import { useId, type ReactNode } from 'react';
import { Modal, Pressable, ScrollView, StyleSheet, View } from 'react-native';
import { useLayout } from '../hooks/useLayout';
import { colors, radius, space } from '../lib/theme';
import { AppText } from './AppText';
import { Button, type ButtonVariant } from './Button';

interface DialogProps {
  visible: boolean;
  title: string;
  /** Escape, the backdrop and the Cancel button all close without acting. */
  onClose: () => void;
  children: ReactNode;
  /** Buttons along the bottom edge, the main action last. */
  actions?: ReactNode;
}

/** A modal dialog: centred on a wide screen, a sheet from the bottom edge on a phone. */
export function Dialog({ visible, title, onClose, children, actions }: DialogProps) {
  const layout = useLayout();
  const titleId = `dialog-title-${useId().replace(/:/g, '')}`;
  const sheet = layout === 'phone';
  return (
    // On the web the modal's own element is the dialog (role and aria-modal); it takes the title as its name.
    <Modal visible={visible} transparent animationType="fade" onRequestClose={onClose} aria-labelledby={titleId}>
      <View style={[styles.backdrop, sheet ? styles.backdropSheet : styles.backdropCentre]}>
        <Pressable
          style={StyleSheet.absoluteFill}
          onPress={onClose}
          accessibilityRole="button"
          accessibilityLabel="Close dialog"
          tabIndex={-1}
        />
        <View style={[styles.panel, sheet ? styles.panelSheet : styles.panelCentre]}>
          <AppText variant="heading" nativeID={titleId}>
            {title}
          </AppText>
          <ScrollView style={styles.body} contentContainerStyle={styles.bodyContent} keyboardShouldPersistTaps="handled">
            {children}
          </ScrollView>
          {actions ? <View style={styles.actions}>{actions}</View> : null}
        </View>
      </View>
    </Modal>
  );
}

interface DialogActionsProps {
  /** The main action's label: what it does ("Create rule"), not "OK". */
  label: string;
  onConfirm: () => void;
  onCancel: () => void;
  /** While the action runs: the main button shows it and Cancel is off, so that nothing is left half done. */
  busy?: boolean;
  variant?: Extract<ButtonVariant, 'primary' | 'danger'>;
}

/** A form dialog's actions: Cancel, then its main action. */
export function DialogActions({ label, onConfirm, onCancel, busy = false, variant = 'primary' }: DialogActionsProps) {
  return (
    <>
      <Button label="Cancel" variant="secondary" onPress={onCancel} disabled={busy} />
      <Button label={label} variant={variant} onPress={onConfirm} busy={busy} />
    </>
  );
}

const styles = StyleSheet.create({
  backdrop: { flex: 1, backgroundColor: colors.backdrop },
  backdropCentre: { alignItems: 'center', justifyContent: 'center', padding: space.xl },
  backdropSheet: { justifyContent: 'flex-end' },
  panel: { backgroundColor: colors.surface, padding: space.xl, gap: space.lg, maxHeight: '92%' },
  panelCentre: { width: '100%', maxWidth: 560, borderRadius: radius.lg },
  panelSheet: { width: '100%', borderTopLeftRadius: radius.lg, borderTopRightRadius: radius.lg, padding: space.lg },
  body: { flexGrow: 0 },
  bodyContent: { gap: space.lg },
  actions: { flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'flex-end', gap: space.sm },
});
