import { describe, expect, it } from "vitest";
import { compileModel, createScratch, evaluateTrial, metricIds } from "@shared/engine/model";
import { runStudy } from "@shared/engine/study";
import { DEG } from "@shared/engine/rotation";
import { compassStack, quantileSE, referenceStack, stackOf, study, studyOf } from "./helpers";

const tol0 = { dist: "normal", tol: 0 };

function oneDie(die: Record<string, unknown>, board: Record<string, unknown> = {}) {
  return stackOf({
    format: "orthostack.stack/1",
    elements: [
      { id: "board", kind: "board", parent: null, size: { x: 30, y: 20, z: 1 }, ...board },
      { id: "die", kind: "asic", parent: "board", size: { x: 1, y: 1, z: 0.2 }, ...die },
    ],
  });
}

function evalWith(stackJson: ReturnType<typeof stackOf>, set: Record<string, number[]>, studyExtra: Record<string, unknown> = {}) {
  const m = compileModel(stackJson, studyOf(study(studyExtra), stackJson));
  const s = createScratch(m);
  const d = new Float64Array(m.drawCount);
  for (const [id, vals] of Object.entries(set)) {
    const src = m.sources.find((x) => x.id === id);
    if (!src) throw new Error(`no source ${id}`);
    vals.forEach((v, k) => (d[src.offset + k] = v));
  }
  evaluateTrial(m, d, s);
  const out: Record<string, number> = {};
  m.metrics.forEach((mi, k) => (out[mi.id] = s.metrics[k]));
  return { out, m, s };
}

/** Rayleigh(σ): density and the quantile σ·sqrt(−2 ln(1 − p)). */
const rayleighPdf = (x: number, s: number) => (x / (s * s)) * Math.exp((-x * x) / (2 * s * s));

