// The screened compass sweep (heading.ts headingSweepScreened, the default) against the exact
// one (headingEvaluation: "exact", every attitude's angle): the same max and RMS per trial to
// far below Monte Carlo error, and the same reported figures for whole studies, on the
// reference stack and on stacks with large tilts, high inclination and large errors.
import { describe, expect, it } from "vitest";
import { buildAttitudes, headingSweep, headingSweepScreened } from "@shared/engine/heading";
import { runStudy } from "@shared/engine/study";
import { mat3 } from "@shared/engine/mat3";
import { rotVec, DEG } from "@shared/engine/rotation";
import type { ResultFile } from "@shared/schemas/result-file";
import { compassStack, fixture, referenceStack, study, studyOf } from "./helpers";

/** A cross-axis matrix: a rotation by (a, b, c) deg with a small non-orthogonal part. */
function crossAxis(a: number, b: number, c: number, skew: number): Float64Array {
  const R = rotVec(a * DEG, b * DEG, c * DEG, mat3());
  R[1] += skew;
  R[5] -= skew / 2;
  return R;
}

describe("screened sweep, one trial at a time", () => {
  it("max |e| and RMS equal the exact sweep's to 1e-9 of their value, small and large errors alike", () => {
    const tilts = [
      { pitchDeg: 0, rollDeg: 0 },
      { pitchDeg: 75, rollDeg: 0 },
      { pitchDeg: -60, rollDeg: 45 },
      { pitchDeg: 20, rollDeg: -85 },
    ];
    let wide = 0;
    for (const inclinationDeg of [0, 60, 85, -70]) {
      const att = buildAttitudes({ inclinationDeg, headingStepDeg: 5, tilts });
      const out = new Float64Array(att.count);
      // errors from hundredths of a degree to beyond 90 deg (ex <= 0 at some attitudes)
      for (const size of [0.01, 0.2, 1, 3, 20, 120]) {
        const Ca = crossAxis(size, -0.5 * size, 0.3 * size, 0.001 * size);
        const Cm = crossAxis(-0.7 * size, 0.4 * size, size, -0.002 * size);
        const ex = headingSweep(Ca, 0, Cm, 0, att, out);
        const exact = { maxAbs: ex.maxAbs, rms: ex.rms };
        const sc = headingSweepScreened(Ca, 0, Cm, 0, att);
        expect(Math.abs(sc.maxAbs - exact.maxAbs)).toBeLessThanOrEqual(1e-9 * exact.maxAbs + 1e-15);
        expect(Math.abs(sc.rms - exact.rms)).toBeLessThanOrEqual(1e-9 * exact.rms + 1e-15);
        if (exact.maxAbs > 1.8) wide++;
      }
    }
    expect(wide).toBeGreaterThan(4); // the exactly evaluated branch was exercised
  });

  it("headings that do not pair up half a turn apart take the one-by-one loop, with the same figures", () => {
    // 7° steps: 52 headings, the last at 357°, none exactly opposite another; 24° steps: 15,
    // an odd count. 10° steps pair up (the reference study), the control.
    for (const [headingStepDeg, pairs] of [
      [7, false],
      [24, false],
      [10, true],
    ] as const) {
      const att = buildAttitudes({ inclinationDeg: 65, headingStepDeg, tilts: [{ pitchDeg: 25, rollDeg: -15 }] });
      expect(att.halfTurnPairs).toBe(pairs);
      const out = new Float64Array(att.count);
      for (const size of [0.3, 4]) {
        const Ca = crossAxis(size, 0.4 * size, -0.6 * size, 0.002 * size);
        const Cm = crossAxis(-size, 0.5 * size, 0.8 * size, 0.001 * size);
        const exact = headingSweep(Ca, 0, Cm, 0, att, out);
        const [maxAbs, rms] = [exact.maxAbs, exact.rms];
        const sc = headingSweepScreened(Ca, 0, Cm, 0, att);
        expect(Math.abs(sc.maxAbs - maxAbs)).toBeLessThanOrEqual(1e-9 * maxAbs);
        expect(Math.abs(sc.rms - rms)).toBeLessThanOrEqual(1e-9 * rms);
      }
    }
  });
});

