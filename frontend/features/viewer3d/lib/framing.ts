/**
 * Camera framing: bounding boxes of the drawn elements and the camera placement that
 * fits them. The board is tens of millimetres across and a die about one, so the default
 * frame is the package (everything but the board), with the whole board one click away.
 */
import type { StackFile } from "@shared/schemas/stack-file";
import type { ShownPose } from "./shown-pose";

export type ViewPreset = "iso" | "top" | "side" | "end" | "package" | "board";
export interface Bounds {
  min: [number, number, number];
  max: [number, number, number];
}

export function emptyBounds(): Bounds {
  return { min: [Infinity, Infinity, Infinity], max: [-Infinity, -Infinity, -Infinity] };
}

/** Box corners of the chosen elements (with their bond lines) in the shown pose. Allocates nothing when given `out`. */
export function shownBounds(stack: StackFile, shown: ShownPose, include: (index: number) => boolean, out: Bounds = emptyBounds()): Bounds {
  out.min[0] = out.min[1] = out.min[2] = Infinity;
  out.max[0] = out.max[1] = out.max[2] = -Infinity;
  const R = shown.R,
    P = shown.P;
  const els = stack.elements;
  for (let i = 0; i < els.length; i++) {
    const e = els[i];
    if (!include(i)) continue;
    const hx = e.size.x / 2,
      hy = e.size.y / 2;
    const z0 = -(e.bondLine?.thicknessUm ?? 0) * 1e-3,
      z1 = e.size.z;
    for (let c = 0; c < 8; c++) {
      const x = c & 1 ? hx : -hx,
        y = c & 2 ? hy : -hy,
        z = c & 4 ? z1 : z0;
      for (let r = 0; r < 3; r++) {
        const v = P[3 * i + r] + R[9 * i + 3 * r] * x + R[9 * i + 3 * r + 1] * y + R[9 * i + 3 * r + 2] * z;
        if (v < out.min[r]) out.min[r] = v;
        if (v > out.max[r]) out.max[r] = v;
      }
    }
  }
  return out;
}

/** Which elements make the package: every one but the board, or the board when it is alone. */
export function packageFilter(stack: StackFile): (index: number) => boolean {
  const hasPackage = stack.elements.some((e) => e.parent !== null);
  return hasPackage ? (i) => stack.elements[i].parent !== null : () => true;
}

export function packageBounds(stack: StackFile, shown: ShownPose, out?: Bounds): Bounds {
  return shownBounds(stack, shown, packageFilter(stack), out);
}

export function boardBounds(stack: StackFile, shown: ShownPose): Bounds {
  return shownBounds(stack, shown, () => true);
}

/** Unit vector from the target toward the camera, per preset (B frame, z up). */
export function presetDirection(preset: ViewPreset): [number, number, number] {
  switch (preset) {
    case "top":
      return [0, -1e-4, 1];
    case "side":
      return [0, -1, 0.02];
    case "end":
      return [1, 0, 0.02];
    case "iso":
    case "package":
    case "board":
    default:
      return [0.62, -0.72, 0.56];
  }
}

/** Distance at which a sphere around the bounds fills the narrower field of view. */
export function fitDistance(
  b: Bounds,
  fovDeg: number,
  aspect: number,
  margin = 1.08,
): { centre: [number, number, number]; distance: number; radius: number } {
  const centre: [number, number, number] = [(b.min[0] + b.max[0]) / 2, (b.min[1] + b.max[1]) / 2, (b.min[2] + b.max[2]) / 2];
  const radius = 0.5 * Math.hypot(b.max[0] - b.min[0], b.max[1] - b.min[1], b.max[2] - b.min[2]) || 1;
  const v = (fovDeg * Math.PI) / 180;
  const h = 2 * Math.atan(Math.tan(v / 2) * aspect);
  const fov = Math.min(v, h);
  return { centre, distance: (radius * margin) / Math.sin(fov / 2), radius };
}
