import { Dialog } from './Dialog';
import { AppText } from './AppText';
import { Button } from './Button';
import { ErrorBanner } from './ErrorBanner';

interface ConfirmDialogProps {
  visible: boolean;
  title: string;
  /** What will happen, in full, so the person knows what they are agreeing to. */
  message: string;
  confirmLabel: string;
  destructive?: boolean;
  busy?: boolean;
  error?: unknown;
  onConfirm: () => void;
  onCancel: () => void;
}

export function ConfirmDialog({
  visible,
  title,
  message,
  confirmLabel,
  destructive = false,
  busy = false,
  error,
  onConfirm,
  onCancel,
}: ConfirmDialogProps) {
  return (
    <Dialog
      visible={visible}
      title={title}
      onClose={onCancel}
      actions={
        <>
          <Button label="Cancel" variant="secondary" onPress={onCancel} disabled={busy} />
          <Button label={confirmLabel} variant={destructive ? 'danger' : 'primary'} onPress={onConfirm} busy={busy} />
        </>
      }
    >
      <AppText>{message}</AppText>
      {error ? <ErrorBanner error={error} /> : null}
    </Dialog>
  );
}
