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
  /** per tilt: L = Rx(φ)ᵀ·Ry(θ)ᵀ (row-major) and the true specific force −L·ez */
  tiltL: Float64Array;
  tiltF: Float64Array;
  /**
   * per heading j, at 5j..5j+4: cos ψ, sin ψ, cos²ψ, cos ψ·sin ψ, sin²ψ (one array: the
   * sweeps' inner loops load five neighbours instead of one element of five arrays)
   */
  trig: Float64Array;
  /**
   * whether heading j + nPsi/2 is heading j turned by half a turn (an even count of equal
   * steps round the circle), so that the screened sweep can take them in pairs
   */
  halfTurnPairs: boolean;
  cosI: number;
  sinI: number;
  /** scratch of the sweep: the turned levelled field per attitude */
  ex: Float64Array;
  ey: Float64Array;
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
    tiltL: new Float64Array(9 * tilts.length),
    tiltF: new Float64Array(3 * tilts.length),
    trig: new Float64Array(5 * nPsi),
    halfTurnPairs: nPsi % 2 === 0 && Math.abs(nPsi * step - 360) < 1e-9,
    cosI: Math.cos(opts.inclinationDeg * DEG),
    sinI: Math.sin(opts.inclinationDeg * DEG),
    ex: new Float64Array(count),
    ey: new Float64Array(count),
  };
  for (let j = 0; j < nPsi; j++) {
    const c = Math.cos(j * step * DEG),
      sn = Math.sin(j * step * DEG);
    a.trig.set([c, sn, c * c, c * sn, sn * sn], 5 * j);
  }
  tilts.forEach((t, ti) => {
    const L = mul(transposeOf(rotX(t.rollDeg * DEG, mat3())), transposeOf(rotY(t.pitchDeg * DEG, mat3())), mat3());
    a.tiltL.set(L, 9 * ti);
    a.tiltF[3 * ti] = -L[2];
    a.tiltF[3 * ti + 1] = -L[5];
    a.tiltF[3 * ti + 2] = -L[8];
  });
  const I = opts.inclinationDeg * DEG;
  const gN = new Float64Array([0, 0, 1]);
  const mN = new Float64Array([Math.cos(I), 0, Math.sin(I)]);
  const Rz = mat3(),
    Ry = mat3(),
    Rx = mat3(),
    T = mat3(),
    Cbn = mat3(),
    v = vec3();
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
      a.f[3 * k] = -v[0];
      a.f[3 * k + 1] = -v[1];
      a.f[3 * k + 2] = -v[2];
      mulVec(CbnT, mN, v);
      a.m[3 * k] = v[0];
      a.m[3 * k + 1] = v[1];
      a.m[3 * k + 2] = v[2];
      a.psiDeg[k] = psi;
      a.cosPsi[k] = Math.cos(psi * DEG);
      a.sinPsi[k] = Math.sin(psi * DEG);
    }
  }
  return a;
}

const identity3 = new Float64Array([1, 0, 0, 0, 1, 0, 0, 0, 1]);

function transposeOf(m: Float64Array): Float64Array {
  return mulTA(m, identity3, mat3());
}

const sweepResult = { maxAbs: 0, rms: 0 };

/**
 * Per tilt, the eight numbers of the levelled field as a function of ψ (see headingSweep):
 * ex = A cos²ψ + (B + D) cosψ sinψ + E sin²ψ + C cosψ + F sinψ,
 * ey = D cos²ψ + (E − A) cosψ sinψ − B sin²ψ + F cosψ − C sinψ, stored per tilt as
 * [A, B + D, E, C, F, D, E − A, B]. The returned array is reused between calls.
 */
