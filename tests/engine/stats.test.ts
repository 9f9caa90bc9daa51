import { describe, expect, it } from "vitest";
import jStat from "jstat";
import { wilson } from "@shared/engine/stats";
import { metricStore } from "@shared/engine/accumulate";
import { blockStream } from "@shared/engine/random";
import { compileDist, sampleDist } from "@shared/engine/distributions";
import { lhsUniforms } from "@shared/engine/sampling";
import { adaptiveConfig, numericalTolerance } from "@shared/engine/coordinator";
import { runStudy } from "@shared/engine/study";
import { compassStack, quantileSE, study, studyOf } from "./helpers";

/** numpy-style percentile: linear interpolation between order statistics at q·(n − 1). */
function exactQuantile(sorted: Float64Array, q: number): number {
  const r = q * (sorted.length - 1);
  const lo = Math.floor(r);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo] + (r - lo) * (sorted[hi] - sorted[lo]);
}

describe("confidence interval of a yield", () => {
  it("Wilson score interval: Newcombe's worked examples 81/263 and 15/148", () => {
    // R. G. Newcombe, Two-sided confidence intervals for the single proportion, Statistics in
    // Medicine 17 (1998): Wilson 95 % intervals 0.2553-0.3662 (81/263) and 0.0624-0.1605 (15/148)
    const [a, b] = wilson(81, 263);
    expect(a).toBeCloseTo(0.2553, 4);
    expect(b).toBeCloseTo(0.3662, 4);
    const [c, d] = wilson(15, 148);
    expect(c).toBeCloseTo(0.0624, 4);
    expect(d).toBeCloseTo(0.1605, 4);
  });

  it("no failures: the upper end is 1 and the lower end z²... closed form n/(n + z²)", () => {
    const z = jStat.normal.inv(0.975, 0, 1);
    const [lo, hi] = wilson(1000, 1000);
    expect(hi).toBe(1);
    expect(lo).toBeCloseTo(1000 / (1000 + z * z), 12);
    expect(wilson(0, 10)[1]).toBeCloseTo((z * z) / (10 + z * z), 12);
  });
});

