import type { ReactNode } from "react";
import { Alert } from "./alert";
import { Button } from "./button";
import { Dialog } from "./dialog";

/** "Are you sure" for destructive actions: names the thing, says what goes with it. */
export function ConfirmDialog({
  open,
  onClose,
  onConfirm,
  title,
  children,
  confirmLabel,
  pending = false,
  error,
}: {
  open: boolean;
  onClose: () => void;
  onConfirm: () => void;
  title: ReactNode;
  children: ReactNode;
  confirmLabel: string;
  pending?: boolean;
  error?: string | null;
}) {
  return (
    <Dialog
      open={open}
      onClose={onClose}
      title={title}
      size="sm"
      busy={pending}
      footer={
        <>
          <Button variant="secondary" onClick={onClose} disabled={pending} data-autofocus>
            Cancel
          </Button>
          <Button variant="danger" onClick={onConfirm} pending={pending}>
            {confirmLabel}
          </Button>
        </>
      }
    >
      <div className="space-y-3 text-[13px] text-ink/75">
        {children}
        {error ? <Alert>{error}</Alert> : null}
      </div>
    </Dialog>
  );
}
