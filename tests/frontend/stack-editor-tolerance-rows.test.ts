import { describe, expect, it } from "vitest";
import { compileModel } from "@shared/engine/model";
import { runStudy } from "@shared/engine/study";
import type { StackFile } from "@shared/schemas/stack-file";
import reference from "../fixtures/stack-reference.json" with { type: "json" };
import demoDraft from "../../backend/demo/ridgeline-stack-draft.json" with { type: "json" };
import { estimate, liveStudy, LIVE_INCLINATION_DEG, LIVE_TRIALS, summarize } from "@frontend/features/stack-editor/lib/live-estimate";
import { metricUnit } from "@shared/metrics";
import { metricOptions } from "@frontend/features/stack-editor/lib/metrics";
import { setAt } from "@frontend/features/stack-editor/lib/stack-ops";
import { filterRows, sigmaOf, sortRows, toleranceRows } from "@frontend/features/stack-editor/lib/tolerance-rows";

const stack = reference as unknown as StackFile;
const STUDY = { format: "orthostack.study/1" as const, trials: 1, seed: 1, inclinationDeg: 60 };

describe("the tolerance table's rows", () => {
  it("has one row per source, named and staged exactly as the engine names and stages them", () => {
    for (const s of [stack, demoDraft as unknown as StackFile]) {
      const rows = toleranceRows(s);
      const engine = compileModel(s, STUDY).sources;
      expect(rows.map((r) => r.sourceId).sort()).toEqual(engine.map((e) => e.id).sort());
      for (const r of rows) {
        const src = engine.find((e) => e.id === r.sourceId)!;
        expect(r.stage, r.sourceId).toBe(src.stage);
        expect(r.draws, r.sourceId).toBe(src.count);
        expect(r.unit, r.sourceId).toBe(src.unit);
        expect(sigmaOf(r.tol), r.sourceId).toBeCloseTo(src.dist.sigma, 12);
      }
    }
  });

  it("names the six axis angles g1..g6 when they are given one by one", () => {
    const six = setAt(
      stack,
      ["elements", 5, "axisTol"],
      Array.from({ length: 6 }, (_, k) => ({ dist: "uniform", tol: 0.1 * (k + 1), stage: k === 0 ? "package" : undefined })),
    );
    const rows = toleranceRows(six).filter((r) => r.elementId === "mag" && r.sourceId.startsWith("mag.axis"));
    expect(rows.map((r) => r.sourceId)).toEqual(["mag.axis.g1", "mag.axis.g2", "mag.axis.g3", "mag.axis.g4", "mag.axis.g5", "mag.axis.g6"]);
    expect(rows.map((r) => r.stage)).toEqual(["package", "die", "die", "die", "die", "die"]);
    expect(rows[0].stageInherited).toBe(false);
    expect(rows[0].path).toEqual(["axisTol", 0]);
    const engine = compileModel(six, STUDY)
      .sources.filter((s) => s.id.startsWith("mag.axis"))
      .map((s) => [s.id, s.stage]);
    expect(engine).toEqual(rows.map((r) => [r.sourceId, r.stage]));
  });

  it("sorts stably in both directions and filters by text, stage and owner", () => {
    const rows = toleranceRows(demoDraft as unknown as StackFile);
    const byTol = sortRows(rows, "tol", "desc");
    expect(byTol[0].sourceId).toBe("board.bow");
    for (let i = 1; i < byTol.length; i++) expect(byTol[i - 1].tol.tol! >= byTol[i].tol.tol!).toBe(true);
    const asc = sortRows(rows, "owner", "asc").map((r) => r.tol.owner ?? "");
    expect([...asc]).toEqual([...asc].sort((a, b) => a.localeCompare(b)));
    expect(sortRows(rows, "element", "asc")).toEqual(rows);
    expect(filterRows(rows, { text: "bondline" }).every((r) => r.sourceId.endsWith(".bondLine"))).toBe(true);
    expect(filterRows(rows, { stage: "die" }).map((r) => r.sourceId)).toEqual(["gyro.axis", "accel.axis", "mag.axis"]);
    expect(filterRows(rows, { owner: "Fenmoor Substrates" }).map((r) => r.sourceId)).toEqual(["pkg.bow"]);
  });
});

