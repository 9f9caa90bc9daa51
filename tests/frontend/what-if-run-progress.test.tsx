/** A what-if run's progress bar: the cancel button only for someone who may run what-if runs, and what it calls. */
import { cleanup, fireEvent, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { RunCancelled, RunProgress } from "@frontend/features/what-if/components/run-progress";

afterEach(cleanup);

describe("RunProgress", () => {
  it("offers Cancel while the run goes, and calls back once per click", () => {
    const onCancel = vi.fn();
    render(<RunProgress label="Sweep" status="running" done={30_000} total={120_000} onCancel={onCancel} />);
    expect(screen.getByRole("progressbar", { name: "Sweep progress" }).getAttribute("aria-valuenow")).toBe("30000");
    expect(screen.getByText("25 %")).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "Cancel sweep" }));
    expect(onCancel).toHaveBeenCalledOnce();
  });

  it("a queued run can be cancelled too; without the right there is no button", () => {
    const onCancel = vi.fn();
    const { rerender } = render(<RunProgress label="Allocation" status="queued" done={0} total={70_000} onCancel={onCancel} />);
    expect(screen.getByText("Waiting in the queue")).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "Cancel allocation" }));
    expect(onCancel).toHaveBeenCalledOnce();
    rerender(<RunProgress label="Allocation" status="queued" done={0} total={70_000} />);
    expect(screen.queryByRole("button")).toBeNull();
  });

  it("while the cancel is on its way the button is busy and does not call again", () => {
    const onCancel = vi.fn();
    render(<RunProgress label="Sweep" status="running" done={1} total={2} onCancel={onCancel} cancelling />);
    const button = screen.getByRole("button", { name: /Cancel sweep/ });
    fireEvent.click(button);
    expect(onCancel).not.toHaveBeenCalled();
  });

  it("a cancelled run says how far it got", () => {
    render(<RunCancelled what="sweep" done={45_000} total={120_000} />);
    expect(screen.getByText(/This sweep was cancelled after 45,000 of 120,000 trials/)).toBeTruthy();
  });
});
