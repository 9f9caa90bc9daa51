/**
 * Tilt-compensated compass (MODEL.md section 6).
 *
 * For each attitude Cbn = Rz(ψ)·Ry(θ)·Rx(φ) (body to NED, ZYX), with the body frame
 * FRD = Q·B, Q = diag(1, −1, −1):
 *   f = −Cbnᵀ(0,0,1), m = Cbnᵀ(cos I, 0, sin I)
 *   f^ = Q·C_accel·Q·f, m^ = Q·C_mag·Q·m
 *   φ^ = atan2(−f^y, −f^z), θ^ = atan2(f^x, √(f^y² + f^z²))
 *   h = Ry(θ^)·Rx(φ^)·m^, ψ^ = atan2(−h_y, h_x), e = ψ^ − ψ wrapped to (−180, 180].
 *
 * The sweep below evaluates exactly these equations, rearranged so each attitude needs
 * one square root and one atan2: sin and cos of φ^ and θ^ are ratios of f^ components,
 * and h scaled by the positive factor |f^|·√(f^y²+f^z²) has the same heading.
 * Rotating h by −ψ before the atan2 gives e already wrapped, and small, so atan2Fast
 * (exact to rounding, see ./fastmath) serves. headingErrorReference is the literal
 * step-by-step form; a test holds the two together.
 */
import { rotX, rotY, rotZ } from "./rotation";
import { mat3, mul, mulTA, mulVec, vec3 } from "./mat3";
import { atan2Fast } from "./fastmath";

// module-local: an imported binding costs a property load per use in the hot loop
const DEG = Math.PI / 180;
const TO_DEG = 180 / Math.PI;

export const DEFAULT_TILTS = [
  { pitchDeg: 0, rollDeg: 0 },
  { pitchDeg: 30, rollDeg: 0 },
  { pitchDeg: -30, rollDeg: 0 },
  { pitchDeg: 0, rollDeg: 30 },
  { pitchDeg: 0, rollDeg: -30 },
];

export interface Attitudes {
  count: number;
  headingsPerTilt: number;
  tilts: { pitchDeg: number; rollDeg: number }[];
  /** per attitude: true heading (deg), its cos and sin, true f and m in the body frame */
  psiDeg: Float64Array;
  cosPsi: Float64Array;
  sinPsi: Float64Array;
  f: Float64Array; // 3 per attitude
  m: Float64Array; // 3 per attitude
}

export function buildAttitudes(opts: {
  inclinationDeg: number;
  headingStepDeg?: number;
  tilts?: { pitchDeg: number; rollDeg: number }[];
}): Attitudes {
  const step = opts.headingStepDeg ?? 10;
  const tilts = opts.tilts ?? DEFAULT_TILTS;
  const nPsi = Math.max(1, Math.ceil(360 / step - 1e-9));
  const count = nPsi * tilts.length;
  const a: Attitudes = {
    count,
    headingsPerTilt: nPsi,
    tilts,
    psiDeg: new Float64Array(count),
    cosPsi: new Float64Array(count),
    sinPsi: new Float64Array(count),
    f: new Float64Array(3 * count),
    m: new Float64Array(3 * count),
  };
  const I = opts.inclinationDeg * DEG;
  const gN = new Float64Array([0, 0, 1]);
  const mN = new Float64Array([Math.cos(I), 0, Math.sin(I)]);
  const Rz = mat3(), Ry = mat3(), Rx = mat3(), T = mat3(), Cbn = mat3(), v = vec3();
  let k = 0;
  for (const t of tilts) {
    for (let j = 0; j < nPsi; j++, k++) {
      const psi = j * step;
      rotZ(psi * DEG, Rz);
      rotY(t.pitchDeg * DEG, Ry);
      rotX(t.rollDeg * DEG, Rx);
      mul(Rz, Ry, T);
      mul(T, Rx, Cbn);
      // Cbnᵀ·v
      const CbnT = mulTA(Cbn, identity3, T);
      mulVec(CbnT, gN, v);
      a.f[3 * k] = -v[0]; a.f[3 * k + 1] = -v[1]; a.f[3 * k + 2] = -v[2];
      mulVec(CbnT, mN, v);
      a.m[3 * k] = v[0]; a.m[3 * k + 1] = v[1]; a.m[3 * k + 2] = v[2];
      a.psiDeg[k] = psi;
      a.cosPsi[k] = Math.cos(psi * DEG);
      a.sinPsi[k] = Math.sin(psi * DEG);
    }
  }
  return a;
}

const identity3 = new Float64Array([1, 0, 0, 0, 1, 0, 0, 0, 1]);

const sweepResult = { maxAbs: 0, rms: 0 };

