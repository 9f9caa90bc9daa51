/**
 * The three.js scene of the stack viewer (inside the fiber Canvas).
 *
 * Everything that follows the pose (element transforms, sensing-axis arrows, their
 * labels, the section outline) is written straight into the three objects from refs in
 * useFrame when the pose version changes; React renders the scene's structure only when
 * the stack itself changes. Frames are drawn on demand.
 */
import { Hud, OrbitControls, OrthographicCamera } from "@react-three/drei";
import { useFrame, useThree, type ThreeEvent } from "@react-three/fiber";
import { memo, useEffect, useLayoutEffect, useMemo, useRef, type RefObject } from "react";
import {
  BackSide,
  BoxGeometry,
  BufferAttribute,
  BufferGeometry,
  CanvasTexture,
  Color,
  ConeGeometry,
  CylinderGeometry,
  DoubleSide,
  EdgesGeometry,
  type Group,
  type InstancedMesh,
  LineBasicMaterial,
  type LineSegments,
  Matrix4,
  MeshBasicMaterial,
  MeshStandardMaterial,
  type PerspectiveCamera,
  Plane,
  Quaternion,
  type Sprite,
  SpriteMaterial,
  SRGBColorSpace,
  Vector3,
  type LineLoop,
} from "three";
import type { OrbitControls as OrbitControlsImpl } from "three-stdlib";
import type { StackFile } from "@shared/schemas/stack-file";
import { isSensorKind } from "@shared/schemas/stack-file";
import { boardBounds, emptyBounds, fitDistance, packageBounds, packageFilter, presetDirection, shownBounds, type ViewPreset } from "../lib/framing";
import { labelTexture } from "../lib/label-texture";
import {
  AXIS_COLOUR,
  AXIS_NAMES,
  BOND_LINE,
  BOND_LINE_OPACITY,
  GRID_MAJOR,
  GRID_MINOR,
  KIND_COLOUR,
  SECTION_OUTLINE,
  SELECTION,
  VIEWPORT_BOTTOM,
  VIEWPORT_TOP,
} from "../lib/palette";
import type { PoseSet } from "../lib/poses";
import { ShownPose } from "../lib/shown-pose";

export type SectionAxis = "off" | "x" | "y";
export interface SectionState {
  axis: SectionAxis;
  /** position of the cut in B (mm) */
  value: number;
  /** false: keep x <= value (or y >= value), the side the default view looks at; true: the other side */
  flip: boolean;
}

export interface ViewRequest {
  preset: ViewPreset;
  /** changes on every request, so the same preset can be asked for twice */
  nonce: number;
  /** jump instead of gliding (first frame) */
  instant?: boolean;
}

export interface SceneApi {
  canvas: HTMLCanvasElement;
  /** draws a frame now (for the export) */
  renderNow: () => void;
}

export interface HoverInfo {
  index: number;
  part: "body" | "bond";
  clientX: number;
  clientY: number;
}

export interface ViewerSceneProps {
  stack: StackFile;
  poseSet: PoseSet;
  exaggeration: number;
  explode: number;
  section: SectionState;
  showAxes: boolean;
  hoveredIndex: number | null;
  selectedIndex: number | null;
  view: ViewRequest;
  onHover: (info: HoverInfo | null) => void;
  onSelect: (index: number) => void;
  onApi: (api: SceneApi) => void;
  /** after every drawn frame; `moving` while the camera still glides to a preset */
  onFrame: (moving: boolean) => void;
}

export const FOV = 30;
const noRaycast = () => null;

// ---------------------------------------------------------------- shared geometry

/** A unit box with its origin at the centre of the bottom face, like the element frames. */
function unitBox(): BoxGeometry {
  const g = new BoxGeometry(1, 1, 1);
  g.translate(0, 0, 0.5);
  return g;
}

