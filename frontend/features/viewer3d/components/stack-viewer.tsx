/**
 * The 3D view of a stack: every element to scale with its bond line, each sensor's
 * sensing axes, deviations exaggerated on demand, the nominal pose or any study trial
 * (regenerated from the seed by the engine), exploded view, a section plane, view
 * presets and a PNG export for reports.
 *
 * Load it lazily so three.js stays in its own chunk:
 *   const StackViewer = lazy(() => import("@frontend/features/viewer3d/components/stack-viewer"));
 */
import { Canvas } from "@react-three/fiber";
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { NeutralToneMapping } from "three";
import { cn } from "@frontend/lib/cn";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import { useSnapshotExport } from "../hooks/use-snapshot-export";
import { useViewerPose, type WorstTrialPick } from "../hooks/use-viewer-pose";
import { useViewSettings } from "../hooks/use-view-settings";
import { KIND_ORDER } from "../lib/palette";
import { isSoftwareRenderer } from "../lib/renderer-caps";
import { ElementFacts } from "./element-facts";
import { PoseCaption } from "./pose-caption";
import { ViewerLegend } from "./viewer-legend";
import { ViewerToolbar } from "./viewer-toolbar";
import { FOV, type HoverInfo, type SceneApi, ViewerScene } from "./viewer-scene";

export type { WorstTrialPick } from "../hooks/use-viewer-pose";

export type StackViewerProps = {
  stack: StackFile;
  /** the study whose trials can be shown; without it only the nominal and mean poses */
  study?: StudyFile;
  /** offered as "worst trial for <metric>" picks */
  worstTrials?: WorstTrialPick[];
  /** the trial shown (0-based index in the study), null for the nominal pose; omit to let the viewer keep it */
  trialIndex?: number | null;
  onTrialChange?: (trialIndex: number | null) => void;
  selectedId?: string | null;
  onSelect?: (id: string) => void;
  /** elements with a geometry warning (ids): outlined in the warning colour */
  flaggedIds?: readonly string[];
  /** which revision is shown ("revision 3"): written in the saved picture's caption and file name */
  revisionLabel?: string;
  className?: string;
};

