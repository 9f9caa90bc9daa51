import { describe, expect, it } from "vitest";
import { REG_TRIALS_PER_BLOCK } from "@shared/engine/accumulate";
import { runStudy } from "@shared/engine/study";
import { DEG } from "@shared/engine/rotation";
import { referenceStack, study, studyOf } from "./helpers";

const stack = referenceStack();

describe("contributors", () => {
  it("relative rotation accel~mag: linearised shares follow the plane-fit rule and the yaw sigma", () => {
    // mag: 0.9 x 0.5 mm, corner heights uniform ±3 um (σ = √3 um): slope σ = σ_h/L per axis
    // (REFERENCES.md plane-fit rule); yaw normal ±0.4 deg (σ = 0.4/3). The accel's own
    // deviations turn both dies together and cancel in the relative rotation.
    const sh = Math.sqrt(3) * 1e-3;
    const tilt2 = ((sh / 0.9) ** 2 + (sh / 0.5) ** 2) / DEG ** 2;
    const yaw2 = (0.4 / 3) ** 2;
    const n = 40_960;
    const r = runStudy(
      stack,
      studyOf(study({ trials: n, requirements: [{ metric: "accel~mag.relRotDeg", max: 0.5, yield: 0.99 }] }), stack),
    );
    const c = r.contributors[0];
    const share = (id: string) => c.sources.find((s) => s.source === id)!;
    expect(share("mag.bondLine").linearShare).toBeCloseTo(tilt2 / (tilt2 + yaw2), 3);
    expect(share("mag.yaw").linearShare).toBeCloseTo(yaw2 / (tilt2 + yaw2), 3);
    expect(share("accel.yaw").linearShare).toBeLessThan(1e-9);
    expect(share("accel.bondLine").linearShare).toBeLessThan(1e-9);
    // the Monte Carlo split of the mean square estimates the same quantity: SE of a share
    // from n_reg regression trials is about 2·√(share/n_reg) (delta method)
    const nReg = (n / 4096) * REG_TRIALS_PER_BLOCK;
    for (const id of ["mag.bondLine", "mag.yaw"]) {
      const s = share(id);
      expect(Math.abs(s.mcShare! - s.linearShare)).toBeLessThan(4.5 * 2 * Math.sqrt(s.linearShare / nReg) + 0.02);
    }
    expect(c.mcDesign).toBe("squared");
  });

  it("a signed metric: SRC² shares agree with the linearised variance shares; RSS = linear 3σ for 3-sigma normals", () => {
    const n = 40_960;
    const r = runStudy(
      stack,
      studyOf(study({ trials: n, requirements: [{ metric: "gyro.crossAxisPct.xy", max: 1.5, yield: 0.99 }] }), stack),
    );
    const c = r.contributors[0];
    expect(c.mcDesign).toBe("linear");
    expect(c.mcR2!).toBeGreaterThan(0.95);
    const nReg = (n / 4096) * REG_TRIALS_PER_BLOCK;
    for (const s of c.sources) {
      expect(Math.abs(s.mcShare! - s.linearShare)).toBeLessThan(4.5 * 2 * Math.sqrt(Math.max(s.linearShare, 1e-4) / nReg) + 0.01);
    }
    const row = r.stackUp.find((x) => x.metric === "gyro.crossAxisPct.xy")!;
    // every source of this metric is normal with tol = 3σ: RSS of the tolerances is the linear 3σ
    expect(row.rss).toBeCloseTo(row.linear3Sigma, 10);
    expect(row.worstCase).toBeGreaterThan(row.rss);
    // Monte Carlo 3σ against the linear one: SE of 3·s is 3·s/√(2n) for a near-normal output
    const m = r.metrics["gyro.crossAxisPct.xy"];
    expect(Math.abs(row.mc3Sigma - row.linear3Sigma)).toBeLessThan((4.5 * (3 * m.std)) / Math.sqrt(2 * n) + 0.01 * row.linear3Sigma);
  });
});
