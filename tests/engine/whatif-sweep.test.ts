/**
 * Sweeps: common random numbers, the point at today's value equals an ordinary study, the
 * compass rule of MODEL.md section 10 (heading error of a tilted magnetometer grows with
 * tan of the inclination), and crossings interpolated between points.
 */
import { describe, expect, it } from "vitest";
import { normInv } from "@shared/engine/distributions";
import { runStudy } from "@shared/engine/study";
import { describeParameter, type ParameterInfo } from "@shared/whatif/parameters";
import { crossings, runSweep } from "@shared/whatif/sweep";
import type { StudyExecutor } from "@shared/whatif/executor";
import { compassStack, fixture, referenceStack, study, studyOf } from "./helpers";

const inThread: StudyExecutor = async (stack, s) => runStudy(stack, s);
const DEG = Math.PI / 180;

function info(x: ParameterInfo | { error: string }): ParameterInfo {
  if ("error" in x) throw new Error(x.error);
  return x;
}

describe("sweeps", () => {
  it("a source sweep: yields fall as the tolerance grows, and the point at today's tolerance is the ordinary study", async () => {
    const stack = referenceStack();
    const st = studyOf({ ...(fixture("study-reference.json") as object), trials: 8_000 }, stack);
    const p = info(describeParameter(stack, st, "mag.axis"));
    expect(p.current).toBe(0.6);
    const { points } = await runSweep({ stack, study: st, info: p, values: [1.2, 0.3, 0.6, 0.9], execute: inThread });
    expect(points.map((x) => x.value)).toEqual([0.3, 0.6, 0.9, 1.2]);
    const ordinary = runStudy(stack, st);
    const today = points[1];
    today.requirements.forEach((r, i) => {
      expect(r.predictedYield).toBe(ordinary.requirements[i].predictedYield);
      expect(r.ci).toEqual(ordinary.requirements[i].ci);
      expect(r.limitAtTarget).toBe(ordinary.requirements[i].limitAtTarget);
    });
    // common random numbers: the same trials at every point, so each requirement fed by the
    // axis falls monotonically (no sampling noise between points)
    for (const k of [0, 1]) {
      for (let i = 1; i < points.length; i++)
        expect(points[i].requirements[k].predictedYield).toBeLessThanOrEqual(points[i - 1].requirements[k].predictedYield);
      expect(points[3].requirements[k].predictedYield).toBeLessThan(points[0].requirements[k].predictedYield);
    }
  }, 60_000);

  it("an inclination sweep holds the compass rule: a tilted magnetometer's heading error grows with tan(I)", async () => {
    // MODEL.md section 10: a magnetometer turned about board x by eps, level: error ≈ −eps·tan(I)·cos(psi),
    // so max over headings ≈ |eps|·tan(I). eps ~ N(0, σ): the median of the max is 0.6745·σ·tan(I).
    const sigma = 0.1; // deg
    const stack = compassStack({}, { tiltTol: { x: { dist: "normal", tol: 3 * sigma } } });
    const st = studyOf(
      study({
        trials: 20_000,
        seed: 3,
        headingStepDeg: 5,
        tilts: [{ pitchDeg: 0, rollDeg: 0 }],
        requirements: [{ metric: "heading.maxAbsDeg", max: 0.2, yield: 0.5 }],
      }),
      stack,
    );
    const incl = [10, 30, 45, 60, 70, 80];
    const { points, crossings: cr } = await runSweep({
      stack,
      study: st,
      info: info(describeParameter(stack, st, "inclinationDeg")),
      values: incl,
      execute: inThread,
    });
    const ratio = points.map((p) => p.requirements[0].limitAtTarget / Math.tan(p.value * DEG));
    // the same trials at each point: the ratio is flat to second order in eps (well under 1 %)
    for (const r of ratio) expect(Math.abs(r / ratio[0] - 1)).toBeLessThan(0.01);
    // and equals the first-order median 0.6745·σ within the Monte Carlo error of a median (~1.5 % at 20,000 trials)
    expect(ratio[0] / (normInv(0.75) * sigma)).toBeGreaterThan(0.97);
    expect(ratio[0] / (normInv(0.75) * sigma)).toBeLessThan(1.03);
    // yield at a fixed limit falls with the inclination
    for (let i = 1; i < points.length; i++)
      expect(points[i].requirements[0].predictedYield).toBeLessThan(points[i - 1].requirements[0].predictedYield);
    // crossing: P(|eps|·tan I <= 0.2) = 0.5 at tan I* = 0.2 / (0.6745 σ) -> I* = 71.4 deg
    const want = Math.atan(0.2 / (normInv(0.75) * sigma)) / DEG;
    expect(cr[0].value).not.toBeNull();
    expect(Math.abs(cr[0].value! - want)).toBeLessThan(1.5); // linear interpolation between 70 and 80 deg plus sampling
  }, 60_000);

  it("crossings: interpolated between the first pair of points on either side of the target, null when none", () => {
    const pt = (value: number, y: number) => ({
      value,
      requirements: [
        { metric: "m", max: 1, yield: 0.99, predictedYield: y, ci: [y, y] as [number, number], passes: y >= 0.99, limitAtTarget: 0 },
      ],
    });
    expect(crossings([pt(1, 0.999), pt(2, 0.995), pt(3, 0.985)])[0].value).toBeCloseTo(2.5, 12);
    expect(crossings([pt(1, 0.999), pt(2, 0.995)])[0].value).toBeNull();
    expect(crossings([pt(1, 0.98), pt(2, 0.99), pt(3, 0.999)])[0].value).toBe(2);
  });

  it("names what cannot be swept", () => {
    const stack = referenceStack();
    const st = studyOf(fixture("study-reference.json"), stack);
    expect(describeParameter(stack, st, "nothing.here")).toHaveProperty("error");
    expect(describeParameter(stack, st, "calibration.residualDeg")).toHaveProperty("error");
  });
});
