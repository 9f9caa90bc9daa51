import { useId, useRef, type FormEvent, type ReactNode } from "react";
import { cn } from "@frontend/lib/cn";
import { CloseIcon } from "./icons";
import { ModalDialog } from "./modal-dialog";

type DialogProps = {
  open: boolean;
  onClose: () => void;
  title: ReactNode;
  description?: ReactNode;
  children?: ReactNode;
  footer?: ReactNode;
  size?: "sm" | "md";
  /** Set while a request runs, so Escape or a click outside does not drop it. */
  busy?: boolean;
  /** Makes body and footer one form, so the footer's submit button submits it. */
  onSubmit?: (event: FormEvent<HTMLFormElement>) => void;
  formLabel?: string;
};

/**
 * A modal dialog with a title, a body and a footer of buttons, on ModalDialog (the browser's own
 * `<dialog>`). While `busy`, Escape and a press beside it do not close it.
 */
export function Dialog({
  open,
  onClose,
  title,
  description,
  children,
  footer,
  size = "md",
  busy = false,
  onSubmit,
  formLabel,
}: DialogProps) {
  const panelRef = useRef<HTMLDivElement>(null);
  const titleId = useId();
  const descriptionId = useId();

  if (!open) return null;

  const requestClose = () => {
    if (!busy) onClose();
  };

  const body = (
    <>
      {children ? <div className="px-5 pt-4 pb-1">{children}</div> : <div className="h-1" />}
      {footer ? (
        <div className="mt-4 flex items-center justify-end gap-2 rounded-b-xl border-t border-line bg-paper/60 px-5 py-3">{footer}</div>
      ) : (
        <div className="h-4" />
      )}
    </>
  );

  return (
    <ModalDialog
      onRequestClose={requestClose}
      onClosedByBrowser={onClose}
      panelRef={panelRef}
      labelledBy={titleId}
      describedBy={description ? descriptionId : undefined}
      className="fixed inset-0 z-50 m-0 h-full max-h-none w-full max-w-none overflow-y-auto bg-transparent p-0 px-4 pt-[12vh] pb-8 text-ink backdrop:bg-ink/45 backdrop:backdrop-blur-[1.5px]"
    >
      <div
        ref={panelRef}
        tabIndex={-1}
        className={cn(
          "relative mx-auto w-full rounded-xl border border-line bg-panel shadow-[0_24px_60px_-12px_rgba(23,33,43,0.35)] focus:outline-none",
          size === "sm" ? "max-w-md" : "max-w-lg",
        )}
      >
        <div className="flex items-start justify-between gap-4 px-5 pt-4.5">
          <div className="min-w-0">
            <h2 id={titleId} className="text-[15px] font-extrabold tracking-[-0.01em] text-ink">
              {title}
            </h2>
            {description ? (
              <p id={descriptionId} className="mt-1 text-[13px] text-ink/65">
                {description}
              </p>
            ) : null}
          </div>
          <button
            type="button"
            onClick={onClose}
            disabled={busy}
            aria-label="Close"
            className="-mr-1.5 flex size-7 shrink-0 items-center justify-center rounded-md text-ink/50 hover:bg-ink/[0.06] hover:text-ink disabled:opacity-40"
          >
            <CloseIcon />
          </button>
        </div>
        {onSubmit ? (
          <form onSubmit={onSubmit} noValidate aria-label={formLabel}>
            {body}
          </form>
        ) : (
          body
        )}
      </div>
    </ModalDialog>
  );
}
