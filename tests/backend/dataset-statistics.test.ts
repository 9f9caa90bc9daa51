/**
 * Statistics of a measured column (shared/datasets/statistics.ts) against jstat and against
 * published values. Each check names its source; "from memory" means the number was not
 * re-read in the source for this test.
 */
import { describe, expect, it } from "vitest";
import jStat from "jstat";
import {
  adPValue,
  andersonDarling,
  capability,
  histogram,
  normalCdf,
  outliers,
  quantileSorted,
  sortedCopy,
  summarize,
} from "@shared/datasets/statistics";

/** A small seeded generator for test samples (xorshift32), normal draws by jstat's inverse CDF. */
function normalSample(n: number, mean: number, std: number, seed = 7): number[] {
  let x = seed;
  const u = () => {
    x ^= x << 13;
    x >>>= 0;
    x ^= x >>> 17;
    x ^= x << 5;
    x >>>= 0;
    return (x + 0.5) / 4294967296;
  };
  return Array.from({ length: n }, () => jStat.normal.inv(u(), mean, std));
}

// R: set.seed(123); rnorm(20) — the first twenty draws of R's default generator.
const RNORM20 = [
  -0.56047565, -0.23017749, 1.55870831, 0.07050839, 0.12928774, 1.71506499, 0.46091621, -1.26506123, -0.68685285, -0.44566197, 1.2240818,
  0.35981383, 0.40077145, 0.11068272, -0.55584113, 1.78691314, 0.49785048, -1.96661716, 0.7013559, -0.47279141,
];
const SKEWED10 = [0.5, 1.2, 2.3, 3.8, 5.1, 7.2, 9.5, 12.3, 15.8, 20.1];
// exponential quantiles at (i + 0.5)/30: a plainly non-normal sample
const EXP30 = Array.from({ length: 30 }, (_, i) => Math.round(-Math.log(1 - (i + 0.5) / 30) * 1e6) / 1e6);
const ONE_TO_100 = Array.from({ length: 100 }, (_, i) => i + 1);

describe("summary", () => {
  it("mean, standard deviation (n − 1), median and quartiles equal jstat's", () => {
    for (const xs of [RNORM20, SKEWED10, EXP30, normalSample(997, 12.5, 0.8)]) {
      const s = summarize(xs);
      expect(s.n).toBe(xs.length);
      expect(s.mean).toBeCloseTo(jStat.mean(xs), 12);
      expect(s.std).toBeCloseTo(jStat.stdev(xs, true), 12);
      expect(s.min).toBe(jStat.min(xs));
      expect(s.max).toBe(jStat.max(xs));
      expect(s.median).toBeCloseTo(jStat.median(xs), 12);
      // jStat.percentile without "exclusive" interpolates at rank p·(n − 1), as we do
      expect(s.q1).toBeCloseTo(jStat.percentile(xs, 0.25), 12);
      expect(s.q3).toBeCloseTo(jStat.percentile(xs, 0.75), 12);
    }
  });

  it("keeps full accuracy for values with a large offset (NIST StRD univariate NumAcc1, NumAcc3, NumAcc4; certified values from memory)", () => {
    // NumAcc1: 10000001, 10000003, 10000002 → mean 10000002, s = 1
    const a1 = summarize([10000001, 10000003, 10000002]);
    expect(a1.mean).toBe(10000002);
    expect(a1.std).toBeCloseTo(1, 12);
    // NumAcc3: 1000000.2, then 1000000.1 and 1000000.3 alternating (1001 values) → mean 1000000.2, s = 0.1
    const a3 = [1000000.2, ...Array.from({ length: 1000 }, (_, i) => (i % 2 === 0 ? 1000000.1 : 1000000.3))];
    expect(summarize(a3).mean).toBeCloseTo(1000000.2, 8);
    expect(summarize(a3).std).toBeCloseTo(0.1, 8);
    // NumAcc4: the same around 10000000.2 → mean 10000000.2, s = 0.1
    const a4 = [10000000.2, ...Array.from({ length: 1000 }, (_, i) => (i % 2 === 0 ? 10000000.1 : 10000000.3))];
    expect(summarize(a4).mean).toBeCloseTo(10000000.2, 7);
    expect(summarize(a4).std).toBeCloseTo(0.1, 7);
  });

  it("interpolated quantiles at the order statistics", () => {
    const s = sortedCopy([4, 1, 3, 2]);
    expect(quantileSorted(s, 0)).toBe(1);
    expect(quantileSorted(s, 1)).toBe(4);
    expect(quantileSorted(s, 0.5)).toBe(2.5);
    expect(quantileSorted(s, 0.25)).toBe(1.75);
  });
});

