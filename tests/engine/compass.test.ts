import { describe, expect, it } from "vitest";
import { buildAttitudes, headingErrorReference, headingSweep } from "@shared/engine/heading";
import { compileModel, createScratch, evaluateTrial } from "@shared/engine/model";
import { mat3, mul } from "@shared/engine/mat3";
import { DEG, rotY, rotVec } from "@shared/engine/rotation";
import { compassStack, study, studyOf } from "./helpers";

const I3 = new Float64Array([1, 0, 0, 0, 1, 0, 0, 0, 1]);
const Q = new Float64Array([1, 0, 0, 0, -1, 0, 0, 0, -1]);

/** Accelerometer matrix that makes a level device read as pitched by eps (deg): Q·Ry(eps)ᵀ·Q. */
function pitchErrorAccel(epsDeg: number): Float64Array {
  const RyT = rotY(-epsDeg * DEG, mat3());
  return mul(mul(Q, RyT, mat3()), Q, mat3());
}

function sweepAt(Ca: Float64Array, Cm: Float64Array, inclinationDeg: number, psiDeg: number, pitchDeg = 0, rollDeg = 0): number {
  // a one-heading sweep: step 360 puts the single heading at 0, so rotate the tilt set instead
  const att = buildAttitudes({ inclinationDeg, headingStepDeg: 1, tilts: [{ pitchDeg, rollDeg }] });
  const out = new Float64Array(att.count);
  headingSweep(Ca, 0, Cm, 0, att, out);
  return out[Math.round(psiDeg)];
}

