/** The 3D view's display settings: exaggeration, explode gap, section plane, axes, legend, camera preset. */
import { useEffect, useMemo, useRef, useState } from "react";
import type { StackFile } from "@shared/schemas/stack-file";
import { type Bounds, packageBounds, type ViewPreset } from "../lib/framing";
import type { PoseChoice, PoseSet } from "../lib/poses";
import type { SectionState, ViewRequest } from "../lib/scene-types";
import { ShownPose } from "../lib/shown-pose";

function nominalBounds(stack: StackFile, set: PoseSet): Bounds {
  const s = new ShownPose(set);
  s.update(0, 0);
  return packageBounds(stack, s);
}

export function useViewSettings(drawn: StackFile | null, set: PoseSet | null, poseKind: PoseChoice["kind"]) {
  const [exaggeration, setExaggeration] = useState(1);
  const [explode, setExplode] = useState(0);
  const [section, setSection] = useState<SectionState>({ axis: "off", value: 0, flip: false });
  const [showAxes, setShowAxes] = useState(true);
  const [legendOpen, setLegendOpen] = useState(true);
  const [view, setView] = useState<ViewRequest>({ preset: "package", nonce: 0, instant: true });
  const requestView = (preset: ViewPreset) => setView((v) => ({ preset, nonce: v.nonce + 1 }));

  const bounds = useMemo(() => (set && drawn ? nominalBounds(drawn, set) : null), [set, drawn]);
  const sectionRange = (axis: "x" | "y") => {
    const c = axis === "x" ? 0 : 1;
    if (!bounds) return { min: -1, max: 1 };
    return { min: Math.floor((bounds.min[c] - 0.3) * 20) / 20, max: Math.ceil((bounds.max[c] + 0.3) * 20) / 20 };
  };
  const setSectionAxis = (axis: SectionState["axis"]) =>
    setSection((s) => {
      if (axis === "off" || !bounds) return { ...s, axis };
      const c = axis === "x" ? 0 : 1;
      return { ...s, axis, value: Math.round(((bounds.min[c] + bounds.max[c]) / 2) * 100) / 100 };
    });
  const sectionBounds = section.axis === "off" ? null : sectionRange(section.axis);

  // A trial's deviations are tenths of a degree: coming from the nominal or mean pose
  // (by any route, the parent's trialIndex included), start at a factor that shows them.
  const lastKind = useRef<PoseChoice["kind"]>("nominal");
  useEffect(() => {
    if (poseKind === "trial" && lastKind.current !== "trial") setExaggeration((k) => (k < 20 ? 50 : k));
    lastKind.current = poseKind;
  }, [poseKind]);

  return {
    exaggeration,
    setExaggeration,
    explode,
    setExplode,
    section,
    setSection,
    setSectionAxis,
    sectionBounds,
    showAxes,
    setShowAxes,
    legendOpen,
    setLegendOpen,
    view,
    requestView,
  };
}

export type ViewSettings = ReturnType<typeof useViewSettings>;
