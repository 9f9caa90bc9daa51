/**
 * The live estimate: a small study of the stack being edited, run in a Web Worker with
 * the same engine as real studies, and the few figures the editor shows from it. The server
 * runs the same estimate when a draft without a study of its stack is submitted
 * (backend/services/requirement-check.ts), so both sides tell the same figures.
 *
 * Fixed seed, so an unchanged stack gives the same figures and a change in the figures
 * comes from the edit, not from sampling. Field inclination 60° (a mid-latitude dip):
 * the real study resolves the site's inclination; the estimate says that it assumed one.
 *
 * `estimate` runs the engine's own trial loop (prepareStudy, runBlock) and reads the
 * same percentile store and pass counts as runStudy, but skips runStudy's finishing
 * (stack-up of every metric, plot histograms, heading envelope, regression), which took
 * two thirds of the time of a 3,000-trial run; the linearised contributors of the
 * requirement metrics (one sweep of the draws) it keeps. A test checks that both give the
 * same figures.
 *
 * The estimate's study comes from ./live-study.ts (it checks the requirements with zod); this
 * module has no zod, so an engine thread can run `estimate` without loading it.
 */
import { metricHistogram, runBlock } from "@shared/engine/accumulate";
import { linearisedContributions } from "@shared/engine/contributors";
import { wilson } from "@shared/engine/stats";
import { newWorkerState, prepareStudy } from "@shared/engine/study";
import type { ResultFile } from "@shared/schemas/result-file";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import { metricUnit, type MetricUnit } from "@shared/metrics";

export const LIVE_TRIALS = 3000;
export const LIVE_SEED = 7;
export const LIVE_INCLINATION_DEG = 60;

export interface LiveStudy {
  study: StudyFile;
  /** index in the document's requirement list of each requirement the study carries */
  requirementIndexes: number[];
}

export interface EstimateRequirement {
  /** index in the document's requirement list */
  index: number;
  metric: string;
  unit: MetricUnit;
  max: number;
  yield: number;
  predictedYield: number;
  ci: [number, number];
  passes: boolean;
  /** the largest linearised contributors (share of variance or mean square), largest first */
  drivers: { source: string; share: number }[];
}

const DRIVERS = 3;
const drivers = (sources: { source: string; share: number }[]) =>
  [...sources]
    .filter((x) => x.share > 0)
    .sort((a, b) => b.share - a.share || a.source.localeCompare(b.source))
    .slice(0, DRIVERS)
    .map(({ source, share }) => ({ source, share }));

export interface WorstPick {
  metric: string;
  trialIndex: number;
  value: number;
  unit: MetricUnit;
}

export interface EstimateSummary {
  trials: number;
  seed: number;
  inclinationDeg: number;
  /** heading.maxAbsDeg percentiles (deg); null without an accelerometer and a magnetometer */
  heading: { p95: number; p99: number; max: number } | null;
  /** the sensor axis with the largest p99 cross-axis total */
  worstCrossAxis: { metric: string; p99: number } | null;
  /** the sensor die pair with the largest p99 relative rotation */
  worstRelRot: { metric: string; p99: number } | null;
  requirements: EstimateRequirement[];
  /** worst trials the 3D view can show */
  worst: WorstPick[];
}

function largestP99(result: ResultFile, test: (id: string) => boolean): { metric: string; p99: number } | null {
  let best: { metric: string; p99: number } | null = null;
  for (const [id, m] of Object.entries(result.metrics)) {
    if (!test(id) || !Number.isFinite(m.p99)) continue;
    if (!best || m.p99 > best.p99) best = { metric: id, p99: m.p99 };
  }
  return best;
}

