/**
 * One trial of a compiled model (compile.ts): orientations, cross-axis matrices, calibration
 * and the metrics of MODEL.md sections 3-7, written into per-worker scratch space so that the
 * hot loop allocates nothing.
 */
import type { Model } from "./compile";
import { identity, invert, mat3, mul, type Mat3 } from "./mat3";
import { rotVec, rotZ, tiltToSlope } from "./rotation";
import { headingSweep, headingSweepScreened } from "./heading";
import { atan2To, sinCosTo, tanTo } from "./fastmath";

// module-local: an imported binding costs a property load per use in the hot loop
const DEG = Math.PI / 180;

/**
 * Per-worker scratch space: one trial allocates nothing. A class, not an object literal: a
 * literal made anew per block is built from a boilerplate on its second run, with other
 * recorded field types than the first object's, and V8 then throws away every optimised
 * function that read the first (the whole trial code) at the second block.
 */
export class Scratch {
  R: Float64Array; // 9 per element, all sources
  Rk: Float64Array; // 9 per element, sources up to the calibration stage
  masked: Float64Array; // draws with the later stages at zero
  C: Float64Array; // 9 per sensor, C_eff after evaluate
  Ck: Float64Array;
  delta: Float64Array; // 9 per sensor, R·Rnomᵀ
  t1: Mat3 = mat3();
  t2: Mat3 = mat3();
  t3: Mat3 = mat3();
  t4: Mat3 = mat3();
  /** small results of the fast-math helpers (six axis tangents, a sine and cosine) */
  fm = new Float64Array(8);
  metrics: Float64Array;
  headingErr: Float64Array; // deg, per attitude
  /** whether the next trial must fill headingErr (else a screened model may skip it) */
  perAttitude = true;
  constructor(m: Model) {
    const nE = m.elements.length,
      nS = m.sensors.length;
    this.R = new Float64Array(9 * nE);
    this.Rk = new Float64Array(9 * nE);
    this.masked = new Float64Array(m.drawCount);
    this.C = new Float64Array(9 * nS);
    this.Ck = new Float64Array(9 * nS);
    this.delta = new Float64Array(9 * nS);
    this.metrics = new Float64Array(m.metrics.length);
    this.headingErr = new Float64Array(m.heading ? m.heading.attitudes.count : 0);
  }
}

export function createScratch(m: Model): Scratch {
  return new Scratch(m);
}

/** R_e = R_parent · W · Rz(yaw + dYaw) · Bl · D for every element (MODEL.md section 3). */
export function orientations(m: Model, draws: Float64Array, R: Float64Array, s: Scratch): void {
  const els = m.elements;
  const W = s.t1,
    Zb = s.t2,
    B = s.t3,
    T = s.t4;
  for (let i = 0; i < els.length; i++) {
    const e = els[i];
    const o = 9 * i;
    if (e.parent < 0) {
      for (let k = 0; k < 9; k++) R[o + k] = k % 4 === 0 ? 1 : 0;
      continue;
    }
    const p = els[e.parent];
    // on a parent without bow W is the identity: Rz goes straight into T (the same numbers
    // as W·Rz, whose other terms are zeros)
    const bow = p.bowOff >= 0;
    if (bow) {
      const w = draws[p.bowOff];
      tiltToSlope(w * e.kx, w * e.ky, W);
    }
    const Z = bow ? Zb : T;
    // Rz(yaw + dYaw) by angle addition: the deviation is small, the nominal yaw exact
    if (e.yawOff >= 0) {
      sinCosTo(draws, e.yawOff, DEG, s.fm, 6);
      const sd = s.fm[6],
        cd = s.fm[7];
      const c = e.cosYaw * cd - e.sinYaw * sd,
        sn = e.sinYaw * cd + e.cosYaw * sd;
      Z[0] = c;
      Z[1] = -sn;
      Z[2] = 0;
      Z[3] = sn;
      Z[4] = c;
      Z[5] = 0;
      Z[6] = 0;
      Z[7] = 0;
      Z[8] = 1;
    } else rotZ(e.yaw, Z);
    if (bow) mul(W, Z, T);
    if (e.supOff >= 0) {
      let b = 0,
        c = 0;
      for (let k = 0; k < e.nSup; k++) {
        const h = draws[e.supOff + k];
        b += e.pb[k] * h;
        c += e.pc[k] * h;
      }
      tiltToSlope(b, c, B);
      mul(T, B, T);
    }
    if (e.tiltXOff >= 0 || e.tiltYOff >= 0) {
      const tx = e.tiltXOff >= 0 ? draws[e.tiltXOff] * DEG : 0;
      const ty = e.tiltYOff >= 0 ? draws[e.tiltYOff] * DEG : 0;
      rotVec(tx, ty, 0, B);
      mul(T, B, T);
    }
    // R_e = R_parent · T, written into the flat array
    const po = 9 * e.parent;
    for (let r = 0; r < 3; r++) {
      const p0 = R[po + 3 * r],
        p1 = R[po + 3 * r + 1],
        p2 = R[po + 3 * r + 2];
      R[o + 3 * r] = p0 * T[0] + p1 * T[3] + p2 * T[6];
      R[o + 3 * r + 1] = p0 * T[1] + p1 * T[4] + p2 * T[7];
      R[o + 3 * r + 2] = p0 * T[2] + p1 * T[5] + p2 * T[8];
    }
  }
}

