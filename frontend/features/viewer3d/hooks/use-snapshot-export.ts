/**
 * "Save picture": the 3D view drawn at twice its pixels, with a caption inside the picture
 * (stack, revision, pose, view and scale, settings, date) and the legend, as a PNG.
 */
import { type RefObject, useState } from "react";
import type { ElementKind, StackFile } from "@shared/schemas/stack-file";
import { formatNumber } from "@shared/format";
import { downloadUrl } from "@frontend/lib/download";
import { composeSnapshot, fileSlug } from "../lib/export-png";
import { AXIS_COLOUR, BOND_LINE, KIND_COLOUR, KIND_LABEL } from "../lib/palette";
import type { PoseChoice } from "../lib/poses";
import type { SceneApi, SectionState } from "../lib/scene-types";
import { fmtMm, sectionSign } from "../lib/viewer-format";

/** The picture has twice the pixels of the view on screen. */
export const PICTURE_FACTOR = 2;

export interface SnapshotInput {
  stack: StackFile | null;
  /** "revision 3", "study 2 of revision 3": said in the caption and the file name */
  revisionLabel?: string;
  poseLabel: string;
  choice: PoseChoice;
  exaggeration: number;
  explode: number;
  section: SectionState;
  kinds: ElementKind[];
  showSensingAxes: boolean;
}

export interface SnapshotView {
  width: number;
  height: number;
  azimuthDeg: number;
  elevationDeg: number;
  pxPerMm: number;
}

/** The caption's title and lines. */
export function snapshotCaption(input: SnapshotInput, view: SnapshotView, date: Date): { title: string; lines: string[] } {
  const { stack, revisionLabel, poseLabel, exaggeration, explode, section } = input;
  const name = stack?.name ?? "Stack";
  return {
    title: `${name}${revisionLabel ? `, ${revisionLabel}` : ""}: ${poseLabel}`,
    lines: [
      `View from azimuth ${Math.round(view.azimuthDeg)}°, elevation ${Math.round(view.elevationDeg)}° (board frame B, z up); ` +
        `scale ${formatNumber(view.pxPerMm, 3)} px per mm at the centre of view (perspective); lengths true to scale, angles ×${exaggeration}` +
        (explode > 0 ? `; exploded ${fmtMm(explode)} per level` : "") +
        (section.axis === "off" ? "" : `; section ${section.axis} ${sectionSign(section.axis, section.flip)} ${fmtMm(section.value)}`),
      `Orthostack 3D view, ${date.toISOString().slice(0, 10)}; ${view.width} × ${view.height} px (${PICTURE_FACTOR}× the view on screen)`,
    ],
  };
}

export function useSnapshotExport(api: RefObject<SceneApi | null>, input: SnapshotInput) {
  const [exporting, setExporting] = useState(false);
  const save = () => {
    const scene = api.current;
    const { stack, choice, exaggeration, kinds, showSensingAxes, revisionLabel } = input;
    if (!scene || !stack) return;
    setExporting(true);
    requestAnimationFrame(() => {
      try {
        const shot = scene.renderAt(PICTURE_FACTOR);
        const { title, lines } = snapshotCaption(input, { ...shot, width: shot.canvas.width, height: shot.canvas.height }, new Date());
        const legend = [
          ...kinds.map((k) => ({ label: KIND_LABEL[k], colour: KIND_COLOUR[k] })),
          { label: "Bond line", colour: BOND_LINE, translucent: true },
          ...(showSensingAxes ? (["x", "y", "z"] as const).map((n, a) => ({ label: `Sensing axis ${n}`, colour: AXIS_COLOUR[a] })) : []),
        ];
        const url = composeSnapshot(shot.canvas, { title, lines, legend });
        const poseSlug = choice.kind === "trial" ? `trial-${choice.index}` : choice.kind;
        const rev = revisionLabel ? `-${fileSlug(revisionLabel)}` : "";
        downloadUrl(url, `${fileSlug(stack.name ?? "stack")}${rev}-${poseSlug}-x${exaggeration}.png`);
      } finally {
        setExporting(false);
      }
    });
  };
  return { save, exporting };
}
