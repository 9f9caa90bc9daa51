import { useEffect, useMemo } from "react";
import { BufferAttribute, BufferGeometry } from "three";
import type { StackFile } from "@shared/schemas/stack-file";
import type { PoseSet } from "../lib/poses";
import type { Materials } from "../lib/scene-materials";
import { noRaycast } from "../lib/scene-types";

/** 1 mm grid over the board's top face, with every fifth line brighter. */
export function BoardGrid({ stack, poseSet, materials }: { stack: StackFile; poseSet: PoseSet; materials: Materials }) {
  const bi = stack.elements.findIndex((e) => e.parent === null);
  const footprint =
    bi < 0
      ? ""
      : [
          stack.elements[bi].size.x,
          stack.elements[bi].size.y,
          poseSet.Pnom[3 * bi],
          poseSet.Pnom[3 * bi + 1],
          poseSet.Pnom[3 * bi + 2] + stack.elements[bi].size.z,
        ].join(",");
  const geometries = useMemo(() => {
    if (!footprint) return null;
    const [sx, sy, cx, cy, top] = footprint.split(",").map(Number);
    const z = top + 0.002;
    const hx = sx / 2,
      hy = sy / 2;
    const minor: number[] = [],
      major: number[] = [];
    for (let x = Math.ceil(cx - hx); x <= cx + hx + 1e-9; x++) (x % 5 === 0 ? major : minor).push(x, cy - hy, z, x, cy + hy, z);
    for (let y = Math.ceil(cy - hy); y <= cy + hy + 1e-9; y++) (y % 5 === 0 ? major : minor).push(cx - hx, y, z, cx + hx, y, z);
    const make = (a: number[]) => {
      const g = new BufferGeometry();
      g.setAttribute("position", new BufferAttribute(new Float32Array(a), 3));
      return g;
    };
    return { minor: make(minor), major: make(major) };
  }, [footprint]);
  useEffect(
    () => () => {
      geometries?.minor.dispose();
      geometries?.major.dispose();
    },
    [geometries],
  );
  if (!geometries) return null;
  return (
    <group>
      <lineSegments geometry={geometries.minor} material={materials.gridMinor} raycast={noRaycast} renderOrder={1} />
      <lineSegments geometry={geometries.major} material={materials.gridMajor} raycast={noRaycast} renderOrder={1} />
    </group>
  );
}