describe("the live estimate", () => {
  it("runs a fixed-seed study with the requirements that can be estimated, and reports them by their place in the list", () => {
    const requirements = [
      { metric: "heading.maxAbsDeg", max: 2, yield: 0.99 },
      { metric: "nope.tiltDeg", max: 1, yield: 0.99 },
      { metric: "mag.crossAxisTotalPct.x", max: 0, yield: 0.99 },
      { metric: "accel~mag.relRotDeg", max: 0.5, yield: 0.9973 },
    ];
    const live = liveStudy(stack, requirements);
    expect(live.study).toMatchObject({ trials: LIVE_TRIALS, inclinationDeg: LIVE_INCLINATION_DEG });
    expect(live.requirementIndexes).toEqual([0, 3]);
    const small = { ...live, study: { ...live.study, trials: 400 } };
    const result = runStudy(stack, small.study);
    const s = summarize(result, small);
    expect(s.heading!.p99).toBe(result.metrics["heading.maxAbsDeg"].p99);
    expect(s.requirements.map((r) => [r.index, r.metric, r.unit])).toEqual([
      [0, "heading.maxAbsDeg", "deg"],
      [3, "accel~mag.relRotDeg", "deg"],
    ]);
    const crossAxis = Object.entries(result.metrics).filter(([id]) => id.includes(".crossAxisTotalPct."));
    expect(s.worstCrossAxis!.p99).toBe(Math.max(...crossAxis.map(([, m]) => m.p99)));
    expect(s.worst[0]).toMatchObject({ metric: "heading.maxAbsDeg", trialIndex: result.worstTrials["heading.maxAbsDeg"][0].trial });
    // the worker's lean path gives exactly runStudy's figures, and the same again on a second run
    expect(estimate(stack, small)).toEqual(s);
    expect(estimate(stack, small)).toEqual(s);
  });

  it("gives runStudy's figures for the demo draft at the estimate's own size", () => {
    const reqs = [
      { metric: "heading.maxAbsDeg", max: 2, yield: 0.99 },
      { metric: "mag.crossAxisTotalPct.x", max: 2, yield: 0.9973 },
      { metric: "accel~mag.relRotDeg", max: 0.5, yield: 0.9973 },
    ];
    const s = demoDraft as unknown as StackFile;
    const live = liveStudy(s, reqs);
    const mine = estimate(s, live);
    expect(mine).toEqual(summarize(runStudy(s, live.study), live));
    // what drives each requirement: shares of one whole, largest first
    for (const r of mine.requirements) {
      expect(r.drivers.length).toBeGreaterThan(0);
      expect(r.drivers.every((d, i) => i === 0 || d.share <= r.drivers[i - 1].share)).toBe(true);
      expect(r.drivers.reduce((a, d) => a + d.share, 0)).toBeLessThanOrEqual(1 + 1e-9);
    }
  }, 60_000);

  it("offers every metric id of the stack to the requirement picker, with its unit", () => {
    const groups = metricOptions(stack);
    const opts = groups.flatMap((g) => g.options);
    expect(groups[0].group).toBe("Heading");
    expect(opts.map((o) => o.id)).toContain("heading.maxAbsDeg");
    expect(opts.find((o) => o.id === "mag.crossAxisPct.xy")).toMatchObject({ unit: "%", group: "mag" });
    expect(opts.find((o) => o.id === "gyro~mag.relRotDeg")).toMatchObject({ unit: "deg", group: "Relative rotation" });
    expect(metricUnit("mag.axisMisalignDeg.z")).toBe("deg");
  });
});
