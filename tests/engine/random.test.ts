import { describe, expect, it } from "vitest";
import jStat from "jstat";
import { blockStream, SplitMix64, Xoshiro128ss, type U64 } from "@shared/engine/random";
import { normInv, compileDist, sampleDist } from "@shared/engine/distributions";

// Reference outputs produced by the authors' C code of xoshiro128** 1.1 and splitmix64
// (Blackman and Vigna, public domain), see tests/engine/reference/xoshiro128ss-reference.c.
const XOSHIRO_1234 = [11520, 0, 5927040, 70819200, 2031721883, 1637235492, 1287239034, 3734860849, 3729100597, 4258142804];
const XOSHIRO_AFTER_JUMP = [3637068021, 4046953083, 519179613, 3034282689, 1958767868];
const SPLITMIX_1234567 = [
  "6457827717110365317",
  "3203168211198807973",
  "9817491932198370423",
  "4593380528125082431",
  "16408922859458223821",
];
const SPLITMIX_0 = ["16294208416658607535", "7960286522194355700", "487617019471545679"];

const big = (x: U64) => (BigInt(x.hi) << 32n) | BigInt(x.lo);

describe("xoshiro128** and splitmix64 against their authors' reference output", () => {
  it("xoshiro128** from state {1,2,3,4}", () => {
    // reference/xoshiro128ss-reference.c: first ten outputs
    const g = new Xoshiro128ss(1, 2, 3, 4);
    expect(Array.from({ length: 10 }, () => g.nextU32())).toEqual(XOSHIRO_1234);
  });

  it("xoshiro128** jump() (2^64 steps)", () => {
    // reference/xoshiro128ss-reference.c: ten more draws, jump(), five outputs
    const g = new Xoshiro128ss(1, 2, 3, 4);
    g.skip(20);
    g.jump();
    expect(Array.from({ length: 5 }, () => g.nextU32())).toEqual(XOSHIRO_AFTER_JUMP);
  });

  it("splitmix64 in 32-bit halves matches the 64-bit reference", () => {
    // reference/xoshiro128ss-reference.c; the 1234567 sequence is also the one commonly
    // published for splitmix64 (6457827717110365317, 3203168211198807973, ...)
    for (const [seed, want] of [
      [1234567, SPLITMIX_1234567],
      [0, SPLITMIX_0],
    ] as const) {
      const s = new SplitMix64(0, seed);
      const out: U64 = { hi: 0, lo: 0 };
      expect(want.map(() => big(s.next(out)).toString())).toEqual(want);
    }
  });

  it("splitmix64 agrees with a BigInt implementation on random 64-bit seeds", () => {
    const M = (1n << 64n) - 1n;
    const ref = (x: bigint) => {
      x = (x + 0x9e3779b97f4a7c15n) & M;
      let z = x;
      z = ((z ^ (z >> 30n)) * 0xbf58476d1ce4e5b9n) & M;
      z = ((z ^ (z >> 27n)) * 0x94d049bb133111ebn) & M;
      return [x, z ^ (z >> 31n)] as const;
    };
    const g = new Xoshiro128ss(9, 8, 7, 6);
    for (let t = 0; t < 200; t++) {
      const hi = g.nextU32(),
        lo = g.nextU32();
      let x = (BigInt(hi) << 32n) | BigInt(lo);
      const s = new SplitMix64(hi, lo);
      const out: U64 = { hi: 0, lo: 0 };
      for (let k = 0; k < 3; k++) {
        const [nx, z] = ref(x);
        x = nx;
        expect(big(s.next(out))).toBe(z);
      }
    }
  });

  it("block streams depend on seed and block only, and differ between blocks", () => {
    const a = blockStream(7, 3),
      b = blockStream(7, 3),
      c = blockStream(7, 4),
      d = blockStream(8, 3);
    const take = (g: Xoshiro128ss) => Array.from({ length: 8 }, () => g.nextU32());
    const ta = take(a);
    expect(take(b)).toEqual(ta);
    expect(take(c)).not.toEqual(ta);
    expect(take(d)).not.toEqual(ta);
  });

  it("open uniforms stay inside (0, 1) and have mean 1/2, variance 1/12", () => {
    const g = blockStream(1, 0);
    const n = 200_000;
    let s = 0,
      s2 = 0,
      lo = 1,
      hi = 0;
    for (let i = 0; i < n; i++) {
      const u = g.nextOpen01();
      s += u;
      s2 += u * u;
      lo = Math.min(lo, u);
      hi = Math.max(hi, u);
    }
    const mean = s / n,
      v = s2 / n - mean * mean;
    expect(lo).toBeGreaterThan(0);
    expect(hi).toBeLessThan(1);
    // standard errors: sqrt(1/12/n) for the mean, sqrt(1/180/n) for the variance of U(0,1)
    expect(Math.abs(mean - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / n));
    expect(Math.abs(v - 1 / 12)).toBeLessThan(5 * Math.sqrt(1 / 180 / n));
  });
});

