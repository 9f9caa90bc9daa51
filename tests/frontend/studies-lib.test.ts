import { describe, expect, it } from "vitest";
import type { MetricStats, ResultFile } from "@shared/schemas/result-file";
import { crossAxisMatrix, crossAxisSensors, heat } from "@frontend/features/studies/lib/cross-axis";
import { changeTone, relativeChange, requirementComparison, settingRows, sourceChanges } from "@frontend/features/studies/lib/compare";
import { yieldRows, lateDrift } from "@frontend/features/studies/lib/convergence";
import { envelopeByTilt, niceCeil, tiltLabel } from "@frontend/features/studies/lib/envelope";
import { histogramRows, niceTicks } from "@frontend/features/studies/lib/histogram";
import { groupMetrics, metricLabel, parseMetric } from "@shared/metrics";
import { paretoRows, sourcesToReach } from "@frontend/features/studies/lib/pareto";
import { estimateSeconds, progressView, recentPace } from "@frontend/features/studies/lib/progress";
import { formatDuration, formatPpm, formatValue, formatYield, formatYieldRange } from "@shared/format";

const stats = (p: Partial<MetricStats> & { v?: number }): MetricStats => {
  const v = p.v ?? 1;
  return {
    mean: 0,
    std: v / 3,
    p50: v / 2,
    p95: v,
    p99: v * 1.2,
    p9973: v * 1.4,
    max: v * 2,
    unit: "%",
    signed: true,
    minValue: -2 * v,
    maxValue: 2 * v,
    interval95: [-v, v],
    shortest95: [-v, v],
    ...p,
  } as MetricStats;
};

describe("cross-axis matrix from the per-term metrics", () => {
  // S_ij at p95 equal to 10·i + j, so each cell can be traced back to its metric id.
  const terms = { xy: 12, xz: 13, yx: 21, yz: 23, zx: 31, zy: 32 };
  const metrics: Record<string, MetricStats> = {
    "heading.maxAbsDeg": stats({ unit: "deg", signed: false }),
    "accel.tiltDeg": stats({ unit: "deg", signed: false }),
  };
  for (const [ij, v] of Object.entries(terms)) {
    metrics[`mag.crossAxisPct.${ij}`] = stats({ v });
    metrics[`accel.crossAxisPct.${ij}`] = stats({ v: v / 10 });
  }
  metrics["mag.axisMisalignDeg.x"] = stats({ v: 0.4, unit: "deg", signed: false });
  metrics["mag.axisMisalignDeg.y"] = stats({ v: 0.5, unit: "deg", signed: false });
  // z misalignment missing on purpose

  it("puts S_ij in row i, column j, leaves the diagonal to the misalignment", () => {
    const m = crossAxisMatrix(metrics, "mag", "p95");
    expect(m.cells).toEqual([
      [null, 12, 13],
      [21, null, 23],
      [31, 32, null],
    ]);
    expect(m.misalignDeg).toEqual([0.4, 0.5, null]);
    expect(m.max).toBe(32);
  });

  it("reads the chosen percentile", () => {
    const m = crossAxisMatrix(metrics, "mag", "p9973");
    expect(m.cells[0][1]).toBeCloseTo(12 * 1.4, 12);
    expect(m.cells[2][1]).toBeCloseTo(32 * 1.4, 12);
    expect(crossAxisMatrix(metrics, "mag", "p50").cells[1][0]).toBe(10.5);
  });

  it("finds the sensors in stack order and shades against the largest cell of any of them", () => {
    expect(crossAxisSensors(metrics, ["board", "accel", "mag"])).toEqual(["accel", "mag"]);
    expect(crossAxisSensors(metrics, ["board", "mag", "accel"])).toEqual(["mag", "accel"]);
    expect(heat(16, 32)).toBe(0.5);
    expect(heat(null, 32)).toBe(0);
    expect(heat(40, 32)).toBe(1);
    expect(heat(3, 0)).toBe(0);
  });

  it("gives empty cells for a sensor without cross-axis metrics", () => {
    const m = crossAxisMatrix(metrics, "gyro", "p95");
    expect(m.cells.flat().every((c) => c === null)).toBe(true);
    expect(m.max).toBe(0);
  });
});

