/**
 * Lots, production order and the uncertainty of capability (issue 13), against values
 * published outside the project; each check names its source.
 */
import { describe, expect, it } from "vitest";
import { jStat } from "jstat";
import {
  cpkLowerBound,
  individualsChart,
  lotStatistics,
  normalQuantile,
  pooledWithin,
  processCapability,
  SHEWHART_N2,
} from "@shared/datasets/process";

describe("lower confidence bound of Cpk (Bissell 1990)", () => {
  it("reproduces a published 95 % interval: n = 45, Cpk 1.15 -> 0.89 to 1.41", () => {
    // Quality Digest, May 2000, "Last Word": "based upon a random sample of n = 45, I am
    // 95-percent confident that it's between 0.89 and 1.41" for a reported Cpk of 1.15.
    // The lower end of a two-sided 95 % interval is the one-sided 97.5 % bound.
    expect(cpkLowerBound(1.15, 45, 0.975)).toBeCloseTo(0.89, 2);
    expect(2 * 1.15 - cpkLowerBound(1.15, 45, 0.975)).toBeCloseTo(1.41, 2);
  });

  it("reproduces the textbook example n = 20, Cpk 1.33 -> lower end 0.88 (two-sided 95 %)", () => {
    // Montgomery, Introduction to Statistical Quality Control, the Cpk confidence-interval
    // example (0.88 <= Cpk <= 1.78); quoted from memory.
    expect(cpkLowerBound(1.33, 20, 0.975)).toBeCloseTo(0.88, 2);
    expect(2 * 1.33 - cpkLowerBound(1.33, 20, 0.975)).toBeCloseTo(1.78, 2);
  });

  it("40 units reading Cpk 1.4 rest on a one-sided 95 % bound of 1.13, below the usual 1.33", () => {
    // hand computation: 1.4 − 1.6449·√(1/360 + 1.96/78) = 1.4 − 1.6449·0.16705 = 1.1252
    expect(cpkLowerBound(1.4, 40)).toBeCloseTo(1.1252, 4);
    // more units, tighter bound
    expect(cpkLowerBound(1.4, 400)).toBeGreaterThan(cpkLowerBound(1.4, 40));
  });

  it("the normal quantile it uses agrees with jstat", () => {
    for (const p of [0.5, 0.9, 0.95, 0.975, 0.999]) expect(normalQuantile(p)).toBeCloseTo(jStat.normal.inv(p, 0, 1), 7);
  });
});

describe("Shewhart individuals and moving-range chart", () => {
  it("uses the tabled constants for moving ranges of two: d2 = 1.128, D3 = 0, D4 = 3.267", () => {
    // ASTM E2587 / Montgomery appendix VI, n = 2. Checked against their definitions:
    // d2 = E|X1 − X2|/σ = 2/√π, d3 = √(2 − 4/π), D4 = 1 + 3·d3/d2.
    const d2 = 2 / Math.sqrt(Math.PI);
    const d3 = Math.sqrt(2 - 4 / Math.PI);
    expect(SHEWHART_N2.d2).toBeCloseTo(d2, 3);
    expect(SHEWHART_N2.D4).toBeCloseTo(1 + (3 * d3) / d2, 3);
    expect(SHEWHART_N2.D3).toBe(0);
    // the individuals limits x̄ ± 2.66·MR̄ of the same tables
    expect(3 / SHEWHART_N2.d2).toBeCloseTo(2.66, 2);
  });

  it("limits by hand for five units, and a drift is signalled where it happens", () => {
    // x = 10 12 11 15 13: MR = 2 1 4 2, MR̄ = 2.25; x̄ = 12.2; UCL = 12.2 + 3·2.25/1.128 = 18.184
    const c = individualsChart([10, 12, 11, 15, 13], [2, 3, 4, 5, 6])!;
    expect(c.mr.centre).toBeCloseTo(2.25, 12);
    expect(c.x.centre).toBeCloseTo(12.2, 12);
    expect(c.x.ucl).toBeCloseTo(12.2 + (3 * 2.25) / 1.128, 12);
    expect(c.mr.ucl).toBeCloseTo(3.267 * 2.25, 12);
    expect(c.points.map((p) => p.mr)).toEqual([null, 2, 1, 4, 2]);
    expect(c.signals).toBe(0);
    // 20 steady units, then a jump of 10 σ: the jump is flagged at unit 21, not before
    const steady = Array.from({ length: 20 }, (_, i) => 10 + (((i * 7) % 5) - 2) * 0.1);
    const drift = individualsChart(
      [...steady, 13, 13.1, 12.9],
      Array.from({ length: 23 }, (_, i) => i + 2),
    )!;
    expect(drift.points.findIndex((p) => p.outX || p.outMr)).toBe(20);
  });
});

describe("lots", () => {
  const lots = ["A", "A", "A", "A", "B", "B", "B", "B"];
  const values = [1, 2, 1.5, 1.2, 4, 5, 4.5, 4.2];
  it("statistics per lot in file order, pooled within-lot σ by hand", () => {
    const ls = lotStatistics(values, lots, { lsl: -10, usl: 10 });
    expect(ls.map((l) => [l.lot, l.n])).toEqual([
      ["A", 4],
      ["B", 4],
    ]);
    expect(ls[0].mean).toBeCloseTo(1.425, 12);
    expect(ls[1].mean).toBeCloseTo(4.425, 12);
    // both lots have the same spread: s² = Σ(x − x̄)²/3 = (0.180625 + 0.330625 + 0.005625 + 0.050625)/3
    const s2 = (0.180625 + 0.330625 + 0.005625 + 0.050625) / 3;
    const w = pooledWithin(values, lots)!;
    expect(w.sigma).toBeCloseTo(Math.sqrt(s2), 12);
    expect(w.dof).toBe(6);
  });

  it("Cpk within lots beside Ppk over all: a shift between lots lowers Ppk, not Cpk", () => {
    const c = processCapability(values, -10, 10, lots)!;
    expect(c.basis).toBe("within lots");
    expect(c.cpk).toBeGreaterThan(c.ppk);
    expect(c.cpk).toBeCloseTo((10 - 2.925) / (3 * c.sigmaWithin!), 12);
    expect(c.cpkLower).toBeCloseTo(cpkLowerBound(c.cpk, 8, 0.95, 6), 12);
    const none = processCapability(values, -10, 10)!;
    expect(none.basis).toBe("overall");
    expect(none.cpk).toBe(none.ppk);
    expect(none.n).toBe(8);
    // one unit per lot: nothing within lots to pool
    expect(
      pooledWithin(
        values,
        values.map((_, i) => String(i)),
      ),
    ).toBeNull();
  });
});