describe("distributions", () => {
  it("inverse normal CDF (AS 241) agrees with jstat's normal quantile", () => {
    // jstat: an independent implementation of the normal quantile; its own relative
    // accuracy is about 1e-10 down to p = 1e-8 and 2e-7 at p = 1e-12
    for (const p of [1e-8, 1e-5, 0.00135, 0.01, 0.025, 0.1, 0.3, 0.5, 0.7, 0.9, 0.975, 0.99, 0.99865, 1 - 1e-6]) {
      const ref = jStat.normal.inv(p, 0, 1);
      expect(Math.abs(normInv(p) - ref)).toBeLessThan(1e-9 * Math.max(1, Math.abs(ref)));
    }
    expect(Math.abs(normInv(1e-12) - jStat.normal.inv(1e-12, 0, 1))).toBeLessThan(2e-6);
    // symmetry holds to rounding, and the round trip through jstat's CDF
    for (const p of [1e-6, 0.01, 0.2, 0.45]) {
      expect(normInv(1 - p)).toBeCloseTo(-normInv(p), 9);
      expect(jStat.normal.cdf(normInv(p), 0, 1)).toBeCloseTo(p, 12);
    }
  });

  it("GUM coverage factors: 1.960 at 95 %, 3 at 99.73 % (JCGM 100:2008)", () => {
    // REFERENCES.md, GUM: k = 1.960 for 95 %, 3 for 99.73 % (normal)
    expect(normInv(0.975)).toBeCloseTo(1.96, 3);
    expect(normInv(0.5 + 0.9973 / 2)).toBeCloseTo(3, 2);
  });

  it("tolerance readings: normal tol = 3 sigma, rectangular a/sqrt(3), triangular a/sqrt(6)", () => {
    // MODEL.md section 8 and REFERENCES.md (GUM: rectangular u = a/sqrt(3), triangular a/sqrt(6))
    expect(compileDist({ dist: "normal", tol: 3 }).sigma).toBe(1);
    expect(compileDist({ dist: "normal", tol: 3, sigmas: 6 }).sigma).toBe(0.5);
    expect(compileDist({ dist: "uniform", tol: 1 }).sigma).toBeCloseTo(1 / Math.sqrt(3), 15);
    expect(compileDist({ dist: "triangular", tol: 1 }).sigma).toBeCloseTo(1 / Math.sqrt(6), 15);
    const tri = compileDist({ dist: "triangular", tol: 2, mean: 1 });
    expect(sampleDist(tri, 0.5)).toBeCloseTo(1, 12);
    expect(sampleDist(tri, 1e-12)).toBeCloseTo(-1, 5);
    expect(sampleDist(compileDist({ dist: "uniform", tol: 2, mean: 1 }), 0.75)).toBe(2);
  });

  it("sampled triangular and data distributions have the stated spread", () => {
    const g = blockStream(3, 0);
    const tri = compileDist({ dist: "triangular", tol: 1 });
    const data = compileDist({ dist: "data", values: [1, 2, 3, 4] });
    const n = 100_000;
    let s2 = 0,
      sd = 0,
      sd2 = 0;
    for (let i = 0; i < n; i++) {
      const x = sampleDist(tri, g.nextOpen01());
      s2 += x * x;
      const y = sampleDist(data, g.nextOpen01());
      sd += y;
      sd2 += y * y;
    }
    // var of a symmetric triangular on ±1 is 1/6; SE of a variance estimate sqrt((m4 − σ⁴)/n), m4 = 1/15
    expect(Math.abs(s2 / n - 1 / 6)).toBeLessThan(5 * Math.sqrt((1 / 15 - 1 / 36) / n));
    // resampling four values: mean 2.5, variance 1.25
    expect(Math.abs(sd / n - 2.5)).toBeLessThan(5 * Math.sqrt(1.25 / n));
    // its variance: m4 of 1..4 about 2.5 is 2.5625, so the SE is sqrt((2.5625 − 1.25²)/n) = sqrt(1/n)
    expect(Math.abs(sd2 / n - (sd / n) ** 2 - 1.25)).toBeLessThan(5 * Math.sqrt(1 / n));
    expect(data.sigma).toBeCloseTo(Math.sqrt(1.25), 12);
  });
});