/** C = Rnom · U · Rᵀ of sensor si into out[9·si..] (MODEL.md section 4). */
function crossAxisMatrix(m: Model, si: number, draws: Float64Array, R: Float64Array, out: Float64Array, s: Scratch): void {
  const e = m.elements[m.sensors[si].element];
  const U = s.t1;
  if (e.axisOff >= 0) {
    const o = e.axisOff;
    const G = s.fm;
    tanTo(draws, o, DEG, 6, G, 0);
    const g1 = G[0],
      g2 = G[1],
      g3 = G[2],
      g4 = G[3],
      g5 = G[4],
      g6 = G[5];
    const nx = 1 / Math.sqrt(1 + g1 * g1 + g2 * g2);
    const ny = 1 / Math.sqrt(g3 * g3 + 1 + g4 * g4);
    const nz = 1 / Math.sqrt(g5 * g5 + g6 * g6 + 1);
    U[0] = nx;
    U[1] = g1 * nx;
    U[2] = g2 * nx;
    U[3] = g3 * ny;
    U[4] = ny;
    U[5] = g4 * ny;
    U[6] = g5 * nz;
    U[7] = g6 * nz;
    U[8] = nz;
  } else identity(U);
  const A = mul(e.Rnom, U, s.t2);
  // out = A·R_eᵀ, R_e read in place (mulTB's products in mulTB's order)
  const ro = 9 * m.sensors[si].element;
  const o = 9 * si;
  for (let r = 0; r < 3; r++) {
    const a0 = A[3 * r],
      a1 = A[3 * r + 1],
      a2 = A[3 * r + 2];
    out[o + 3 * r] = a0 * R[ro] + a1 * R[ro + 1] + a2 * R[ro + 2];
    out[o + 3 * r + 1] = a0 * R[ro + 3] + a1 * R[ro + 4] + a2 * R[ro + 5];
    out[o + 3 * r + 2] = a0 * R[ro + 6] + a1 * R[ro + 7] + a2 * R[ro + 8];
  }
}

/**
 * One trial: fills s.metrics (MODEL.md section 7 order of model.metrics) and
 * s.headingErr (deg per attitude; left stale when s.perAttitude is false and the model's
 * sweep is screened). Pure function of the draws.
 */
