/** The allocation's table and form: cost change per source and in total, the draft button only for a verified proposal, what the form sends. */
import { cleanup, fireEvent, render, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import type { Allocation } from "@shared/schemas/what-if";
import { AllocationResult } from "@frontend/features/what-if/components/allocation-result";
import { AllocationForm } from "@frontend/features/what-if/components/allocation-form";

afterEach(cleanup);
const ID = "0b6f2c1e-8a55-4d7e-9a51-3f0c6f1d2e77";
const cost = { a: 0.1, b: 0.05, k: 2 };
const c = (T: number) => cost.a + cost.b / T ** cost.k;
const source = (name: string, current: number, proposed: number) => ({
  source: name,
  unit: "deg" as const,
  free: true,
  current,
  proposed,
  costCurrent: c(current),
  costProposed: c(proposed),
  cost,
  min: current / 10,
  max: current * 3,
  atBound: null,
  noInfluence: false,
});
const requirement = {
  metric: "heading.maxAbsDeg",
  max: 2,
  yield: 0.99,
  predictedYield: 0.9925,
  ci: [0.9906, 0.994] as [number, number],
  passes: true,
  demonstrated: true,
  limitAtTarget: 1.9,
  current: { predictedYield: 0.96, ci: [0.955, 0.965] as [number, number], passes: false, limitAtTarget: 2.4 },
};
function allocation(verified: boolean): Allocation {
  const sources = [source("mag.axis", 0.6, 0.47), source("gyro.axis", 0.5, 1.5)];
  return {
    id: ID,
    projectId: ID,
    revisionId: ID,
    revisionNumber: 1,
    status: "finished",
    progress: { done: 10, total: 10 },
    error: null,
    trials: 10_000,
    seed: 5,
    createdAt: "2026-12-02T10:00:00.000Z",
    finishedAt: "2026-12-02T10:01:00.000Z",
    verified,
    message: verified ? "Every requirement is shown." : "Not shown within 6 rounds.",
    method: "Lagrange",
    sources,
    requirements: [requirement],
    totalCostCurrent: sources.reduce((s, x) => s + x.costCurrent, 0),
    totalCostProposed: sources.reduce((s, x) => s + x.costProposed, 0),
    rounds: [],
    appliedRevisionId: null,
  };
}

describe("AllocationResult", () => {
  it("shows what each change costs or saves and the total, and makes a draft on request", () => {
    const onApply = vi.fn();
    render(<AllocationResult allocation={allocation(true)} canApply applying={false} onApply={onApply} />);
    const rows = within(screen.getByRole("table", { name: "Current and proposed tolerances" })).getAllByRole("row");
    // mag.axis tightened 0.6 → 0.47: costs (0.05/0.47² − 0.05/0.6²) more
    expect(rows[1].textContent).toContain(`+${(c(0.47) - c(0.6)).toFixed(3)}`);
    // gyro.axis loosened 0.5 → 1.5: saves
    expect(rows[2].textContent).toContain(`−${(c(0.5) - c(1.5)).toFixed(3)}`);
    const total = c(0.47) + c(1.5) - c(0.6) - c(0.5);
    expect(screen.getByTestId("cost-change").textContent).toBe(`−${Math.abs(total).toFixed(3)} (saves)`);
    expect(screen.getByText("yes, by the interval's lower end")).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "Create a draft from this" }));
    expect(onApply).toHaveBeenCalledOnce();
  });

  it("offers no draft from a proposal that was not verified, nor to a role that may not write", () => {
    render(<AllocationResult allocation={allocation(false)} canApply applying={false} onApply={() => undefined} />);
    expect(screen.queryByRole("button", { name: "Create a draft from this" })).toBeNull();
    expect(screen.getByText("Not verified")).toBeTruthy();
    cleanup();
    render(<AllocationResult allocation={allocation(true)} canApply={false} applying={false} onApply={() => undefined} />);
    expect(screen.queryByRole("button", { name: "Create a draft from this" })).toBeNull();
  });
});

describe("AllocationForm", () => {
  const stack = JSON.parse(readFileSync(join(process.cwd(), "tests/fixtures/stack-reference.json"), "utf8"));
  it("starts from the per-kind defaults and sends only the free sources with their costs and bounds", async () => {
    const onSubmit = vi.fn();
    render(<AllocationForm stack={stack} defaultTrials="20000" pending={false} onSubmit={onSubmit} />);
    // the axis kind: a = 0.1, b = 0.05, k = 2; bounds a tenth to three times today's 0.6°
    expect((screen.getByLabelText("mag.axis k") as HTMLInputElement).value).toBe("2");
    expect((screen.getByLabelText("mag.axis highest") as HTMLInputElement).value).toBe("1.8");
    fireEvent.click(screen.getByLabelText("board.bow free"));
    fireEvent.change(screen.getByLabelText("mag.axis b"), { target: { value: "0.2" } });
    fireEvent.click(screen.getByRole("button", { name: "Find the least-cost tolerances" }));
    await waitFor(() => expect(onSubmit).toHaveBeenCalledOnce());
    const [body, trials] = onSubmit.mock.calls[0];
    expect(trials).toBe(20000);
    expect(body.free).not.toContain("board.bow");
    expect(body.free).toContain("mag.axis");
    expect(body.costs["mag.axis"]).toEqual({ a: 0.1, b: 0.2, k: 2 });
    expect(body.bounds["mag.axis"]).toEqual({ min: 0.06, max: 1.8 });
  });

  it("asks for at least 1,000 trials per verifying run, under that field", async () => {
    const onSubmit = vi.fn();
    render(<AllocationForm stack={stack} defaultTrials="20000" pending={false} onSubmit={onSubmit} />);
    const trials = screen.getByLabelText("Trials per verifying run");
    fireEvent.change(trials, { target: { value: "1,500" } });
    fireEvent.click(screen.getByRole("button", { name: "Find the least-cost tolerances" }));
    const message = await screen.findByText("Trials must be a whole number of at least 1,000");
    expect(trials.getAttribute("aria-describedby")).toBe(message.id);
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it("refuses a lower bound above the upper one, naming the source", async () => {
    const onSubmit = vi.fn();
    render(<AllocationForm stack={stack} defaultTrials="20000" pending={false} onSubmit={onSubmit} />);
    fireEvent.change(screen.getByLabelText("mag.axis lowest"), { target: { value: "2" } });
    fireEvent.click(screen.getByRole("button", { name: "Find the least-cost tolerances" }));
    expect(await screen.findByText(/^mag\.axis:/)).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
  });
});