describe("normal distribution", () => {
  it("Φ agrees with jstat in the body and with tabulated values in the tails", () => {
    for (let x = -5; x <= 5; x += 0.125) expect(Math.abs(normalCdf(x) - jStat.normal.cdf(x, 0, 1))).toBeLessThan(1e-14);
    // Standard normal table values (Abramowitz & Stegun, Handbook, Table 26.1; from memory),
    // the far tail as printed by SciPy 1.17 scipy.stats.norm.cdf on this machine.
    expect(normalCdf(1.96)).toBeCloseTo(0.9750021048517795, 15);
    expect(normalCdf(-3)).toBeCloseTo(0.0013498980316301, 15);
    const tail: Array<[number, number]> = [
      [-6, 9.865876450376946e-10],
      [-7.5, 3.1908916729108844e-14],
      [-5, 2.866515718791933e-7],
    ];
    for (const [x, p] of tail) expect(Math.abs(normalCdf(x) / p - 1)).toBeLessThan(2e-8);
  });
});

describe("Anderson–Darling normality test", () => {
  it("A² equals SciPy's scipy.stats.anderson (SciPy 1.17.1, run on this machine) for four samples", () => {
    // scipy.stats.anderson(x, 'norm').statistic: mean and σ (n − 1) estimated, as here
    const cases: Array<[number[], number]> = [
      [RNORM20, 0.2654385207277876],
      [SKEWED10, 0.3098134289525625],
      [EXP30, 1.3651627485140736],
      [ONE_TO_100, 1.0837094127385285],
    ];
    for (const [xs, a2] of cases) expect(andersonDarling(xs)!.a2).toBeCloseTo(a2, 12);
  });

  it("A² equals a direct evaluation of the defining sum with jstat's normal CDF", () => {
    const xs = normalSample(250, -0.03, 0.11, 99);
    const n = xs.length;
    const mean = jStat.mean(xs),
      sd = jStat.stdev(xs, true);
    const s = [...xs].sort((a, b) => a - b);
    let sum = 0;
    for (let i = 1; i <= n; i++) {
      const F = (v: number) => jStat.normal.cdf(v, mean, sd);
      sum += (2 * i - 1) * (Math.log(F(s[i - 1])) + Math.log(1 - F(s[n - i])));
    }
    expect(andersonDarling(xs)!.a2).toBeCloseTo(-n - sum / n, 9);
  });

  it("the p-value of A* matches the percentage points of D'Agostino & Stephens (1986), Table 4.7, case 3 (from memory)", () => {
    // upper-tail points of A* = A²(1 + 0.75/n + 2.25/n²)
    const points: Array<[number, number]> = [
      [0.341, 0.5],
      [0.47, 0.25],
      [0.561, 0.15],
      [0.631, 0.1],
      [0.752, 0.05],
      [0.873, 0.025],
      [1.035, 0.01],
      [1.159, 0.005],
    ];
    for (const [a, p] of points) expect(Math.abs(adPValue(a) / p - 1), `A* = ${a}`).toBeLessThan(0.03);
  });

  it("agrees with the critical values of Stephens (1974) as SciPy scales them for n (5 %, 2.5 %, 1 %)", () => {
    // SciPy's critical values for n = 20, 30, 100: Stephens' 0.787, 0.918, 1.092 divided by (1 + 4/n − 25/n²).
    // A different small-sample correction from ours, so agreement within 15 % of the level is what to expect.
    const crit: Record<number, number[]> = { 20: [0.721, 0.837, 0.992], 30: [0.732, 0.85, 1.007], 100: [0.746, 0.866, 1.027] };
    const levels = [0.05, 0.025, 0.01];
    for (const [n, cs] of Object.entries(crit)) {
      const k = 1 + 0.75 / Number(n) + 2.25 / Number(n) ** 2;
      cs.forEach((c, i) => expect(Math.abs(adPValue(c * k) / levels[i] - 1), `n = ${n}, ${levels[i]}`).toBeLessThan(0.15));
    }
  });

  it("does not reject normal samples and rejects clearly skewed ones; needs eight values and some spread", () => {
    expect(andersonDarling(RNORM20)!.normalAt5pct).toBe(true);
    expect(andersonDarling(normalSample(5000, 0, 1, 3))!.pValue).toBeGreaterThan(0.05);
    expect(andersonDarling(EXP30)!.pValue).toBeLessThan(0.01);
    expect(andersonDarling(EXP30)!.normalAt5pct).toBe(false);
    expect(andersonDarling([1, 2, 3, 4, 5, 6, 7])).toBeNull();
    expect(andersonDarling(Array(20).fill(0.2))).toBeNull();
  });

  it("rejects normality at about 5 % of normal samples of 48 (the modified statistic is calibrated)", () => {
    let rejected = 0;
    const runs = 2000;
    for (let r = 0; r < runs; r++) if (!andersonDarling(normalSample(48, 0, 1, 1000 + r))!.normalAt5pct) rejected++;
    // binomial(2000, 0.05): mean 100, σ 9.7
    expect(rejected).toBeGreaterThan(100 - 40);
    expect(rejected).toBeLessThan(100 + 40);
  });
});