describe("tilt-compensated compass: published check values", () => {
  it("+1 deg pitch-estimate error, level, psi = 90: exact values at I = 30, 45, 60, 70, 80", () => {
    // REFERENCES.md: compass equations, exact values for a +1 deg pitch-estimate error
    const want: [number, number][] = [
      [30, -0.5773],
      [45, -0.9998],
      [60, -1.7314],
      [70, -2.7452],
      [80, -5.6526],
    ];
    const Ca = pitchErrorAccel(1);
    for (const [I, e] of want) {
      expect(sweepAt(Ca, I3, I, 90)).toBeCloseTo(e, 4);
      expect(headingErrorReference(Ca, I3, I, 90, 0, 0)).toBeCloseTo(e, 4);
    }
  });

  it("+1 deg pitch-estimate error at psi = 45, I = 60: -1.1947", () => {
    // REFERENCES.md: compass equations, exact value at psi = 45, I = 60
    expect(sweepAt(pitchErrorAccel(1), I3, 60, 45)).toBeCloseTo(-1.1947, 4);
  });

  it("first order: dpsi ≈ tan(I)·(−dθ·sin psi + dφ·cos psi) for small tilt errors", () => {
    // REFERENCES.md: first-order heading error from a tilt error (derived from the equations)
    const eps = 0.01; // deg: second-order terms are ~1e-4 of the first-order ones
    const Ca = pitchErrorAccel(eps);
    for (const psi of [0, 30, 90, 135, 250]) {
      const first = Math.tan(60 * DEG) * (-eps * Math.sin(psi * DEG));
      expect(Math.abs(sweepAt(Ca, I3, 60, psi) - first)).toBeLessThan(2e-3 * eps + 1e-12);
    }
  });

  it("magnetometer die turned about board x by 1 deg, level, I = 60: -1.7314 at north (MODEL.md section 10)", () => {
    // MODEL.md section 10 / REFERENCES.md: -eps·tan(I)·cos(psi) to first order, -1.7314 exact at north
    const stack = compassStack({}, { tiltTol: { x: { dist: "normal", tol: 0 } } });
    const m = compileModel(stack, studyOf(study({ tilts: [{ pitchDeg: 0, rollDeg: 0 }], headingStepDeg: 1 }), stack));
    const s = createScratch(m);
    const draws = new Float64Array(m.drawCount);
    draws[m.sources.find((x) => x.id === "mag.tiltX")!.offset] = 1;
    evaluateTrial(m, draws, s);
    expect(s.headingErr[0]).toBeCloseTo(-1.7314, 4);
    // first order −tan(60)·cos(psi) elsewhere; the peak lies a little off north
    const att = m.heading!.attitudes;
    let peakAt = 0;
    for (let k = 0; k < att.count; k++) {
      expect(Math.abs(s.headingErr[k] - -Math.tan(60 * DEG) * Math.cos(att.psiDeg[k] * DEG))).toBeLessThan(0.06);
      if (Math.abs(s.headingErr[k]) > Math.abs(s.headingErr[peakAt])) peakAt = k;
    }
    expect(att.psiDeg[peakAt]).not.toBe(0);
  });

  it("magnetometer turned about board z by eps: exactly −eps at every heading when level, not when tilted", () => {
    // MODEL.md section 10: a turn about the board's up axis, level: −eps at every heading
    const stack = compassStack({}, { placementTol: { yawDeg: { dist: "normal", tol: 0 } } });
    const m = compileModel(stack, studyOf(study(), stack));
    const s = createScratch(m);
    const draws = new Float64Array(m.drawCount);
    draws[m.sources.find((x) => x.id === "mag.yaw")!.offset] = 0.7;
    evaluateTrial(m, draws, s);
    const att = m.heading!.attitudes;
    let tiltedOff = 0;
    for (let k = 0; k < att.count; k++) {
      const t = att.tilts[Math.floor(k / att.headingsPerTilt)];
      if (t.pitchDeg === 0 && t.rollDeg === 0) expect(s.headingErr[k]).toBeCloseTo(-0.7, 12);
      else tiltedOff = Math.max(tiltedOff, Math.abs(s.headingErr[k] + 0.7));
    }
    expect(tiltedOff).toBeGreaterThan(1e-3);
  });

  it("magnetometer x-y non-orthogonality: −alpha·cos²(psi) to first order, −1.000 at psi = 0 for 1 deg", () => {
    // REFERENCES.md: dpsi ≈ −alpha·cos²(psi), alpha = the body (FRD) y axis tipped toward
    // body x; Q = diag(1, −1, −1) flips y, so in the die's board-aligned axes that is g3 = −alpha
    const stack = compassStack({}, { axisTol: [0, 0, 0, 0, 0, 0].map(() => ({ dist: "normal", tol: 0 })) });
    const m = compileModel(stack, studyOf(study({ tilts: [{ pitchDeg: 0, rollDeg: 0 }], headingStepDeg: 15 }), stack));
    const s = createScratch(m);
    const g3 = m.sources.find((x) => x.id === "mag.axis.g3")!.offset;
    const draws = new Float64Array(m.drawCount);
    const att = m.heading!.attitudes;
    draws[g3] = -0.01;
    evaluateTrial(m, draws, s);
    for (let k = 0; k < att.count; k++) {
      expect(Math.abs(s.headingErr[k] - -0.01 * Math.cos(att.psiDeg[k] * DEG) ** 2)).toBeLessThan(2e-4 * 0.01);
    }
    draws[g3] = -1;
    evaluateTrial(m, draws, s);
    expect(s.headingErr[0]).toBeCloseTo(-1.0, 3);
    // REFERENCES.md lists −0.504 at psi = 45 ("derived"). The equations of MODEL.md give,
    // for a y axis tipped by alpha, psi^ = atan2(sin(psi − alpha), cos psi) exactly: −0.5088
    // at 45 and −0.4913 at 135 (second order ∓alpha²·sin(psi)cos(psi)(1 + 2cos²psi)/2).
    // The check holds the closed form; the listed −0.504 agrees only to 1 %.
    const a = 1 * DEG;
    for (let k = 0; k < att.count; k++) {
      const psi = att.psiDeg[k] * DEG;
      let exact = (Math.atan2(Math.sin(psi - a), Math.cos(psi)) - psi) / DEG;
      exact = ((exact + 540) % 360) - 180;
      expect(Math.abs(s.headingErr[k] - exact)).toBeLessThan(1e-9);
    }
    expect(Math.abs(s.headingErr[3] - -0.504)).toBeLessThan(0.01 * 0.504);
  });

  it("zero deviations: C = I and zero heading error at every attitude (definition)", () => {
    // MODEL.md section 10: zero deviations -> C = I, heading error 0
    const tol0 = { dist: "normal", tol: 0 };
    const stack = compassStack(
      { yawDeg: 90, bondLine: { heightTol: tol0 }, axisTol: tol0 },
      { yawDeg: -30, bondLine: { heightTol: tol0 }, axisTol: tol0, tiltTol: { x: tol0, y: tol0 } },
    );
    const m = compileModel(
      stack,
      studyOf(
        study({
          headingStepDeg: 5,
          tilts: [
            { pitchDeg: 0, rollDeg: 0 },
            { pitchDeg: 60, rollDeg: -45 },
            { pitchDeg: -20, rollDeg: 170 },
          ],
        }),
        stack,
      ),
    );
    const s = createScratch(m);
    evaluateTrial(m, new Float64Array(m.drawCount), s);
    for (let k = 0; k < s.C.length; k++) expect(Math.abs(s.C[k] - I3[k % 9])).toBeLessThan(1e-15);
    for (const e of s.headingErr) expect(Math.abs(e)).toBeLessThan(1e-12);
    for (const v of s.metrics) expect(Math.abs(v)).toBeLessThan(1e-12);
  });

  it("the sweep's rearranged equations equal the step-by-step equations of MODEL.md section 6", () => {
    // exact path held to the literal one, for large and small errors and every tilt class
    const tilts = [
      { pitchDeg: 0, rollDeg: 0 },
      { pitchDeg: 30, rollDeg: 0 },
      { pitchDeg: -75, rollDeg: 20 },
      { pitchDeg: 10, rollDeg: 160 },
    ];
    const att = buildAttitudes({ inclinationDeg: 67, headingStepDeg: 15, tilts });
    const out = new Float64Array(att.count);
    for (const size of [1e-4, 0.02, 0.3]) {
      const Ca = mul(rotVec(size, -size / 2, size / 3, mat3()), I3, mat3());
      const Cm = rotVec(-size / 3, size, size / 2, mat3());
      Cm[1] += size / 4;
      headingSweep(Ca, 0, Cm, 0, att, out);
      for (let k = 0; k < att.count; k++) {
        const t = tilts[Math.floor(k / att.headingsPerTilt)];
        const ref = headingErrorReference(Ca, Cm, 67, att.psiDeg[k], t.pitchDeg, t.rollDeg);
        expect(Math.abs(out[k] - ref)).toBeLessThan(1e-11);
      }
    }
  });
});
