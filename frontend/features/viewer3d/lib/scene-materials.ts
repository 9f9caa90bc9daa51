/**
 * Geometry and materials of the 3D view: one unit box per element kind scaled in place,
 * arrow parts for the sensing axes, and the materials (with the hatched section cap).
 */
import { useMemo } from "react";
import {
  BackSide,
  BoxGeometry,
  Color,
  ConeGeometry,
  CylinderGeometry,
  DoubleSide,
  EdgesGeometry,
  LineBasicMaterial,
  MeshBasicMaterial,
  MeshStandardMaterial,
} from "three";
import type { StackFile } from "@shared/schemas/stack-file";
import { isSensorKind } from "@shared/schemas/stack-file";
import { BOND_LINE, BOND_LINE_OPACITY, GRID_MAJOR, GRID_MINOR, KIND_COLOUR, SECTION_OUTLINE, SELECTION } from "./palette";

/** A unit box with its origin at the centre of the bottom face, like the element frames. */
function unitBox(): BoxGeometry {
  const g = new BoxGeometry(1, 1, 1);
  g.translate(0, 0, 0.5);
  return g;
}

export function useSharedGeometry() {
  return useMemo(() => {
    const box = unitBox();
    const edges = new EdgesGeometry(box);
    // arrows along +z from the origin: shaft of unit length, head of unit length
    const shaft = new CylinderGeometry(1, 1, 1, 12, 1);
    shaft.rotateX(Math.PI / 2);
    shaft.translate(0, 0, 0.5);
    const head = new ConeGeometry(1, 1, 18, 1);
    head.rotateX(Math.PI / 2);
    head.translate(0, 0, 0.5);
    return { box, edges, shaft, head };
  }, []);
}
export type SharedGeometry = ReturnType<typeof useSharedGeometry>;

interface ElementMaterials {
  body: MeshStandardMaterial;
  edge: LineBasicMaterial;
  cap: MeshBasicMaterial;
}

export function lighten(hex: string, t: number): Color {
  return new Color(hex).lerp(new Color("#ffffff"), t);
}

/**
 * Seen through a cut, a box shows its inner faces; drawn flat with a diagonal hatch in
 * screen space, they read as cut material, as on a drawing's section view.
 */
function hatchCut(shader: { fragmentShader: string }) {
  shader.fragmentShader = shader.fragmentShader.replace(
    "#include <dithering_fragment>",
    `#include <dithering_fragment>
    float hatch = step(mod(gl_FragCoord.x + gl_FragCoord.y, 7.0), 1.6);
    gl_FragColor.rgb = mix(gl_FragColor.rgb, vec3(1.0), hatch * 0.3);`,
  );
}

export function makeMaterials(stack: StackFile) {
  const elements: ElementMaterials[] = stack.elements.map((e) => {
    const colour = KIND_COLOUR[e.kind];
    const board = e.kind === "board";
    const body = new MeshStandardMaterial({
      color: colour,
      roughness: board ? 0.82 : isSensorKind(e.kind) ? 0.42 : 0.6,
      metalness: 0.0,
      polygonOffset: true,
      polygonOffsetFactor: 1,
      polygonOffsetUnits: board ? 4 : 1,
    });
    const edge = new LineBasicMaterial({ color: lighten(colour, board ? 0.25 : 0.45), transparent: true, opacity: board ? 0.55 : 0.9 });
    const cap = new MeshBasicMaterial({ color: new Color(colour).multiplyScalar(0.7), side: BackSide });
    cap.onBeforeCompile = hatchCut;
    cap.customProgramCacheKey = () => "orthostack-section-hatch";
    return { body, edge, cap };
  });
  const bond = new MeshStandardMaterial({
    color: BOND_LINE,
    roughness: 0.35,
    transparent: true,
    opacity: BOND_LINE_OPACITY,
    depthWrite: false,
    side: DoubleSide,
    // its top face lies in the die's bottom face: seen through a cut, the die's face wins
    polygonOffset: true,
    polygonOffsetFactor: 2,
    polygonOffsetUnits: 8,
  });
  const gridMinor = new LineBasicMaterial({ color: GRID_MINOR, transparent: true, opacity: 0.13, depthWrite: false });
  const gridMajor = new LineBasicMaterial({ color: GRID_MAJOR, transparent: true, opacity: 0.28, depthWrite: false });
  const arrow = new MeshStandardMaterial({ color: "#ffffff", roughness: 0.45 });
  const ghost = new MeshBasicMaterial({ color: "#ffffff", transparent: true, opacity: 0.3, depthTest: false, depthWrite: false });
  const outline = new LineBasicMaterial({ color: SECTION_OUTLINE, transparent: true, opacity: 0.65, depthTest: false });
  const selection = new LineBasicMaterial({ color: SELECTION, transparent: true, opacity: 0.95, depthTest: false });
  return { elements, bond, gridMinor, gridMajor, arrow, ghost, outline, selection };
}
export type Materials = ReturnType<typeof makeMaterials>;

export function disposeMaterials(m: Materials) {
  for (const e of m.elements) {
    e.body.dispose();
    e.edge.dispose();
    e.cap.dispose();
  }
  m.bond.dispose();
  m.gridMinor.dispose();
  m.gridMajor.dispose();
  m.arrow.dispose();
  m.ghost.dispose();
  m.outline.dispose();
  m.selection.dispose();
}

/**
 * Materials that the section plane cuts: the package's elements and bond lines. The board
 * stays whole (a cut board is only a missing half), and so do arrows, labels and outline.
 */
export function clippedMaterials(m: Materials, stack: StackFile) {
  return [...m.elements.filter((_, i) => stack.elements[i]?.parent !== null).flatMap((e) => [e.body, e.edge, e.cap]), m.bond];
}
