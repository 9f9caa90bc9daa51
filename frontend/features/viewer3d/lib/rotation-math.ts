/**
 * Rotation helpers for the 3D view, on the engine's row-major 3x3 layout (m[3·row + col]).
 * Every function writes into an `out` array so the pose update allocates nothing.
 *
 * Exaggeration (the view's "angles ×k"): an element's deviation from its nominal
 * orientation is D = Rnomᵀ·R. With v = log(D) its rotation vector (axis · angle), the
 * shown orientation is Rnom · exp(k·v): same axis, k times the angle.
 */
import { rotVec } from "@shared/engine/rotation";

/** Rotation vector (axis·angle, rad) of the rotation matrix m[mo..mo+8], into out[oo..oo+2]. */
export function logRotation(m: ArrayLike<number>, mo: number, out: Float64Array, oo: number): void {
  const m00 = m[mo],
    m01 = m[mo + 1],
    m02 = m[mo + 2];
  const m10 = m[mo + 3],
    m11 = m[mo + 4],
    m12 = m[mo + 5];
  const m20 = m[mo + 6],
    m21 = m[mo + 7],
    m22 = m[mo + 8];
  // skew part: 2 sin θ · n
  const sx = m21 - m12,
    sy = m02 - m20,
    sz = m10 - m01;
  const s2 = Math.sqrt(sx * sx + sy * sy + sz * sz);
  const c2 = m00 + m11 + m22 - 1;
  const theta = Math.atan2(s2, c2);
  if (theta < 1e-7) {
    // θ/sinθ → 1: v = skew/2 to better than 1e-14 relative
    out[oo] = 0.5 * sx;
    out[oo + 1] = 0.5 * sy;
    out[oo + 2] = 0.5 * sz;
    return;
  }
  if (Math.PI - theta > 1e-4) {
    const f = theta / s2;
    out[oo] = f * sx;
    out[oo + 1] = f * sy;
    out[oo + 2] = f * sz;
    return;
  }
  // near π the skew part vanishes: n nᵀ = (R + Rᵀ)/2 − cos θ · I, divided by (1 − cos θ)
  const c = Math.cos(theta),
    k = 1 / (1 - c);
  const xx = (m00 - c) * k,
    yy = (m11 - c) * k,
    zz = (m22 - c) * k;
  let nx: number, ny: number, nz: number;
  if (xx >= yy && xx >= zz) {
    nx = Math.sqrt(Math.max(xx, 0));
    ny = ((m01 + m10) * 0.5 * k) / nx;
    nz = ((m02 + m20) * 0.5 * k) / nx;
  } else if (yy >= zz) {
    ny = Math.sqrt(Math.max(yy, 0));
    nx = ((m01 + m10) * 0.5 * k) / ny;
    nz = ((m12 + m21) * 0.5 * k) / ny;
  } else {
    nz = Math.sqrt(Math.max(zz, 0));
    nx = ((m02 + m20) * 0.5 * k) / nz;
    ny = ((m12 + m21) * 0.5 * k) / nz;
  }
  // the sign of the axis from what is left of the skew part
  if (nx * sx + ny * sy + nz * sz < 0) {
    nx = -nx;
    ny = -ny;
    nz = -nz;
  }
  out[oo] = theta * nx;
  out[oo + 1] = theta * ny;
  out[oo + 2] = theta * nz;
}

/** out = aᵀ · b, for matrices at offsets (out must not alias a or b). */
export function mulTransposeA(a: ArrayLike<number>, ao: number, b: ArrayLike<number>, bo: number, out: Float64Array, oo: number): void {
  for (let r = 0; r < 3; r++)
    for (let c = 0; c < 3; c++) out[oo + 3 * r + c] = a[ao + r] * b[bo + c] + a[ao + 3 + r] * b[bo + 3 + c] + a[ao + 6 + r] * b[bo + 6 + c];
}

/** out = a · b, for matrices at offsets (out must not alias a or b). */
export function mulAt(a: ArrayLike<number>, ao: number, b: ArrayLike<number>, bo: number, out: Float64Array, oo: number): void {
  for (let r = 0; r < 3; r++)
    for (let c = 0; c < 3; c++)
      out[oo + 3 * r + c] = a[ao + 3 * r] * b[bo + c] + a[ao + 3 * r + 1] * b[bo + 3 + c] + a[ao + 3 * r + 2] * b[bo + 6 + c];
}

const tmpV = new Float64Array(3);
const tmpD = new Float64Array(9);
const tmpE = new Float64Array(9);

/**
 * Shown orientation Rnom · exp(k · log(Rnomᵀ R)) of one element, into out[oo..oo+8].
 * k = 1 gives R back (to rounding), k = 0 gives Rnom.
 */
export function exaggerateRotation(
  R: ArrayLike<number>,
  Rnom: ArrayLike<number>,
  o: number,
  k: number,
  out: Float64Array,
  oo: number,
): void {
  mulTransposeA(Rnom, o, R, o, tmpD, 0);
  logRotation(tmpD, 0, tmpV, 0);
  rotVec(k * tmpV[0], k * tmpV[1], k * tmpV[2], tmpE);
  mulAt(Rnom, o, tmpE, 0, out, oo);
}

/**
 * A unit vector u (a sensing axis in its die's frame) turned away from the ideal axis e_i
 * by k times its misalignment angle, about the same axis e_i × u. Into out[oo..oo+2].
 */
export function exaggerateDirection(u: ArrayLike<number>, uo: number, i: 0 | 1 | 2, k: number, out: Float64Array, oo: number): void {
  const ux = u[uo],
    uy = u[uo + 1],
    uz = u[uo + 2];
  // e_i × u
  let ax: number, ay: number, az: number, dot: number;
  if (i === 0) {
    ax = 0;
    ay = -uz;
    az = uy;
    dot = ux;
  } else if (i === 1) {
    ax = uz;
    ay = 0;
    az = -ux;
    dot = uy;
  } else {
    ax = -uy;
    ay = ux;
    az = 0;
    dot = uz;
  }
  const s = Math.sqrt(ax * ax + ay * ay + az * az);
  const phi = Math.atan2(s, dot);
  if (s < 1e-15) {
    out[oo] = i === 0 ? 1 : 0;
    out[oo + 1] = i === 1 ? 1 : 0;
    out[oo + 2] = i === 2 ? 1 : 0;
    return;
  }
  const f = (k * phi) / s;
  rotVec(f * ax, f * ay, f * az, tmpE);
  out[oo] = tmpE[i];
  out[oo + 1] = tmpE[3 + i];
  out[oo + 2] = tmpE[6 + i];
}

/** Angle (rad) between the z axes (third columns) of two rotations at offset o. */
export function zAxisAngle(R: ArrayLike<number>, Rn: ArrayLike<number>, o: number): number {
  const ax = R[o + 2],
    ay = R[o + 5],
    az = R[o + 8];
  const bx = Rn[o + 2],
    by = Rn[o + 5],
    bz = Rn[o + 8];
  const cx = ay * bz - az * by,
    cy = az * bx - ax * bz,
    cz = ax * by - ay * bx;
  return Math.atan2(Math.sqrt(cx * cx + cy * cy + cz * cz), ax * bx + ay * by + az * bz);
}
