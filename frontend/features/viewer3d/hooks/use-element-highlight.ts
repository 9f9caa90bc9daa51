import { useLayoutEffect, type RefObject } from "react";
import { Color } from "three";
import type { StackFile } from "@shared/schemas/stack-file";
import { PALETTE } from "@shared/palette";
import { KIND_COLOUR } from "../lib/palette";
import { lighten, type Materials } from "../lib/scene-materials";

const WARN = new Color(PALETTE.warn);

/**
 * The element colours that follow the pointer and the editor: the selected element glows
 * with a white outline, the hovered one glows less, and an element with a geometry warning
 * (overhang, overlap, clearance, body height) has its outline drawn in the warning colour.
 */
export function useElementHighlight(
  materials: Materials,
  stack: StackFile,
  hoveredIndex: number | null,
  selectedIndex: number | null,
  flagged: ReadonlySet<number>,
  version: RefObject<number>,
  invalidate: () => void,
) {
  useLayoutEffect(() => {
    materials.elements.forEach((m, i) => {
      const kind = stack.elements[i]?.kind;
      if (!kind) return;
      const base = KIND_COLOUR[kind];
      const selected = i === selectedIndex,
        hovered = i === hoveredIndex,
        warned = flagged.has(i);
      m.body.emissive.set(base);
      m.body.emissiveIntensity = selected ? 0.42 : hovered ? 0.3 : 0;
      m.edge.color.copy(selected ? new Color("#ffffff") : warned ? WARN : lighten(base, kind === "board" ? 0.25 : 0.45));
      m.edge.opacity = selected || warned ? 1 : kind === "board" ? 0.55 : 0.9;
    });
    version.current++;
    invalidate();
  }, [materials, stack, hoveredIndex, selectedIndex, flagged, version, invalidate]);
}
