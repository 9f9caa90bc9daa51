/**
 * Least-cost tolerance allocation held to cases with a closed form (derived here), and the
 * whole loop on the reference stack with the engine's own Monte Carlo.
 */
import { describe, expect, it } from "vitest";
import jStat from "jstat";
import { normInv } from "@shared/engine/distributions";
import { runStudy } from "@shared/engine/study";
import { wilson } from "@shared/engine/stats";
import { allocate, probeYield, roundTolerance, type LoopSource } from "@shared/whatif/allocate-loop";
import { runAllocation } from "@shared/whatif/allocation";
import { costAt } from "@shared/whatif/cost";
import { leastCost } from "@shared/whatif/least-cost";
import { withTolerances } from "@shared/whatif/parameters";
import { fixture, referenceStack, studyOf } from "./helpers";

/**
 * Closed form (single RSS condition, common exponent k, no bound active): minimise
 * Σ (a_j + b_j T_j^-k) subject to Σ A_j T_j² = S². Lagrange: −k b_j T_j^-(k+1) + 2λ A_j T_j = 0, so
 * T_j = (k b_j / (2 λ A_j))^(1/(k+2)). Put in the condition: λ^(-2/(k+2)) Σ A_j (k b_j/(2A_j))^(2/(k+2)) = S²,
 * λ = (Σ A_j (k b_j/(2A_j))^(2/(k+2)) / S²)^((k+2)/2).
 */
function closedForm(A: number[], b: number[], k: number, S: number): number[] {
  const g = (j: number) => ((k * b[j]) / (2 * A[j])) ** (2 / (k + 2));
  const lambda = (A.reduce((acc, a, j) => acc + a * g(j), 0) / (S * S)) ** ((k + 2) / 2);
  return A.map((a, j) => ((k * b[j]) / (2 * lambda * a)) ** (1 / (k + 2)));
}

/** An additive stack y = Σ c_j x_j of independent normals, x_j with ±T_j = 3σ_j: exact yield and percentiles. */
function additive(c: number[]) {
  const sigmaY = (T: number[]) => Math.sqrt(T.reduce((acc, t, j) => acc + ((c[j] * t) / 3) ** 2, 0));
  return {
    A: c.map((cj) => (cj / 3) ** 2),
    yieldAt: (T: number[], max: number) => 2 * jStat.normal.cdf(max / sigmaY(T), 0, 1) - 1,
    percentile: (T: number[], p: number) => sigmaY(T) * normInv((1 + p) / 2),
  };
}

