/**
 * Results that cannot be misread (issue 14, item 5): signed axis ticks, shares down to
 * "< 0.1 %", Monte Carlo contributors limited to shares told apart from zero, each with an
 * interval, and what a calibration corrects said in words.
 */
import { cleanup, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import type { ResultFile } from "@shared/schemas/result-file";
import { formatShare, formatSignedTick } from "@shared/format";
import { ContributorsPanel } from "@frontend/features/studies/components/contributors-pareto";
import { axisWidthFor } from "@frontend/features/studies/components/chart-theme";
import { CalibrationNote } from "@frontend/features/studies/components/study-cautions";
import { mcShares } from "@shared/contributor-significance";
import { paretoRows } from "@frontend/features/studies/lib/pareto";

vi.setConfig({ testTimeout: 30_000 });
afterEach(cleanup);

type C = ResultFile["contributors"][number];
const source = (id: string, linear: number, src2: number) => ({
  source: id,
  linearShare: linear,
  linearContribution: linear,
  mcShare: src2,
  src2,
});
/** Shares of one metric; the SRC² sum to 0.9 = R², as an OLS fit with independent regressors gives. */
const contributors: C = {
  metric: "mag.crossAxisPct.xy",
  basis: "variance",
  nominal: 0,
  linearTotal: 1,
  mcDesign: "linear",
  mcR2: 0.9,
  sources: [
    source("mag.axis", 0.7, 0.62),
    source("mag.bondLine", 0.3, 0.279),
    source("pkg.yaw", 1e-7, 1e-6),
    source("board.bow", 0, 0.001),
  ],
};

describe("signed ticks and shares", () => {
  it("keeps the sign of a tick, with a true minus, and an axis wide enough for it", () => {
    expect(formatSignedTick(-0.125, "deg")).toBe("−0.125°");
    expect(formatSignedTick(0.25, "deg")).toBe("+0.250°");
    expect(formatSignedTick(0, "deg")).toBe("0°");
    expect(formatSignedTick(-1.5, "%")).toBe("−1.50 %");
    // 7 characters at 10.5 px: wider than the 34 px the envelope axis used to have
    expect(axisWidthFor(["−0.125°", "+0.125°"], 34)).toBeGreaterThan(50);
  });

  it("prints a small share as < 0.1 %, never as a row of zeros", () => {
    expect(formatShare(1e-7)).toBe("< 0.1 %");
    expect(formatShare(0.035)).toBe("3.5 %");
    expect(formatShare(0.42)).toBe("42 %");
  });
});

describe("Monte Carlo contributors", () => {
  it("gives each share an interval and keeps only those told apart from zero; a source with no sensitivity is left out", () => {
    const m = mcShares(contributors, 10_000, () => 1);
    // se of a standardised coefficient: √((1 − 0.9)/(10000 − 4 − 1)) = 0.003164; half-width 1.96·se = 0.0062
    const axis = m.get("mag.axis")!;
    expect(axis.significant).toBe(true);
    expect(axis.lo).toBeLessThan(axis.share);
    expect(axis.hi).toBeGreaterThan(axis.share);
    const half = 1.96 * Math.sqrt(0.1 / 9995);
    expect(axis.lo).toBeCloseTo((Math.sqrt(0.62) - half) ** 2, 9);
    // √1e-6 = 0.001 is inside the noise
    expect(m.get("pkg.yaw")!.significant).toBe(false);
    // zero linearised sensitivity: no entry at all, whatever the regression gave it
    expect(m.has("board.bow")).toBe(false);
    // a source of four draws has four coefficients: a wider interval
    const four = mcShares(contributors, 10_000, (id) => (id === "mag.bondLine" ? 4 : 1)).get("mag.bondLine")!;
    const one = m.get("mag.bondLine")!;
    expect(four.hi - four.lo).toBeGreaterThan(one.hi - one.lo);
    // fewer trials: wider intervals, and the small source stays out
    const few = mcShares(contributors, 200, () => 1);
    expect(few.get("mag.axis")!.hi - few.get("mag.axis")!.lo).toBeGreaterThan(axis.hi - axis.lo);
    const keep = new Set([...m.values()].filter((x) => x.significant).map((x) => x.source));
    expect(paretoRows(contributors, "mc", 0.5, keep).map((r) => r.source)).toEqual(["mag.axis", "mag.bondLine"]);
  });

  it("the panel shows intervals, says what R² means and prints small linear shares as < 0.1 %", () => {
    const result = {
      trials: 10_000,
      metrics: { "mag.crossAxisPct.xy": { unit: "%" } },
      contributors: [contributors],
      sources: contributors.sources.map((s) => ({
        id: s.source,
        unit: "deg",
        stage: "package",
        draws: 1,
        sigma: 0.1,
        halfWidth: 0.3,
        mean: 0,
      })),
    } as unknown as ResultFile;
    render(
      <ContributorsPanel result={result} metric="mag.crossAxisPct.xy" onMetric={() => undefined} kindOf={() => "mag"} elementOrder={[]} />,
    );
    expect(screen.getByText(/R² = 0\.90: the regression on the sources explains 90 %/)).toBeTruthy();
    // the linearised total with its unit as a symbol, never the file's unit word
    expect(screen.getByText(/√Σ = 1(\.0+)? %$/)).toBeTruthy();
    const table = screen.getByRole("table", { name: "Tolerance sources" });
    const yaw = within(table).getByText("pkg.yaw").closest("tr")!;
    expect(yaw.textContent).toContain("< 0.1 %");
    expect(yaw.textContent).toContain("not told from 0");
    expect(within(table).queryByText("board.bow")).toBeNull();
    const axis = within(table).getByText("mag.axis").closest("tr")!;
    expect(axis.textContent).toMatch(/62 %\s*\(\d+ % – \d+ %\)/);
    expect(table.textContent).not.toMatch(/0\.0000/);

    // an angle metric: degrees as a symbol, with milliradians, not the file's unit word
    cleanup();
    const angle = {
      ...result,
      metrics: { "accel~mag.relRotDeg": { unit: "deg" } },
      contributors: [{ ...contributors, metric: "accel~mag.relRotDeg", linearTotal: 0.25 }],
    } as unknown as ResultFile;
    render(
      <ContributorsPanel result={angle} metric="accel~mag.relRotDeg" onMetric={() => undefined} kindOf={() => "mag"} elementOrder={[]} />,
    );
    const note = screen.getByText(/√Σ = /).textContent ?? "";
    expect(note).toMatch(/√Σ = 0\.250° \(4\.36 mrad\)/);
    expect(note).not.toMatch(/\bdeg\b/);
  });
});

describe("calibration in words", () => {
  it("says what a calibration corrects and what it leaves", () => {
    render(<CalibrationNote after="package" />);
    const text = screen.getByTestId("calibration-note").textContent ?? "";
    expect(text).toMatch(/corrects the cross-axis terms .* compass heading/);
    expect(text).toMatch(/geometric tilt of each die and the relative rotation between dies stay as built/);
    cleanup();
    render(<CalibrationNote after="none" />);
    expect(screen.getByTestId("calibration-note").textContent).toMatch(/No calibration/);
  });
});