export function summarize(result: ResultFile, live: LiveStudy): EstimateSummary {
  const heading = result.metrics["heading.maxAbsDeg"];
  const worstCrossAxis = largestP99(result, (id) => id.includes(".crossAxisTotalPct."));
  const worstRelRot = largestP99(result, (id) => id.endsWith(".relRotDeg"));
  const requirements: EstimateRequirement[] = result.requirements.map((r, k) => ({
    index: live.requirementIndexes[k],
    metric: r.metric,
    unit: metricUnit(r.metric),
    max: r.max,
    yield: r.yield,
    predictedYield: r.predictedYield,
    ci: r.ci,
    passes: r.passes,
    drivers: drivers(
      (result.contributors.find((c) => c.metric === r.metric)?.sources ?? []).map((x) => ({ source: x.source, share: x.linearShare })),
    ),
  }));
  return finish(
    result.trials,
    result.seed,
    heading ? { p95: heading.p95, p99: heading.p99, max: heading.max } : null,
    worstCrossAxis,
    worstRelRot,
    requirements,
    (metric) => {
      const t = result.worstTrials[metric]?.[0];
      return t ? { trial: t.trial, value: t.value } : null;
    },
  );
}

function finish(
  trials: number,
  seed: number,
  heading: EstimateSummary["heading"],
  worstCrossAxis: EstimateSummary["worstCrossAxis"],
  worstRelRot: EstimateSummary["worstRelRot"],
  requirements: EstimateRequirement[],
  worstOf: (metric: string) => { trial: number; value: number } | null,
): EstimateSummary {
  const worstMetrics = [
    ...(heading ? ["heading.maxAbsDeg"] : []),
    ...(worstCrossAxis ? [worstCrossAxis.metric] : []),
    ...(worstRelRot ? [worstRelRot.metric] : []),
    ...requirements.map((r) => r.metric),
  ];
  const worst: WorstPick[] = [];
  for (const metric of worstMetrics) {
    if (worst.some((w) => w.metric === metric)) continue;
    const t = worstOf(metric);
    if (t) worst.push({ metric, trialIndex: t.trial, value: t.value, unit: metricUnit(metric) });
  }
  return { trials, seed, inclinationDeg: LIVE_INCLINATION_DEG, heading, worstCrossAxis, worstRelRot, requirements, worst };
}

/** The estimate's figures from the engine's trial loop alone (see the note at the top). */
export function estimate(stack: StackFile, live: LiveStudy): EstimateSummary {
  const prep = prepareStudy(stack, live.study);
  const { model, plan } = prep;
  const st = newWorkerState(prep);
  for (let b = 0; b < plan.blocks; b++) runBlock(model, plan, st, b);
  const n = st.n;
  const pct = (k: number, p: number) => (n > 0 ? metricHistogram(st, k).quantileAbs(p, st.minAbs[k], st.maxAbs[k]) : NaN);
  const largest = (test: (id: string) => boolean) => {
    let best: { metric: string; p99: number } | null = null;
    model.metrics.forEach((m, k) => {
      if (!test(m.id)) return;
      const p99 = pct(k, 0.99);
      if (Number.isFinite(p99) && (!best || p99 > best.p99)) best = { metric: m.id, p99 };
    });
    return best as { metric: string; p99: number } | null;
  };
  const h = model.metricIndex.get("heading.maxAbsDeg");
  const heading = h === undefined ? null : { p95: pct(h, 0.95), p99: pct(h, 0.99), max: st.maxAbs[h] };
  const lin = new Map(
    linearisedContributions(model, [...new Set(plan.requirements.map((r) => r.metric))]).map((l) => [l.metric, l] as const),
  );
  const requirements: EstimateRequirement[] = plan.requirements.map((r, i) => {
    const py = n > 0 ? st.pass[i] / n : NaN;
    return {
      index: live.requirementIndexes[i],
      metric: r.id,
      unit: metricUnit(r.id),
      max: r.max,
      yield: r.yield,
      predictedYield: py,
      ci: wilson(st.pass[i], n),
      passes: py >= r.yield,
      drivers: drivers(lin.get(r.id)?.sources ?? []),
    };
  });
  return finish(
    n,
    plan.seed,
    heading,
    largest((id) => id.includes(".crossAxisTotalPct.")),
    largest((id) => id.endsWith(".relRotDeg")),
    requirements,
    (metric) => {
      const k = model.metricIndex.get(metric);
      if (k === undefined) return null;
      const t = st.worstTrial[k * st.worstK];
      return t >= 0 ? { trial: t, value: st.worstVal[k * st.worstK] } : null;
    },
  );
}
