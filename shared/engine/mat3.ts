/**
 * 3x3 matrices and 3-vectors on Float64Array.
 *
 * Storage: ROW-MAJOR. m[3 * row + col], so m[0], m[1], m[2] is the first row.
 * Every function that builds a matrix or vector writes into an `out` argument and
 * returns it, so the per-trial loop allocates nothing. `out` may alias an input:
 * products read all inputs into locals before writing.
 */

export type Mat3 = Float64Array;
export type Vec3 = Float64Array;

export function mat3(): Mat3 {
  return new Float64Array(9);
}

export function vec3(): Vec3 {
  return new Float64Array(3);
}

export function fromRows(rows: ArrayLike<number>[], out: Mat3 = mat3()): Mat3 {
  for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) out[3 * r + c] = rows[r][c];
  return out;
}

export function identity(out: Mat3): Mat3 {
  out[0] = 1;
  out[1] = 0;
  out[2] = 0;
  out[3] = 0;
  out[4] = 1;
  out[5] = 0;
  out[6] = 0;
  out[7] = 0;
  out[8] = 1;
  return out;
}

export function copy(a: Mat3, out: Mat3): Mat3 {
  for (let i = 0; i < 9; i++) out[i] = a[i];
  return out;
}

/** out = a · b */
export function mul(a: Mat3, b: Mat3, out: Mat3): Mat3 {
  const a0 = a[0],
    a1 = a[1],
    a2 = a[2],
    a3 = a[3],
    a4 = a[4],
    a5 = a[5],
    a6 = a[6],
    a7 = a[7],
    a8 = a[8];
  const b0 = b[0],
    b1 = b[1],
    b2 = b[2],
    b3 = b[3],
    b4 = b[4],
    b5 = b[5],
    b6 = b[6],
    b7 = b[7],
    b8 = b[8];
  out[0] = a0 * b0 + a1 * b3 + a2 * b6;
  out[1] = a0 * b1 + a1 * b4 + a2 * b7;
  out[2] = a0 * b2 + a1 * b5 + a2 * b8;
  out[3] = a3 * b0 + a4 * b3 + a5 * b6;
  out[4] = a3 * b1 + a4 * b4 + a5 * b7;
  out[5] = a3 * b2 + a4 * b5 + a5 * b8;
  out[6] = a6 * b0 + a7 * b3 + a8 * b6;
  out[7] = a6 * b1 + a7 * b4 + a8 * b7;
  out[8] = a6 * b2 + a7 * b5 + a8 * b8;
  return out;
}

/** out = aᵀ · b */
export function mulTA(a: Mat3, b: Mat3, out: Mat3): Mat3 {
  const a0 = a[0],
    a1 = a[3],
    a2 = a[6],
    a3 = a[1],
    a4 = a[4],
    a5 = a[7],
    a6 = a[2],
    a7 = a[5],
    a8 = a[8];
  const b0 = b[0],
    b1 = b[1],
    b2 = b[2],
    b3 = b[3],
    b4 = b[4],
    b5 = b[5],
    b6 = b[6],
    b7 = b[7],
    b8 = b[8];
  out[0] = a0 * b0 + a1 * b3 + a2 * b6;
  out[1] = a0 * b1 + a1 * b4 + a2 * b7;
  out[2] = a0 * b2 + a1 * b5 + a2 * b8;
  out[3] = a3 * b0 + a4 * b3 + a5 * b6;
  out[4] = a3 * b1 + a4 * b4 + a5 * b7;
  out[5] = a3 * b2 + a4 * b5 + a5 * b8;
  out[6] = a6 * b0 + a7 * b3 + a8 * b6;
  out[7] = a6 * b1 + a7 * b4 + a8 * b7;
  out[8] = a6 * b2 + a7 * b5 + a8 * b8;
  return out;
}