describe("progress: pace and time left", () => {
  const running = {
    status: "running" as const,
    startedAt: "2026-01-05T10:00:00.000Z",
    progress: { done: 250_000, total: 1_000_000, trialsPerSecond: 12_500 },
  };

  it("time left is the trials still to run at the current pace", () => {
    const v = progressView(running, Date.parse("2026-01-05T10:00:20.000Z"));
    expect(v.fraction).toBe(0.25);
    expect(v.secondsLeft).toBe(60); // 750,000 / 12,500
    expect(v.elapsed).toBe(20);
    expect(formatDuration(v.secondsLeft)).toBe("1 min 00 s");
  });

  it("no estimate while queued or before the first pace", () => {
    expect(progressView({ ...running, status: "queued", startedAt: null }).secondsLeft).toBeNull();
    expect(progressView({ ...running, progress: { done: 0, total: 10, trialsPerSecond: null } }).secondsLeft).toBeNull();
    expect(progressView({ ...running, progress: { done: 0, total: 0, trialsPerSecond: null } }).fraction).toBe(0);
  });

  it("never goes below zero or past the end", () => {
    const v = progressView({ ...running, progress: { done: 1_000_500, total: 1_000_000, trialsPerSecond: 10 } });
    expect(v.fraction).toBe(1);
    expect(v.secondsLeft).toBe(0);
  });

  it("estimates a new study from its work (trials × attitudes) at the measured work pace", () => {
    // 10^6 trials × 180 attitudes at 2·10^6 trial-attitudes per second
    expect(estimateSeconds(1_000_000 * 180, 2_000_000)).toBe(90);
    // the same trials at a 0.1° step (18,000 attitudes) take a hundred times as long
    expect(estimateSeconds(1_000_000 * 18_000, 2_000_000)).toBe(9_000);
    expect(estimateSeconds(1_000_000, null)).toBeNull();
    expect(estimateSeconds(0, 2_000_000)).toBeNull();
  });
});

type Contributors = ResultFile["contributors"][number];
const contributors = (shares: [string, number, number | null][]): Contributors => ({
  metric: "heading.maxAbsDeg",
  basis: "meanSquare",
  nominal: 0,
  linearTotal: 1,
  mcDesign: "squared",
  mcR2: 0.4,
  sources: shares.map(([source, linearShare, mcShare]) => ({
    source,
    linearShare,
    linearContribution: linearShare,
    mcShare,
    src2: mcShare,
  })),
});

describe("Pareto of contributors", () => {
  const c = contributors([
    ["mag.axis", 0.4, 0.2],
    ["mag.bondLine", 0.3, 0.5],
    ["accel.axis", 0.2, 0.25],
    ["pkg.yaw", 0.1, 0.05],
    ["board.bow", 0, 0],
  ]);

  it("ranks by share and runs the cumulative total up to 100 %", () => {
    const rows = paretoRows(c, "linear");
    expect(rows.map((r) => r.source)).toEqual(["mag.axis", "mag.bondLine", "accel.axis", "pkg.yaw"]);
    expect(rows.map((r) => r.share)).toEqual([40, 30, 20, 10]);
    expect(rows.map((r) => r.cumulative)).toEqual([40, 70, 90, 100]);
    expect(rows[0].otherShare).toBe(20);
  });

  it("ranks the Monte Carlo shares on their own", () => {
    const rows = paretoRows(c, "mc");
    expect(rows.map((r) => r.source)).toEqual(["mag.bondLine", "accel.axis", "mag.axis", "pkg.yaw"]);
    expect(rows[rows.length - 1].cumulative).toBeCloseTo(100, 12);
  });

  it("folds sources below the threshold into one bar and counts them", () => {
    const many = contributors([
      ["a", 0.9, null],
      ["b", 0.06, null],
      ["c", 0.03, null],
      ["d", 0.004, null],
      ["e", 0.003, null],
      ["f", 0.003, null],
    ]);
    const rows = paretoRows(many, "linear", 0.5);
    expect(rows.map((r) => r.source)).toEqual(["a", "b", "c", "3 others"]);
    expect(rows[3].count).toBe(3);
    expect(rows[3].share).toBeCloseTo(1, 12);
    expect(rows[3].cumulative).toBeCloseTo(100, 12);
    expect(sourcesToReach(rows, 80)).toBe(1);
    expect(sourcesToReach(rows, 99)).toBe(3);
    expect(sourcesToReach(rows, 100)).toBe(6);
  });

  it("has no Monte Carlo Pareto when the regression did not run", () => {
    expect(paretoRows(contributors([["a", 1, null]]), "mc")).toEqual([]);
  });
});

