import type { ThreeEvent } from "@react-three/fiber";
import { memo, type RefObject } from "react";
import type { Group, Plane } from "three";
import type { StackFile } from "@shared/schemas/stack-file";
import type { Materials, SharedGeometry } from "../lib/scene-materials";
import { type HoverInfo, noRaycast } from "../lib/scene-types";

interface StackModelProps {
  stack: StackFile;
  materials: Materials;
  geometry: SharedGeometry;
  showCaps: boolean;
  groupRefs: RefObject<(Group | null)[]>;
  onHover: (info: HoverInfo | null) => void;
  onSelect: (index: number) => void;
  plane: Plane;
  sectionOn: boolean;
  boardIndex: number;
}

/** Boxes, edges, bond lines and section caps of every element. Rendered once per stack. */
export const StackModel = memo(function StackModel({
  stack,
  materials,
  geometry,
  showCaps,
  groupRefs,
  onHover,
  onSelect,
  plane,
  sectionOn,
  boardIndex,
}: StackModelProps) {
  const pick = (e: ThreeEvent<PointerEvent | MouseEvent>) => {
    for (const hit of e.intersections) {
      const ud = hit.object.userData as { elementIndex?: number; part?: "body" | "bond" };
      if (ud.elementIndex === undefined) continue;
      if (sectionOn && ud.elementIndex !== boardIndex && plane.distanceToPoint(hit.point) < 0) continue; // cut away: look further
      return { index: ud.elementIndex, part: ud.part ?? "body" };
    }
    return null;
  };
  return (
    <group
      onPointerMove={(e) => {
        e.stopPropagation();
        const hit = pick(e);
        onHover(hit ? { ...hit, clientX: e.nativeEvent.clientX, clientY: e.nativeEvent.clientY } : null);
      }}
      onPointerLeave={() => onHover(null)}
      onClick={(e) => {
        e.stopPropagation();
        if (e.delta > 4) return; // the end of an orbit drag, not a click
        const hit = pick(e);
        if (hit) onSelect(hit.index);
      }}
    >
      {stack.elements.map((e, i) => {
        const m = materials.elements[i];
        const t = (e.bondLine?.thicknessUm ?? 0) * 1e-3;
        return (
          <group
            key={e.id}
            matrixAutoUpdate={false}
            ref={(g) => {
              groupRefs.current[i] = g;
            }}
          >
            <mesh
              geometry={geometry.box}
              material={m.body}
              scale={[e.size.x, e.size.y, e.size.z]}
              userData={{ elementIndex: i, part: "body" }}
            />
            <lineSegments geometry={geometry.edges} material={m.edge} scale={[e.size.x, e.size.y, e.size.z]} raycast={noRaycast} />
            {showCaps && i !== boardIndex ? (
              <mesh geometry={geometry.box} material={m.cap} scale={[e.size.x, e.size.y, e.size.z]} raycast={noRaycast} />
            ) : null}
            {t > 0 ? (
              <mesh
                geometry={geometry.box}
                material={materials.bond}
                position={[0, 0, -t]}
                scale={[e.size.x * 0.985, e.size.y * 0.985, t]}
                renderOrder={2}
                userData={{ elementIndex: i, part: "bond" }}
              />
            ) : null}
          </group>
        );
      })}
    </group>
  );
});