/** out = a · bᵀ */
export function mulTB(a: Mat3, b: Mat3, out: Mat3): Mat3 {
  const a0 = a[0],
    a1 = a[1],
    a2 = a[2],
    a3 = a[3],
    a4 = a[4],
    a5 = a[5],
    a6 = a[6],
    a7 = a[7],
    a8 = a[8];
  const b0 = b[0],
    b1 = b[3],
    b2 = b[6],
    b3 = b[1],
    b4 = b[4],
    b5 = b[7],
    b6 = b[2],
    b7 = b[5],
    b8 = b[8];
  out[0] = a0 * b0 + a1 * b3 + a2 * b6;
  out[1] = a0 * b1 + a1 * b4 + a2 * b7;
  out[2] = a0 * b2 + a1 * b5 + a2 * b8;
  out[3] = a3 * b0 + a4 * b3 + a5 * b6;
  out[4] = a3 * b1 + a4 * b4 + a5 * b7;
  out[5] = a3 * b2 + a4 * b5 + a5 * b8;
  out[6] = a6 * b0 + a7 * b3 + a8 * b6;
  out[7] = a6 * b1 + a7 * b4 + a8 * b7;
  out[8] = a6 * b2 + a7 * b5 + a8 * b8;
  return out;
}

export function transpose(a: Mat3, out: Mat3): Mat3 {
  const a1 = a[1],
    a2 = a[2],
    a5 = a[5];
  out[0] = a[0];
  out[4] = a[4];
  out[8] = a[8];
  out[1] = a[3];
  out[3] = a1;
  out[2] = a[6];
  out[6] = a2;
  out[5] = a[7];
  out[7] = a5;
  return out;
}

export function det(a: Mat3): number {
  return a[0] * (a[4] * a[8] - a[5] * a[7]) - a[1] * (a[3] * a[8] - a[5] * a[6]) + a[2] * (a[3] * a[7] - a[4] * a[6]);
}

/** General inverse (cross-axis matrices are not orthogonal). Returns false if singular. */
export function invert(a: Mat3, out: Mat3): boolean {
  const a0 = a[0],
    a1 = a[1],
    a2 = a[2],
    a3 = a[3],
    a4 = a[4],
    a5 = a[5],
    a6 = a[6],
    a7 = a[7],
    a8 = a[8];
  const c0 = a4 * a8 - a5 * a7;
  const c3 = a5 * a6 - a3 * a8;
  const c6 = a3 * a7 - a4 * a6;
  const d = a0 * c0 + a1 * c3 + a2 * c6;
  if (d === 0 || !Number.isFinite(d)) return false;
  const id = 1 / d;
  out[0] = c0 * id;
  out[1] = (a2 * a7 - a1 * a8) * id;
  out[2] = (a1 * a5 - a2 * a4) * id;
  out[3] = c3 * id;
  out[4] = (a0 * a8 - a2 * a6) * id;
  out[5] = (a2 * a3 - a0 * a5) * id;
  out[6] = c6 * id;
  out[7] = (a1 * a6 - a0 * a7) * id;
  out[8] = (a0 * a4 - a1 * a3) * id;
  return true;
}

/** out = m · v */
export function mulVec(m: Mat3, v: Vec3, out: Vec3): Vec3 {
  const x = v[0],
    y = v[1],
    z = v[2];
  out[0] = m[0] * x + m[1] * y + m[2] * z;
  out[1] = m[3] * x + m[4] * y + m[5] * z;
  out[2] = m[6] * x + m[7] * y + m[8] * z;
  return out;
}

/** Angle between two vectors, accurate at small angles (atan2 of |a×b| and a·b). */
export function angleBetween(ax: number, ay: number, az: number, bx: number, by: number, bz: number): number {
  const cx = ay * bz - az * by;
  const cy = az * bx - ax * bz;
  const cz = ax * by - ay * bx;
  return Math.atan2(Math.sqrt(cx * cx + cy * cy + cz * cz), ax * bx + ay * by + az * bz);
}

export function toArray(m: Mat3): number[] {
  return Array.from(m);
}
