/** Poses of every element for one draw vector, for the 3D view and the worst-trial replay. */
import type { Model } from "./compile";
import { createScratch, orientations } from "./trial";

/** Pose of every element for one draw vector: R, nominal R, position with placement offsets (mm). */
export interface ElementPose {
  id: string;
  kind: string;
  R: number[];
  Rnom: number[];
  position: [number, number, number];
  positionNominal: [number, number, number];
}

export function poses(m: Model, draws: Float64Array): ElementPose[] {
  const s = createScratch(m);
  orientations(m, draws, s.R, s);
  const zero = new Float64Array(m.drawCount);
  const pos = new Float64Array(3 * m.elements.length);
  const posN = new Float64Array(3 * m.elements.length);
  const place = (d: Float64Array, Rs: Float64Array, P: Float64Array) => {
    m.elements.forEach((e, i) => {
      if (e.parent < 0) {
        P[3 * i] = 0;
        P[3 * i + 1] = 0;
        P[3 * i + 2] = -e.size.z;
        return;
      }
      const p = m.elements[e.parent];
      const w = p.bowOff >= 0 ? d[p.bowOff] * 1e-3 : 0;
      const rd2 = (p.size.x / 2) ** 2 + (p.size.y / 2) ** 2;
      let a = 0;
      for (let k = 0; k < e.nSup; k++) a += e.pa[k] * d[e.supOff + k];
      const lx = e.x + (e.dxOff >= 0 ? d[e.dxOff] * 1e-3 : 0);
      const ly = e.y + (e.dyOff >= 0 ? d[e.dyOff] * 1e-3 : 0);
      const lz = p.size.z + w * (1 - (e.x * e.x + e.y * e.y) / rd2) + e.bondThickness + a;
      const o = 9 * e.parent;
      for (let r = 0; r < 3; r++) P[3 * i + r] = P[3 * e.parent + r] + Rs[o + 3 * r] * lx + Rs[o + 3 * r + 1] * ly + Rs[o + 3 * r + 2] * lz;
    });
  };
  place(draws, s.R, pos);
  const sN = createScratch(m);
  orientations(m, zero, sN.R, sN);
  place(zero, sN.R, posN);
  // report in file order
  const list = m.elements.map((e, i) => ({
    fileIndex: e.fileIndex,
    pose: {
      id: e.id,
      kind: e.kind,
      R: Array.from(s.R.subarray(9 * i, 9 * i + 9)),
      Rnom: Array.from(e.Rnom),
      position: [pos[3 * i], pos[3 * i + 1], pos[3 * i + 2]] as [number, number, number],
      positionNominal: [posN[3 * i], posN[3 * i + 1], posN[3 * i + 2]] as [number, number, number],
    },
  }));
  list.sort((a, b) => a.fileIndex - b.fileIndex);
  return list.map((l) => l.pose);
}