let coefScratch = new Float64Array(8 * 5);
function tiltCoefficients(Ca: Float64Array, ca: number, Cm: Float64Array, cm: number, att: Attitudes): Float64Array {
  if (coefScratch.length < 8 * att.tilts.length) coefScratch = new Float64Array(8 * att.tilts.length);
  const K = coefScratch;
  // Q·C·Q flips the sign of the entries that mix body x with body y or z
  const a0 = Ca[ca],
    a1 = -Ca[ca + 1],
    a2 = -Ca[ca + 2];
  const a3 = -Ca[ca + 3],
    a4 = Ca[ca + 4],
    a5 = Ca[ca + 5];
  const a6 = -Ca[ca + 6],
    a7 = Ca[ca + 7],
    a8 = Ca[ca + 8];
  const m0 = Cm[cm],
    m1 = -Cm[cm + 1],
    m2 = -Cm[cm + 2];
  const m3 = -Cm[cm + 3],
    m4 = Cm[cm + 4],
    m5 = Cm[cm + 5];
  const m6 = -Cm[cm + 6],
    m7 = Cm[cm + 7],
    m8 = Cm[cm + 8];
  const nT = att.tilts.length;
  const TL = att.tiltL,
    TF = att.tiltF;
  const cosI = att.cosI,
    sinI = att.sinI;
  for (let t = 0; t < nT; t++) {
    const o = 3 * t,
      l = 9 * t;
    const tfx = TF[o],
      tfy = TF[o + 1],
      tfz = TF[o + 2];
    const fx = a0 * tfx + a1 * tfy + a2 * tfz;
    const fy = a3 * tfx + a4 * tfy + a5 * tfz;
    const fz = a6 * tfx + a7 * tfy + a8 * tfz;
    const r2 = fy * fy + fz * fz;
    const N = Math.sqrt(r2 + fx * fx);
    // u = (r², −fx·fy, −fx·fz), v = (0, N·fz, −N·fy); U = uᵀ·Mm·L, V = vᵀ·Mm·L
    const u0 = r2,
      u1 = -fx * fy,
      u2 = -fx * fz;
    const v1 = N * fz,
      v2 = -N * fy;
    const p0 = u0 * m0 + u1 * m3 + u2 * m6,
      p1 = u0 * m1 + u1 * m4 + u2 * m7,
      p2 = u0 * m2 + u1 * m5 + u2 * m8;
    const q0 = v1 * m3 + v2 * m6,
      q1 = v1 * m4 + v2 * m7,
      q2 = v1 * m5 + v2 * m8;
    const L0 = TL[l],
      L1 = TL[l + 1],
      L2 = TL[l + 2],
      L3 = TL[l + 3],
      L4 = TL[l + 4],
      L5 = TL[l + 5];
    const L6 = TL[l + 6],
      L7 = TL[l + 7],
      L8 = TL[l + 8];
    const U0 = p0 * L0 + p1 * L3 + p2 * L6,
      U1 = p0 * L1 + p1 * L4 + p2 * L7,
      U2 = p0 * L2 + p1 * L5 + p2 * L8;
    const V0 = q0 * L0 + q1 * L3 + q2 * L6,
      V1 = q0 * L1 + q1 * L4 + q2 * L7,
      V2 = q0 * L2 + q1 * L5 + q2 * L8;
    const A = U0 * cosI,
      B = -U1 * cosI,
      C = U2 * sinI;
    const D = V0 * cosI,
      E = -V1 * cosI,
      F = V2 * sinI;
    const BD = B + D,
      EA = E - A;
    const q = 8 * t;
    K[q] = A;
    K[q + 1] = BD;
    K[q + 2] = E;
    K[q + 3] = C;
    K[q + 4] = F;
    K[q + 5] = D;
    K[q + 6] = EA;
    K[q + 7] = B;
  }
  return K;
}

/**
 * First pass of the sweep: the levelled field turned by −ψ, (ex, ey) per attitude, into
 * att.ex and att.ey; the heading error is its angle.
 */
function levelledField(Ca: Float64Array, ca: number, Cm: Float64Array, cm: number, att: Attitudes): void {
  const k = tiltCoefficients(Ca, ca, Cm, cm, att);
  const nPsi = att.headingsPerTilt,
    nT = att.tilts.length;
  const trig = att.trig;
  const EX = att.ex,
    EY = att.ey;
  for (let t = 0; t < nT; t++) {
    const o = 8 * t;
    const A = k[o],
      BD = k[o + 1],
      E = k[o + 2],
      C = k[o + 3],
      F = k[o + 4],
      D = k[o + 5],
      EA = k[o + 6],
      B = k[o + 7];
    const base = t * nPsi;
    for (let j = 0; j < nPsi; j++) {
      // (ex, ey) = (h_x, −h_y) turned by −ψ; its angle is e = ψ^ − ψ in (−π, π]
      const q = 5 * j;
      const c = trig[q],
        s = trig[q + 1],
        cc = trig[q + 2],
        cs = trig[q + 3],
        ss = trig[q + 4];
      EX[base + j] = A * cc + BD * cs + E * ss + C * c + F * s;
      EY[base + j] = D * cc + EA * cs - B * ss + F * c - C * s;
    }
  }
}

