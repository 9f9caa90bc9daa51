/** "Save PNG": the picture of the 3D view with its title, settings and legend burnt in. */
import { type RefObject, useState } from "react";
import type { ElementKind, StackFile } from "@shared/schemas/stack-file";
import { composeSnapshot, downloadDataUrl, fileSlug } from "../lib/export-png";
import { AXIS_COLOUR, BOND_LINE, KIND_COLOUR, KIND_LABEL } from "../lib/palette";
import type { PoseChoice } from "../lib/poses";
import type { SceneApi, SectionState } from "../lib/scene-types";
import { fmtMm, sectionSign } from "../lib/viewer-format";

export interface SnapshotInput {
  stack: StackFile | null;
  poseLabel: string;
  choice: PoseChoice;
  exaggeration: number;
  explode: number;
  section: SectionState;
  kinds: ElementKind[];
  showSensingAxes: boolean;
}

export function useSnapshotExport(api: RefObject<SceneApi | null>, input: SnapshotInput) {
  const [exporting, setExporting] = useState(false);
  const save = () => {
    const canvas = api.current?.canvas;
    const { stack, poseLabel, choice, exaggeration, explode, section, kinds, showSensingAxes } = input;
    if (!canvas || !stack) return;
    setExporting(true);
    requestAnimationFrame(() => {
      try {
        const lines = [
          `Angles exaggerated ×${exaggeration} (lengths true to scale)` +
            (explode > 0 ? `; exploded ${fmtMm(explode)} per level` : "") +
            (section.axis === "off" ? "" : `; section ${section.axis} ${sectionSign(section.axis, section.flip)} ${fmtMm(section.value)}`),
          `Board frame B, z up; sizes in mm. Orthostack 3D view, ${new Date().toISOString().slice(0, 10)}`,
        ];
        const legend = [
          ...kinds.map((k) => ({ label: KIND_LABEL[k], colour: KIND_COLOUR[k] })),
          { label: "Bond line", colour: BOND_LINE, translucent: true },
          ...(showSensingAxes ? (["x", "y", "z"] as const).map((n, a) => ({ label: `Sensing axis ${n}`, colour: AXIS_COLOUR[a] })) : []),
        ];
        const url = composeSnapshot(canvas, { title: `${stack.name ?? "Stack"}: ${poseLabel}`, lines, legend });
        const poseSlug = choice.kind === "trial" ? `trial-${choice.index}` : choice.kind;
        downloadDataUrl(url, `${fileSlug(stack.name ?? "stack")}-${poseSlug}-x${exaggeration}.png`);
      } finally {
        setExporting(false);
      }
    });
  };
  return { save, exporting };
}
