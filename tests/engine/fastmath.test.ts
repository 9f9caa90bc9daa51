// The series in shared/engine/fastmath.ts replace Math.* only where they agree with it to
// rounding; these checks hold them to Math.* (the exact path) over and beyond their ranges.
import { describe, expect, it } from "vitest";
import { atan2Fast, atan2To, cosFast, sinCosTo, sinFast, tanFast, tanTo } from "@shared/engine/fastmath";
import { compileDist, sampleDist, sampleInto } from "@shared/engine/distributions";
import { Xoshiro128ss } from "@shared/engine/random";

const g = new Xoshiro128ss(5, 6, 7, 8);
const rnd = () => 2 * g.nextOpen01() - 1;
const ulps = (a: number, b: number) => Math.abs(a - b) / (Number.EPSILON * Math.max(Math.abs(b), Number.MIN_VALUE));

describe("small-argument series against Math.*", () => {
  it("atan2Fast within 2 ulp of Math.atan2 on every branch, and exact in sign and quadrant", () => {
    let worst = 0;
    for (let i = 0; i < 200_000; i++) {
      const x = rnd() * 10 ** (3 * rnd());
      const y = x * (0.2 * rnd()) + (i % 7 === 0 ? rnd() : 0);
      const a = atan2Fast(y, x),
        b = Math.atan2(y, x);
      if (b !== 0) worst = Math.max(worst, ulps(a, b));
      else expect(a).toBe(0);
    }
    expect(worst).toBeLessThan(2);
    expect(atan2Fast(0, -1)).toBe(Math.PI);
    expect(atan2Fast(-1e-300, 1)).toBe(Math.atan2(-1e-300, 1));
  });

  it("tanFast, sinFast, cosFast within 2 ulp of Math.tan, Math.sin, Math.cos", () => {
    let wt = 0,
      ws = 0,
      wc = 0;
    for (let i = 0; i < 200_000; i++) {
      const a = 0.3 * rnd() * 10 ** (-4 * Math.abs(rnd()));
      wt = Math.max(wt, ulps(tanFast(a), Math.tan(a)));
      ws = Math.max(ws, ulps(sinFast(a), Math.sin(a)));
      wc = Math.max(wc, ulps(cosFast(a), Math.cos(a)));
    }
    expect(wt).toBeLessThan(2);
    expect(ws).toBeLessThan(2);
    expect(wc).toBeLessThan(2);
  });
});

describe("out-parameter forms used by the trial loop", () => {
  it("atan2To, tanTo, sinCosTo give the same numbers as atan2Fast, tanFast, sinFast/cosFast", () => {
    const out = new Float64Array(8);
    const a = new Float64Array(6);
    for (let i = 0; i < 20_000; i++) {
      const x = rnd() * 3,
        y = rnd() * 0.5;
      atan2To(y, x, out, 0);
      expect(out[0]).toBe(atan2Fast(y, x));
      for (let k = 0; k < 6; k++) a[k] = rnd() * 8;
      tanTo(a, 0, Math.PI / 180, 6, out, 1);
      for (let k = 0; k < 6; k++) expect(out[1 + k]).toBe(tanFast(a[k] * (Math.PI / 180)));
      const t = rnd() * 0.3;
      sinCosTo(a, 2, Math.PI / 180, out, 6);
      expect(out[6]).toBe(sinFast(a[2] * (Math.PI / 180)));
      expect(out[7]).toBe(cosFast(a[2] * (Math.PI / 180)));
      a[0] = t;
      sinCosTo(a, 0, 1, out, 6);
      expect(out[6]).toBe(sinFast(t));
      expect(out[7]).toBe(cosFast(t));
    }
  });

  it("sampleInto (AS 241 inlined) gives exactly the draws of sampleDist", () => {
    const dists = [
      compileDist({ dist: "normal", tol: 3, mean: 0.5 }),
      compileDist({ dist: "uniform", tol: 2 }),
      compileDist({ dist: "triangular", tol: 1, mean: -1 }),
      compileDist({ dist: "data", values: [3, 1, 2] }),
    ];
    const u = new Float64Array(dists.length);
    const out = new Float64Array(dists.length);
    for (let i = 0; i < 50_000; i++) {
      for (let k = 0; k < u.length; k++) u[k] = i % 97 === 0 ? 10 ** (-13 * g.nextOpen01()) : g.nextOpen01();
      sampleInto(dists, u, 0, out);
      for (let k = 0; k < u.length; k++) expect(out[k]).toBe(sampleDist(dists[k], u[k]));
    }
  });
});