/**
 * Heading error (deg) at every attitude for the cross-axis matrices Ca (at ca..ca+8)
 * and Cm (at cm..cm+8). Writes out[k]; returns max |e| and RMS (deg). The returned
 * object is reused between calls.
 *
 * Per tilt, f (so f^, φ^, θ^) does not depend on the heading, and m^ = Mm·L·w(ψ) with
 * w(ψ) = (cos I cos ψ, −cos I sin ψ, sin I). The scaled levelled components
 *   h_x = (r², −f^x f^y, −f^x f^z)·m^,  −h_y = (0, N f^z, −N f^y)·m^
 * are therefore A cos ψ + B sin ψ + C and D cos ψ + E sin ψ + F with six numbers per
 * tilt, and after the turn by −ψ each heading needs a handful of products and one atan2.
 */
export function headingSweep(
  Ca: Float64Array,
  ca: number,
  Cm: Float64Array,
  cm: number,
  att: Attitudes,
  out: Float64Array,
): { maxAbs: number; rms: number } {
  levelledField(Ca, ca, Cm, cm, att);
  const EX = att.ex,
    EY = att.ey;
  let maxAbs = 0,
    sum2 = 0;
  // second pass: the angles, in a loop small enough to keep its values in registers
  const n = att.count;
  for (let k = 0; k < n; k++) {
    const x = EX[k],
      y = EY[k];
    const ay = y < 0 ? -y : y;
    let e: number;
    if (x > 0 && ay <= 0.03125 * x) {
      // the series of fastmath.atan2Fast's first range, inlined by hand
      const t = y / x,
        t2 = t * t;
      e = t * (1 + t2 * (-1 / 3 + t2 * (1 / 5 + t2 * (-1 / 7 + t2 * (1 / 9 + t2 * (-1 / 11 + t2 * (1 / 13))))))) * TO_DEG;
    } else e = atan2Fast(y, x) * TO_DEG;
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
export function headingErrorReference(
  Ca: Float64Array,
  Cm: Float64Array,
  inclinationDeg: number,
  psiDeg: number,
  pitchDeg: number,
  rollDeg: number,
): number {
  const Q = new Float64Array([1, 0, 0, 0, -1, 0, 0, 0, -1]);
  const Cbn = mat3(),
    T = mat3();
  mul(rotZ(psiDeg * DEG, mat3()), rotY(pitchDeg * DEG, mat3()), T);
  mul(T, rotX(rollDeg * DEG, mat3()), Cbn);
  const CbnT = mulTA(Cbn, identity3, mat3());
  const I = inclinationDeg * DEG;
  const f = mulVec(CbnT, new Float64Array([0, 0, 1]), vec3());
  f[0] = -f[0];
  f[1] = -f[1];
  f[2] = -f[2];
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

/** Ratios |ey/ex| up to this are summed by the series below (atan(t)² to 4·10^-10 of itself). */
const SCREEN_T = 0.03125;
const screenResult = { maxAbs: 0, rms: 0 };

/**
 * The screened sweep: max |e| and RMS of the same errors as headingSweep, without the angle
 * of every attitude (no per-attitude output; the study uses it where the heading envelope
 * does not need the per-attitude errors).
 *
 * - max |e|: atan is increasing, so the attitude with the largest |ey/ex| holds the maximum;
 *   one exact atan of that ratio gives it.
 * - RMS: for |t| = |ey/ex| ≤ 1/32, atan(t)² = t² − (2/3)t⁴ + (23/45)t⁶ − (44/105)t⁸ + …, so
 *   the power sums Σt², Σt⁴, Σt⁶ give Σ atan(t)² to 4·10^-10 of itself (the first term left
 *   out, relative to t², is at most (44/105)·2^-30).
 * - Every attitude outside that range (error above 1.8°, or ex ≤ 0) is evaluated exactly,
 *   one atan2 each, and enters both figures directly.
 * - Headings half a turn apart share their products (see halfTurnPairs): (ex, ey) at ψ + π is
 *   the same quadratic part minus the linear part, so the pair costs little more than one.
 *   The sums then round differently from headingSweep's (ex, ey) in the last bits, far below
 *   the Monte Carlo error; the exact sweep keeps its own evaluation.
 */
export function headingSweepScreened(
  Ca: Float64Array,
  ca: number,
  Cm: Float64Array,
  cm: number,
  att: Attitudes,
): { maxAbs: number; rms: number } {
  const k = tiltCoefficients(Ca, ca, Cm, cm, att);
  const nPsi = att.headingsPerTilt,
    nT = att.tilts.length;
  const trig = att.trig;
  const n = att.count;
  let tMax = 0,
    s2 = 0,
    s4 = 0,
    s6 = 0,
    wide2 = 0,
    wideMax = 0;
  // half-turn pairs: ψ + π flips cos ψ and sin ψ and keeps their products, so one heading's
  // quadratic part (qx, qy) and linear part (lx, ly) give both (ex, ey) = q ± l
  const half = att.halfTurnPairs ? nPsi >> 1 : 0;
  for (let t = 0; t < nT; t++) {
    const o = 8 * t;
    const A = k[o],
      BD = k[o + 1],
      E = k[o + 2],
      C = k[o + 3],
      F = k[o + 4],
      D = k[o + 5],
      EA = k[o + 6],
      B = k[o + 7];
    // half pairs first, then the headings that do not pair up one by one (all of them when
    // the step does not divide half a turn)
    for (let j = 0; j < nPsi - half; j++) {
      const paired = j < half;
      const q = 5 * (paired ? j : j + half);
      const c = trig[q],
        sn = trig[q + 1],
        cc = trig[q + 2],
        cs = trig[q + 3],
        ss = trig[q + 4];
      let x1: number,
        y1: number,
        x2 = 0,
        y2 = 0;
      if (paired) {
        const qx = A * cc + BD * cs + E * ss,
          qy = D * cc + EA * cs - B * ss;
        const lx = C * c + F * sn,
          ly = F * c - C * sn;
        x1 = qx + lx;
        x2 = qx - lx;
        y1 = qy + ly;
        y2 = qy - ly;
      } else {
        x1 = A * cc + BD * cs + E * ss + C * c + F * sn;
        y1 = D * cc + EA * cs - B * ss + F * c - C * sn;
      }
      const a1 = y1 < 0 ? -y1 : y1,
        a2 = y2 < 0 ? -y2 : y2;
      if (paired && x1 > 0 && a1 <= SCREEN_T * x1 && x2 > 0 && a2 <= SCREEN_T * x2) {
        // both narrow (nearly always): the series terms of the two at once
        const t1 = a1 / x1,
          t2 = a2 / x2;
        const u1 = t1 * t1,
          u2 = t2 * t2;
        s2 += u1 + u2;
        s4 += u1 * u1 + u2 * u2;
        s6 += u1 * u1 * u1 + u2 * u2 * u2;
        const tt = t1 > t2 ? t1 : t2;
        if (tt > tMax) tMax = tt;
        continue;
      }
      for (let h = 0, count = paired ? 2 : 1; h < count; h++) {
        const x = h === 0 ? x1 : x2,
          ay = h === 0 ? a1 : a2;
        if (x > 0 && ay <= SCREEN_T * x) {
          const tt = ay / x;
          const t2 = tt * tt;
          s2 += t2;
          s4 += t2 * t2;
          s6 += t2 * t2 * t2;
          if (tt > tMax) tMax = tt;
        } else {
          const e = atan2Fast(ay, x);
          wide2 += e * e;
          if (e > wideMax) wideMax = e;
        }
      }
    }
  }
  const narrowMax = Math.atan(tMax);
  screenResult.maxAbs = (narrowMax > wideMax ? narrowMax : wideMax) * TO_DEG;
  screenResult.rms = Math.sqrt((s2 - (2 / 3) * s4 + (23 / 45) * s6 + wide2) / n) * TO_DEG;
  return screenResult;
}
