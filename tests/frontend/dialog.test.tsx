import { useState } from "react";
import { act, cleanup, fireEvent, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { Dialog } from "@frontend/components/ui/dialog";
import { ConfirmDialog } from "@frontend/components/ui/confirm-dialog";

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

/** A page with a button that opens a confirmation; `closes` counts the dialog's requests to close. */
function Page({ busy = false, onCloseRequest }: { busy?: boolean; onCloseRequest: () => void }) {
  const [open, setOpen] = useState(false);
  return (
    <>
      <button type="button" onClick={() => setOpen(true)}>
        Delete lot
      </button>
      <ConfirmDialog
        open={open}
        onClose={() => {
          onCloseRequest();
          setOpen(false);
        }}
        onConfirm={() => {}}
        title="Delete lot L-0412?"
        confirmLabel="Delete lot"
        pending={busy}
      >
        The lot&apos;s 120 measurements go with it.
      </ConfirmDialog>
    </>
  );
}

function openPage(busy = false) {
  const onCloseRequest = vi.fn();
  const utils = render(<Page busy={busy} onCloseRequest={onCloseRequest} />);
  const opener = screen.getByRole("button", { name: "Delete lot" });
  opener.focus();
  fireEvent.click(opener);
  const dialog = screen.getByRole("dialog", { name: "Delete lot L-0412?" });
  return { ...utils, opener, dialog, onCloseRequest };
}

describe("Dialog without showModal (jsdom, older browsers): opened in place", () => {
  it("opens named by its title, focus on the safe choice, and Escape closes it and gives focus back", () => {
    const { opener, dialog, onCloseRequest } = openPage();
    expect(dialog.tagName).toBe("DIALOG");
    expect(dialog.hasAttribute("open")).toBe(true);
    expect(document.activeElement).toBe(screen.getByRole("button", { name: "Cancel" }));
    fireEvent.keyDown(document.activeElement!, { key: "Escape" });
    expect(onCloseRequest).toHaveBeenCalledTimes(1);
    expect(screen.queryByRole("dialog")).toBeNull();
    expect(document.activeElement).toBe(opener);
  });

  it("closes on a press beside the panel and on its close button, not on a press inside", () => {
    const { dialog, onCloseRequest } = openPage();
    fireEvent.mouseDown(screen.getByText(/120 measurements/));
    expect(onCloseRequest).not.toHaveBeenCalled();
    fireEvent.mouseDown(dialog);
    expect(onCloseRequest).toHaveBeenCalledTimes(1);
    cleanup();

    const again = openPage();
    fireEvent.click(screen.getByRole("button", { name: "Close" }));
    expect(again.onCloseRequest).toHaveBeenCalledTimes(1);
  });

  it("stays open while busy", () => {
    const { dialog, onCloseRequest } = openPage(true);
    fireEvent.keyDown(dialog, { key: "Escape" });
    fireEvent.mouseDown(dialog);
    expect(onCloseRequest).not.toHaveBeenCalled();
    expect(screen.getByRole("dialog")).toBe(dialog);
  });
});

describe("Dialog with the browser's modal dialog", () => {
  // jsdom has no modal dialogs: the least of one, enough to see what the component asks of it
  const proto = HTMLDialogElement.prototype as Partial<HTMLDialogElement>;
  function withModal() {
    const showModal = vi.fn(function (this: HTMLDialogElement) {
      this.setAttribute("open", "");
    });
    const close = vi.fn(function (this: HTMLDialogElement) {
      this.removeAttribute("open");
      this.dispatchEvent(new Event("close"));
    });
    Object.assign(proto, { showModal, close });
    return { showModal, close };
  }
  afterEach(() => {
    delete proto.showModal;
    delete proto.close;
  });

  it("opens with showModal, leaves Escape to the browser's cancel event, and closes once", () => {
    const modal = withModal();
    const { opener, dialog, onCloseRequest } = openPage();
    expect(modal.showModal).toHaveBeenCalledTimes(1);
    // no key handling of ours: the browser turns Escape into `cancel`
    fireEvent.keyDown(dialog, { key: "Escape" });
    expect(onCloseRequest).not.toHaveBeenCalled();
    const cancel = new Event("cancel", { cancelable: true });
    act(() => {
      dialog.dispatchEvent(cancel);
    });
    expect(cancel.defaultPrevented).toBe(true);
    expect(onCloseRequest).toHaveBeenCalledTimes(1);
    expect(modal.close).toHaveBeenCalledTimes(1);
    expect(screen.queryByRole("dialog")).toBeNull();
    expect(document.activeElement).toBe(opener);
  });

  it("refuses the cancel while busy, and follows the browser when it closes the dialog itself", () => {
    withModal();
    const busy = openPage(true);
    const cancel = new Event("cancel", { cancelable: true });
    act(() => {
      busy.dialog.dispatchEvent(cancel);
    });
    expect(cancel.defaultPrevented).toBe(true);
    expect(busy.onCloseRequest).not.toHaveBeenCalled();
    cleanup();

    const idle = openPage();
    act(() => {
      (idle.dialog as HTMLDialogElement).close();
    });
    expect(idle.onCloseRequest).toHaveBeenCalledTimes(1);
    expect(screen.queryByRole("dialog")).toBeNull();
  });
});

describe("Dialog as a form", () => {
  it("submits body and footer as one form", () => {
    const onSubmit = vi.fn((e: { preventDefault: () => void }) => e.preventDefault());
    render(
      <Dialog
        open
        onClose={() => {}}
        title="Rename lot"
        onSubmit={onSubmit}
        formLabel="Rename lot"
        footer={<button type="submit">Save</button>}
      >
        <input aria-label="Lot name" defaultValue="L-0412" />
      </Dialog>,
    );
    expect(document.activeElement).toBe(screen.getByLabelText("Lot name"));
    fireEvent.click(screen.getByRole("button", { name: "Save" }));
    expect(onSubmit).toHaveBeenCalledTimes(1);
  });
});