describe("formatting", () => {
  it("writes angles in degrees with milliradians beside", () => {
    expect(formatValue(1, "deg")).toBe("1.00° (17.5 mrad)");
    expect(formatValue(0.0573, "deg")).toBe("0.0573° (1.00 mrad)");
    expect(formatValue(1.75, "%")).toBe("1.75 %");
  });
  it("gives yields enough digits to tell them from 100 %", () => {
    expect(formatYield(0.92094)).toBe("92.09 %");
    expect(formatYield(0.9973)).toBe("99.73 %");
    expect(formatYield(0.99891)).toBe("99.89 %"); // 0.11 % out
    expect(formatYieldRange(0.998757, 0.999047)).toBe("99.876 – 99.905 %");
    expect(formatYield(0.9999912)).toBe("99.99912 %");
    expect(formatYield(1)).toBe("100.00 %");
    expect(formatPpm(79060.00000001)).toBe("79,060 ppm");
    expect(formatPpm(2.5)).toBe("2.5 ppm");
  });
  it("writes durations as a person would", () => {
    expect(formatDuration(0.4)).toBe("< 1 s");
    expect(formatDuration(42.4)).toBe("42 s");
    expect(formatDuration(185)).toBe("3 min 05 s");
    expect(formatDuration(4380)).toBe("1 h 13 min");
    expect(formatDuration(null)).toBe("—");
  });
});

describe("metric ids", () => {
  it("reads each kind back", () => {
    expect(parseMetric("mag.crossAxisPct.xy")).toMatchObject({ kind: "crossAxis", element: "mag", axis: "xy" });
    expect(parseMetric("accel~mag.relRotDeg")).toMatchObject({ kind: "relRot", element: "accel", other: "mag" });
    expect(parseMetric("pkg.tiltDeg")).toMatchObject({ kind: "tilt", element: "pkg" });
    expect(metricLabel("mag.crossAxisTotalPct.x")).toBe("mag cross-axis total, x");
    expect(metricLabel("gyro.crossAxisPct.zy")).toBe("gyro cross-axis z←y");
  });
  it("groups heading first, then sensors in stack order, then relative rotations and tilts", () => {
    const groups = groupMetrics(
      ["pkg.tiltDeg", "mag.crossAxisPct.xy", "accel~mag.relRotDeg", "accel.crossAxisTotalPct.x", "heading.rmsDeg", "heading.maxAbsDeg"],
      ["board", "pkg", "accel", "mag"],
    );
    expect(groups.map((g) => g.label)).toEqual(["Heading", "accel", "mag", "Relative rotation", "Tilt"]);
    expect(groups[0].ids).toEqual(["heading.maxAbsDeg", "heading.rmsDeg"]);
  });
});

