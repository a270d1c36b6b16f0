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
  /** Default "Cancel"; name what staying means when that is clearer ("Keep editing"). */
  cancelLabel?: string;
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
  cancelLabel = 'Cancel',
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
          <Button label={cancelLabel} variant="secondary" onPress={onCancel} disabled={busy} />
          <Button label={confirmLabel} variant={destructive ? 'danger' : 'primary'} onPress={onConfirm} busy={busy} />
        </>
      }
    >
      <AppText>{message}</AppText>
      {error ? <ErrorBanner error={error} /> : null}
    </Dialog>
  );
}