describe("bounded percentile store", () => {
  it("percentiles of |v| agree with exact order statistics far inside the Monte Carlo error", () => {
    // claim in shared/engine/histogram.ts: within the bucket width (2^-8 of the value), and
    // about sqrt(q·f(q)/2^8) <= 1/16 of the Monte Carlo standard error sqrt(p(1−p)/n)/f(q)
    const n = 100_000;
    const g = blockStream(99, 0);
    const normal = compileDist({ dist: "normal", tol: 3 });
    const density = {
      normal: (q: number) => 2 * jStat.normal.pdf(q, 0, 1), // |N(0,1)|
      rayleigh: (q: number) => q * Math.exp((-q * q) / 2),
    };
    for (const kind of ["normal", "rayleigh"] as const) {
      const h = metricStore();
      const abs = new Float64Array(n);
      let mn = Infinity,
        mx = 0;
      for (let i = 0; i < n; i++) {
        const x = sampleDist(normal, g.nextOpen01());
        const v = kind === "normal" ? x : Math.hypot(x, sampleDist(normal, g.nextOpen01()));
        h.add(v);
        abs[i] = Math.abs(v);
        mn = Math.min(mn, abs[i]);
        mx = Math.max(mx, abs[i]);
      }
      abs.sort();
      for (const q of [0.5, 0.95, 0.99, 0.9973]) {
        const exact = exactQuantile(abs, q);
        const est = h.quantileAbs(q, mn, mx);
        expect(Math.abs(est - exact) / exact).toBeLessThan(2 ** -8);
        expect(Math.abs(est - exact)).toBeLessThan(0.1 * quantileSE(q, n, density[kind](exact)));
      }
      expect(h.quantileAbs(1, mn, mx)).toBe(mx);
      expect(h.total()).toBe(n);
    }
  });

  it("the occupied buckets taken from the extremes are those a scan finds, NaN, zeros, infinities and empty stores included", () => {
    const g = blockStream(3, 2);
    const normal = compileDist({ dist: "normal", tol: 3 });
    const sets: number[][] = [
      [],
      [NaN, NaN],
      [0, -0],
      [1e-30, -2e-9, 3, -7e5],
      [NaN, 0.25, -0.5],
      [Infinity, -1e-3, 2],
      [-Infinity, NaN],
      Array.from({ length: 20_000 }, () => sampleDist(normal, g.nextOpen01()) * 1e-3),
    ];
    for (const values of sets) {
      const scanned = metricStore();
      // the extremes as the engine keeps them: NaN leaves them alone
      let minAbs = Infinity,
        maxAbs = 0;
      for (const v of values) {
        scanned.add(v);
        const a = Math.abs(v);
        if (a < minAbs) minAbs = a;
        if (a > maxAbs) maxAbs = a;
      }
      const known = metricStore(scanned.counts.slice()).knownExtremes(minAbs, maxAbs);
      expect(known.occupied(), String(values.slice(0, 4))).toEqual(scanned.occupied());
      if (values.length > 100) {
        const [mn, mx] = [Math.min(...values), Math.max(...values)];
        expect(known.quantilesSigned([0.025, 0.5, 0.975], mn, mx)).toEqual(scanned.quantilesSigned([0.025, 0.5, 0.975], mn, mx));
        expect(known.shortestInterval(0.95, mn, mx)).toEqual(scanned.shortestInterval(0.95, mn, mx));
      }
    }
  });

  it("merging stores adds counts exactly, in any order", () => {
    const a = metricStore(),
      b = metricStore(),
      c = metricStore();
    const g = blockStream(5, 1);
    for (let i = 0; i < 5000; i++) {
      const v = (g.nextOpen01() - 0.5) * 10;
      (i % 2 ? a : b).add(v);
      c.add(v);
    }
    const ab = metricStore();
    ab.merge(a);
    ab.merge(b);
    const ba = metricStore();
    ba.merge(b);
    ba.merge(a);
    expect(ab.counts).toEqual(c.counts);
    expect(ba.counts).toEqual(c.counts);
  });
});

