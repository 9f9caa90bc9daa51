// three.js (Quaternion, Matrix4, Matrix3) is the independent reference for the rotation
// code; three stores matrices column-major, the engine row-major (see shared/engine/mat3.ts).
import { describe, expect, it } from "vitest";
import * as THREE from "three";
import { det, invert, mat3, mul, mulTA, mulTB, transpose } from "@shared/engine/mat3";
import { relativeAngle, rotationAngle, rotVec, rotX, rotY, rotZ, tiltTo, tiltToSlope } from "@shared/engine/rotation";
import { Xoshiro128ss } from "@shared/engine/random";

const g = new Xoshiro128ss(11, 22, 33, 44);
const rnd = () => 2 * g.nextOpen01() - 1;

/** three Matrix4 (column-major) -> our row-major 3x3 */
function fromThree(m: THREE.Matrix4): Float64Array {
  const e = m.elements;
  const out = mat3();
  for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) out[3 * r + c] = e[4 * c + r];
  return out;
}

function toThree(a: Float64Array): THREE.Matrix4 {
  const m = new THREE.Matrix4();
  m.set(a[0], a[1], a[2], 0, a[3], a[4], a[5], 0, a[6], a[7], a[8], 0, 0, 0, 0, 1); // set() takes row-major
  return m;
}

function maxDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let d = 0;
  for (let i = 0; i < a.length; i++) d = Math.max(d, Math.abs(a[i] - b[i]));
  return d;
}

describe("rotations against three.js", () => {
  it("rot(v) (Rodrigues) equals three's axis-angle quaternion, from 1e-10 rad to 3 rad", () => {
    for (const scale of [1e-10, 1e-6, 1e-3, 0.1, 1, 3]) {
      for (let t = 0; t < 20; t++) {
        const v = new THREE.Vector3(rnd(), rnd(), rnd());
        v.setLength(scale * (0.5 + 0.5 * Math.abs(rnd())));
        const q = new THREE.Quaternion().setFromAxisAngle(v.clone().normalize(), v.length());
        const ref = fromThree(new THREE.Matrix4().makeRotationFromQuaternion(q));
        expect(maxDiff(rotVec(v.x, v.y, v.z, mat3()), ref)).toBeLessThan(2e-15);
      }
    }
  });

  it("tiltTo(n) equals three's setFromUnitVectors(ez, n): the smallest rotation taking ez to n", () => {
    for (let t = 0; t < 50; t++) {
      const n = new THREE.Vector3(rnd(), rnd(), 1 + rnd() * 0.9).normalize();
      const q = new THREE.Quaternion().setFromUnitVectors(new THREE.Vector3(0, 0, 1), n);
      const ref = fromThree(new THREE.Matrix4().makeRotationFromQuaternion(q));
      expect(maxDiff(tiltTo(n.x, n.y, n.z, mat3()), ref)).toBeLessThan(1e-14);
    }
  });

  it("tiltTo of a plane z = a + b·x + c·y is rot(atan(√(b²+c²))·(c, −b, 0)/√(b²+c²)) (MODEL.md section 2)", () => {
    for (let t = 0; t < 50; t++) {
      const b = 0.05 * rnd(),
        c = 0.05 * rnd();
      const s = Math.hypot(b, c);
      const th = Math.atan(s);
      const viaRot = rotVec((th * c) / s, (-th * b) / s, 0, mat3());
      expect(maxDiff(tiltToSlope(b, c, mat3()), viaRot)).toBeLessThan(1e-15);
      // the tilted ez is the plane's normal normalize(−b, −c, 1)
      const R = tiltToSlope(b, c, mat3());
      const k = 1 / Math.sqrt(1 + b * b + c * c);
      expect(maxDiff([R[2], R[5], R[8]], [-b * k, -c * k, k])).toBeLessThan(1e-16);
    }
  });

  it("Rx, Ry, Rz equal three's makeRotationX/Y/Z", () => {
    for (const a of [-2, -0.3, 1e-4, 0.7, 3]) {
      expect(maxDiff(rotX(a, mat3()), fromThree(new THREE.Matrix4().makeRotationX(a)))).toBeLessThan(1e-16);
      expect(maxDiff(rotY(a, mat3()), fromThree(new THREE.Matrix4().makeRotationY(a)))).toBeLessThan(1e-16);
      expect(maxDiff(rotZ(a, mat3()), fromThree(new THREE.Matrix4().makeRotationZ(a)))).toBeLessThan(1e-16);
    }
  });

  it("products, transposes and the general inverse equal three's Matrix4 results", () => {
    for (let t = 0; t < 20; t++) {
      const a = Float64Array.from({ length: 9 }, rnd),
        b = Float64Array.from({ length: 9 }, rnd);
      expect(maxDiff(mul(a, b, mat3()), fromThree(toThree(a).multiply(toThree(b))))).toBeLessThan(1e-15);
      expect(maxDiff(mulTA(a, b, mat3()), fromThree(toThree(a).transpose().multiply(toThree(b))))).toBeLessThan(1e-15);
      expect(maxDiff(mulTB(a, b, mat3()), fromThree(toThree(a).multiply(toThree(b).transpose())))).toBeLessThan(1e-15);
      expect(maxDiff(transpose(a, mat3()), fromThree(toThree(a).transpose()))).toBe(0);
      const inv = mat3();
      expect(invert(a, inv)).toBe(true);
      expect(maxDiff(inv, fromThree(toThree(a).invert()))).toBeLessThan(1e-9 * Math.max(1, Math.abs(1 / det(a))));
      // aliasing: out may be an input
      const c = a.slice();
      mul(c, b, c);
      expect(maxDiff(c, mul(a, b, mat3()))).toBe(0);
    }
  });

  it("rotation angle and relative angle equal three's quaternion angles, also for tiny angles", () => {
    for (const scale of [1e-9, 1e-4, 0.5, 3]) {
      for (let t = 0; t < 10; t++) {
        const va = new THREE.Vector3(rnd(), rnd(), rnd()).setLength(scale);
        const vb = new THREE.Vector3(rnd(), rnd(), rnd()).setLength(scale);
        const A = rotVec(va.x, va.y, va.z, mat3()),
          B = rotVec(vb.x, vb.y, vb.z, mat3());
        expect(rotationAngle(A)).toBeCloseTo(va.length(), 14);
        const qa = new THREE.Quaternion().setFromAxisAngle(va.clone().normalize(), va.length());
        const qb = new THREE.Quaternion().setFromAxisAngle(vb.clone().normalize(), vb.length());
        const ref = qa.angleTo(qb);
        // three's angleTo goes through acos: its own error is about 1e-16/angle
        const got = relativeAngle(A, B);
        if (ref > 1e-6) expect(Math.abs(got - ref)).toBeLessThan(1e-9 * ref + 1e-15 / ref);
        const direct = rotationAngle(mulTA(A, B, mat3()));
        expect(Math.abs(got - direct)).toBeLessThan(1e-15 + 1e-11 * direct);
      }
    }
  });
});