function useSharedGeometry() {
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

// ---------------------------------------------------------------- environment

function gradientTexture(): CanvasTexture {
  const c = document.createElement("canvas");
  c.width = 4;
  c.height = 256;
  const g = c.getContext("2d")!;
  const grad = g.createLinearGradient(0, 0, 0, 256);
  grad.addColorStop(0, VIEWPORT_TOP);
  grad.addColorStop(1, VIEWPORT_BOTTOM);
  g.fillStyle = grad;
  g.fillRect(0, 0, 4, 256);
  const t = new CanvasTexture(c);
  t.colorSpace = SRGBColorSpace;
  return t;
}

/**
 * Lights only, no environment map: a prefiltered environment doubles the start-up and the
 * frame time on machines without a GPU, and hemisphere plus three directional lights
 * give the boxes readable, distinct faces.
 */
function SceneEnvironment() {
  const scene = useThree((s) => s.scene);
  const invalidate = useThree((s) => s.invalidate);
  useEffect(() => {
    const background = gradientTexture();
    scene.background = background;
    invalidate();
    return () => {
      scene.background = null;
      background.dispose();
    };
  }, [scene, invalidate]);
  return (
    <>
      <hemisphereLight args={["#fbf8f2", "#3a4753", 1.55]} />
      <directionalLight position={[5, -8, 11]} intensity={1.9} />
      <directionalLight position={[-9, 7, 4]} intensity={0.7} />
      <directionalLight position={[-3, 9, -2]} intensity={0.35} />
    </>
  );
}

// ---------------------------------------------------------------- the stack

interface ElementMaterials {
  body: MeshStandardMaterial;
  edge: LineBasicMaterial;
  cap: MeshBasicMaterial;
}

function lighten(hex: string, t: number): Color {
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

function makeMaterials(stack: StackFile) {
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
type Materials = ReturnType<typeof makeMaterials>;

function disposeMaterials(m: Materials) {
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
function clippedMaterials(m: Materials, stack: StackFile) {
  return [...m.elements.filter((_, i) => stack.elements[i]?.parent !== null).flatMap((e) => [e.body, e.edge, e.cap]), m.bond];
}

/** 1 mm grid over the board's top face, with every fifth line brighter. */
function BoardGrid({ stack, poseSet, materials }: { stack: StackFile; poseSet: PoseSet; materials: Materials }) {
  const bi = stack.elements.findIndex((e) => e.parent === null);
  const footprint =
    bi < 0
      ? ""
      : [stack.elements[bi].size.x, stack.elements[bi].size.y, poseSet.Pnom[3 * bi], poseSet.Pnom[3 * bi + 1], poseSet.Pnom[3 * bi + 2] + stack.elements[bi].size.z].join(",");
  const geometries = useMemo(() => {
    if (!footprint) return null;
    const [sx, sy, cx, cy, top] = footprint.split(",").map(Number);
    const z = top + 0.002;
    const hx = sx / 2, hy = sy / 2;
    const minor: number[] = [], major: number[] = [];
    for (let x = Math.ceil(cx - hx); x <= cx + hx + 1e-9; x++) (x % 5 === 0 ? major : minor).push(x, cy - hy, z, x, cy + hy, z);
    for (let y = Math.ceil(cy - hy); y <= cy + hy + 1e-9; y++) (y % 5 === 0 ? major : minor).push(cx - hx, y, z, cx + hx, y, z);
    const make = (a: number[]) => {
      const g = new BufferGeometry();
      g.setAttribute("position", new BufferAttribute(new Float32Array(a), 3));
      return g;
    };
    return { minor: make(minor), major: make(major) };
  }, [footprint]);
  useEffect(() => () => {
    geometries?.minor.dispose();
    geometries?.major.dispose();
  }, [geometries]);
  if (!geometries) return null;
  return (
    <group>
      <lineSegments geometry={geometries.minor} material={materials.gridMinor} raycast={noRaycast} renderOrder={1} />
      <lineSegments geometry={geometries.major} material={materials.gridMajor} raycast={noRaycast} renderOrder={1} />
    </group>
  );
}

interface StackModelProps {
  stack: StackFile;
  materials: Materials;
  geometry: ReturnType<typeof useSharedGeometry>;
  showCaps: boolean;
  groupRefs: RefObject<(Group | null)[]>;
  onHover: ViewerSceneProps["onHover"];
  onSelect: ViewerSceneProps["onSelect"];
  plane: Plane;
  sectionOn: boolean;
  boardIndex: number;
}

/** Boxes, edges, bond lines and section caps of every element. Rendered once per stack. */
const StackModel = memo(function StackModel({ stack, materials, geometry, showCaps, groupRefs, onHover, onSelect, plane, sectionOn, boardIndex }: StackModelProps) {
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
            <mesh geometry={geometry.box} material={m.body} scale={[e.size.x, e.size.y, e.size.z]} userData={{ elementIndex: i, part: "body" }} />
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

// ---------------------------------------------------------------- sensing axes

interface TriadLayout {
  /** element index of each sensor */
  sensors: number[];
  /** arrow length per sensor (mm) */
  length: number[];
}

function triadLayout(stack: StackFile): TriadLayout {
  const sensors: number[] = [], length: number[] = [];
  stack.elements.forEach((e, i) => {
    if (!isSensorKind(e.kind)) return;
    sensors.push(i);
    length.push(0.5 * Math.max(e.size.x, e.size.y) + 0.4);
  });
  return { sensors, length };
}

const SHAFT_R = 0.014;
const HEAD_R = 0.045;
const HEAD_L = 0.13;

// ---------------------------------------------------------------- scene

export function ViewerScene(props: ViewerSceneProps) {
  const { stack, poseSet, exaggeration, explode, section, showAxes, hoveredIndex, selectedIndex, view, onHover, onSelect, onApi, onFrame } = props;
  const gl = useThree((s) => s.gl);
  const camera = useThree((s) => s.camera) as PerspectiveCamera;
  const size = useThree((s) => s.size);
  const invalidate = useThree((s) => s.invalidate);
  const controls = useThree((s) => s.controls) as unknown as OrbitControlsImpl | null;

  const geometry = useSharedGeometry();
  useEffect(() => () => Object.values(geometry).forEach((g) => g.dispose()), [geometry]);

  // Materials depend on the element list only: a tolerance edit keeps them.
  const structureKey = stack.elements.map((e) => `${e.id}:${e.kind}`).join("|");
  const materials = useMemo(() => makeMaterials(stack), [structureKey]);
  useEffect(() => () => disposeMaterials(materials), [materials]);

  const shown = useMemo(() => new ShownPose(poseSet), [poseSet]);
  const boardIndex = useMemo(() => stack.elements.findIndex((e) => e.parent === null), [stack]);
  const version = useRef(0);
  const groupRefs = useRef<(Group | null)[]>([]);
  const selectionRef = useRef<LineSegments>(null);

  // ---- pose: recompute the shown pose when its inputs change; objects follow in useFrame
  useLayoutEffect(() => {
    shown.update(exaggeration, explode);
    version.current++;
    invalidate();
  }, [shown, exaggeration, explode, invalidate]);

  // ---- section plane
  const plane = useMemo(() => new Plane(new Vector3(-1, 0, 0), 0), []);
  const sectionOn = section.axis !== "off";
  useLayoutEffect(() => {
    if (section.axis === "x") plane.set(new Vector3(section.flip ? 1 : -1, 0, 0), section.flip ? -section.value : section.value);
    else if (section.axis === "y") plane.set(new Vector3(0, section.flip ? -1 : 1, 0), section.flip ? section.value : -section.value);
    version.current++;
    invalidate();
  }, [plane, section.axis, section.value, section.flip, invalidate]);
  useLayoutEffect(() => {
    gl.localClippingEnabled = true;
    const planes = sectionOn ? [plane] : [];
    for (const m of clippedMaterials(materials, stack)) {
      m.clippingPlanes = planes;
      m.needsUpdate = true;
    }
    invalidate();
    // the materials follow the element list (structureKey), not every edit of the stack
  }, [gl, materials, plane, sectionOn, invalidate]);

  // ---- hover and selection highlight
  useLayoutEffect(() => {
    materials.elements.forEach((m, i) => {
      const kind = stack.elements[i]?.kind;
      if (!kind) return;
      const base = KIND_COLOUR[kind];
      const selected = i === selectedIndex, hovered = i === hoveredIndex;
      m.body.emissive.set(base);
      m.body.emissiveIntensity = selected ? 0.42 : hovered ? 0.3 : 0;
      m.edge.color.copy(selected ? new Color("#ffffff") : lighten(base, kind === "board" ? 0.25 : 0.45));
      m.edge.opacity = selected ? 1 : kind === "board" ? 0.55 : 0.9;
    });
    version.current++;
    invalidate();
  }, [materials, stack, hoveredIndex, selectedIndex, invalidate]);

  // ---- sensing-axis arrows (instanced: three per sensor, solid and see-through)
  const triads = useMemo(() => triadLayout(stack), [stack]);
  const arrowCount = 3 * triads.sensors.length;
  const shaftRef = useRef<InstancedMesh>(null);
  const headRef = useRef<InstancedMesh>(null);
  const ghostShaftRef = useRef<InstancedMesh>(null);
  const ghostHeadRef = useRef<InstancedMesh>(null);
  const labelRefs = useRef<(Sprite | null)[]>([]);
  // one label per arrow: the axis letter in the axis colour, ringed in the die's colour
  const sensorKinds = triads.sensors.map((ei) => stack.elements[ei].kind).join("|");
  const labelMaterials = useMemo(
    () =>
      sensorKinds
        .split("|")
        .filter(Boolean)
        .flatMap((kind) =>
          AXIS_NAMES.map((name, a) => {
            const t = labelTexture(name, AXIS_COLOUR[a], { ring: KIND_COLOUR[kind as keyof typeof KIND_COLOUR] });
            return { material: new SpriteMaterial({ map: t.texture, depthTest: false, depthWrite: false, sizeAttenuation: false }), aspect: t.aspect };
          }),
        ),
    [sensorKinds],
  );
  useEffect(() => () => labelMaterials.forEach((l) => l.material.dispose()), [labelMaterials]);
  useLayoutEffect(() => {
    const c = new Color();
    for (const ref of [shaftRef, headRef, ghostShaftRef, ghostHeadRef]) {
      const mesh = ref.current;
      if (!mesh) continue;
      for (let k = 0; k < arrowCount; k++) mesh.setColorAt(k, c.set(AXIS_COLOUR[k % 3]));
      if (mesh.instanceColor) mesh.instanceColor.needsUpdate = true;
    }
    version.current++;
    invalidate();
  }, [arrowCount, invalidate]);

  // Label size: a constant height on screen (px), whatever the zoom.
  useLayoutEffect(() => {
    const px = 17;
    const s = (2 * px * Math.tan(((camera.fov ?? FOV) * Math.PI) / 360)) / Math.max(1, size.height);
    labelRefs.current.forEach((sp, k) => {
      if (!sp) return;
      sp.scale.set(s * (labelMaterials[k]?.aspect ?? 1), s, 1);
    });
    invalidate();
  }, [size.height, camera, labelMaterials, arrowCount, invalidate]);

  // Axis labels only while the package is large enough on screen to carry them.
  const labelGroup = useRef<Group>(null);
  const shortestArrow = triads.length.length ? Math.min(...triads.length) : 1;
  useFrame(() => {
    const g = labelGroup.current;
    if (!g || !controls) return;
    const dist = camera.position.distanceTo(controls.target);
    const pxPerMm = size.height / (2 * dist * Math.tan(((camera.fov ?? FOV) * Math.PI) / 360));
    g.visible = pxPerMm * shortestArrow > 45;
  });

  // ---- the section outline: a rectangle where the plane cuts the package's box
  const outlineRef = useRef<LineLoop>(null);
  const outlineGeometry = useMemo(() => {
    const g = new BufferGeometry();
    g.setAttribute("position", new BufferAttribute(new Float32Array(15), 3));
    return g;
  }, []);
  useEffect(() => () => outlineGeometry.dispose(), [outlineGeometry]);

  // ---- per-frame application (allocation-free): only when something changed
  const scratch = useMemo(
    () => ({ m: new Matrix4(), q: new Quaternion(), o: new Vector3(), d: new Vector3(), s: new Vector3(), h: new Vector3(), z: new Vector3(0, 0, 1), bounds: emptyBounds() }),
    [],
  );
  const inPackage = useMemo(() => packageFilter(stack), [stack]);
  const arrowMeshes = useMemo(() => [shaftRef, headRef, ghostShaftRef, ghostHeadRef], []);
  const applied = useRef(-1);
  useFrame(() => {
    if (applied.current === version.current) return;
    applied.current = version.current;
    const R = shown.R, P = shown.P;
    const { m, q, o, d, s, z, h } = scratch;
    groupRefs.current.forEach((g, i) => {
      if (!g) return;
      const r = 9 * i;
      g.matrix.set(R[r], R[r + 1], R[r + 2], P[3 * i], R[r + 3], R[r + 4], R[r + 5], P[3 * i + 1], R[r + 6], R[r + 7], R[r + 8], P[3 * i + 2], 0, 0, 0, 1);
      g.matrixWorldNeedsUpdate = true;
    });
    // the selection box: the selected element's edges, a little larger, drawn on top
    const sel = selectionRef.current;
    if (sel) {
      const i = selectedIndex ?? -1;
      const e = i >= 0 ? stack.elements[i] : undefined;
      sel.visible = !!e && stack.elements[i]?.parent !== null;
      if (e) {
        const pad = 0.025 + 0.01 * Math.max(e.size.x, e.size.y);
        const ax = e.size.x + 2 * pad, ay = e.size.y + 2 * pad, az = e.size.z + 2 * pad;
        const r = 9 * i;
        const px = P[3 * i] - R[r + 2] * pad, py = P[3 * i + 1] - R[r + 5] * pad, pz = P[3 * i + 2] - R[r + 8] * pad;
        sel.matrix.set(R[r] * ax, R[r + 1] * ay, R[r + 2] * az, px, R[r + 3] * ax, R[r + 4] * ay, R[r + 5] * az, py, R[r + 6] * ax, R[r + 7] * ay, R[r + 8] * az, pz, 0, 0, 0, 1);
        sel.matrixWorldNeedsUpdate = true;
      }
    }
    const shaft = shaftRef.current, head = headRef.current, ghostShaft = ghostShaftRef.current, ghostHead = ghostHeadRef.current;
    for (let si = 0; si < triads.sensors.length; si++) {
      const ei = triads.sensors[si];
      const e = stack.elements[ei];
      const len = triads.length[si];
      const r = 9 * ei;
      // origin: the centre of the die's top face
      o.set(P[3 * ei] + R[r + 2] * e.size.z, P[3 * ei + 1] + R[r + 5] * e.size.z, P[3 * ei + 2] + R[r + 8] * e.size.z);
      for (let a = 0; a < 3; a++) {
        const k = 3 * si + a;
        const ax = 9 * ei + 3 * a;
        d.set(shown.axes[ax], shown.axes[ax + 1], shown.axes[ax + 2]).normalize();
        q.setFromUnitVectors(z, d);
        const shaftLen = len - HEAD_L;
        m.compose(o, q, s.set(SHAFT_R, SHAFT_R, shaftLen));
        shaft?.setMatrixAt(k, m);
        ghostShaft?.setMatrixAt(k, m);
        const hx = o.x + d.x * shaftLen, hy = o.y + d.y * shaftLen, hz = o.z + d.z * shaftLen;
        m.compose(h.set(hx, hy, hz), q, s.set(HEAD_R, HEAD_R, HEAD_L));
        head?.setMatrixAt(k, m);
        ghostHead?.setMatrixAt(k, m);
        const label = labelRefs.current[k];
        if (label) label.position.set(o.x + d.x * (len + 0.09), o.y + d.y * (len + 0.09), o.z + d.z * (len + 0.09));
      }
    }
    for (let j = 0; j < arrowMeshes.length; j++) {
      const mesh = arrowMeshes[j].current;
      if (!mesh) continue;
      mesh.instanceMatrix.needsUpdate = true;
      mesh.computeBoundingSphere();
    }
    // section outline around the package's shown box
    const line = outlineRef.current;
    if (line) {
      line.visible = sectionOn;
      if (sectionOn) {
        const b = shownBounds(stack, shown, inPackage, scratch.bounds);
        const pos = outlineGeometry.getAttribute("position") as BufferAttribute;
        const v = section.value, pad = 0.25;
        const z0 = b.min[2] - pad, z1 = b.max[2] + pad;
        // a rectangle in the plane, around the package (the fifth point closes it)
        const along = section.axis === "x" ? 1 : 0;
        const u0 = b.min[along] - pad, u1 = b.max[along] + pad;
        for (let k = 0; k < 5; k++) {
          const u = k === 1 || k === 2 ? u1 : u0, z = k === 2 || k === 3 ? z1 : z0;
          if (along === 1) pos.setXYZ(k, v, u, z);
          else pos.setXYZ(k, u, v, z);
        }
        pos.needsUpdate = true;
        outlineGeometry.computeBoundingSphere();
      }
    }
  });

  // ---- camera: presets and framing
  const rig = useRef({ active: false, t: 0, fromPos: new Vector3(), toPos: new Vector3(), fromTarget: new Vector3(), toTarget: new Vector3() });
  useEffect(() => {
    if (!controls) return;
    const b = view.preset === "board" ? boardBounds(stack, shown) : packageBounds(stack, shown);
    const fit = fitDistance(b, camera.fov ?? FOV, size.width / Math.max(1, size.height));
    const dir = presetDirection(view.preset);
    const dl = Math.hypot(dir[0], dir[1], dir[2]);
    const r = rig.current;
    r.toTarget.set(fit.centre[0], fit.centre[1], fit.centre[2]);
    r.toPos.set(fit.centre[0] + (dir[0] / dl) * fit.distance, fit.centre[1] + (dir[1] / dl) * fit.distance, fit.centre[2] + (dir[2] / dl) * fit.distance);
    if (view.instant) {
      camera.position.copy(r.toPos);
      controls.target.copy(r.toTarget);
      controls.update();
      r.active = false;
    } else {
      r.fromPos.copy(camera.position);
      r.fromTarget.copy(controls.target);
      r.t = 0;
      r.active = true;
    }
    invalidate();
    // the request alone triggers a move; later pose changes do not
    }, [view.nonce, controls]);
  useFrame((_, delta) => {
    const r = rig.current;
    if (!r.active || !controls) return;
    r.t = Math.min(1, r.t + delta / 0.45);
    const e = r.t < 0.5 ? 4 * r.t * r.t * r.t : 1 - Math.pow(-2 * r.t + 2, 3) / 2;
    camera.position.lerpVectors(r.fromPos, r.toPos, e);
    controls.target.lerpVectors(r.fromTarget, r.toTarget, e);
    controls.update();
    if (r.t >= 1) r.active = false;
    invalidate();
  });

  // ---- the API for the export, and a frame counter for tests
  useEffect(() => {
    onApi({ canvas: gl.domElement, renderNow: () => invalidate() });
  }, [gl, onApi, invalidate]);
  useFrame(() => onFrame(rig.current.active), 3);

  // keep the near plane useful from a die's corner to the whole board
  useFrame(() => {
    if (!controls) return;
    const dist = camera.position.distanceTo(controls.target);
    const near = Math.max(0.005, dist / 400);
    if (Math.abs(near - camera.near) / camera.near > 0.2) {
      camera.near = near;
      camera.far = Math.max(200, dist * 40);
      camera.updateProjectionMatrix();
    }
  });

  return (
    <>
      <SceneEnvironment />
      <BoardGrid stack={stack} poseSet={poseSet} materials={materials} />
      <StackModel
        stack={stack}
        materials={materials}
        geometry={geometry}
        showCaps={sectionOn}
        groupRefs={groupRefs}
        onHover={onHover}
        onSelect={onSelect}
        plane={plane}
        sectionOn={sectionOn}
        boardIndex={boardIndex}
      />
      <group visible={showAxes}>
        <instancedMesh key={`s${arrowCount}`} ref={shaftRef} args={[geometry.shaft, materials.arrow, Math.max(1, arrowCount)]} count={arrowCount} raycast={noRaycast} frustumCulled={false} />
        <instancedMesh key={`h${arrowCount}`} ref={headRef} args={[geometry.head, materials.arrow, Math.max(1, arrowCount)]} count={arrowCount} raycast={noRaycast} frustumCulled={false} />
        <instancedMesh key={`gs${arrowCount}`} ref={ghostShaftRef} args={[geometry.shaft, materials.ghost, Math.max(1, arrowCount)]} count={arrowCount} raycast={noRaycast} renderOrder={8} frustumCulled={false} />
        <instancedMesh key={`gh${arrowCount}`} ref={ghostHeadRef} args={[geometry.head, materials.ghost, Math.max(1, arrowCount)]} count={arrowCount} raycast={noRaycast} renderOrder={8} frustumCulled={false} />
        <group ref={labelGroup}>
        {Array.from({ length: arrowCount }, (_, k) => (
          <sprite
            key={k}
            ref={(sp) => {
              labelRefs.current[k] = sp;
            }}
            material={labelMaterials[k]?.material}
            raycast={noRaycast}
            renderOrder={10}
            center={[0.5, 0.5]}
          />
        ))}
        </group>
      </group>
      <lineSegments ref={selectionRef} geometry={geometry.edges} material={materials.selection} matrixAutoUpdate={false} visible={false} raycast={noRaycast} renderOrder={11} />
      <lineLoop ref={outlineRef} geometry={outlineGeometry} material={materials.outline} raycast={noRaycast} renderOrder={9} visible={false} />
      <OrbitControls makeDefault enableDamping={false} minDistance={0.3} maxDistance={600} zoomSpeed={0.9} />
      <FrameIndicator mainCamera={camera} />
    </>
  );
}

// ---------------------------------------------------------------- board-frame indicator

/** A small B-frame triad in the corner, turning with the camera. */
function FrameIndicator({ mainCamera }: { mainCamera: PerspectiveCamera }) {
  return (
    <Hud renderPriority={1}>
      <FrameIndicatorContent mainCamera={mainCamera} />
    </Hud>
  );
}

function FrameIndicatorContent({ mainCamera }: { mainCamera: PerspectiveCamera }) {
  const size = useThree((s) => s.size);
  const group = useRef<Group>(null);
  const items = useMemo(() => {
    const shaft = new CylinderGeometry(1.3, 1.3, 1, 10);
    shaft.rotateX(Math.PI / 2);
    shaft.translate(0, 0, 0.5);
    const head = new ConeGeometry(4, 9, 14);
    head.rotateX(Math.PI / 2);
    head.translate(0, 0, 4.5);
    const mats = AXIS_COLOUR.map((c) => new MeshBasicMaterial({ color: c }));
    const labels = (["x", "y", "z"] as const).map((n, a) => {
      const t = labelTexture(n, AXIS_COLOUR[a], { pill: false, weight: 800 });
      return { material: new SpriteMaterial({ map: t.texture, depthTest: false }), aspect: t.aspect };
    });
    const caption = labelTexture("B", "#f7f5f0", { pill: false, weight: 700 });
    return { shaft, head, mats, labels, caption: { material: new SpriteMaterial({ map: caption.texture, depthTest: false, opacity: 0.7, transparent: true }), aspect: caption.aspect } };
  }, []);
  useEffect(
    () => () => {
      items.shaft.dispose();
      items.head.dispose();
      items.mats.forEach((m) => m.dispose());
      items.labels.forEach((l) => l.material.dispose());
      items.caption.material.dispose();
    },
    [items],
  );
  const q = useMemo(() => new Quaternion(), []);
  useFrame(() => {
    if (!group.current) return;
    group.current.quaternion.copy(q.copy(mainCamera.quaternion).invert());
  });
  const L = 30;
  const dirs: [number, number, number][] = [[1, 0, 0], [0, 1, 0], [0, 0, 1]];
  const rot: [number, number, number][] = [[0, Math.PI / 2, 0], [-Math.PI / 2, 0, 0], [0, 0, 0]];
  return (
    <>
      <OrthographicCamera makeDefault position={[0, 0, 200]} />
      <group position={[size.width / 2 - 58, -size.height / 2 + 58, 0]}>
        <sprite material={items.caption.material} position={[-14, -14, 0]} scale={[16 * items.caption.aspect, 16, 1]} />
        <group ref={group}>
          {rot.map((r, a) => (
            <group key={a} rotation={r}>
              <mesh geometry={items.shaft} material={items.mats[a]} scale={[1, 1, L - 8]} />
              <mesh geometry={items.head} material={items.mats[a]} position={[0, 0, L - 9]} />
            </group>
          ))}
          {dirs.map((d, a) => (
            <sprite key={`l${a}`} material={items.labels[a].material} position={[d[0] * (L + 9), d[1] * (L + 9), d[2] * (L + 9)]} scale={[15 * items.labels[a].aspect, 15, 1]} />
          ))}
        </group>
      </group>
    </>
  );
}
