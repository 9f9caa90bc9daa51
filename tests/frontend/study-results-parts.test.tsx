import { cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import type { MetricStats, ResultFile } from "@shared/schemas/result-file";
import { CrossAxisTables } from "@frontend/features/studies/components/cross-axis-tables";
import { RequirementCards } from "@frontend/features/studies/components/requirement-cards";
import { StudyProgress } from "@frontend/features/studies/components/study-progress";

afterEach(cleanup);

describe("StudyProgress", () => {
  it("shows trials done, the pace, the time left, and cancels", () => {
    const onCancel = vi.fn();
    render(
      <StudyProgress
        study={{
          number: 4,
          status: "running",
          startedAt: new Date(Date.now() - 30_000).toISOString(),
          progress: { done: 360_000, total: 1_000_000, trialsPerSecond: 12_000 },
        }}
        onCancel={onCancel}
      />,
    );
    const bar = screen.getByRole("progressbar", { name: "Study 4 progress" });
    expect(bar.getAttribute("aria-valuenow")).toBe("360000");
    expect(bar.getAttribute("aria-valuemax")).toBe("1000000");
    expect(screen.getByText("Running: 360,000 of 1,000,000 trials")).toBeTruthy();
    expect(screen.getByText("36.0 %")).toBeTruthy();
    expect(screen.getByText("12,000 trials/s")).toBeTruthy();
    // 640,000 left at 12,000 a second
    expect(screen.getByText("about 53 s")).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "Cancel study" }));
    expect(onCancel).toHaveBeenCalledOnce();
  });

  it("a queued study waits without a time", () => {
    render(
      <StudyProgress
        study={{ number: 5, status: "queued", startedAt: null, progress: { done: 0, total: 20_000, trialsPerSecond: null } }}
      />,
    );
    expect(screen.getByText("Waiting in the queue")).toBeTruthy();
    expect(screen.getByRole("progressbar").getAttribute("aria-valuetext")).toBe("queued");
    expect(screen.queryByRole("button", { name: "Cancel study" })).toBeNull();
  });
});

const req = (metric: string, predictedYield: number, ci: [number, number], yieldTarget: number) => ({
  metric,
  max: 2,
  yield: yieldTarget,
  predictedYield,
  ci,
  ppmOut: (1 - predictedYield) * 1e6,
  passes: predictedYield >= yieldTarget,
  demonstrated: ci[0] >= yieldTarget,
  limitAtTarget: 2.54,
});
const stats = (unit: "deg" | "%", v = 1): MetricStats =>
  ({
    mean: 0,
    std: 1,
    p50: v / 2,
    p95: v,
    p99: v,
    p9973: v,
    max: v,
    unit,
    signed: unit === "%",
    minValue: -v,
    maxValue: v,
    interval95: [-v, v],
    shortest95: [-v, v],
  }) as MetricStats;

describe("RequirementCards", () => {
  const result = {
    trials: 200_000,
    requirements: [
      req("heading.maxAbsDeg", 0.92094, [0.91975, 0.92211], 0.99),
      req("gyro.crossAxisTotalPct.x", 0.99891, [0.99876, 0.99905], 0.9973),
    ],
    metrics: { "heading.maxAbsDeg": stats("deg"), "gyro.crossAxisTotalPct.x": stats("%") },
  } as unknown as ResultFile;

  it("shows pass or fail, the predicted yield with its interval and the ppm out", () => {
    const onSelect = vi.fn();
    render(<RequirementCards result={result} selected="heading.maxAbsDeg" onSelect={onSelect} />);
    const fail = screen.getByRole("button", { name: "Heading error, max over the sweep: fail" });
    expect(within(fail).getByText("Fail")).toBeTruthy();
    expect(within(fail).getByText("92.09 %")).toBeTruthy();
    expect(within(fail).getByText("91.97 – 92.21 %")).toBeTruthy();
    expect(within(fail).getByText("79,060 ppm")).toBeTruthy();
    expect(within(fail).getByText("10,000 ppm")).toBeTruthy();
    expect(within(fail).getByText("Misses the target beyond sampling error")).toBeTruthy();
    expect(fail.getAttribute("aria-pressed")).toBe("true");

    const pass = screen.getByRole("button", { name: "gyro cross-axis total, x: pass" });
    expect(within(pass).getByText("Pass")).toBeTruthy();
    expect(within(pass).getByText("99.876 – 99.905 %")).toBeTruthy();
    expect(within(pass).getByText(/Demonstrated/)).toBeTruthy();
    fireEvent.click(pass);
    expect(onSelect).toHaveBeenCalledWith("gyro.crossAxisTotalPct.x");
  });
});

describe("CrossAxisTables", () => {
  it("builds each sensor's 3×3 table at the chosen percentile, with the misalignment on the diagonal", () => {
    const metrics: Record<string, MetricStats> = {};
    for (const ij of ["xy", "xz", "yx", "yz", "zx", "zy"]) {
      metrics[`mag.crossAxisPct.${ij}`] = { ...stats("%"), p95: ij === "xy" ? 2.1 : 1, p9973: ij === "xy" ? 3.3 : 1.5 };
    }
    for (const i of ["x", "y", "z"]) metrics[`mag.axisMisalignDeg.${i}`] = { ...stats("deg"), p9973: 1.25 };
    render(<CrossAxisTables result={{ metrics } as unknown as ResultFile} kindOf={() => "mag"} elementOrder={["mag"]} />);

    const table = screen.getByRole("table", { name: "mag cross-axis at p99.73" });
    const rows = within(table).getAllByRole("row");
    expect(rows).toHaveLength(4);
    const cells = (r: number) =>
      within(rows[r])
        .getAllByRole("cell")
        .map((c) => c.textContent);
    expect(cells(1)).toEqual(["—∠ 1.3°", "3.30%", "1.50%"]);
    fireEvent.click(screen.getByRole("radio", { name: "p95" }));
    const at95 = screen.getByRole("table", { name: "mag cross-axis at p95" });
    expect(within(within(at95).getAllByRole("row")[1]).getAllByRole("cell")[1].textContent).toBe("2.10%");
  });
});