describe("envelope and histogram data", () => {
  it("splits the envelope by tilt and closes each turn at 360°", () => {
    const points = [0, 1].flatMap((t) =>
      [0, 120, 240].map((h) => ({ pitchDeg: t * 30, rollDeg: 0, headingDeg: h, p5: -1 - t, p50: 0, p95: 1 + t, min: -2, max: 2 })),
    );
    const series = envelopeByTilt({ inclinationDeg: 60, accel: "accel", mag: "mag", points });
    expect(series.map((s) => s.label)).toEqual(["Level", "Pitch +30°"]);
    expect(series[1].rows.map((r) => r.headingDeg)).toEqual([0, 120, 240, 360]);
    expect(series[1].rows[3].band).toEqual([-2, 2]);
    expect(tiltLabel(-30, 15)).toBe("Pitch −30°, roll +15°");
    expect(niceCeil(1.7)).toBe(2);
    expect(niceCeil(2.3)).toBe(2.5);
    expect(niceCeil(0.083)).toBe(0.1);
  });

  it("marks the bins past the limit and the one the limit cuts", () => {
    const rows = histogramRows({ abs: true, edges: [0, 1, 2, 3, 4], counts: [10, 20, 60, 10] }, 2.5);
    expect(rows.map((r) => r.x)).toEqual([0.5, 1.5, 2.5, 3.5]);
    expect(rows.map((r) => r.beyond)).toEqual([false, false, false, true]);
    expect(rows.map((r) => r.straddles)).toEqual([false, false, true, false]);
    expect(rows[2].pct).toBe(60);
    const signed = histogramRows({ abs: false, edges: [-4, -2, 0, 2, 4], counts: [1, 1, 1, 1] }, 2);
    expect(signed.map((r) => r.beyond)).toEqual([true, false, false, true]);
  });
});

describe("convergence rows", () => {
  it("puts the Wilson interval around each checkpoint's yield, narrowing with trials", () => {
    const pt = (trials: number, y: number) => ({ trials, mean: 0, std: 0, p95: 0, p99: 0, p9973: 0, pAtCoverage: 1, yield: y });
    const rows = yieldRows({ metric: "m", p: 0.99, points: [pt(4096, 0.92), pt(65536, 0.921)] });
    expect(rows[0].band[0]).toBeLessThan(92);
    expect(rows[0].band[1]).toBeGreaterThan(92);
    expect(rows[1].band[1] - rows[1].band[0]).toBeLessThan(rows[0].band[1] - rows[0].band[0]);
    expect(
      lateDrift([
        { trials: 1, value: 1 },
        { trials: 2, value: 2 },
        { trials: 4, value: 2.1 },
        { trials: 8, value: 2 },
      ]),
    ).toBeCloseTo(5, 9);
  });
});