describe("least-cost allocation on the linearised model (Lagrange multipliers)", () => {
  it("one RSS condition, three sources, k = 2: the solver gives the closed form and nothing cheaper meets the condition", () => {
    const A = [1, 0.25, 4],
      b = [2, 1, 0.5],
      k = 2,
      S = 1.2;
    const want = closedForm(A, b, k, S);
    const got = leastCost(
      A.map((a, j) => ({ id: `s${j}`, A: [a], cost: { a: 0.1, b: b[j], k }, min: 1e-6, max: 1e6 })),
      [S * S],
    );
    want.forEach((t, j) => expect(got.T[j]).toBeCloseTo(t, 8));
    expect(A.reduce((acc, a, j) => acc + a * got.T[j] ** 2, 0)).toBeCloseTo(S * S, 10);
    // moving along the condition (tighten one, loosen another to keep Σ A T² = S²) costs more
    const cost = (T: number[]) => T.reduce((acc, t, j) => acc + costAt({ a: 0.1, b: b[j], k }, t), 0);
    for (const d of [-0.05, 0.05]) {
      const T = got.T.slice();
      T[0] *= 1 + d;
      T[1] = Math.sqrt((S * S - A[0] * T[0] ** 2 - A[2] * T[2] ** 2) / A[1]);
      expect(cost(T)).toBeGreaterThan(cost(got.T));
    }
  });

  it("a dominant source takes most of the tightening: T_j ∝ (b_j/A_j)^(1/(k+2))", () => {
    const A = [100, 1, 1],
      b = [1, 1, 1],
      k = 1,
      S = 2;
    const got = leastCost(
      A.map((a, j) => ({ id: `s${j}`, A: [a], cost: { a: 0, b: b[j], k }, min: 1e-9, max: 1e9 })),
      [S * S],
    );
    expect(got.T[0] / got.T[1]).toBeCloseTo((1 / 100) ** (1 / 3), 8);
    expect(got.T[1]).toBeCloseTo(got.T[2], 10);
    // its share of the variance stays the largest: A_j T_j² ∝ A_j^(1/3) for k = 1
    expect((A[0] * got.T[0] ** 2) / (A[1] * got.T[1] ** 2)).toBeCloseTo(100 ** (1 / 3), 6);
  });

  it("a source held at its upper bound: the others share what is left of the budget, by the same closed form", () => {
    const A = [1, 1, 1],
      b = [1, 1, 50],
      k = 2,
      S = 1;
    const free = closedForm(A, b, k, S);
    const cap = free[2] * 0.6; // the expensive source would like to be wider than it may be
    const got = leastCost(
      A.map((a, j) => ({ id: `s${j}`, A: [a], cost: { a: 0, b: b[j], k }, min: 1e-9, max: j === 2 ? cap : 1e9 })),
      [S * S],
    );
    expect(got.T[2]).toBeCloseTo(cap, 12);
    const rest = closedForm(A.slice(0, 2), b.slice(0, 2), k, Math.sqrt(S * S - A[2] * cap * cap));
    expect(got.T[0]).toBeCloseTo(rest[0], 8);
    expect(got.T[1]).toBeCloseTo(rest[1], 8);
  });

  it("two conditions: each holds, and the multiplier of a slack one is zero", () => {
    const src = [
      { id: "p", A: [1, 0], cost: { a: 0, b: 1, k: 1 }, min: 1e-6, max: 1e6 },
      { id: "q", A: [1, 1], cost: { a: 0, b: 1, k: 1 }, min: 1e-6, max: 1e6 },
      { id: "r", A: [0, 1], cost: { a: 0, b: 1, k: 1 }, min: 1e-6, max: 1e6 },
    ];
    const tight = leastCost(src, [1, 0.5]);
    expect(tight.T[0] ** 2 + tight.T[1] ** 2).toBeLessThanOrEqual(1 + 1e-9);
    expect(tight.T[1] ** 2 + tight.T[2] ** 2).toBeCloseTo(0.5, 8);
    // a budget wide enough for p at its upper bound leaves the first condition slack: zero multiplier
    const slack = leastCost(src, [1e13, 0.5]);
    expect(slack.multipliers[0]).toBe(0);
    expect(slack.T[0]).toBe(1e6);
    expect(slack.T[1] ** 2 + slack.T[2] ** 2).toBeCloseTo(0.5, 8);
  });

  it("the verify-and-correct loop on an exact additive stack ends at the closed form for the probe yield", async () => {
    const c = [2, 1, 0.5],
      b = [1, 2, 3],
      k = 2,
      max = 1,
      target = 0.99,
      trials = 100_000;
    const model = additive(c);
    const sources: LoopSource[] = c.map((_, j) => ({
      id: `s${j}`,
      current: 0.2,
      free: true,
      cost: { a: 0.05, b: b[j], k },
      min: 1e-4,
      max: 10,
    }));
    const out = await allocate({
      sources,
      requirements: [{ metric: "y", max, yield: target }],
      linearise: () => [model.A],
      // an exact model stands in for the Monte Carlo run: yields as a run of `trials` would report them
      verify: async (T, probes) => {
        const y = model.yieldAt(T, max);
        return [
          {
            predictedYield: y,
            ci: wilson(y * trials, trials),
            passes: y >= target,
            probeLimit: model.percentile(T, probes[0]),
            limitAtTarget: model.percentile(T, target),
          },
        ];
      },
      trials,
    });
    expect(out.chosen).not.toBeNull();
    const S = max / normInv((1 + probeYield(target, trials)) / 2);
    const want = closedForm(model.A, b, k, S);
    out.chosen!.T.forEach((t, j) => expect(Math.abs(t / want[j] - 1)).toBeLessThan(0.011)); // 3 significant digits, rounded down
    expect(out.chosen!.requirements[0].ci[0]).toBeGreaterThanOrEqual(target);
    expect(out.chosen!.closest).toBeGreaterThan(0.97);
  });

  it("roundTolerance keeps three significant digits, rounding toward the tighter value", () => {
    expect(roundTolerance(0.0123956)).toBeCloseTo(0.0123, 12);
    expect(roundTolerance(12.399)).toBeCloseTo(12.3, 12);
  });
});

describe("allocation on the reference stack with the engine's Monte Carlo", () => {
  it("verifies a proposal that an ordinary study with another seed confirms, and is not needlessly tight", async () => {
    const stack = referenceStack();
    const study = studyOf({ ...(fixture("study-reference.json") as object), trials: 20_000 }, stack);
    const out = await runAllocation({ stack, study, execute: async (s, st) => runStudy(s, st) });
    expect(out.verified).toBe(true);
    for (const r of out.requirements) expect(r.ci[0]).toBeGreaterThanOrEqual(r.yield);
    // at least one requirement ends close to its limit (percentile at the target near max)
    expect(Math.max(...out.requirements.map((r) => r.limitAtTarget / r.max))).toBeGreaterThan(0.9);
    expect(out.totalCostProposed).toBeLessThan(out.totalCostCurrent); // today's stack fails, yet the answer is cheaper
    const proposed = withTolerances(stack, Object.fromEntries(out.sources.map((s) => [s.source, s.proposed])));
    const check = runStudy(proposed, { ...study, seed: 90210, trials: 40_000 });
    for (const r of check.requirements) expect(r.predictedYield).toBeGreaterThanOrEqual(r.yield);
  }, 120_000);
});