describe("stack model: published and defining check values", () => {
  it("metric ids of the reference stack, in the order of MODEL.md section 7", () => {
    const ids = metricIds(referenceStack(), {});
    expect(ids.slice(0, 4)).toEqual(["gyro.crossAxisPct.xy", "gyro.crossAxisPct.xz", "gyro.crossAxisTotalPct.x", "gyro.axisMisalignDeg.x"]);
    expect(ids).toContain("pkg.tiltDeg");
    expect(ids).not.toContain("board.tiltDeg");
    expect(ids.filter((i) => i.endsWith(".relRotDeg"))).toEqual(["gyro~accel.relRotDeg", "gyro~mag.relRotDeg", "accel~mag.relRotDeg"]);
    expect(ids.slice(-2)).toEqual(["heading.maxAbsDeg", "heading.rmsDeg"]);
    expect(ids.length).toBe(3 * 12 + 5 + 3 + 2);
  });

  it("bond-line wedge D across a die of length L tilts it by atan(D/L): 10 um over 2 mm -> 0.286 deg, over 1 mm -> 0.573 deg", () => {
    // REFERENCES.md, packaging: bond-line wedge
    for (const [L, want] of [
      [2, 0.286],
      [1, 0.573],
    ]) {
      const st = oneDie({ size: { x: L, y: L, z: 0.2 }, bondLine: { heightTol: tol0 } });
      // corners in the order (−x,−y), (x,−y), (x,y), (−x,y): a 10 um wedge along x
      const { out } = evalWith(st, { "die.bondLine": [0, 10, 10, 0] });
      expect(out["die.tiltDeg"]).toBeCloseTo(want, 3);
      expect(out["die.tiltDeg"]).toBeCloseTo(Math.atan(0.01 / L) / DEG, 12);
    }
  });

  it("plane fit through four corners with height sigma s on a die of length L: slope sigma = s/L", () => {
    // REFERENCES.md / MODEL.md section 10: plane-fit sigma rule
    for (const L of [0.5, 1, 3]) {
      const m = compileModel(oneDie({ size: { x: L, y: L, z: 0.2 }, bondLine: { heightTol: tol0 } }), studyOf(study(), oneDie({})));
      const e = m.elements.find((x) => x.id === "die")!;
      const sb = Math.sqrt(e.pb.reduce((a, b) => a + b * b, 0));
      const sc = Math.sqrt(e.pc.reduce((a, b) => a + b * b, 0));
      expect(sb).toBeCloseTo(1e-3 / L, 15); // um -> mm, per unit height sigma
      expect(sc).toBeCloseTo(1e-3 / L, 15);
    }
    // and sampled: the tilt of such a die is Rayleigh in tan, p95 = atan(2.4477·s/L)
    const s = 4,
      L = 1,
      n = 100_000;
    const st = oneDie({ bondLine: { heightTol: { dist: "normal", tol: 3 * s } } });
    const r = runStudy(st, studyOf(study({ trials: n, seed: 5 }), st));
    const sigma = (s * 1e-3) / L;
    const q = 2.4477 * sigma;
    const se = quantileSE(0.95, n, rayleighPdf(q, sigma) * (1 + q * q)) / DEG; // density of atan(slope) in rad
    expect(Math.abs(r.metrics["die.tiltDeg"].p95 - Math.atan(q) / DEG)).toBeLessThan(4.5 * se + (1e-4 * Math.atan(q)) / DEG);
  });

  it("tilt with two independent normal components: Rayleigh percentiles 1.1774, 2.4477, 3.0349, 3.4393 sigma", () => {
    // REFERENCES.md, distributions: Rayleigh quantile sigma·sqrt(−2 ln(1 − p))
    const sigmaDeg = 0.1,
      n = 200_000;
    const st = oneDie({ tiltTol: { x: { dist: "normal", tol: 3 * sigmaDeg }, y: { dist: "normal", tol: 3 * sigmaDeg } } });
    const r = runStudy(st, studyOf(study({ trials: n, seed: 11 }), st));
    const got = r.metrics["die.tiltDeg"];
    const table: [number, number, keyof typeof got][] = [
      [0.5, 1.1774, "p50"],
      [0.95, 2.4477, "p95"],
      [0.99, 3.0349, "p99"],
      [0.9973, 3.4393, "p9973"],
    ];
    for (const [p, k, key] of table) {
      const q = k * sigmaDeg;
      expect(q).toBeCloseTo(sigmaDeg * Math.sqrt(-2 * Math.log(1 - p)), 5);
      const se = quantileSE(p, n, rayleighPdf(q, sigmaDeg));
      expect(Math.abs((got[key] as number) - q)).toBeLessThan(4.5 * se);
    }
    // mean sigma·sqrt(pi/2), SE = sd/sqrt(n) with sd = sigma·sqrt(2 − pi/2)
    expect(Math.abs(got.mean - sigmaDeg * Math.sqrt(Math.PI / 2))).toBeLessThan(
      (4.5 * sigmaDeg * Math.sqrt(2 - Math.PI / 2)) / Math.sqrt(n),
    );
  });

  it("1 deg of axis misalignment gives 1.75 % cross-axis sensitivity (tan 1 deg)", () => {
    // MODEL.md section 10 / REFERENCES.md (common practice): 1 deg ≈ 1.745 %
    const st = compassStack({ axisTol: [1, 2, 3, 4, 5, 6].map(() => tol0) });
    const { out } = evalWith(st, { "acc.axis.g1": [1, 0, 0, 0, 0, 0].slice(0, 1) });
    expect(out["acc.crossAxisPct.xy"]).toBeCloseTo(1.75, 2);
    expect(out["acc.crossAxisPct.xy"]).toBeCloseTo(100 * Math.tan(DEG), 12);
    expect(out["acc.axisMisalignDeg.x"]).toBeCloseTo(1, 12);
    expect(out["acc.crossAxisTotalPct.x"]).toBeCloseTo(100 * Math.tan(DEG), 12);
    expect(out["acc.crossAxisPct.yx"]).toBeCloseTo(0, 14);
  });

  it("board bow: slope at x from the centre is 2·w·x/Rd² (MODEL.md section 3), i.e. 8·s·x/D² for the diagonal D", () => {
    // REFERENCES.md, packaging: a parabolic bow of sag s over length L has slope 8·s·x/L²
    const st = oneDie({ position: { x: 5, y: 0 } }, { bowUm: tol0 });
    const { out } = evalWith(st, { "board.bow": [100] });
    const D = Math.hypot(30, 20);
    expect(out["die.tiltDeg"]).toBeCloseTo(Math.atan((8 * 0.1 * 5) / (D * D)) / DEG, 12);
    // an element at the parent's centre sees no slope
    const centre = evalWith(oneDie({}, { bowUm: tol0 }), { "board.bow": [100] });
    expect(centre.out["die.tiltDeg"]).toBe(0);
  });

  it("placement offsets move an element but do not turn it; yaw errors of two sensors give their relative rotation", () => {
    const st = compassStack({ placementTol: { xUm: tol0, yUm: tol0, yawDeg: tol0 } }, { placementTol: { yawDeg: tol0 } });
    const { out } = evalWith(st, { "acc.x": [40], "acc.y": [-25], "acc.yaw": [0.3], "mag.yaw": [-0.2] });
    expect(out["acc~mag.relRotDeg"]).toBeCloseTo(0.5, 12);
    expect(out["acc.tiltDeg"]).toBe(0);
    const moved = evalWith(st, { "acc.x": [40], "acc.y": [-25] });
    for (const v of Object.values(moved.out)) expect(Math.abs(v)).toBeLessThan(1e-12);
  });

  it("support points turn with the die: a yawed die with a wedge tilts about the turned axis", () => {
    const st = oneDie({ yawDeg: 90, bondLine: { heightTol: tol0 } });
    const { s, m } = evalWith(st, { "die.bondLine": [0, 10, 10, 0] });
    const o = 9 * m.elements.findIndex((e) => e.id === "die");
    // the wedge rises along the die's x, which the yaw turned onto board y: the die's z leans to −y
    expect(s.R[o + 5]).toBeLessThan(-1e-3);
    expect(Math.abs(s.R[o + 2])).toBeLessThan(1e-15);
  });

  it("calibration after package removes package-stage errors and keeps board-stage ones; tilt is geometry", () => {
    // MODEL.md section 5
    const json = {
      format: "orthostack.stack/1",
      elements: [
        { id: "board", kind: "board", parent: null, size: { x: 30, y: 20, z: 1 } },
        { id: "pkg", kind: "substrate", parent: "board", stage: "board", size: { x: 3, y: 3, z: 0.2 }, bondLine: { heightTol: tol0 } },
        { id: "mag", kind: "mag", parent: "pkg", size: { x: 1, y: 1, z: 0.2 }, bondLine: { heightTol: tol0 }, axisTol: tol0 },
        { id: "acc", kind: "accel", parent: "pkg", position: { x: 1, y: 0 }, size: { x: 1, y: 1, z: 0.2 } },
      ],
    };
    const st = stackOf(json);
    const cal = { calibration: { after: "package", residualDeg: tol0 } };
    const pkgOnly = evalWith(st, { "mag.bondLine": [0, 8, 8, 0], "mag.axis": [0.4, -0.2, 0.1, 0.3, 0, 0.2] }, cal);
    for (const [id, v] of Object.entries(pkgOnly.out)) {
      if (id.startsWith("mag.cross") || id.startsWith("mag.axis")) expect(Math.abs(v)).toBeLessThan(1e-12);
    }
    expect(pkgOnly.out["mag.tiltDeg"]).toBeCloseTo(Math.atan(0.008) / DEG, 12);
    const withBoard = evalWith(st, { "pkg.bondLine": [0, 30, 30, 0], "mag.bondLine": [0, 8, 8, 0] }, cal);
    expect(withBoard.out["mag.crossAxisPct.xz"]).not.toBeCloseTo(0, 3);
    // the residual E = rot(eps) is left over: C_eff = E⁻¹ when nothing else happens
    const resid = evalWith(st, { "calibration.mag": [0, 0, 0.1] }, cal);
    expect(resid.out["mag.crossAxisPct.xy"]).toBeCloseTo(100 * Math.tan(0.1 * DEG), 10);
    expect(resid.out["mag.tiltDeg"]).toBe(0);
    // after "board" the board-stage errors are calibrated too
    const afterBoard = evalWith(st, { "pkg.bondLine": [0, 30, 30, 0], "mag.bondLine": [0, 8, 8, 0] }, { calibration: { after: "board" } });
    expect(Math.abs(afterBoard.out["mag.crossAxisPct.xz"])).toBeLessThan(1e-12);
  });

  it("a tolerance's own stage overrides its element's (reference stack: pkg bow at package)", () => {
    const m = compileModel(referenceStack(), studyOf(study({ calibration: { after: "package" } }), referenceStack()));
    const src = (id: string) => m.sources.find((s) => s.id === id)!;
    expect(src("pkg.bow").stage).toBe("package");
    expect(src("pkg.bondLine").stage).toBe("board");
    expect(src("board.bow").stage).toBe("board");
    expect(src("mag.axis").stage).toBe("die");
    expect(m.sources.map((s) => s.id)).toContain("pkg.x");
  });
});
