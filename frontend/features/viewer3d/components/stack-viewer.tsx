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
import { type StackFile, validateStackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import { composeSnapshot, downloadDataUrl, fileSlug } from "../lib/export-png";
import { type Bounds, packageBounds, type ViewPreset } from "../lib/framing";
import { AXIS_COLOUR, BOND_LINE, KIND_COLOUR, KIND_LABEL, KIND_ORDER } from "../lib/palette";
import { compileForViewer, drawsFor, type PoseChoice, type PoseSet, poseSet } from "../lib/poses";
import { isSoftwareRenderer } from "../lib/renderer-caps";
import { ShownPose } from "../lib/shown-pose";
import { FOV, type HoverInfo, type SceneApi, type SectionState, type ViewRequest, ViewerScene } from "./viewer-scene";

export interface WorstTrialPick {
  metric: string;
  trialIndex: number;
  value: number;
  unit?: string;
}

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
  className?: string;
};

const MAX_EXAGGERATION = 200;
const toSlider = (k: number) => (100 * Math.log(k)) / Math.log(MAX_EXAGGERATION);
const fromSlider = (t: number) => {
  const k = Math.pow(MAX_EXAGGERATION, t / 100);
  return k < 10 ? Math.round(k * 2) / 2 : k < 50 ? Math.round(k) : Math.round(k / 5) * 5;
};
const EXAGGERATION_STOPS = [1, 10, 50, 200];

const fmt = (v: number, digits = 2) => v.toFixed(digits);
const fmtMm = (v: number) => `${v.toFixed(2)} mm`;
const fmtCount = (n: number) => n.toLocaleString("en-GB").replace(/,/g, "\u202f");
function fmtValue(v: number, unit?: string): string {
  const a = Math.abs(v);
  const s = a >= 100 ? v.toFixed(0) : a >= 10 ? v.toFixed(1) : a >= 1 ? v.toFixed(2) : v.toPrecision(2);
  if (!unit) return s;
  return unit === "°" ? `${s}°` : `${s} ${unit}`;
}
const fmtAngle = (deg: number) => `${deg.toFixed(3)}° (${((deg * Math.PI) / 180 * 1000).toFixed(2)} mrad)`;

function nominalBounds(stack: StackFile, set: PoseSet): Bounds {
  const s = new ShownPose(set);
  s.update(0, 0);
  return packageBounds(stack, s);
}

