import { Hud, OrthographicCamera } from "@react-three/drei";
import { useFrame, useThree } from "@react-three/fiber";
import { useEffect, useMemo, useRef } from "react";
import { ConeGeometry, CylinderGeometry, type Group, MeshBasicMaterial, type PerspectiveCamera, Quaternion, SpriteMaterial } from "three";
import { labelTexture } from "../lib/label-texture";
import { AXIS_COLOUR } from "../lib/palette";

/** A small B-frame triad in the corner, turning with the camera. */
export function FrameIndicator({ mainCamera }: { mainCamera: PerspectiveCamera }) {
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
    return {
      shaft,
      head,
      mats,
      labels,
      caption: {
        material: new SpriteMaterial({ map: caption.texture, depthTest: false, opacity: 0.7, transparent: true }),
        aspect: caption.aspect,
      },
    };
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
  const dirs: [number, number, number][] = [
    [1, 0, 0],
    [0, 1, 0],
    [0, 0, 1],
  ];
  const rot: [number, number, number][] = [
    [0, Math.PI / 2, 0],
    [-Math.PI / 2, 0, 0],
    [0, 0, 0],
  ];
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
            <sprite
              key={`l${a}`}
              material={items.labels[a].material}
              position={[d[0] * (L + 9), d[1] * (L + 9), d[2] * (L + 9)]}
              scale={[15 * items.labels[a].aspect, 15, 1]}
            />
          ))}
        </group>
      </group>
    </>
  );
}