export function evaluateTrial(m: Model, draws: Float64Array, s: Scratch): void {
  orientations(m, draws, s.R, s);
  const nS = m.sensors.length;
  for (let si = 0; si < nS; si++) crossAxisMatrix(m, si, draws, s.R, s.C, s);

  if (m.calibrationRank >= 0) {
    const masked = s.masked;
    for (let k = 0; k < m.drawCount; k++) masked[k] = m.drawRank[k] <= m.calibrationRank ? draws[k] : 0;
    orientations(m, masked, s.Rk, s);
    for (let si = 0; si < nS; si++) {
      crossAxisMatrix(m, si, masked, s.Rk, s.Ck, s);
      // C_eff = (E · C_k)⁻¹ · C_total
      const sen = m.sensors[si];
      const E = s.t1,
        EC = s.t2,
        inv = s.t3,
        Ct = s.t4;
      if (sen.calOff >= 0) rotVec(draws[sen.calOff] * DEG, draws[sen.calOff + 1] * DEG, draws[sen.calOff + 2] * DEG, E);
      else identity(E);
      for (let k = 0; k < 9; k++) Ct[k] = s.Ck[9 * si + k];
      mul(E, Ct, EC);
      if (!invert(EC, inv)) identity(inv);
      for (let k = 0; k < 9; k++) Ct[k] = s.C[9 * si + k];
      mul(inv, Ct, EC);
      for (let k = 0; k < 9; k++) s.C[9 * si + k] = EC[k];
    }
  }

  // Δ = R·Rnomᵀ per sensor, for relative rotations
  for (let si = 0; si < nS; si++) {
    const e = m.elements[m.sensors[si].element];
    const o = 9 * m.sensors[si].element;
    const Rn = e.Rnom;
    for (let r = 0; r < 3; r++) {
      const a0 = s.R[o + 3 * r],
        a1 = s.R[o + 3 * r + 1],
        a2 = s.R[o + 3 * r + 2];
      s.delta[9 * si + 3 * r] = a0 * Rn[0] + a1 * Rn[1] + a2 * Rn[2];
      s.delta[9 * si + 3 * r + 1] = a0 * Rn[3] + a1 * Rn[4] + a2 * Rn[5];
      s.delta[9 * si + 3 * r + 2] = a0 * Rn[6] + a1 * Rn[7] + a2 * Rn[8];
    }
  }

  let hMax = 0,
    hRms = 0;
  if (m.heading) {
    const h = m.heading;
    const r =
      h.screened && !s.perAttitude
        ? headingSweepScreened(s.C, 9 * h.accel, s.C, 9 * h.mag, h.attitudes)
        : headingSweep(s.C, 9 * h.accel, s.C, 9 * h.mag, h.attitudes, s.headingErr);
    hMax = r.maxAbs;
    hRms = r.rms;
  }

  const out = s.metrics;
  const C = s.C,
    R = s.R;
  const ms = m.metrics;
  // a row's off-axis magnitude, kept for its percent and angle metrics (consecutive)
  let offAt = -1,
    offVal = 0;
  for (let k = 0; k < ms.length; k++) {
    const mi = ms[k];
    switch (mi.code) {
      case 0: {
        const o = 9 * mi.a + 3 * mi.row;
        out[k] = (100 * C[o + mi.b]) / C[o + mi.row];
        break;
      }
      case 1:
      case 2: {
        const o = 9 * mi.a + 3 * mi.row;
        const i = mi.row,
          j = i === 2 ? 0 : i + 1,
          l = i === 0 ? 2 : i - 1;
        if (offAt !== o) {
          offAt = o;
          offVal = Math.sqrt(C[o + j] * C[o + j] + C[o + l] * C[o + l]);
        }
        const off = offVal;
        if (mi.code === 1) out[k] = (100 * off) / Math.abs(C[o + i]);
        else {
          atan2To(off, C[o + i], out, k);
          out[k] /= DEG;
        }
        break;
      }
      case 3: {
        const o = 9 * mi.a;
        const Rn = m.elements[mi.a].Rnom;
        // angle between R·ez and Rnom·ez
        const ax = R[o + 2],
          ay = R[o + 5],
          az = R[o + 8],
          bx = Rn[2],
          by = Rn[5],
          bz = Rn[8];
        const cx = ay * bz - az * by,
          cy = az * bx - ax * bz,
          cz = ax * by - ay * bx;
        atan2To(Math.sqrt(cx * cx + cy * cy + cz * cz), ax * bx + ay * by + az * bz, out, k);
        out[k] /= DEG;
        break;
      }
      case 4:
        relativeAngleTo(s.delta, 9 * mi.a, 9 * mi.b, out, k);
        out[k] /= DEG;
        break;
      case 5:
        out[k] = hMax;
        break;
      case 6:
        out[k] = hRms;
        break;
    }
  }
}

/** out[i] = rotation angle of aᵀ·b for a, b at offsets of d (see rotation.relativeAngle). */
function relativeAngleTo(d: Float64Array, oa: number, ob: number, out: Float64Array, i: number): void {
  let tr = 0;
  for (let k = 0; k < 9; k++) tr += d[oa + k] * d[ob + k];
  // M_ij = Σ_r a_ri b_rj
  const m21 = d[oa + 2] * d[ob + 1] + d[oa + 5] * d[ob + 4] + d[oa + 8] * d[ob + 7];
  const m12 = d[oa + 1] * d[ob + 2] + d[oa + 4] * d[ob + 5] + d[oa + 7] * d[ob + 8];
  const m02 = d[oa] * d[ob + 2] + d[oa + 3] * d[ob + 5] + d[oa + 6] * d[ob + 8];
  const m20 = d[oa + 2] * d[ob] + d[oa + 5] * d[ob + 3] + d[oa + 8] * d[ob + 6];
  const m10 = d[oa + 1] * d[ob] + d[oa + 4] * d[ob + 3] + d[oa + 7] * d[ob + 6];
  const m01 = d[oa] * d[ob + 1] + d[oa + 3] * d[ob + 4] + d[oa + 6] * d[ob + 7];
  const sx = m21 - m12,
    sy = m02 - m20,
    sz = m10 - m01;
  atan2To(Math.sqrt(sx * sx + sy * sy + sz * sz), tr - 1, out, i);
}

/** Draw vector at the means of every source (the point the linearised model uses). */
export function meanDraws(m: Model, out: Float64Array = new Float64Array(m.drawCount)): Float64Array {
  for (let k = 0; k < m.drawCount; k++) out[k] = m.drawDist[k].mean;
  return out;
}
