/**
 * A page for the 3D view alone: the reference stack and study, worst trials found by
 * running the first block of the study with the engine, the viewer loaded lazily the way
 * the editor and the results page load it. Served by tests/e2e/viewer3d.test.ts.
 */
import { lazy, StrictMode, Suspense, useMemo, useState } from "react";
import { createRoot } from "react-dom/client";
import "@frontend/styles/app.css";
import { compileModel, createScratch, evaluateTrial } from "@shared/engine/model";
import { blockSampler, blockTrials } from "@shared/engine/sampling";
import { StackFileSchema, type StackFile } from "@shared/schemas/stack-file";
import { StudyFileSchema, type StudyFile } from "@shared/schemas/study-file";
import stackJson from "../../fixtures/stack-reference.json";
import studyJson from "../../fixtures/study-reference.json";

const StackViewer = lazy(() => import("@frontend/features/viewer3d/components/stack-viewer"));

const stack: StackFile = StackFileSchema.parse(stackJson);
const study: StudyFile = StudyFileSchema.parse(studyJson);

const WATCHED = ["heading.maxAbsDeg", "mag.crossAxisTotalPct.x", "accel~mag.relRotDeg", "mag.tiltDeg", "gyro.tiltDeg"];

/** The worst of the study's first 1024 trials for a few metrics (a stand-in for a stored result). */
function worstOfFirstTrials() {
  const m = compileModel(stack, study);
  const n = Math.min(1024, blockTrials(0, study.trials));
  const sampler = blockSampler(m, study.sampling ?? "random", study.seed, 0, n);
  const s = createScratch(m);
  const draws = new Float64Array(m.drawCount);
  const idx = WATCHED.map((id) => m.metricIndex.get(id)!);
  const best = WATCHED.map(() => ({ trialIndex: -1, value: 0 }));
  for (let i = 0; i < n; i++) {
    sampler.next(draws);
    evaluateTrial(m, draws, s);
    idx.forEach((k, j) => {
      if (Math.abs(s.metrics[k]) > Math.abs(best[j].value)) best[j] = { trialIndex: i, value: s.metrics[k] };
    });
  }
  return WATCHED.map((metric, j) => ({ metric, ...best[j], unit: m.metrics[idx[j]].unit }));
}

function Harness() {
  const worst = useMemo(worstOfFirstTrials, []);
  const [trial, setTrial] = useState<number | null>(null);
  const [selected, setSelected] = useState<string | null>(null);
  /** elements with a geometry warning, as the editor passes them; toggled by the test */
  const [flagged, setFlagged] = useState<string[]>([]);
  return (
    <div style={{ padding: 16, display: "flex", flexDirection: "column", gap: 8, height: "100vh", boxSizing: "border-box" }}>
      <div style={{ display: "flex", gap: 24, fontSize: 12 }}>
        <strong>3D view harness</strong>
        <span>
          trial: <output data-testid="harness-trial">{trial === null ? "nominal" : trial}</output>
        </span>
        <span>
          selected: <output data-testid="harness-selected">{selected ?? "none"}</output>
        </span>
        <button type="button" data-testid="harness-flag" onClick={() => setFlagged((f) => (f.length ? [] : ["gyro"]))}>
          {flagged.length ? "clear warning" : "warn on gyro"}
        </button>
        <script type="application/json" data-testid="harness-worst" dangerouslySetInnerHTML={{ __html: JSON.stringify(worst) }} />
      </div>
      <Suspense fallback={<div data-testid="viewer-loading">Loading the 3D view…</div>}>
        <StackViewer
          stack={stack}
          study={study}
          worstTrials={worst}
          trialIndex={trial}
          onTrialChange={setTrial}
          selectedId={selected}
          onSelect={setSelected}
          flaggedIds={flagged}
          revisionLabel="revision 3"
          className="min-h-0 flex-1"
        />
      </Suspense>
    </div>
  );
}

createRoot(document.getElementById("root")!).render(
  <StrictMode>
    <Harness />
  </StrictMode>,
);
