/**
 * Measured rows (issue 13): a source whose draws are one unit's measurements taken together
 * (a bond line's corner heights, a tilt's x and y, six axis angles). Every trial takes one
 * whole row, and the bond-line plane fit of MODEL.md §3 turns measured heights into the tilt
 * exactly as it does sampled ones.
 */
import { describe, expect, it } from "vitest";
import { compileModel, createScratch, evaluateTrial } from "@shared/engine/model";
import { drawsOfTrial } from "@shared/engine/sampling";
import { poseOfTrial, runStudy } from "@shared/engine/study";
import { DEG } from "@shared/engine/rotation";
import { validateStackFile } from "@shared/schemas/stack-file";
import { stackOf, study, studyOf } from "./helpers";

function oneDie(die: Record<string, unknown>) {
  return {
    format: "orthostack.stack/1",
    elements: [
      { id: "board", kind: "board", parent: null, size: { x: 30, y: 20, z: 1 } },
      { id: "die", kind: "asic", parent: "board", size: { x: 2, y: 1, z: 0.2 }, ...die },
    ],
  };
}

/** Heights h = a + b·x + c·y (um, x and y in mm) at the corners in MODEL.md's order. */
const corners = (a: number, b: number, c: number, hx = 1, hy = 0.5) =>
  [
    [-hx, -hy],
    [hx, -hy],
    [hx, hy],
    [-hx, hy],
  ].map(([x, y]) => a + b * x + c * y);

describe("measured rows", () => {
  it("four corner heights with a known slope give the known tilt (hand computation)", () => {
    // Die 2 × 1 mm; heights 20 + 5·x + 2·y um: slopes 5 um/mm = 0.005 and 0.002.
    // Tilt = atan(√(0.005² + 0.002²)) = atan(0.00538516) = 0.00538511 rad = 0.308544°.
    const rows = [corners(20, 5, 2), corners(20, 5, 2)];
    const st = stackOf(oneDie({ bondLine: { heightTol: { dist: "data", rows } } }));
    const pose = poseOfTrial(st, studyOf(study({ trials: 10 }), st), 3);
    expect(pose.draws["die.bondLine"]).toEqual(rows[0]);
    expect(pose.metrics["die.tiltDeg"]).toBeCloseTo(0.308544, 6);
    expect(pose.metrics["die.tiltDeg"]).toBeCloseTo(Math.atan(Math.hypot(0.005, 0.002)) / DEG, 10);
  });

  it("every trial draws one whole unit: the corners of a unit never mix with another's", () => {
    // Two units: one wedged along x, one flat. Independent corners would mix them into
    // tilts other than these two values; whole rows give exactly 0 or atan(0.01/2).
    const rows = [corners(10, 5, 0), corners(10, 0, 0)];
    const st = stackOf(oneDie({ bondLine: { heightTol: { dist: "data", rows } } }));
    for (const sampling of ["random", "lhs"]) {
      const sd = studyOf(study({ trials: 400, sampling }), st);
      const m = compileModel(st, sd);
      const s = createScratch(m);
      const k = m.metrics.findIndex((x) => x.id === "die.tiltDeg");
      const seen = new Map<string, number>();
      for (let t = 0; t < 400; t++) {
        evaluateTrial(m, drawsOfTrial(m, sampling as "random" | "lhs", 1, 400, t), s);
        const v = s.metrics[k].toFixed(9);
        seen.set(v, (seen.get(v) ?? 0) + 1);
      }
      expect([...seen.keys()].sort()).toEqual([(0).toFixed(9), (Math.atan(0.005) / DEG).toFixed(9)].sort());
      // each unit about half the trials (Latin hypercube: exactly half)
      for (const n of seen.values()) expect(Math.abs(n - 200)).toBeLessThan(sampling === "lhs" ? 1 : 45);
    }
  });

  it("the study's trials agree with the regenerated ones, and the tilt's x and y stay together", () => {
    const rows = [
      [0.1, -0.1],
      [0.2, 0.2],
      [-0.3, 0],
    ];
    const st = stackOf(oneDie({ tiltTol: { xy: { dist: "data", rows } } }));
    const sd = studyOf(study({ trials: 300 }), st);
    const r = runStudy(st, sd);
    const want = rows.map(([x, y]) => {
      // D = rot((x, y, 0)) in degrees: the die normal turns by |(x, y)|
      return Math.hypot(x, y);
    });
    for (let t = 0; t < 20; t++) {
      const p = poseOfTrial(st, sd, t);
      const [x, y] = p.draws["die.tilt"];
      expect(rows.some((row) => row[0] === x && row[1] === y)).toBe(true);
      expect(want.some((w) => Math.abs(w - p.metrics["die.tiltDeg"]) < 1e-9)).toBe(true);
    }
    expect(r.metrics["die.tiltDeg"].max).toBeCloseTo(Math.max(...want), 9);
  });

  it("a row of the wrong width, rows on a one-draw tolerance, and tilt xy beside x are refused", () => {
    const bad = validateStackFile(
      oneDie({
        bondLine: {
          heightTol: {
            dist: "data",
            rows: [
              [1, 2, 3],
              [1, 2, 3],
            ],
          },
        },
        bowUm: {
          dist: "data",
          rows: [
            [1, 2],
            [3, 4],
          ],
        },
        tiltTol: {
          x: { dist: "normal", tol: 1 },
          xy: {
            dist: "data",
            rows: [
              [1, 2],
              [3, 4],
            ],
          },
        },
      }),
    );
    expect(bad.ok).toBe(false);
    const msgs = bad.ok ? [] : bad.issues.map((i) => `${i.path}: ${i.message}`);
    expect(msgs.some((m) => m.includes("bondLine.heightTol.rows") && m.includes("(4), not 3"))).toBe(true);
    expect(msgs.some((m) => m.includes("bowUm.rows"))).toBe(true);
    expect(msgs.some((m) => m.includes("tiltTol.xy") && m.includes("one or the other"))).toBe(true);
    const uneven = validateStackFile(
      oneDie({
        bondLine: {
          heightTol: {
            dist: "data",
            rows: [
              [1, 2, 3, 4],
              [1, 2, 3],
            ],
          },
        },
      }),
    );
    expect(uneven.ok).toBe(false);
  });
});
