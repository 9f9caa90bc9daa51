import { useEffect, useRef, type ReactNode, type RefObject } from "react";
import { createPortal } from "react-dom";

type ModalDialogProps = {
  /** Asked to close: Escape, a press beside the panel, or the browser closing it. */
  onRequestClose: () => void;
  /** The browser closed it on its own (a close request it would not let us refuse); default onRequestClose. */
  onClosedByBrowser?: () => void;
  /** The panel inside the dialog; it takes focus unless it holds a `[data-autofocus]` element or a field. */
  panelRef: RefObject<HTMLElement | null>;
  labelledBy: string;
  describedBy?: string;
  className: string;
  children: ReactNode;
};

/**
 * The one modal primitive: the browser's own `<dialog>` opened with `showModal`, so the page
 * behind is inert and focus stays in without a trap of ours, and Escape is a `cancel` event we
 * turn into a close request. Focus moves to the `[data-autofocus]` element, else the first field,
 * else the panel, and returns to whatever opened the dialog; the page does not scroll behind it.
 * Where `showModal` is missing (older browsers, jsdom) the dialog opens in place and Escape is
 * heard on the dialog itself. Mounted while open: the caller renders it only then.
 */
export function ModalDialog({
  onRequestClose,
  onClosedByBrowser,
  panelRef,
  labelledBy,
  describedBy,
  className,
  children,
}: ModalDialogProps) {
  const dialogRef = useRef<HTMLDialogElement>(null);
  const requestClose = useRef(onRequestClose);
  requestClose.current = onRequestClose;
  const closedByBrowser = useRef(onClosedByBrowser ?? onRequestClose);
  closedByBrowser.current = onClosedByBrowser ?? onRequestClose;
  const closingRef = useRef(false);

  useEffect(() => {
    const dialog = dialogRef.current;
    if (!dialog) return;
    const opener = document.activeElement as HTMLElement | null;
    closingRef.current = false;
    if (typeof dialog.showModal === "function") dialog.showModal();
    else dialog.setAttribute("open", "");
    const panel = panelRef.current;
    const first = panel?.querySelector<HTMLElement>("[data-autofocus]") ?? panel?.querySelector<HTMLElement>("input, select, textarea");
    (first ?? panel)?.focus();
    const { overflow } = document.body.style;
    document.body.style.overflow = "hidden";
    return () => {
      document.body.style.overflow = overflow;
      closingRef.current = true;
      if (dialog.open) {
        if (typeof dialog.close === "function") dialog.close();
        else dialog.removeAttribute("open");
      }
      opener?.focus?.();
    };
  }, [panelRef]);

  return createPortal(
    <dialog
      ref={dialogRef}
      aria-labelledby={labelledBy}
      aria-describedby={describedBy}
      onCancel={(event) => {
        // Escape (or another close request) in a modal dialog: we close through our caller
        event.preventDefault();
        requestClose.current();
      }}
      onKeyDown={(event) => {
        // only where the browser has no modal dialog, so no `cancel` event comes
        if (event.key === "Escape" && typeof dialogRef.current?.showModal !== "function") {
          event.stopPropagation();
          requestClose.current();
        }
      }}
      onMouseDown={(event) => {
        // the dialog covers the window around the panel: a press on it is a press beside the panel
        if (event.target === event.currentTarget) requestClose.current();
      }}
      onClose={() => {
        // the browser closed it on its own (a close request it would not let us refuse)
        if (!closingRef.current) closedByBrowser.current();
      }}
      className={className}
    >
      {children}
    </dialog>,
    document.body,
  );
}
