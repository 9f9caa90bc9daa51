import { useEffect, useId, useRef, type FormEvent, type ReactNode } from "react";
import { createPortal } from "react-dom";
import { cn } from "@frontend/lib/cn";
import { CloseIcon } from "./icons";

const FOCUSABLE =
  'a[href], button:not([disabled]), input:not([disabled]), select:not([disabled]), textarea:not([disabled]), [tabindex]:not([tabindex="-1"])';

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
 * A modal dialog: focus moves in and stays in while it is open, Escape closes it,
 * and focus returns to whatever opened it.
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
  const closeRef = useRef(onClose);
  closeRef.current = onClose;
  const busyRef = useRef(busy);
  busyRef.current = busy;

  useEffect(() => {
    if (!open) return;
    const opener = document.activeElement as HTMLElement | null;
    const panel = panelRef.current;
    const first = panel?.querySelector<HTMLElement>("[data-autofocus]") ?? panel?.querySelector<HTMLElement>("input, select, textarea");
    (first ?? panel)?.focus();

    function onKey(event: KeyboardEvent) {
      if (event.key === "Escape" && !busyRef.current) {
        event.stopPropagation();
        closeRef.current();
      }
      if (event.key === "Tab" && panel) {
        const items = Array.from(panel.querySelectorAll<HTMLElement>(FOCUSABLE));
        if (items.length === 0) return;
        const firstItem = items[0];
        const lastItem = items[items.length - 1];
        if (event.shiftKey && document.activeElement === firstItem) {
          event.preventDefault();
          lastItem.focus();
        } else if (!event.shiftKey && document.activeElement === lastItem) {
          event.preventDefault();
          firstItem.focus();
        }
      }
    }
    document.addEventListener("keydown", onKey);
    const { overflow } = document.body.style;
    document.body.style.overflow = "hidden";
    return () => {
      document.removeEventListener("keydown", onKey);
      document.body.style.overflow = overflow;
      opener?.focus?.();
    };
  }, [open]);

  if (!open) return null;

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

  return createPortal(
    <div className="fixed inset-0 z-50 flex items-start justify-center overflow-y-auto px-4 pt-[12vh] pb-8">
      <div
        className="fixed inset-0 bg-ink/45 backdrop-blur-[1.5px]"
        aria-hidden="true"
        onMouseDown={() => {
          if (!busyRef.current) onClose();
        }}
      />
      <div
        ref={panelRef}
        role="dialog"
        aria-modal="true"
        aria-labelledby={titleId}
        aria-describedby={description ? descriptionId : undefined}
        tabIndex={-1}
        className={cn(
          "relative w-full rounded-xl border border-line bg-panel shadow-[0_24px_60px_-12px_rgba(23,33,43,0.35)] focus:outline-none",
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
    </div>,
    document.body,
  );
}
