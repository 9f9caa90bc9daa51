/**
 * The pose as drawn: deviations from nominal exaggerated by k, every level of the stack
 * lifted by `gap` above its parent (exploded view). Preallocated per pose set, so a
 * slider drag recomputes it without allocating.
 *
 *   R_shown(e) = Rnom(e) · exp(k · log(Rnom(e)ᵀ R(e)))
 *   P_shown(e) = P_shown(parent) + R_shown(parent) · (L(e) + gap · ez)
 *
 * L(e) is the true offset of the element's bottom-face centre in its parent's frame
 * (placement, bow, bond line), so children ride on their exaggerated parents while
 * lengths stay true to scale. Sensing axes turn away from the die's ideal axes by k times
 * their misalignment.
 */
import type { PoseSet } from "./poses";
import { exaggerateDirection, exaggerateRotation } from "./rotation-math";

export class ShownPose {
  readonly R: Float64Array;
  readonly P: Float64Array;
  /** world directions of the sensing axes, 3 per axis, 9 per element */
  readonly axes: Float64Array;
  private readonly local = new Float64Array(9);

  constructor(readonly set: PoseSet) {
    this.R = new Float64Array(9 * set.count);
    this.P = new Float64Array(3 * set.count);
    this.axes = new Float64Array(9 * set.count);
  }

  update(k: number, gap: number): void {
    const s = this.set,
      R = this.R,
      P = this.P;
    for (let j = 0; j < s.order.length; j++) {
      const i = s.order[j];
      const q = s.parent[i];
      const o = 9 * i;
      exaggerateRotation(s.R, s.Rnom, o, k, R, o);
      if (q < 0) {
        P[3 * i] = s.P[3 * i];
        P[3 * i + 1] = s.P[3 * i + 1];
        P[3 * i + 2] = s.P[3 * i + 2];
      } else {
        const lx = s.L[3 * i],
          ly = s.L[3 * i + 1],
          lz = s.L[3 * i + 2] + gap;
        const po = 9 * q;
        for (let r = 0; r < 3; r++) P[3 * i + r] = P[3 * q + r] + R[po + 3 * r] * lx + R[po + 3 * r + 1] * ly + R[po + 3 * r + 2] * lz;
      }
      // sensing axes: exaggerated in the die frame, then into B with the shown orientation
      const u = this.local;
      for (let a = 0 as 0 | 1 | 2; a < 3; a = (a + 1) as 0 | 1 | 2) {
        exaggerateDirection(s.U, o + 3 * a, a, k, u, 3 * a);
        for (let r = 0; r < 3; r++)
          this.axes[o + 3 * a + r] = R[o + 3 * r] * u[3 * a] + R[o + 3 * r + 1] * u[3 * a + 1] + R[o + 3 * r + 2] * u[3 * a + 2];
      }
    }
  }
}
