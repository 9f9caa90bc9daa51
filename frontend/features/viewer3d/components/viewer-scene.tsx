/**
 * The three.js scene of the stack viewer (inside the fiber Canvas).
 *
 * Everything that follows the pose (element transforms, sensing-axis arrows, their
 * labels, the section outline) is written straight into the three objects from refs in
 * useFrame when the pose version changes; React renders the scene's structure only when
 * the stack itself changes. Frames are drawn on demand.
 */
import { OrbitControls } from "@react-three/drei";
import { useFrame, useThree } from "@react-three/fiber";
import { useEffect, useLayoutEffect, useMemo, useRef } from "react";
import {
  BufferAttribute,
  BufferGeometry,
  Color,
  type Group,
  type InstancedMesh,
  type LineLoop,
  type LineSegments,
  Matrix4,
  type PerspectiveCamera,
  Plane,
  Quaternion,
  type Sprite,
  SpriteMaterial,
  Vector3,
} from "three";
import type { OrbitControls as OrbitControlsImpl } from "three-stdlib";
import type { StackFile } from "@shared/schemas/stack-file";
import { boardBounds, emptyBounds, fitDistance, packageBounds, packageFilter, presetDirection, shownBounds } from "../lib/framing";
import { labelTexture } from "../lib/label-texture";
import { AXIS_COLOUR, AXIS_NAMES, KIND_COLOUR } from "../lib/palette";
import type { PoseSet } from "../lib/poses";
import { useElementHighlight } from "../hooks/use-element-highlight";
import { clippedMaterials, disposeMaterials, makeMaterials, useSharedGeometry } from "../lib/scene-materials";
import { cameraView, renderAtScale } from "../lib/render-at";
import { FOV, type HoverInfo, noRaycast, type SceneApi, type SectionState, type ViewRequest } from "../lib/scene-types";
import { ShownPose } from "../lib/shown-pose";
import { HEAD_L, HEAD_R, SHAFT_R, triadLayout } from "../lib/triad-layout";
import { BoardGrid } from "./board-grid";
import { FrameIndicator } from "./frame-indicator";
import { SceneEnvironment } from "./scene-environment";
import { StackModel } from "./stack-model";

export { FOV, type HoverInfo, type SceneApi, type SectionAxis, type SectionState, type ViewRequest } from "../lib/scene-types";

export interface ViewerSceneProps {
  stack: StackFile;
  poseSet: PoseSet;
  exaggeration: number;
  explode: number;
  section: SectionState;
  showAxes: boolean;
  hoveredIndex: number | null;
  selectedIndex: number | null;
  /** elements with a geometry warning: their outline is drawn in the warning colour */
  flagged: ReadonlySet<number>;
  view: ViewRequest;
  onHover: (info: HoverInfo | null) => void;
  onSelect: (index: number) => void;
  onApi: (api: SceneApi) => void;
  /** after every drawn frame; `moving` while the camera still glides to a preset */
  onFrame: (moving: boolean) => void;
}

// ---------------------------------------------------------------- scene

