/**
 * A validated stack and study compiled into a model and a plan of blocks. Separate from
 * ./study so the worker threads load only what the trial loop needs.
 */
import type { StackFile } from "../schemas/stack-file";
import type { StudyFile } from "../schemas/study-file";
import type { Plan, RegressionSpec, TrackedSpec } from "./accumulate";
import { adaptiveConfig, type AdaptiveConfig } from "./coordinator";
import { compileModel, type Model } from "./compile";
import { BLOCK_SIZE } from "./random";

export interface StudyOverrides {
  trials?: number;
  seed?: number;
}

export interface PreparedStudy {
  stack: StackFile;
  study: StudyFile;
  model: Model;
  plan: Plan;
  adaptive: AdaptiveConfig | null;
}

/** Compile a validated stack and study into a model and a plan of blocks. */
export function prepareStudy(stack: StackFile, study: StudyFile, overrides: StudyOverrides = {}): PreparedStudy {
  const s: StudyFile = { ...study, trials: overrides.trials ?? study.trials, seed: overrides.seed ?? study.seed };
  const model = compileModel(stack, s);
  const idx = (id: string) => {
    const k = model.metricIndex.get(id);
    if (k === undefined) throw new Error(`the stack has no metric "${id}" (validate the study first)`);
    return k;
  };
  const requirements = (s.requirements ?? []).map((r) => ({ id: r.metric, metric: idx(r.metric), max: r.max, yield: r.yield }));
  const tracked: TrackedSpec[] = [];
  for (const r of requirements)
    if (!tracked.some((t) => t.metric === r.metric)) tracked.push({ metric: r.metric, limit: r.max, p: r.yield });
  for (const id of s.adaptive?.metrics ?? []) {
    const k = idx(id);
    if (!tracked.some((t) => t.metric === k)) tracked.push({ metric: k, limit: NaN, p: s.adaptive?.coverage ?? 0.95 });
  }
  if (tracked.length === 0 && model.metrics.length > 0) {
    const k = model.metricIndex.get("heading.maxAbsDeg") ?? 0;
    tracked.push({ metric: k, limit: NaN, p: s.adaptive?.coverage ?? 0.95 });
  }

  const cols = Int32Array.from(model.drawDist.map((d, i) => (d.sigma > 0 ? i : -1)).filter((i) => i >= 0));
  const regMetrics: RegressionSpec["metrics"] = [];
  for (const r of requirements) {
    if (regMetrics.some((x) => x.metric === r.metric)) continue;
    regMetrics.push({ metric: r.metric, design: model.metrics[r.metric].signed ? "linear" : "squared" });
  }
  const regression: RegressionSpec = {
    cols,
    metrics: regMetrics,
    useLinear: regMetrics.some((x) => x.design === "linear"),
    useSquared: regMetrics.some((x) => x.design === "squared"),
  };

  let adaptive: AdaptiveConfig | null = null;
  let trials = s.trials;
  if (s.adaptive) {
    const pMax = Math.max(...tracked.map((t) => t.p));
    adaptive = adaptiveConfig(pMax, s.adaptive.significantDigits ?? 2, s.trials);
    trials = adaptive.maxRuns * adaptive.runTrials;
  }
  const plan: Plan = {
    mode: s.sampling ?? "random",
    seed: s.seed,
    trials,
    blocks: Math.ceil(trials / BLOCK_SIZE),
    requirements,
    tracked,
    regression,
    worstK: s.worstTrials ?? 5,
  };
  return { stack, study: s, model, plan, adaptive };
}