describe("sampling and coverage intervals against JCGM 101:2008 (GUM Supplement 1), additive model", () => {
  // Y = X1 + X2 + X3 + X4, 10^6 trials, probabilistically symmetric 95 % interval
  function additive(dists: { dist: "normal" | "uniform"; tol: number }[], n = 1_000_000) {
    const ds = dists.map((d) => compileDist(d));
    const g = blockStream(2008, 0);
    const h = metricStore();
    let s = 0,
      s2 = 0,
      mn = Infinity,
      mx = -Infinity;
    for (let i = 0; i < n; i++) {
      let y = 0;
      for (const d of ds) y += sampleDist(d, g.nextOpen01());
      h.add(y);
      s += y;
      s2 += y * y;
      mn = Math.min(mn, y);
      mx = Math.max(mx, y);
    }
    const u = Math.sqrt((s2 - (s * s) / n) / (n - 1));
    return { u, lo: h.quantileSigned(0.025, mn, mx), hi: h.quantileSigned(0.975, mn, mx), n };
  }

  it("normal inputs, u(xi) = 1: u(y) = 2.00, 95 % interval [-3.92, 3.92]", () => {
    // REFERENCES.md: JCGM 101:2008 section 9.2, normal inputs
    const r = additive([0, 1, 2, 3].map(() => ({ dist: "normal" as const, tol: 3 })));
    // published values carry two decimals (±0.005); MC error: SE(s) = σ/√(2n), SE(q) from the N(0, 4) density
    expect(Math.abs(r.u - 2)).toBeLessThan(0.005 + 4.5 * (2 / Math.sqrt(2 * r.n)));
    const seQ = quantileSE(0.975, r.n, jStat.normal.pdf(3.92, 0, 2));
    expect(Math.abs(r.hi - 3.92)).toBeLessThan(0.005 + 4.5 * seQ);
    expect(Math.abs(r.lo + 3.92)).toBeLessThan(0.005 + 4.5 * seQ);
  });

  it("rectangular inputs, u(xi) = 1: 95 % interval [-3.88, 3.88] (Irwin-Hall: ±3.8794)", () => {
    // REFERENCES.md: JCGM 101:2008 section 9.2, rectangular inputs; half-width √3 gives u = 1
    const r = additive([0, 1, 2, 3].map(() => ({ dist: "uniform" as const, tol: Math.sqrt(3) })));
    // density of Y = 2√3·(S − 2), S Irwin-Hall(4): f_S(s) = (4 − s)³/6 on [3, 4]
    const s = 2 + 3.8794 / (2 * Math.sqrt(3));
    const f = (4 - s) ** 3 / 6 / (2 * Math.sqrt(3));
    const seQ = quantileSE(0.975, r.n, f);
    expect(Math.abs(r.hi - 3.8794)).toBeLessThan(4.5 * seQ + 1e-4);
    expect(Math.abs(r.lo + 3.8794)).toBeLessThan(4.5 * seQ + 1e-4);
    expect(r.hi).toBeCloseTo(3.88, 1);
  });

  it("X4 rectangular with u = 10, the others normal u = 1: u(y) = 10.2, interval [-17.0, 17.0]", () => {
    // REFERENCES.md: JCGM 101:2008 section 9.2.4 (listed there as from memory): values to 0.1
    const r = additive([
      { dist: "normal", tol: 3 },
      { dist: "normal", tol: 3 },
      { dist: "normal", tol: 3 },
      { dist: "uniform", tol: 10 * Math.sqrt(3) },
    ]);
    expect(Math.abs(r.u - 10.2)).toBeLessThan(0.05 + 4.5 * (10 / Math.sqrt(r.n)));
    // near the end of a rectangular-dominated sum the density is about 1/(2·17.3)·(smoothing): use 0.01 as a lower bound
    const seQ = quantileSE(0.975, r.n, 0.01);
    expect(Math.abs(r.hi - 17.0)).toBeLessThan(0.05 + 4.5 * seQ);
    expect(Math.abs(r.lo + 17.0)).toBeLessThan(0.05 + 4.5 * seQ);
  });
});