export function ViewerScene(props: ViewerSceneProps) {
  const { stack, poseSet, exaggeration, explode, section, showAxes, hoveredIndex, selectedIndex, flagged, view } = props;
  const { onHover, onSelect, onApi, onFrame } = props;
  const gl = useThree((s) => s.gl);
  const camera = useThree((s) => s.camera) as PerspectiveCamera;
  const size = useThree((s) => s.size);
  const invalidate = useThree((s) => s.invalidate);
  // react-three-fiber types `controls` as a bare EventDispatcher; ours are drei's OrbitControls (makeDefault)
  const controls = useThree((s) => s.controls) as unknown as OrbitControlsImpl | null;

  const geometry = useSharedGeometry();
  useEffect(() => () => Object.values(geometry).forEach((g) => g.dispose()), [geometry]);

  // Materials depend on the element list only: a tolerance edit keeps them.
  const structureKey = stack.elements.map((e) => `${e.id}:${e.kind}`).join("|");
  // eslint-disable-next-line react-hooks/exhaustive-deps -- structureKey stands for the element list
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
    // eslint-disable-next-line react-hooks/exhaustive-deps -- see the line above
  }, [gl, materials, plane, sectionOn, invalidate]);

  // ---- hover, selection and geometry-warning highlight
  useElementHighlight(materials, stack, hoveredIndex, selectedIndex, flagged, version, invalidate);

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
            return {
              material: new SpriteMaterial({ map: t.texture, depthTest: false, depthWrite: false, sizeAttenuation: false }),
              aspect: t.aspect,
            };
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
    () => ({
      m: new Matrix4(),
      q: new Quaternion(),
      o: new Vector3(),
      d: new Vector3(),
      s: new Vector3(),
      h: new Vector3(),
      z: new Vector3(0, 0, 1),
      bounds: emptyBounds(),
    }),
    [],
  );
  const inPackage = useMemo(() => packageFilter(stack), [stack]);
  const arrowMeshes = useMemo(() => [shaftRef, headRef, ghostShaftRef, ghostHeadRef], []);
  const applied = useRef(-1);
  useFrame(() => {
    if (applied.current === version.current) return;
    applied.current = version.current;
    const R = shown.R,
      P = shown.P;
    const { m, q, o, d, s, z, h } = scratch;
    groupRefs.current.forEach((g, i) => {
      if (!g) return;
      const r = 9 * i;
      g.matrix.set(
        R[r],
        R[r + 1],
        R[r + 2],
        P[3 * i],
        R[r + 3],
        R[r + 4],
        R[r + 5],
        P[3 * i + 1],
        R[r + 6],
        R[r + 7],
        R[r + 8],
        P[3 * i + 2],
        0,
        0,
        0,
        1,
      );
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
        const ax = e.size.x + 2 * pad,
          ay = e.size.y + 2 * pad,
          az = e.size.z + 2 * pad;
        const r = 9 * i;
        const px = P[3 * i] - R[r + 2] * pad,
          py = P[3 * i + 1] - R[r + 5] * pad,
          pz = P[3 * i + 2] - R[r + 8] * pad;
        sel.matrix.set(
          R[r] * ax,
          R[r + 1] * ay,
          R[r + 2] * az,
          px,
          R[r + 3] * ax,
          R[r + 4] * ay,
          R[r + 5] * az,
          py,
          R[r + 6] * ax,
          R[r + 7] * ay,
          R[r + 8] * az,
          pz,
          0,
          0,
          0,
          1,
        );
        sel.matrixWorldNeedsUpdate = true;
      }
    }
    const shaft = shaftRef.current,
      head = headRef.current,
      ghostShaft = ghostShaftRef.current,
      ghostHead = ghostHeadRef.current;
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
        const hx = o.x + d.x * shaftLen,
          hy = o.y + d.y * shaftLen,
          hz = o.z + d.z * shaftLen;
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
        const v = section.value,
          pad = 0.25;
        const z0 = b.min[2] - pad,
          z1 = b.max[2] + pad;
        // a rectangle in the plane, around the package (the fifth point closes it)
        const along = section.axis === "x" ? 1 : 0;
        const u0 = b.min[along] - pad,
          u1 = b.max[along] + pad;
        for (let k = 0; k < 5; k++) {
          const u = k === 1 || k === 2 ? u1 : u0,
            z = k === 2 || k === 3 ? z1 : z0;
          if (along === 1) pos.setXYZ(k, v, u, z);
          else pos.setXYZ(k, u, v, z);
        }
        pos.needsUpdate = true;
        outlineGeometry.computeBoundingSphere();
      }
    }
  });

  // ---- camera: presets and framing
  const rig = useRef({
    active: false,
    t: 0,
    fromPos: new Vector3(),
    toPos: new Vector3(),
    fromTarget: new Vector3(),
    toTarget: new Vector3(),
  });
  useEffect(() => {
    if (!controls) return;
    const b = view.preset === "board" ? boardBounds(stack, shown) : packageBounds(stack, shown);
    const fit = fitDistance(b, camera.fov ?? FOV, size.width / Math.max(1, size.height));
    const dir = presetDirection(view.preset);
    const dl = Math.hypot(dir[0], dir[1], dir[2]);
    const r = rig.current;
    r.toTarget.set(fit.centre[0], fit.centre[1], fit.centre[2]);
    r.toPos.set(
      fit.centre[0] + (dir[0] / dl) * fit.distance,
      fit.centre[1] + (dir[1] / dl) * fit.distance,
      fit.centre[2] + (dir[2] / dl) * fit.distance,
    );
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
    // eslint-disable-next-line react-hooks/exhaustive-deps -- see the line above
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
  const advance = useThree((s) => s.advance);
  useEffect(() => {
    const renderAt = (factor: number) => {
      const canvas = renderAtScale(gl, () => advance(performance.now()), factor);
      return { canvas, ...cameraView(camera, controls?.target ?? new Vector3(), canvas.height) };
    };
    onApi({ canvas: gl.domElement, renderNow: () => invalidate(), renderAt });
  }, [gl, onApi, invalidate, advance, camera, controls]);
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
        <instancedMesh
          key={`s${arrowCount}`}
          ref={shaftRef}
          args={[geometry.shaft, materials.arrow, Math.max(1, arrowCount)]}
          count={arrowCount}
          raycast={noRaycast}
          frustumCulled={false}
        />
        <instancedMesh
          key={`h${arrowCount}`}
          ref={headRef}
          args={[geometry.head, materials.arrow, Math.max(1, arrowCount)]}
          count={arrowCount}
          raycast={noRaycast}
          frustumCulled={false}
        />
        <instancedMesh
          key={`gs${arrowCount}`}
          ref={ghostShaftRef}
          args={[geometry.shaft, materials.ghost, Math.max(1, arrowCount)]}
          count={arrowCount}
          raycast={noRaycast}
          renderOrder={8}
          frustumCulled={false}
        />
        <instancedMesh
          key={`gh${arrowCount}`}
          ref={ghostHeadRef}
          args={[geometry.head, materials.ghost, Math.max(1, arrowCount)]}
          count={arrowCount}
          raycast={noRaycast}
          renderOrder={8}
          frustumCulled={false}
        />
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
      <lineSegments
        ref={selectionRef}
        geometry={geometry.edges}
        material={materials.selection}
        matrixAutoUpdate={false}
        visible={false}
        raycast={noRaycast}
        renderOrder={11}
      />
      <lineLoop
        ref={outlineRef}
        geometry={outlineGeometry}
        material={materials.outline}
        raycast={noRaycast}
        renderOrder={9}
        visible={false}
      />
      <OrbitControls makeDefault enableDamping={false} minDistance={0.3} maxDistance={600} zoomSpeed={0.9} />
      <FrameIndicator mainCamera={camera} />
    </>
  );
}