describe("capability", () => {
  it("Cp and Cpk by their definitions (Cp = (USL − LSL)/6σ, Cpk = min(USL − μ, μ − LSL)/3σ)", () => {
    const xs = normalSample(400, 0.05, 0.1, 5);
    const c = capability(xs, -0.4, 0.4)!;
    const m = jStat.mean(xs),
      s = jStat.stdev(xs, true);
    expect(c.cp).toBeCloseTo(0.8 / (6 * s), 12);
    expect(c.cpk).toBeCloseTo(Math.min(0.4 - m, m + 0.4) / (3 * s), 12);
    expect(c.observedOut).toBe(xs.filter((x) => Math.abs(x) > 0.4).length);
  });

  it("fraction out of a centred normal process: Cpk 1.00 → 2700 ppm, 1.33 → 63 ppm, 1.67 → 0.57 ppm (REFERENCES.md)", () => {
    const at = (T: number) => capability([-1, 1], -T, T, { mean: 0, std: 1 })!;
    expect(at(3).cpk).toBeCloseTo(1, 12);
    expect(at(3).expectedPpm).toBeCloseTo(2700, -1);
    expect(at(4).cpk).toBeCloseTo(1.333, 3);
    expect(Math.round(at(4).expectedPpm)).toBe(63);
    expect(at(5).cpk).toBeCloseTo(1.667, 3);
    expect(at(5).expectedPpm).toBeCloseTo(0.57, 2);
  });

  it("an off-centre process loses Cpk but not Cp", () => {
    const c = capability([0, 2], -3, 3, { mean: 1, std: 1 })!;
    expect(c.cp).toBeCloseTo(1, 12);
    expect(c.cpk).toBeCloseTo(2 / 3, 12);
    // Φ(−4) + Φ(−2), by jstat
    expect(c.expectedPpm).toBeCloseTo(1e6 * (jStat.normal.cdf(-4, 0, 1) + jStat.normal.cdf(-2, 0, 1)), 3);
  });

  it("no capability without spread or without a window", () => {
    expect(capability([1, 1, 1], -1, 2)).toBeNull();
    expect(capability([1, 2, 3], 1, 1)).toBeNull();
  });
});

describe("outliers", () => {
  it("flags |modified z| > 3.5 with the median absolute deviation from jstat", () => {
    const xs = [...normalSample(47, 0, 1, 17), 9];
    const med = jStat.median(xs);
    const mad = jStat.meddev(xs);
    const expected = xs.map((x, i) => ({ i, z: (0.6745 * (x - med)) / mad })).filter((o) => Math.abs(o.z) > 3.5);
    const found = outliers(xs);
    expect(found.map((o) => o.index)).toEqual(expected.map((o) => o.i));
    expect(found.at(-1)!.index).toBe(47);
    for (const [k, o] of found.entries()) expect(o.score).toBeCloseTo(expected[k].z, 10);
  });

  it("worked example: 1, 2, 3, 4, 100 (median 3, MAD 1): only 100 is out, at M = 65.4", () => {
    const o = outliers([1, 2, 3, 4, 100]);
    expect(o).toHaveLength(1);
    expect(o[0].value).toBe(100);
    expect(o[0].score).toBeCloseTo(0.6745 * 97, 10);
  });

  it("with MAD = 0 the mean absolute deviation stands in", () => {
    const o = outliers([5, 5, 5, 5, 5, 5, 5, 6]);
    // meanAD = 1/8; M = 1 / (1.253314 · 0.125) = 6.38
    expect(o.map((x) => x.value)).toEqual([6]);
    expect(o[0].score).toBeCloseTo(1 / (1.253314 * 0.125), 8);
    expect(outliers([2, 2, 2, 2])).toEqual([]);
  });
});

describe("histogram", () => {
  it("counts every value once, covers the tolerance window and scales the normal curve to counts", () => {
    const xs = normalSample(480, 0.02, 0.05, 21);
    const h = histogram(xs, { lsl: -0.4, usl: 0.4 });
    expect(h.bins.reduce((s, b) => s + b.count, 0)).toBe(480);
    expect(h.bins.length).toBeGreaterThanOrEqual(5);
    expect(h.bins.length).toBeLessThanOrEqual(40);
    expect(h.domain[0]).toBeLessThan(-0.4);
    expect(h.domain[1]).toBeGreaterThan(0.4);
    // the area under the curve equals the area of the bars: n · bin width
    const w = h.bins[0].to - h.bins[0].from;
    let area = 0;
    for (let i = 1; i < h.curve.length; i++) area += ((h.curve[i].y + h.curve[i - 1].y) / 2) * (h.curve[i].x - h.curve[i - 1].x);
    expect(area / (480 * w)).toBeCloseTo(1, 2);
  });

  it("one value or all equal: a single bin, no curve", () => {
    const h = histogram([0.3, 0.3, 0.3]);
    expect(h.bins).toHaveLength(1);
    expect(h.bins[0].count).toBe(3);
    expect(h.curve).toEqual([]);
  });
});