describe("Latin hypercube and adaptive stopping", () => {
  it("each dimension of a Latin-hypercube block has exactly one point per stratum", () => {
    const n = 1000,
      D = 7;
    const u = lhsUniforms(blockStream(4, 2), n, D);
    for (let k = 0; k < D; k++) {
      const seen = new Uint8Array(n);
      for (let i = 0; i < n; i++) seen[Math.floor(u[i * D + k] * n)]++;
      expect(Array.from(seen).every((c) => c === 1)).toBe(true);
    }
  });

  it("a Latin-hypercube study agrees with random sampling and pins the mean of a near-linear metric", () => {
    const st = compassStack({ axisTol: { dist: "normal", tol: 1.5 } });
    const n = 40_000;
    const lhs = runStudy(st, studyOf(study({ trials: n, sampling: "lhs" }), st));
    const rnd = runStudy(st, studyOf(study({ trials: n }), st));
    const a = lhs.metrics["acc.crossAxisPct.xy"],
      b = rnd.metrics["acc.crossAxisPct.xy"];
    // true mean 0 by symmetry; random sampling's SE is s/√n, the hypercube's far smaller
    expect(Math.abs(b.mean)).toBeLessThan((4.5 * b.std) / Math.sqrt(n));
    expect(Math.abs(a.mean)).toBeLessThan((0.2 * a.std) / Math.sqrt(n));
    expect(Math.abs(a.std - b.std)).toBeLessThan(4.5 * b.std * Math.sqrt(1 / (2 * n)) * Math.SQRT2);
  });

  it("JCGM 101 7.9: M = max(100/(1 − p), 10^4) and δ = ½·10^l from u = c·10^l", () => {
    // REFERENCES.md, JCGM 101:2008 7.9
    expect(adaptiveConfig(0.95, 2, 1e6).M).toBe(10_000);
    expect(adaptiveConfig(0.9973, 2, 1e6).M).toBe(37_038);
    expect(adaptiveConfig(0.9973, 2, 1e6).runTrials % 4096).toBe(0);
    expect(numericalTolerance(0.40277, 2)).toBeCloseTo(0.005, 15);
    expect(numericalTolerance(0.40277, 1)).toBeCloseTo(0.05, 15);
    expect(numericalTolerance(12.3, 2)).toBeCloseTo(0.5, 15);
  });

  it("an adaptive study stops when every tracked quantity is stable and reports the trials it used", () => {
    const st = compassStack({ axisTol: { dist: "normal", tol: 0.6 } }, { bondLine: { heightTol: { dist: "normal", tol: 4 } } });
    const sd = studyOf(
      study({ trials: 400_000, adaptive: { significantDigits: 1 }, requirements: [{ metric: "heading.maxAbsDeg", max: 2, yield: 0.95 }] }),
      st,
    );
    const r = runStudy(st, sd);
    const a = r.adaptive!;
    expect(a.converged).toBe(true);
    expect(a.runs).toBeGreaterThanOrEqual(2);
    expect(r.trials).toBe(a.runs * a.runTrials);
    expect(r.trials).toBeLessThan(400_000);
    for (const d of a.last) {
      expect(2 * d.sMean).toBeLessThanOrEqual(d.delta);
      expect(2 * d.sStd).toBeLessThanOrEqual(d.delta);
      expect(2 * d.sQ).toBeLessThanOrEqual(d.delta);
    }
  });
});

describe("coverage intervals", () => {
  it("shortest 95 % interval: symmetric ±1.96σ for a normal, [≈0, q] shifted left for a Rayleigh, against exact order statistics", () => {
    // JCGM 101:2008 5.3.4 (REFERENCES.md: use the shortest coverage interval for skewed outputs)
    const n = 100_000;
    const g = blockStream(123, 0);
    const normal = compileDist({ dist: "normal", tol: 3 });
    for (const kind of ["normal", "rayleigh"] as const) {
      const h = metricStore();
      const v = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        const x = sampleDist(normal, g.nextOpen01());
        v[i] = kind === "normal" ? x : Math.hypot(x, sampleDist(normal, g.nextOpen01()));
        h.add(v[i]);
      }
      v.sort();
      // exact: the narrowest window of 0.95·n consecutive order statistics
      const w = Math.round(0.95 * (n - 1));
      let bl = 0;
      for (let i = 1; i + w < n; i++) if (v[i + w] - v[i] < v[bl + w] - v[bl]) bl = i;
      const [lo, hi] = h.shortestInterval(0.95, v[0], v[n - 1]);
      // the interval ends are quantiles: allow 4.5 standard errors of a quantile at the ends' densities
      const f = (x: number) => (kind === "normal" ? jStat.normal.pdf(x, 0, 1) : x * Math.exp((-x * x) / 2));
      const se = (x: number) => quantileSE(0.5, n, Math.max(f(x), 0.02));
      expect(Math.abs(lo - v[bl])).toBeLessThan(4.5 * se(v[bl]));
      expect(Math.abs(hi - v[bl + w])).toBeLessThan(4.5 * se(v[bl + w]));
      if (kind === "normal") {
        expect(Math.abs(lo + 1.96)).toBeLessThan(4.5 * se(1.96) + 0.02);
        expect(Math.abs(hi - 1.96)).toBeLessThan(4.5 * se(1.96) + 0.02);
      } else {
        // narrower than the probabilistically symmetric interval of a right-skewed output
        expect(hi - lo).toBeLessThan(h.quantileSigned(0.975, v[0], v[n - 1]) - h.quantileSigned(0.025, v[0], v[n - 1]));
      }
    }
  });
});
