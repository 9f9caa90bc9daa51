/** Types and constants shared by the 3D viewer's panel and its three.js scene. */
import type { ViewPreset } from "../lib/framing";

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
  /** the view drawn at `factor` times its pixels, with where the camera looks from and the scale at its target */
  renderAt: (factor: number) => { canvas: HTMLCanvasElement; azimuthDeg: number; elevationDeg: number; pxPerMm: number };
}

export interface HoverInfo {
  index: number;
  part: "body" | "bond";
  clientX: number;
  clientY: number;
}

export const FOV = 30;

/** Given to decorations (grid, arrows, labels, outlines) so pointer picking passes through them. */
export const noRaycast = () => null;
