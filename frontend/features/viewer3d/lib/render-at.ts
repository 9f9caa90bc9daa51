/**
 * The 3D view drawn once at a larger size for "Save picture": the renderer's pixel ratio
 * raised by `factor` (the canvas keeps its size on the page), one frame drawn through the
 * fiber loop (so the corner triad's second pass is in it too), the pixels copied, and the
 * ratio put back and the view redrawn in the same task, so the page never shows the switch.
 */
import type { PerspectiveCamera, Vector3, WebGLRenderer } from "three";

/** Browsers refuse canvases much larger than this; keep well inside what a GPU renders to. */
const MAX_SIDE = 8192;

export function renderAtScale(gl: WebGLRenderer, drawFrame: () => void, factor: number): HTMLCanvasElement {
  const old = gl.getPixelRatio();
  const canvas = gl.domElement;
  const cssW = canvas.width / old;
  const cssH = canvas.height / old;
  const limit = Math.min(gl.capabilities.maxTextureSize || MAX_SIDE, MAX_SIDE);
  const ratio = Math.min(old * factor, limit / Math.max(cssW, cssH, 1));
  const out = document.createElement("canvas");
  try {
    gl.setPixelRatio(ratio);
    drawFrame();
    out.width = canvas.width;
    out.height = canvas.height;
    out.getContext("2d")?.drawImage(canvas, 0, 0);
  } finally {
    gl.setPixelRatio(old);
    drawFrame();
  }
  return out;
}

/** Where the camera looks from (board frame, degrees) and the picture's scale at the point it looks at. */
export function cameraView(camera: PerspectiveCamera, target: Vector3, heightPx: number) {
  const dx = camera.position.x - target.x;
  const dy = camera.position.y - target.y;
  const dz = camera.position.z - target.z;
  const dist = Math.hypot(dx, dy, dz);
  const azimuthDeg = ((Math.atan2(dy, dx) * 180) / Math.PI + 360) % 360;
  const elevationDeg = (Math.atan2(dz, Math.hypot(dx, dy)) * 180) / Math.PI;
  const pxPerMm = heightPx / (2 * dist * Math.tan((camera.fov * Math.PI) / 360));
  return { azimuthDeg, elevationDeg, pxPerMm };
}