describe("comparing two results", () => {
  const req = (metric: string, predictedYield: number, ci: [number, number], passes: boolean) => ({
    metric,
    max: 2,
    yield: 0.99,
    predictedYield,
    ci,
    ppmOut: (1 - predictedYield) * 1e6,
    passes,
    demonstrated: passes,
    limitAtTarget: 1,
  });
  const base = { sources: [] as ResultFile["sources"] } as unknown as ResultFile;
  const a = {
    ...base,
    requirements: [req("heading.maxAbsDeg", 0.95, [0.94, 0.96], false), req("mag.tiltDeg", 0.995, [0.993, 0.997], true)],
  } as ResultFile;
  const b = {
    ...base,
    requirements: [req("heading.maxAbsDeg", 0.992, [0.991, 0.993], true), req("mag.tiltDeg", 0.996, [0.994, 0.998], true)],
  } as ResultFile;

  it("calls a yield change significant only when the intervals part", () => {
    const rows = requirementComparison(a, b);
    expect(rows[0].deltaPoints).toBeCloseTo(4.2, 9);
    expect(rows[0].significant).toBe(true);
    expect(rows[0].verdictChanged).toBe(true);
    expect(rows[1].significant).toBe(false);
    expect(rows[1].verdictChanged).toBe(false);
  });

  it("lower is better: a 10 % drop is better, a 2 % rise is no change", () => {
    expect(relativeChange(2, 1.8)).toBeCloseTo(-10, 9);
    expect(changeTone(relativeChange(2, 1.8))).toBe("better");
    expect(changeTone(relativeChange(2, 2.04))).toBe("same");
    expect(changeTone(relativeChange(2, 2.2))).toBe("worse");
    expect(relativeChange(0, 1)).toBeNull();
  });

  it("lists only the tolerances that changed", () => {
    const src = (id: string, halfWidth: number) => ({
      id,
      unit: "um" as const,
      stage: "package",
      draws: 4,
      sigma: halfWidth / 3,
      halfWidth,
      mean: 0,
    });
    const ra = { ...base, sources: [src("mag.bondLine", 3), src("pkg.bow", 8)] } as ResultFile;
    const rb = { ...base, sources: [src("mag.bondLine", 1.5), src("pkg.bow", 8), src("mag.x", 20)] } as ResultFile;
    expect(sourceChanges(ra, rb).map((c) => c.id)).toEqual(["mag.bondLine", "mag.x"]);
  });

  it("marks the settings that differ", () => {
    const s = { format: "orthostack.study/1" as const, trials: 1000, seed: 7, inclinationDeg: 60 };
    const rows = settingRows(
      { study: s, site: null, revisionNumber: 1 },
      { study: { ...s, calibration: { after: "board" } }, site: null, revisionNumber: 2 },
    );
    expect(rows.filter((r) => r.differs).map((r) => r.label)).toEqual(["Stack revision", "Calibration"]);
  });

  it("an as-built study of the same dip typed in shows no site difference; another dip does", () => {
    const s = { format: "orthostack.study/1" as const, trials: 1000, seed: 7, inclinationDeg: 64.25 };
    const site = {
      site: { latitudeDeg: 48.1, longitudeDeg: 11.6, altitudeKm: 0.5, date: "2026-06-01" },
      model: "WMM2025",
      inclinationDeg: 64.25,
      declinationDeg: 4,
      totalIntensityNt: 48000,
    } as never;
    const same = settingRows({ study: s, site, revisionNumber: 1 }, { study: s, site: null, revisionNumber: 1 });
    expect(same.filter((r) => r.differs).map((r) => r.label)).toEqual([]);
    const other = settingRows(
      { study: s, site, revisionNumber: 1 },
      { study: { ...s, inclinationDeg: 60 }, site: null, revisionNumber: 1 },
    );
    expect(other.filter((r) => r.differs).map((r) => r.label)).toEqual(["Field dip", "Site"]);
  });
});

describe("recent pace", () => {
  it("reads the pace of the last seconds, not the run's average with its start-up", () => {
    // 8 s of start-up with nothing done, then 12,000 trials a second.
    const samples = [
      { at: 0, done: 0 },
      { at: 8_000, done: 0 },
      { at: 9_000, done: 12_000 },
      { at: 10_000, done: 24_000 },
      { at: 11_000, done: 36_000 },
    ];
    expect(recentPace(samples, 11_000, 3_000)).toBe(12_000);
    const average = 36_000 / 11; // what the queue reports
    const withRecent = progressView(
      { status: "running", startedAt: null, progress: { done: 36_000, total: 1_000_000, trialsPerSecond: average } },
      11_000,
      recentPace(samples, 11_000, 3_000),
    );
    expect(withRecent.secondsLeft).toBeCloseTo(964_000 / 12_000, 9);
  });
  it("says nothing until the samples span two seconds and show progress", () => {
    expect(
      recentPace(
        [
          { at: 0, done: 0 },
          { at: 1_000, done: 5_000 },
        ],
        1_000,
      ),
    ).toBeNull();
    expect(
      recentPace(
        [
          { at: 0, done: 5_000 },
          { at: 3_000, done: 5_000 },
        ],
        3_000,
      ),
    ).toBeNull();
    expect(
      recentPace(
        [
          { at: 0, done: 0 },
          { at: 30_000, done: 5_000 },
        ],
        30_000,
      ),
    ).toBeNull(); // the first sample is too old
  });
});

describe("histogram axis ticks", () => {
  it("round steps inside the range", () => {
    expect(niceTicks(0, 4.24)).toEqual([0, 1, 2, 3, 4]);
    expect(niceTicks(-3.3, 3.4)).toEqual([-2, 0, 2]);
    expect(niceTicks(0, 0.733)).toEqual([0, 0.2, 0.4, 0.6]);
  });
});