const FIGURES = ["mean", "std", "p50", "p95", "p99", "p9973", "max", "minValue", "maxValue"] as const;

/** Every reported figure of the two results, side by side; relative differences returned. */
function compare(a: ResultFile, b: ResultFile): number {
  let worst = 0;
  const rel = (x: number, y: number) => (x === y ? 0 : Math.abs(x - y) / Math.max(Math.abs(x), Math.abs(y), 1e-12));
  expect(Object.keys(b.metrics)).toEqual(Object.keys(a.metrics));
  for (const [id, m] of Object.entries(a.metrics)) {
    const n = b.metrics[id];
    for (const f of FIGURES) worst = Math.max(worst, rel(m[f], n[f]));
    for (const k of [0, 1] as const) {
      worst = Math.max(worst, rel(m.interval95![k], n.interval95![k]), rel(m.shortest95![k], n.shortest95![k]));
    }
  }
  a.requirements.forEach((r, i) => {
    const s = b.requirements[i];
    expect(s.predictedYield).toBe(r.predictedYield);
    expect(s.passes).toBe(r.passes);
    worst = Math.max(worst, rel(r.limitAtTarget, s.limitAtTarget));
  });
  // the heading envelope is filled by the exact sweep on both paths
  expect(JSON.stringify(b.envelope)).toBe(JSON.stringify(a.envelope));
  return worst;
}

describe("screened and exact studies report the same figures", () => {
  // Monte Carlo error of a percentile at these sizes is of the order of 1 %; the two paths
  // differ by rounding only (the series above), so 1e-6 is far inside it.
  const cases: [string, () => ResultFile[]][] = [
    [
      "the reference stack and study",
      () => {
        const stack = referenceStack();
        const base = fixture("study-reference.json") as Record<string, unknown>;
        return ["screened", "exact"].map((h) => runStudy(stack, studyOf({ ...base, headingEvaluation: h }, stack), { trials: 12_000 }));
      },
    ],
    [
      "large tilts, inclination 80 deg, errors of several degrees",
      () => {
        const stack = compassStack(
          { axisTol: { dist: "normal", tol: 2.5 } },
          { axisTol: { dist: "normal", tol: 2 }, tiltTol: { x: { dist: "normal", tol: 1.5 }, y: { dist: "uniform", tol: 1.5 } } },
        );
        const tilts = [
          { pitchDeg: 0, rollDeg: 0 },
          { pitchDeg: 70, rollDeg: 0 },
          { pitchDeg: -70, rollDeg: 0 },
          { pitchDeg: 0, rollDeg: 80 },
          { pitchDeg: 45, rollDeg: -60 },
        ];
        return ["screened", "exact"].map((h) =>
          runStudy(
            stack,
            studyOf(
              study({
                trials: 12_000,
                seed: 5,
                inclinationDeg: 80,
                tilts,
                headingEvaluation: h,
                requirements: [{ metric: "heading.maxAbsDeg", max: 10, yield: 0.9 }],
              }),
              stack,
            ),
          ),
        );
      },
    ],
    [
      "high southern inclination, small errors",
      () => {
        const stack = compassStack({ axisTol: { dist: "normal", tol: 0.05 } }, { axisTol: { dist: "normal", tol: 0.05 } });
        return ["screened", "exact"].map((h) =>
          runStudy(stack, studyOf(study({ trials: 9000, seed: 2, inclinationDeg: -75, headingEvaluation: h }), stack)),
        );
      },
    ],
  ];
  for (const [name, run] of cases) {
    it(name, () => {
      const [screened, exact] = run();
      expect(screened.headingEvaluation).toBe("screened");
      expect(exact.headingEvaluation).toBe("exact");
      expect(compare(exact, screened)).toBeLessThan(1e-6);
    });
  }
});
