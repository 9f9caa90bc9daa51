/**
 * Exact rotations (MODEL.md section 2) on the row-major matrices of ./mat3.
 * No small-angle forms here: this is the reference path.
 */
import type { Mat3 } from "./mat3";

export const DEG = Math.PI / 180;

/**
 * rot(v): axis v/|v|, angle |v| (radians), by Rodrigues' formula
 * R = I + s·K + c·K², K = [v]×, s = sin θ / θ, c = (1 − cos θ) / θ².
 * c is computed as 2 sin²(θ/2) / θ² so tiny angles keep full relative precision.
 */
export function rotVec(x: number, y: number, z: number, out: Mat3): Mat3 {
  const t2 = x * x + y * y + z * z;
  let s: number;
  let c: number;
  if (t2 < 1e-24) {
    // Series to beyond double precision for θ < 1e-12.
    s = 1 - t2 / 6;
    c = 0.5 - t2 / 24;
  } else {
    const t = Math.sqrt(t2);
    s = Math.sin(t) / t;
    const h = Math.sin(0.5 * t);
    c = (2 * h * h) / t2;
  }
  // K² = v vᵀ − θ² I
  out[0] = 1 + c * (x * x - t2);
  out[1] = -s * z + c * x * y;
  out[2] = s * y + c * x * z;
  out[3] = s * z + c * x * y;
  out[4] = 1 + c * (y * y - t2);
  out[5] = -s * x + c * y * z;
  out[6] = -s * y + c * x * z;
  out[7] = s * x + c * y * z;
  out[8] = 1 + c * (z * z - t2);
  return out;
}

/**
 * tiltTo(n): the smallest rotation taking ez to the unit vector n (nz > −1).
 * Closed form of rot(acos(nz) · (ez × n)/|ez × n|); no trigonometry needed.
 */
export function tiltTo(nx: number, ny: number, nz: number, out: Mat3): Mat3 {
  const k = 1 / (1 + nz);
  out[0] = 1 - nx * nx * k;
  out[1] = -nx * ny * k;
  out[2] = nx;
  out[3] = -nx * ny * k;
  out[4] = 1 - ny * ny * k;
  out[5] = ny;
  out[6] = -nx;
  out[7] = -ny;
  out[8] = nz;
  return out;
}

/** tiltTo of the surface z = a + b·x + c·y, i.e. tiltTo(normalize(−b, −c, 1)). */
export function tiltToSlope(b: number, c: number, out: Mat3): Mat3 {
  const inv = 1 / Math.sqrt(1 + b * b + c * c);
  return tiltTo(-b * inv, -c * inv, inv, out);
}

export function rotZ(a: number, out: Mat3): Mat3 {
  const c = Math.cos(a),
    s = Math.sin(a);
  out[0] = c;
  out[1] = -s;
  out[2] = 0;
  out[3] = s;
  out[4] = c;
  out[5] = 0;
  out[6] = 0;
  out[7] = 0;
  out[8] = 1;
  return out;
}

export function rotY(a: number, out: Mat3): Mat3 {
  const c = Math.cos(a),
    s = Math.sin(a);
  out[0] = c;
  out[1] = 0;
  out[2] = s;
  out[3] = 0;
  out[4] = 1;
  out[5] = 0;
  out[6] = -s;
  out[7] = 0;
  out[8] = c;
  return out;
}

export function rotX(a: number, out: Mat3): Mat3 {
  const c = Math.cos(a),
    s = Math.sin(a);
  out[0] = 1;
  out[1] = 0;
  out[2] = 0;
  out[3] = 0;
  out[4] = c;
  out[5] = -s;
  out[6] = 0;
  out[7] = s;
  out[8] = c;
  return out;
}

/**
 * Rotation angle of a rotation matrix in [0, π]. atan2 of the skew part and the trace
 * instead of acos((tr − 1)/2), which loses half the digits near zero.
 */
export function rotationAngle(m: Mat3): number {
  const sx = m[7] - m[5],
    sy = m[2] - m[6],
    sz = m[3] - m[1];
  const sin2 = Math.sqrt(sx * sx + sy * sy + sz * sz); // 2 sin θ
  const cos2 = m[0] + m[4] + m[8] - 1; // 2 cos θ
  return Math.atan2(sin2, cos2);
}

/** Angle of aᵀ·b without forming the product (relative rotation of two frames). */
export function relativeAngle(a: Mat3, b: Mat3): number {
  // M = aᵀ b; M_ij = Σ_k a_ki b_kj
  const m01 = a[0] * b[1] + a[3] * b[4] + a[6] * b[7];
  const m02 = a[0] * b[2] + a[3] * b[5] + a[6] * b[8];
  const m10 = a[1] * b[0] + a[4] * b[3] + a[7] * b[6];
  const m12 = a[1] * b[2] + a[4] * b[5] + a[7] * b[8];
  const m20 = a[2] * b[0] + a[5] * b[3] + a[8] * b[6];
  const m21 = a[2] * b[1] + a[5] * b[4] + a[8] * b[7];
  const tr = a[0] * b[0] + a[3] * b[3] + a[6] * b[6] + a[1] * b[1] + a[4] * b[4] + a[7] * b[7] + a[2] * b[2] + a[5] * b[5] + a[8] * b[8];
  const sx = m21 - m12,
    sy = m02 - m20,
    sz = m10 - m01;
  return Math.atan2(Math.sqrt(sx * sx + sy * sy + sz * sz), tr - 1);
}
