import { useThree } from "@react-three/fiber";
import { useEffect } from "react";
import { CanvasTexture, SRGBColorSpace } from "three";
import { VIEWPORT_BOTTOM, VIEWPORT_TOP } from "../lib/palette";

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
export function SceneEnvironment() {
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