export default function StackViewer({
  stack,
  study,
  worstTrials,
  trialIndex,
  onTrialChange,
  selectedId,
  onSelect,
  flaggedIds,
  revisionLabel,
  className,
}: StackViewerProps) {
  const pose = useViewerPose({ stack, study, worstTrials, trialIndex, onTrialChange });
  const { drawn, set, poseError, choiceKey, stackIssue } = pose;
  const settings = useViewSettings(drawn, set, pose.choice.kind);
  const { exaggeration, explode, section, showAxes, view, setLegendOpen } = settings;

  // decided once per mount: the context cannot change its multisampling later
  const [software] = useState(isSoftwareRenderer);

  // ---- selection and hover
  const ids = useMemo(() => drawn?.elements.map((e) => e.id) ?? [], [drawn]);
  const [ownSelected, setOwnSelected] = useState<string | null>(null);
  const selected = selectedId !== undefined ? selectedId : ownSelected;
  const selectedIndex = selected ? ids.indexOf(selected) : -1;
  const flaggedKey = (flaggedIds ?? []).join("|");
  const flagged = useMemo(
    () =>
      new Set(
        flaggedKey
          ? flaggedKey
              .split("|")
              .map((id) => ids.indexOf(id))
              .filter((i) => i >= 0)
          : [],
      ),
    [flaggedKey, ids],
  );
  const handleSelect = useCallback(
    (index: number) => {
      const id = ids[index];
      if (!id) return;
      setOwnSelected(id);
      onSelect?.(id);
    },
    [ids, onSelect],
  );
  const [hover, setHover] = useState<{ index: number; part: "body" | "bond" } | null>(null);
  const viewportRef = useRef<HTMLDivElement>(null);
  // in a small viewport (a side panel) the legend starts folded, so the stack stays visible
  useEffect(() => {
    const vp = viewportRef.current;
    if (vp && (vp.clientWidth < 700 || vp.clientHeight < 460)) setLegendOpen(false);
  }, [setLegendOpen]);
  const tooltipRef = useRef<HTMLDivElement>(null);
  const handleHover = useCallback((info: HoverInfo | null) => {
    setHover((h) =>
      info === null ? null : h && h.index === info.index && h.part === info.part ? h : { index: info.index, part: info.part },
    );
    const el = tooltipRef.current,
      vp = viewportRef.current;
    if (info && el && vp) {
      const r = vp.getBoundingClientRect();
      const x = info.clientX - r.left,
        y = info.clientY - r.top;
      const flipX = x > r.width - 260;
      el.style.transform = `translate(${flipX ? x - 14 : x + 14}px, ${y + 14}px) translateX(${flipX ? "-100%" : "0"})`;
    }
    if (vp) vp.style.cursor = info ? "pointer" : "";
  }, []);

  // ---- scene API, frames
  const api = useRef<SceneApi | null>(null);
  const rootRef = useRef<HTMLDivElement>(null);
  const frames = useRef(0);
  const handleApi = useCallback((a: SceneApi) => {
    api.current = a;
  }, []);
  // data-frames / data-moving let a browser test wait for the picture without guessing
  const handleFrame = useCallback((moving: boolean) => {
    frames.current++;
    const el = rootRef.current;
    if (!el) return;
    el.dataset.frames = String(frames.current);
    el.dataset.moving = moving ? "true" : "false";
  }, []);

  // ---- legend and export
  const kindsPresent = useMemo(() => KIND_ORDER.filter((k) => drawn?.elements.some((e) => e.kind === k)), [drawn]);
  const hasSensors = kindsPresent.some((k) => k === "gyro" || k === "accel" || k === "mag");
  const snapshot = useSnapshotExport(api, {
    stack: drawn,
    revisionLabel,
    poseLabel: pose.poseLabel,
    choice: pose.choice,
    exaggeration,
    explode,
    section,
    kinds: kindsPresent,
    showSensingAxes: hasSensors && showAxes,
  });

  return (
    <div
      ref={rootRef}
      data-testid="stack-viewer"
      data-pose={poseError ? "nominal" : choiceKey}
      data-exaggeration={exaggeration}
      className={cn("flex min-h-[420px] flex-col overflow-hidden rounded-lg border border-line bg-panel", className)}
    >
      <ViewerToolbar pose={pose} settings={settings} onSave={snapshot.save} canSave={!!set && !snapshot.exporting} />

      {/* ---- viewport */}
      <div ref={viewportRef} className="relative min-h-0 flex-1 bg-ink" data-testid="stack-viewer-viewport">
        {drawn && set ? (
          <Canvas
            frameloop="demand"
            dpr={[1, 2]}
            gl={{ preserveDrawingBuffer: true, antialias: !software }}
            camera={{ fov: FOV, near: 0.02, far: 2000, up: [0, 0, 1], position: [20, -25, 20] }}
            onCreated={({ gl }) => {
              gl.localClippingEnabled = true;
              gl.toneMapping = NeutralToneMapping;
              gl.toneMappingExposure = 1.05;
            }}
            data-testid="stack-viewer-canvas"
            aria-label="3D view of the stack"
          >
            <ViewerScene
              stack={drawn}
              poseSet={set}
              exaggeration={exaggeration}
              explode={explode}
              section={section}
              showAxes={showAxes}
              hoveredIndex={hover?.index ?? null}
              selectedIndex={selectedIndex >= 0 ? selectedIndex : null}
              flagged={flagged}
              view={view}
              onHover={handleHover}
              onSelect={handleSelect}
              onApi={handleApi}
              onFrame={handleFrame}
            />
          </Canvas>
        ) : (
          <div className="flex h-full items-center justify-center p-6 text-center text-sm text-paper/70">
            {stackIssue ? `The stack cannot be drawn yet: ${stackIssue}` : "The stack cannot be drawn."}
          </div>
        )}

        <PoseCaption pose={pose} exaggeration={exaggeration} explode={explode} onView={settings.requestView} />
        <ViewerLegend
          kinds={kindsPresent}
          showSensingAxes={hasSensors && showAxes}
          open={settings.legendOpen}
          onToggle={() => setLegendOpen((o) => !o)}
        />

        {flagged.size ? (
          <p
            data-testid="viewer-geometry-warnings"
            className="absolute right-2 bottom-2 z-[5] max-w-[60%] rounded bg-[#0f161d]/85 px-2 py-1 text-[11px] text-paper/90"
          >
            <span className="mr-1 inline-block size-2 rounded-full bg-warn align-middle" aria-hidden="true" />
            Geometry warning on {[...flagged].map((i) => ids[i]).join(", ")}: outlined in amber
          </p>
        ) : null}

        {/* hover tooltip */}
        <div
          ref={tooltipRef}
          role="tooltip"
          data-testid="viewer-tooltip"
          className={cn(
            "pointer-events-none absolute top-0 left-0 z-10 max-w-xs rounded-md border border-paper/10 bg-[#0f161d]/92 px-2.5 py-1.5 text-xs text-paper shadow-lg",
            hover ? "block" : "hidden",
          )}
        >
          {hover && drawn && set ? <ElementFacts stack={drawn} set={set} index={hover.index} part={hover.part} /> : null}
        </div>
      </div>
    </div>
  );
}