/**
 * Heading error (deg) at every attitude for the cross-axis matrices Ca (at ca..ca+8)
 * and Cm (at cm..cm+8). Writes out[k]; returns max |e| and RMS (deg). The returned
 * object is reused between calls.
 */
export function headingSweep(
  Ca: Float64Array, ca: number, Cm: Float64Array, cm: number, att: Attitudes, out: Float64Array,
): { maxAbs: number; rms: number } {
  // Q·C·Q flips the sign of the entries that mix body x with body y or z
  const a0 = Ca[ca], a1 = -Ca[ca + 1], a2 = -Ca[ca + 2];
  const a3 = -Ca[ca + 3], a4 = Ca[ca + 4], a5 = Ca[ca + 5];
  const a6 = -Ca[ca + 6], a7 = Ca[ca + 7], a8 = Ca[ca + 8];
  const m0 = Cm[cm], m1 = -Cm[cm + 1], m2 = -Cm[cm + 2];
  const m3 = -Cm[cm + 3], m4 = Cm[cm + 4], m5 = Cm[cm + 5];
  const m6 = -Cm[cm + 6], m7 = Cm[cm + 7], m8 = Cm[cm + 8];
  const F = att.f, M = att.m, cp = att.cosPsi, sp = att.sinPsi;
  let maxAbs = 0, sum2 = 0;
  const n = att.count;
  for (let k = 0; k < n; k++) {
    const o = 3 * k;
    const tfx = F[o], tfy = F[o + 1], tfz = F[o + 2];
    const tmx = M[o], tmy = M[o + 1], tmz = M[o + 2];
    const fx = a0 * tfx + a1 * tfy + a2 * tfz;
    const fy = a3 * tfx + a4 * tfy + a5 * tfz;
    const fz = a6 * tfx + a7 * tfy + a8 * tfz;
    const mx = m0 * tmx + m1 * tmy + m2 * tmz;
    const my = m3 * tmx + m4 * tmy + m5 * tmz;
    const mz = m6 * tmx + m7 * tmy + m8 * tmz;
    const r2 = fy * fy + fz * fz;
    const N = Math.sqrt(r2 + fx * fx);
    // (h_x, −h_y) scaled by |f|·√(fy²+fz²) > 0
    const hx = r2 * mx - fx * (fy * my + fz * mz);
    const hyNeg = N * (fz * my - fy * mz);
    // rotate by −ψ: the angle of the result is e = ψ^ − ψ in (−π, π]
    const c = cp[k], s = sp[k];
    const ex = c * hx + s * hyNeg;
    const ey = c * hyNeg - s * hx;
    const e = atan2Fast(ey, ex) * TO_DEG;
    out[k] = e;
    const ae = e < 0 ? -e : e;
    if (ae > maxAbs) maxAbs = ae;
    sum2 += e * e;
  }
  sweepResult.maxAbs = maxAbs;
  sweepResult.rms = Math.sqrt(sum2 / n);
  return sweepResult;
}

/** The section 6 equations step by step, for one attitude (deg in, deg out). */
export function headingErrorReference(Ca: Float64Array, Cm: Float64Array, inclinationDeg: number, psiDeg: number, pitchDeg: number, rollDeg: number): number {
  const Q = new Float64Array([1, 0, 0, 0, -1, 0, 0, 0, -1]);
  const Cbn = mat3(), T = mat3();
  mul(rotZ(psiDeg * DEG, mat3()), rotY(pitchDeg * DEG, mat3()), T);
  mul(T, rotX(rollDeg * DEG, mat3()), Cbn);
  const CbnT = mulTA(Cbn, identity3, mat3());
  const I = inclinationDeg * DEG;
  const f = mulVec(CbnT, new Float64Array([0, 0, 1]), vec3());
  f[0] = -f[0]; f[1] = -f[1]; f[2] = -f[2];
  const m = mulVec(CbnT, new Float64Array([Math.cos(I), 0, Math.sin(I)]), vec3());
  const QCaQ = mul(mul(Q, Ca, mat3()), Q, mat3());
  const QCmQ = mul(mul(Q, Cm, mat3()), Q, mat3());
  const fh = mulVec(QCaQ, f, vec3());
  const mh = mulVec(QCmQ, m, vec3());
  const phi = Math.atan2(-fh[1], -fh[2]);
  const theta = Math.atan2(fh[0], Math.sqrt(fh[1] * fh[1] + fh[2] * fh[2]));
  const L = mul(rotY(theta, mat3()), rotX(phi, mat3()), mat3());
  const h = mulVec(L, mh, vec3());
  const psiHat = Math.atan2(-h[1], h[0]);
  let e = psiHat / DEG - psiDeg;
  while (e > 180) e -= 360;
  while (e <= -180) e += 360;
  return e;
}