export default function StackViewer({
  stack,
  study,
  worstTrials,
  trialIndex,
  onTrialChange,
  selectedId,
  onSelect,
  className,
}: StackViewerProps) {
  // ---- the stack: keep drawing the last valid one while an edit is incomplete
  const validation = useMemo(() => validateStackFile(stack), [stack]);
  const lastGood = useRef<StackFile | null>(null);
  if (validation.ok) lastGood.current = validation.stack;
  const drawn = validation.ok ? validation.stack : lastGood.current;
  const stackIssue = validation.ok ? null : `${validation.issues[0]?.path ? `${validation.issues[0].path}: ` : ""}${validation.issues[0]?.message ?? "invalid stack"}`;

  const vm = useMemo(() => {
    if (!drawn) return null;
    try {
      return compileForViewer(drawn, study);
    } catch {
      return null;
    }
  }, [drawn, study]);

  // ---- pose: controlled by trialIndex when given
  const controlled = trialIndex !== undefined;
  const [ownTrial, setOwnTrial] = useState<number | null>(null);
  const [meanPose, setMeanPose] = useState(false);
  const [pickedMetric, setPickedMetric] = useState<string | null>(null);
  const trial = controlled ? trialIndex : ownTrial;
  const setTrial = useCallback(
    (t: number | null) => {
      if (!controlled) setOwnTrial(t);
      onTrialChange?.(t);
    },
    [controlled, onTrialChange],
  );
  const choice: PoseChoice = trial !== null && trial !== undefined ? { kind: "trial", index: trial } : meanPose ? { kind: "mean" } : { kind: "nominal" };
  const choiceKey = choice.kind === "trial" ? `trial:${choice.index}` : choice.kind;

  const { set, poseError } = useMemo(() => {
    if (!vm || !drawn) return { set: null, poseError: null };
    if (choice.kind === "trial" && !vm.hasStudy) {
      return { set: poseSet(vm, drawn, drawsFor(vm, { kind: "nominal" })), poseError: "Trials need a study: showing the nominal pose." };
    }
    try {
      return { set: poseSet(vm, drawn, drawsFor(vm, choice)), poseError: null };
    } catch (error) {
      const message = error instanceof Error ? error.message : String(error);
      return { set: poseSet(vm, drawn, drawsFor(vm, { kind: "nominal" })), poseError: `${message}: showing the nominal pose.` };
    }
    // choiceKey stands for choice
  }, [vm, drawn, choiceKey]);

  // decided once per mount: the context cannot change its multisampling later
  const [software] = useState(isSoftwareRenderer);

  // ---- view settings
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

  // ---- selection and hover
  const ids = useMemo(() => drawn?.elements.map((e) => e.id) ?? [], [drawn]);
  const [ownSelected, setOwnSelected] = useState<string | null>(null);
  const selected = selectedId !== undefined ? selectedId : ownSelected;
  const selectedIndex = selected ? ids.indexOf(selected) : -1;
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
  }, []);
  const tooltipRef = useRef<HTMLDivElement>(null);
  const handleHover = useCallback((info: HoverInfo | null) => {
    setHover((h) => (info === null ? null : h && h.index === info.index && h.part === info.part ? h : { index: info.index, part: info.part }));
    const el = tooltipRef.current, vp = viewportRef.current;
    if (info && el && vp) {
      const r = vp.getBoundingClientRect();
      const x = info.clientX - r.left, y = info.clientY - r.top;
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

  // ---- pose description
  const worst = worstTrials ?? [];
  const pickIndex = (() => {
    if (choice.kind !== "trial") return -1;
    const byMetric = worst.findIndex((w) => w.trialIndex === choice.index && w.metric === pickedMetric);
    return byMetric >= 0 ? byMetric : worst.findIndex((w) => w.trialIndex === choice.index);
  })();
  const pick = pickIndex >= 0 ? worst[pickIndex] : null;
  const recomputed = (() => {
    if (!pick || !set || poseError) return null;
    const k = set.metricIds.indexOf(pick.metric);
    return k >= 0 ? set.metrics[k] : null;
  })();
  const mismatch = pick && recomputed !== null && Math.abs(recomputed - pick.value) > 1e-6 * Math.max(1, Math.abs(pick.value));
  const poseLabel =
    poseError || choice.kind === "nominal"
      ? "Nominal pose (design intent)"
      : choice.kind === "mean"
        ? "Tolerance means (systematic shifts only)"
        : pick
          ? `Trial ${choice.index}: worst ${pick.metric}, ${fmtValue(pick.value, pick.unit)}`
          : `Trial ${choice.index}`;

  const selectValue = choice.kind === "trial" ? (pickIndex >= 0 ? `worst:${pickIndex}` : "trial") : choice.kind;
  const onPoseSelect = (v: string) => {
    if (v === "nominal" || v === "mean") {
      setMeanPose(v === "mean");
      setPickedMetric(null);
      setTrial(null);
    } else if (v === "trial") {
      setMeanPose(false);
      setPickedMetric(null);
      setTrial(trial ?? 0);
    } else if (v.startsWith("worst:")) {
      const w = worst[Number(v.slice(6))];
      if (!w) return;
      setMeanPose(false);
      setPickedMetric(w.metric);
      setTrial(w.trialIndex);
    }
  };

  // A trial's deviations are tenths of a degree: coming from the nominal or mean pose
  // (by any route, the parent's trialIndex included), start at a factor that shows them.
  const lastKind = useRef<PoseChoice["kind"]>("nominal");
  useEffect(() => {
    if (choice.kind === "trial" && lastKind.current !== "trial") setExaggeration((k) => (k < 20 ? 50 : k));
    lastKind.current = choice.kind;
  }, [choice.kind]);

  // ---- trial index field (text while typing, committed on Enter or blur)
  const [trialText, setTrialText] = useState(trial != null ? String(trial) : "");
  useEffect(() => {
    setTrialText(trial != null ? String(trial) : "");
  }, [trial]);
  const trials = vm?.hasStudy ? vm.plan.trials : 0;
  const commitTrial = (text: string) => {
    const n = Number(text);
    if (text.trim() === "" || !Number.isInteger(n) || n < 0) {
      setTrialText(trial != null ? String(trial) : "");
      return;
    }
    setMeanPose(false);
    setPickedMetric(null);
    setTrial(Math.min(n, Math.max(0, trials - 1)));
  };

  // ---- legend
  const kindsPresent = useMemo(() => KIND_ORDER.filter((k) => drawn?.elements.some((e) => e.kind === k)), [drawn]);
  const hasSensors = kindsPresent.some((k) => k === "gyro" || k === "accel" || k === "mag");

  // ---- export
  const [exporting, setExporting] = useState(false);
  const savePng = () => {
    const canvas = api.current?.canvas;
    if (!canvas || !drawn) return;
    setExporting(true);
    requestAnimationFrame(() => {
      try {
        const lines = [
          `Angles exaggerated ×${exaggeration} (lengths true to scale)` +
            (explode > 0 ? `; exploded ${fmtMm(explode)} per level` : "") +
            (section.axis === "off" ? "" : `; section ${section.axis} ${section.flip !== (section.axis === "y") ? "≥" : "≤"} ${fmtMm(section.value)}`),
          `Board frame B, z up; sizes in mm. Orthostack 3D view, ${new Date().toISOString().slice(0, 10)}`,
        ];
        const legend = [
          ...kindsPresent.map((k) => ({ label: KIND_LABEL[k], colour: KIND_COLOUR[k] })),
          { label: "Bond line", colour: BOND_LINE, translucent: true },
          ...(hasSensors && showAxes ? (["x", "y", "z"] as const).map((n, a) => ({ label: `Sensing axis ${n}`, colour: AXIS_COLOUR[a] })) : []),
        ];
        const url = composeSnapshot(canvas, { title: `${drawn.name ?? "Stack"}: ${poseLabel}`, lines, legend });
        const poseSlug = choice.kind === "trial" ? `trial-${choice.index}` : choice.kind;
        downloadDataUrl(url, `${fileSlug(drawn.name ?? "stack")}-${poseSlug}-x${exaggeration}.png`);
      } finally {
        setExporting(false);
      }
    });
  };

  // ---- hover facts
  const factsFor = (index: number, part: "body" | "bond") => {
    if (!drawn || !set) return null;
    const e = drawn.elements[index];
    if (!e) return null;
    const tilt = set.tiltDeg[index];
    return (
      <>
        <div className="flex items-center gap-2">
          <span className="size-2.5 rounded-sm" style={{ background: part === "bond" ? BOND_LINE : KIND_COLOUR[e.kind] }} aria-hidden="true" />
          <span className="font-bold">{part === "bond" ? `Bond line under ${e.name ?? e.id}` : (e.name ?? e.id)}</span>
          <span className="text-paper/60">{part === "bond" ? "adhesive" : KIND_LABEL[e.kind]}</span>
        </div>
        <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-paper/85">
          {part === "bond" ? (
            <>
              <dt className="text-paper/55">thickness</dt>
              <dd className="num text-left">{fmt(e.bondLine?.thicknessUm ?? 0, 0)} µm</dd>
            </>
          ) : (
            <>
              {e.name ? (
                <>
                  <dt className="text-paper/55">id</dt>
                  <dd className="font-mono">{e.id}</dd>
                </>
              ) : null}
              <dt className="text-paper/55">size</dt>
              <dd className="num text-left">
                {fmt(e.size.x)} × {fmt(e.size.y)} × {fmt(e.size.z)} mm
              </dd>
              {e.bondLine?.thicknessUm ? (
                <>
                  <dt className="text-paper/55">bond line</dt>
                  <dd className="num text-left">{fmt(e.bondLine.thicknessUm, 0)} µm</dd>
                </>
              ) : null}
              <dt className="text-paper/55">centre</dt>
              <dd className="num text-left">
                x {fmt(set.P[3 * index], 3)}, y {fmt(set.P[3 * index + 1], 3)} mm
              </dd>
              {e.parent !== null ? (
                <>
                  <dt className="text-paper/55">tilt</dt>
                  <dd className="num text-left">{fmtAngle(tilt)}</dd>
                </>
              ) : null}
            </>
          )}
        </dl>
      </>
    );
  };

  const sectionBounds = section.axis === "off" ? null : sectionRange(section.axis);

  return (
    <div
      ref={rootRef}
      data-testid="stack-viewer"
      data-pose={poseError ? "nominal" : choiceKey}
      data-exaggeration={exaggeration}
      className={cn("flex min-h-[420px] flex-col overflow-hidden rounded-lg border border-line bg-panel", className)}
    >
      {/* ---- toolbar */}
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2 border-b border-line px-3 py-2 text-xs" role="toolbar" aria-label="3D view settings">
        <label className="flex items-center gap-1.5">
          <span className="font-semibold text-ink/70">Pose</span>
          <select
            aria-label="Pose"
            className="h-7 max-w-[15rem] rounded-md border border-line bg-white px-1.5 text-xs hover:border-ink/30 focus:border-gyro focus:outline-none"
            value={selectValue}
            onChange={(e) => onPoseSelect(e.target.value)}
          >
            <option value="nominal">Nominal (design intent)</option>
            <option value="mean">Tolerance means</option>
            <option value="trial" disabled={!vm?.hasStudy}>
              Trial by index{vm?.hasStudy ? "" : " (needs a study)"}
            </option>
            {worst.length > 0 ? (
              <optgroup label="Worst trial for">
                {worst.map((w, i) => (
                  <option key={`${w.metric}-${w.trialIndex}-${i}`} value={`worst:${i}`}>
                    {w.metric}: {fmtValue(w.value, w.unit)} (trial {w.trialIndex})
                  </option>
                ))}
              </optgroup>
            ) : null}
          </select>
        </label>
        {vm?.hasStudy ? (
          <div className="flex items-center gap-1">
            <span className="font-semibold text-ink/70">Trial</span>
            <button
              type="button"
              aria-label="Previous trial"
              className="h-7 rounded-md border border-line bg-white px-1.5 hover:border-ink/30 disabled:opacity-50"
              disabled={trial == null || trial <= 0}
              onClick={() => trial != null && commitTrial(String(trial - 1))}
            >
              ‹
            </button>
            <input
              aria-label="Trial index"
              inputMode="numeric"
              className="num h-7 w-20 rounded-md border border-line bg-white px-1.5 text-xs hover:border-ink/30 focus:border-gyro focus:outline-none"
              value={trialText}
              placeholder="—"
              onChange={(e) => setTrialText(e.target.value.replace(/[^0-9]/g, ""))}
              onBlur={(e) => commitTrial(e.target.value)}
              onKeyDown={(e) => {
                if (e.key === "Enter") commitTrial((e.target as HTMLInputElement).value);
              }}
            />
            <button
              type="button"
              aria-label="Next trial"
              className="h-7 rounded-md border border-line bg-white px-1.5 hover:border-ink/30 disabled:opacity-50"
              disabled={trial != null && trial >= trials - 1}
              onClick={() => commitTrial(String(trial == null ? 0 : trial + 1))}
            >
              ›
            </button>
            <span className="text-ink/50">of {fmtCount(trials)}</span>
          </div>
        ) : null}
        <div className="flex items-center gap-2">
          <label className="flex items-center gap-1.5" title="Tilts and rotations are multiplied by this factor; lengths stay true to scale">
            <span className="font-semibold text-ink/70">Angles</span>
            <input
              type="range"
              aria-label="Angle exaggeration"
              min={0}
              max={100}
              step={0.5}
              value={toSlider(exaggeration)}
              onChange={(e) => setExaggeration(fromSlider(Number(e.target.value)))}
              className="w-28 accent-gyro"
            />
            <output className="w-10 font-semibold text-ink tabular-nums" aria-live="polite" data-testid="exaggeration-value">
              ×{exaggeration}
            </output>
          </label>
          <div className="flex items-center gap-0.5" role="group" aria-label="Exaggeration presets">
            {EXAGGERATION_STOPS.map((k) => (
              <button
                key={k}
                type="button"
                aria-pressed={exaggeration === k}
                className={cn(
                  "h-6 rounded px-1.5 text-2xs font-semibold",
                  exaggeration === k ? "bg-ink text-paper" : "text-ink/60 hover:bg-ink/[0.06] hover:text-ink",
                )}
                onClick={() => setExaggeration(k)}
              >
                ×{k}
              </button>
            ))}
          </div>
        </div>
        <label className="flex items-center gap-1.5" title="Lifts every level of the stack above its parent">
          <span className="font-semibold text-ink/70">Explode</span>
          <input
            type="range"
            aria-label="Explode gap (mm)"
            min={0}
            max={1.5}
            step={0.05}
            value={explode}
            onChange={(e) => setExplode(Number(e.target.value))}
            className="w-24 accent-gyro"
          />
          <output className="num w-14 text-ink">{fmtMm(explode)}</output>
        </label>
        <div className="flex items-center gap-1.5">
          <span className="font-semibold text-ink/70">Section</span>
          <div className="flex rounded-md border border-line bg-white p-0.5" role="group" aria-label="Section plane">
            {(["off", "x", "y"] as const).map((a) => (
              <button
                key={a}
                type="button"
                aria-pressed={section.axis === a}
                className={cn("h-5.5 rounded px-1.5 text-2xs font-semibold", section.axis === a ? "bg-ink text-paper" : "text-ink/65 hover:text-ink")}
                onClick={() => setSectionAxis(a)}
              >
                {a === "off" ? "Off" : `${a} cut`}
              </button>
            ))}
          </div>
          {sectionBounds ? (
            <>
              <input
                type="range"
                aria-label={`Section position along ${section.axis} (mm)`}
                min={sectionBounds.min}
                max={sectionBounds.max}
                step={0.01}
                value={section.value}
                onChange={(e) => setSection((s) => ({ ...s, value: Number(e.target.value) }))}
                className="w-24 accent-gyro"
              />
              <output className="num w-[4.5rem] text-ink">
                {section.axis} {section.flip !== (section.axis === "y") ? "≥" : "≤"} {fmt(section.value)}
              </output>
              <button
                type="button"
                className="h-6 rounded px-1.5 text-2xs font-semibold text-ink/60 hover:bg-ink/[0.06] hover:text-ink"
                onClick={() => setSection((s) => ({ ...s, flip: !s.flip }))}
                title="Keep the other side of the plane"
              >
                Flip
              </button>
            </>
          ) : null}
        </div>
        <label className="flex items-center gap-1.5">
          <input type="checkbox" checked={showAxes} onChange={(e) => setShowAxes(e.target.checked)} className="accent-gyro" />
          <span className="font-semibold text-ink/70">Sensing axes</span>
        </label>
        <button
          type="button"
          onClick={savePng}
          disabled={!set || exporting}
          className="ml-auto inline-flex h-7 items-center gap-1.5 rounded-md border border-ink bg-ink px-2.5 text-xs font-semibold text-paper hover:bg-ink/90 disabled:opacity-55"
        >
          <svg viewBox="0 0 16 16" className="size-3.5" aria-hidden="true">
            <path d="M8 2v8m0 0 3-3m-3 3L5 7M3 12.5h10" stroke="currentColor" strokeWidth="1.6" fill="none" strokeLinecap="round" strokeLinejoin="round" />
          </svg>
          Save PNG
        </button>
      </div>

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

        {/* pose caption */}
        <div className="pointer-events-none absolute inset-x-2.5 top-2.5 flex flex-wrap items-start justify-between gap-2">
          <div className="max-w-[34rem] rounded-md bg-[#0f161d]/75 px-2.5 py-1.5 text-xs text-paper shadow-sm">
            <div className="font-bold" data-testid="pose-label">
              {poseLabel}
            </div>
            <div className="text-paper/65">
              Angles ×{exaggeration}
              {exaggeration > 1 ? " exaggerated" : " (true)"} · lengths to scale · mm
              {explode > 0 ? ` · exploded ${fmtMm(explode)}` : ""}
            </div>
            {pick && recomputed !== null ? (
              <div className={cn("mt-0.5", mismatch ? "font-semibold text-[#f5a08a]" : "text-paper/65")} data-testid="recomputed">
                {mismatch
                  ? `Regenerated trial gives ${pick.metric} = ${fmtValue(recomputed, pick.unit)}, not ${fmtValue(pick.value, pick.unit)}: the stack or study changed since the study ran.`
                  : `Regenerated from the seed: ${pick.metric} = ${fmtValue(recomputed, pick.unit)}`}
              </div>
            ) : null}
            {poseError ? <div className="mt-0.5 font-semibold text-[#f5a08a]">{poseError}</div> : null}
            {vm && !vm.exact && choice.kind === "trial" && !poseError ? (
              <div className="mt-0.5 font-semibold text-[#f5a08a]">The study does not fit the edited stack: this trial is drawn from it only approximately.</div>
            ) : null}
            {stackIssue && drawn ? <div className="mt-0.5 font-semibold text-[#f5a08a]">Showing the last valid stack. {stackIssue}</div> : null}
          </div>

          {/* view presets */}
          <div className="pointer-events-auto ml-auto flex gap-0.5 rounded-md bg-[#0f161d]/75 p-0.5 text-2xs font-semibold" role="group" aria-label="View presets">
            {(
              [
                ["package", "Package"],
                ["iso", "Iso"],
                ["top", "Top"],
                ["side", "Side"],
                ["end", "End"],
                ["board", "Whole board"],
              ] as const
            ).map(([p, label]) => (
              <button
                key={p}
                type="button"
                className="h-6 rounded px-2 text-paper/80 hover:bg-paper/10 hover:text-paper"
                onClick={() => requestView(p)}
                title={
                  p === "side" ? "Looking along +y" : p === "end" ? "Looking along −x" : p === "package" ? "Frame the package" : p === "board" ? "Frame the whole board" : undefined
                }
              >
                {label}
              </button>
            ))}
          </div>
        </div>

        {/* legend */}
        <div className="absolute bottom-2.5 left-2.5 rounded-md bg-[#0f161d]/75 px-2.5 py-2 text-2xs text-paper/85" data-testid="viewer-legend">
          <button
            type="button"
            className="flex w-full items-center justify-between gap-3 font-semibold text-paper/70 hover:text-paper"
            aria-expanded={legendOpen}
            onClick={() => setLegendOpen((o) => !o)}
          >
            Legend
            <span aria-hidden="true">{legendOpen ? "–" : "+"}</span>
          </button>
          {legendOpen ? (
            <>
              <ul className="mt-1 grid grid-cols-[repeat(2,auto)] gap-x-3 gap-y-0.5">
                {kindsPresent.map((k) => (
                  <li key={k} className="flex items-center gap-1.5">
                    <span className="size-2.5 rounded-sm" style={{ background: KIND_COLOUR[k] }} aria-hidden="true" />
                    {KIND_LABEL[k]}
                  </li>
                ))}
                <li className="flex items-center gap-1.5">
                  <span className="h-1 w-2.5 rounded-sm opacity-60" style={{ background: BOND_LINE }} aria-hidden="true" />
                  Bond line
                </li>
              </ul>
              {hasSensors && showAxes ? (
                <div className="mt-1.5 flex items-center gap-2 border-t border-paper/15 pt-1.5">
                  <span className="text-paper/60">Sensing axes</span>
                  {(["x", "y", "z"] as const).map((n, a) => (
                    <span key={n} className="flex items-center gap-1">
                      <span className="h-0.5 w-3 rounded" style={{ background: AXIS_COLOUR[a] }} aria-hidden="true" />
                      <span style={{ color: AXIS_COLOUR[a] }}>{n}</span>
                    </span>
                  ))}
                </div>
              ) : null}
              {hasSensors && showAxes ? <div className="text-paper/50">Label ring: the die&apos;s colour</div> : null}
              <div className="mt-1 text-paper/50">Grid 1 mm, bold every 5 mm</div>
            </>
          ) : null}
        </div>

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
          {hover ? factsFor(hover.index, hover.part) : null}
        </div>
      </div>
    </div>
  );
}
