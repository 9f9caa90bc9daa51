import { describe, expect, it } from "vitest";
import { defaultThreads, runStudyOnThreads, StudyAbortedError, threadsForTrials } from "@backend/engine/runner";
import { poseOfTrial, runStudy } from "@shared/engine/study";
import { compassStack, fixture, referenceStack, study, studyOf } from "./helpers";

const stack = referenceStack();
const baseStudy = studyOf(fixture("study-reference.json"), stack);

describe("same seed, same numbers, whatever the number of threads", () => {
  it("1 thread, 2 threads and the in-process runner give identical result files", async () => {
    const opts = { trials: 10_000 };
    const one = await runStudyOnThreads(stack, baseStudy, { ...opts, threads: 1 });
    const two = await runStudyOnThreads(stack, baseStudy, { ...opts, threads: 2 });
    const inProc = runStudy(stack, baseStudy, opts);
    expect(JSON.stringify(two)).toBe(JSON.stringify(one));
    expect(JSON.stringify(inProc)).toBe(JSON.stringify(one));
    expect(one.trials).toBe(10_000);
  });

  it("Latin hypercube and calibration studies are thread-independent too", async () => {
    const cal = studyOf({ ...(fixture("study-reference-calibrated.json") as object), sampling: "lhs" }, stack);
    const a = await runStudyOnThreads(stack, cal, { trials: 9000, threads: 1, seed: 3 });
    const b = await runStudyOnThreads(stack, cal, { trials: 9000, threads: 2, seed: 3 });
    expect(JSON.stringify(b)).toBe(JSON.stringify(a));
    const c = runStudy(stack, cal, { trials: 9000, seed: 4 });
    expect(c.metrics["heading.maxAbsDeg"].mean).not.toBe(a.metrics["heading.maxAbsDeg"].mean);
  });

  it("adaptive stopping takes the same decision on threads as in-process", async () => {
    const st = compassStack({ axisTol: { dist: "normal", tol: 0.6 } }, { bondLine: { heightTol: { dist: "normal", tol: 4 } } });
    const sd = studyOf(
      study({ trials: 200_000, adaptive: { significantDigits: 1 }, requirements: [{ metric: "heading.maxAbsDeg", max: 2, yield: 0.95 }] }),
      st,
    );
    const threads = await runStudyOnThreads(st, sd, { threads: 2 });
    const inProc = runStudy(st, sd);
    expect(threads.adaptive!.runs).toBeGreaterThanOrEqual(2);
    expect(JSON.stringify(threads)).toBe(JSON.stringify(inProc));
  });

  it("reports progress up to the total and can be cancelled", async () => {
    const seen: number[] = [];
    await runStudyOnThreads(stack, baseStudy, { trials: 12_288, threads: 2, onProgress: (p) => seen.push(p.trialsDone) });
    expect(seen.at(-1)).toBe(12_288);
    expect(seen.every((v, i) => i === 0 || v > seen[i - 1])).toBe(true);
    const ctl = new AbortController();
    const run = runStudyOnThreads(stack, baseStudy, {
      trials: 2_000_000,
      threads: 2,
      signal: ctl.signal,
      onProgress: (p) => {
        if (p.trialsDone >= 8192) ctl.abort();
      },
    });
    await expect(run).rejects.toBeInstanceOf(StudyAbortedError);
  });

  it("the in-process runner stops between blocks when asked, with the blocks done so far", () => {
    let calls = 0;
    const r = runStudy(stack, baseStudy, { trials: 40_000, shouldStop: () => ++calls > 2 });
    expect(r.stopped).toBe(true);
    expect(r.trials).toBe(2 * 4096);
  });

  it("worst trials are regenerated from the seed with the full pose of every element", () => {
    const r = runStudy(stack, baseStudy, { trials: 5000 });
    const worst = r.worstTrials["heading.maxAbsDeg"];
    expect(worst.length).toBe(5);
    expect(Math.abs(worst[0].value)).toBeGreaterThanOrEqual(Math.abs(worst[4].value));
    const pose = poseOfTrial(stack, baseStudy, worst[0].trial, { trials: 5000 });
    expect(pose.metrics["heading.maxAbsDeg"]).toBe(worst[0].value);
    expect(pose.metrics["heading.maxAbsDeg"]).toBe(r.metrics["heading.maxAbsDeg"].max);
    expect(pose.elements.map((e) => e.id)).toEqual(stack.elements.map((e) => e.id));
    const mag = pose.elements.find((e) => e.id === "mag")!;
    expect(mag.R).toHaveLength(9);
    // rows of R are orthonormal
    const R = mag.R;
    for (let i = 0; i < 3; i++) expect(R[3 * i] ** 2 + R[3 * i + 1] ** 2 + R[3 * i + 2] ** 2).toBeCloseTo(1, 14);
    // the package moved by its placement offsets, in mm
    const pkg = pose.elements.find((e) => e.id === "pkg")!;
    const dx = pkg.position[0] - pkg.positionNominal[0];
    expect(Math.abs(dx - pose.draws["pkg.x"][0] * 1e-3)).toBeLessThan(1e-3);
    // and a trial in the middle of a later block regenerates too
    const again = poseOfTrial(stack, baseStudy, 4321, { trials: 5000 });
    expect(again.trial).toBe(4321);
  });
});

describe("threads for a one-off study (the command line's default)", () => {
  it("one thread up to a dozen blocks, then one more per dozen, never more than the cores", () => {
    // a fresh thread's start and compile pay only from about a dozen blocks (runner.ts)
    expect(threadsForTrials(1)).toBe(1);
    expect(threadsForTrials(10_000)).toBe(1);
    expect(threadsForTrials(12 * 4096)).toBe(1);
    expect(threadsForTrials(12 * 4096 + 1)).toBe(Math.min(2, defaultThreads()));
    expect(threadsForTrials(100_000)).toBe(Math.min(3, defaultThreads()));
    expect(threadsForTrials(10_000_000)).toBe(defaultThreads());
  });
});
