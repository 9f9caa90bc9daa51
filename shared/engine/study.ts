/**
 * Public entry points of the engine: prepare a study, run blocks, fold them, finalize
 * the result file, regenerate one trial. The same functions serve the Node worker
 * threads (backend/engine), the browser Web Worker (live estimates) and the tests.
 */
import type { StackFile } from "../schemas/stack-file";
import type { StudyFile } from "../schemas/study-file";
import type { ResultFile } from "../schemas/result-file";
import {
  createWorkerState,
  envelopeHistogram,
  metricHistogram,
  runBlock,
  type BlockPartial,
  type Plan,
  type WorkerState,
} from "./accumulate";
import { Coordinator } from "./coordinator";
import { prepareStudy, type PreparedStudy, type StudyOverrides } from "./plan";
import { regressionFromSums, stackUp } from "./contributors";
import { partsInput, resultParts, type ResultParts } from "./result-parts";
import type { Model } from "./compile";
import { evaluateTrial, createScratch } from "./trial";
import { poses, type ElementPose } from "./poses";
import { BLOCK_SIZE } from "./random";
import { drawsOfTrial } from "./sampling";
import { wilson } from "./stats";
import { ENGINE_VERSION } from "./version";

export { BLOCK_SIZE, ENGINE_VERSION };
export type { BlockPartial, WorkerState, Plan, Model, ElementPose };

export { prepareStudy, type PreparedStudy, type StudyOverrides } from "./plan";

export interface Progress {
  trialsDone: number;
  trialsTotal: number;
  /** when the study's first trial started on an engine thread, ms since the epoch (performance.timeOrigin + now); from the thread pool */
  firstTrialAt?: number;
}

export interface RunOptions extends StudyOverrides {
  onProgress?: (p: Progress) => void;
  /** polled between blocks; true stops the study after the blocks done so far */
  shouldStop?: () => boolean;
}

export function newCoordinator(prep: PreparedStudy): Coordinator {
  return new Coordinator(prep.model, prep.plan, prep.adaptive);
}

export function newWorkerState(prep: PreparedStudy): WorkerState {
  return createWorkerState(prep.model, prep.plan);
}

/** Run the given blocks into a worker state, handing each block's partial to onBlock. */
export function runBlocks(prep: PreparedStudy, state: WorkerState, blocks: Iterable<number>, onBlock: (p: BlockPartial) => void): void {
  for (const b of blocks) onBlock(runBlock(prep.model, prep.plan, state, b));
}

export { mergeWorkerStates } from "./accumulate";

/** Run a whole study in this thread (tests, the browser's Web Worker, small studies). */
export function runStudy(stack: StackFile, study: StudyFile, opts: RunOptions = {}): ResultFile {
  const prep = prepareStudy(stack, study, opts);
  const st = newWorkerState(prep);
  const coord = newCoordinator(prep);
  let stopped = false;
  for (let b = 0; b < prep.plan.blocks; b++) {
    if (opts.shouldStop?.()) {
      stopped = true;
      break;
    }
    coord.add(runBlock(prep.model, prep.plan, st, b));
    opts.onProgress?.({ trialsDone: coord.trials, trialsTotal: prep.plan.trials });
    if (prep.adaptive && coord.merged % prep.adaptive.runBlocks === 0 && coord.adaptiveStatus().stable) break;
  }
  return finalizeStudy(prep, coord, st, { stopped });
}

/** Whether an adaptive study may stop after the blocks folded so far. */
export function adaptiveDone(prep: PreparedStudy, coord: Coordinator): boolean {
  if (!prep.adaptive) return coord.merged >= prep.plan.blocks;
  if (coord.merged >= prep.plan.blocks) return true;
  return coord.merged % prep.adaptive.runBlocks === 0 && coord.adaptiveStatus().stable;
}

const PERCENTILES = [0.5, 0.95, 0.99, 0.9973];

/** Build the result file from the folded partials and the merged worker state. */
export function finalizeStudy(prep: PreparedStudy, coord: Coordinator, state: WorkerState, flags: { stopped?: boolean } = {}): ResultFile {
  const figures = stateFigures(prep, coord, state);
  return assembleResult(prep, coord, figures, resultParts(prep, partsInput(coord)), flags);
}

/** The result's figures that come from the merged worker state (see finalizeStudy). */
export interface StateFigures {
  metrics: ResultFile["metrics"];
  histograms: ResultFile["histograms"];
  worstTrials: ResultFile["worstTrials"];
  requirements: ResultFile["requirements"];
  envelope: ResultFile["envelope"];
  /** |v| p50, p95, p99, p99.73 per metric index */
  pctCache: Map<number, number[]>;
}

/**
 * Percentiles, histograms, worst trials, requirement yields and the compass envelope from the
 * merged worker state: the first half of finalizeStudy, which the engine pool runs while one
 * of its threads computes the ResultParts.
 */
export function stateFigures(prep: PreparedStudy, coord: Coordinator, state: WorkerState): StateFigures {
  const { model, plan, study } = prep;
  if (coord.pendingCount > 0) throw new Error("finalize: blocks are missing before some delivered ones");
  if (state.n !== coord.trials) throw new Error(`finalize: worker states hold ${state.n} trials, the coordinator ${coord.trials}`);
  coord.checkpoint();
  const n = coord.trials;
  const metrics: ResultFile["metrics"] = {};
  const histograms: ResultFile["histograms"] = {};
  const worstTrials: ResultFile["worstTrials"] = {};
  const pctCache = new Map<number, number[]>();
  model.metrics.forEach((mi, k) => {
    const h = metricHistogram(state, k);
    const [p50, p95, p99, p9973] = n > 0 ? h.quantilesAbs(PERCENTILES, state.minAbs[k], state.maxAbs[k]) : [NaN, NaN, NaN, NaN];
    pctCache.set(k, [p50, p95, p99, p9973]);
    metrics[mi.id] = {
      mean: coord.mean[k],
      std: coord.count[k] > 1 ? Math.sqrt(coord.m2[k] / (coord.count[k] - 1)) : 0,
      p50,
      p95,
      p99,
      p9973,
      max: state.maxAbs[k],
      unit: mi.unit,
      signed: mi.signed,
      minValue: state.min[k],
      maxValue: state.max[k],
      interval95: n > 0 ? (h.quantilesSigned([0.025, 0.975], state.min[k], state.max[k]) as [number, number]) : [NaN, NaN],
      shortest95: n > 0 ? h.shortestInterval(0.95, state.min[k], state.max[k]) : [NaN, NaN],
    };
    const lo = mi.signed ? state.min[k] : 0;
    const hi = mi.signed ? state.max[k] : state.maxAbs[k];
    histograms[mi.id] =
      n > 0
        ? { abs: !mi.signed, ...h.plotBins(lo, hi > lo ? hi : lo + 1e-12, 60, !mi.signed) }
        : { abs: !mi.signed, edges: [], counts: [] };
    const K = state.worstK;
    const list: { trial: number; value: number }[] = [];
    for (let j = 0; j < K; j++) {
      const t = state.worstTrial[k * K + j];
      if (t >= 0) list.push({ trial: t, value: state.worstVal[k * K + j] });
    }
    worstTrials[mi.id] = list;
  });

  const requirements: ResultFile["requirements"] = plan.requirements.map((r, i) => {
    const pass = state.pass[i];
    const py = n > 0 ? pass / n : NaN;
    const ci = wilson(pass, n);
    const h = metricHistogram(state, r.metric);
    return {
      metric: r.id,
      max: r.max,
      yield: r.yield,
      predictedYield: py,
      ci,
      ppmOut: (1 - py) * 1e6,
      passes: py >= r.yield,
      demonstrated: ci[0] >= r.yield,
      limitAtTarget: n > 0 ? h.quantileAbs(r.yield, state.minAbs[r.metric], state.maxAbs[r.metric]) : NaN,
    };
  });

  let envelope: ResultFile["envelope"] = null;
  if (model.heading && n > 0) {
    const att = model.heading.attitudes;
    const points: NonNullable<ResultFile["envelope"]>["points"] = [];
    for (let k = 0; k < att.count; k++) {
      const h = envelopeHistogram(state, k);
      const tilt = att.tilts[Math.floor(k / att.headingsPerTilt)];
      const [p5, p50, p95] = h.quantilesSigned([0.05, 0.5, 0.95], state.envMin[k], state.envMax[k]);
      points.push({
        pitchDeg: tilt.pitchDeg,
        rollDeg: tilt.rollDeg,
        headingDeg: att.psiDeg[k],
        p5,
        p50,
        p95,
        min: state.envMin[k],
        max: state.envMax[k],
      });
    }
    envelope = {
      inclinationDeg: study.inclinationDeg,
      accel: model.sensors[model.heading.accel].id,
      mag: model.sensors[model.heading.mag].id,
      points,
    };
  }

  return { metrics, histograms, worstTrials, requirements, envelope, pctCache };
}

/** The result file from the state figures and the parts (the second half of finalizeStudy). */
export function assembleResult(
  prep: PreparedStudy,
  coord: Coordinator,
  figures: StateFigures,
  parts: ResultParts,
  flags: { stopped?: boolean } = {},
): ResultFile {
  const { model, plan, study } = prep;
  const { metrics, histograms, worstTrials, requirements, envelope, pctCache } = figures;
  const n = coord.trials;
  // contributors of the requirement metrics; stack-up of every signed metric
  const signedMetrics = model.metrics.map((m, k) => (m.signed ? k : -1)).filter((k) => k >= 0);
  const linOf = new Map(parts.lin.map((l) => [l.metric, l] as const));
  const L = plan.regression.cols.length + 1;
  const designs = parts.designs;
  const contributors: ResultFile["contributors"] = plan.regression.metrics.map((spec, r) => {
    const id = model.metrics[spec.metric].id;
    const lin = linOf.get(id)!;
    let reg = null;
    if (coord.xty && n > 0) {
      const o = r * (L + 1);
      reg = regressionFromSums(
        model,
        plan.regression.cols,
        designs[spec.design],
        coord.xty.subarray(o, o + L),
        coord.xty[o + L],
        id,
        spec.design,
      );
    }
    return {
      metric: id,
      basis: lin.basis,
      nominal: lin.nominal,
      linearTotal: lin.total,
      mcDesign: reg ? reg.design : null,
      mcR2: reg ? reg.r2 : null,
      sources: lin.sources
        .map((s, j) => ({
          source: s.source,
          linearShare: s.share,
          linearContribution: s.contribution,
          mcShare: reg ? reg.sources[j].share : null,
          src2: reg ? reg.sources[j].src2 : null,
        }))
        .sort((a, b) => b.linearShare - a.linearShare || a.source.localeCompare(b.source)),
    };
  });
  const stack = stackUp(
    model,
    signedMetrics.map((k) => linOf.get(model.metrics[k].id)!),
  ).map((row) => {
    const k = model.metricIndex.get(row.metric)!;
    const mst = metrics[row.metric];
    return {
      metric: row.metric,
      nominal: row.nominal,
      worstCase: row.worstCase,
      rss: row.rss,
      linear3Sigma: Math.abs(row.nominal) + 3 * row.linearStd,
      mc3Sigma: Math.abs(mst.mean) + 3 * mst.std,
      mcP9973: pctCache.get(k)![3],
    };
  });

  const convergence = plan.tracked.map((t, i) => ({ metric: model.metrics[t.metric].id, p: t.p, points: coord.convergence[i] }));

  let adaptive: ResultFile["adaptive"] = null;
  if (prep.adaptive) {
    const status = coord.adaptiveStatus();
    adaptive = {
      method: "JCGM 101:2008 7.9",
      significantDigits: prep.adaptive.significantDigits,
      M: prep.adaptive.M,
      runTrials: prep.adaptive.runTrials,
      runs: coord.runs.length,
      trialsUsed: n,
      maxTrials: plan.trials,
      converged: status.stable,
      coverage: plan.tracked.map((t) => ({ metric: model.metrics[t.metric].id, p: t.p })),
      last: status.details,
    };
  }

  return {
    format: "orthostack.result/1",
    engine: ENGINE_VERSION,
    trials: n,
    seed: plan.seed,
    sampling: plan.mode,
    headingEvaluation: model.heading ? (model.heading.screened ? "screened" : "exact") : undefined,
    stopped: flags.stopped ?? false,
    calibration: study.calibration?.after ?? "none",
    metrics,
    requirements,
    ciMethod: "wilson",
    percentileStore: { method: "signed log-bucket histogram, linear interpolation inside buckets", maxRelativeBucketWidth: 2 ** -10 },
    histograms,
    envelope,
    contributors,
    stackUp: stack,
    worstTrials,
    convergence,
    adaptive,
    sources: model.sources.map((s) => ({
      id: s.id,
      unit: s.unit,
      stage: s.stage,
      draws: s.count,
      sigma: s.dist.sigma,
      halfWidth: s.dist.halfWidth,
      mean: s.dist.mean,
      ...(s.owner ? { owner: s.owner } : {}),
    })),
  };
}

export interface TrialPose {
  trial: number;
  metrics: Record<string, number>;
  /** every element, file order: R and nominal R (row-major 3x3), positions (mm) */
  elements: ElementPose[];
  /** the sampled deviations of every source, in its unit */
  draws: Record<string, number[]>;
}

/** Regenerate trial `trialIndex` of a study from its seed: the full pose of every element. */
export function poseOfTrial(stack: StackFile, study: StudyFile, trialIndex: number, overrides: StudyOverrides = {}): TrialPose {
  const prep = prepareStudy(stack, study, overrides);
  const { model, plan } = prep;
  const draws = drawsOfTrial(model, plan.mode, plan.seed, plan.trials, trialIndex);
  const s = createScratch(model);
  evaluateTrial(model, draws, s);
  const metrics: Record<string, number> = {};
  model.metrics.forEach((m, k) => (metrics[m.id] = s.metrics[k]));
  const bySource: Record<string, number[]> = {};
  for (const src of model.sources) bySource[src.id] = Array.from(draws.subarray(src.offset, src.offset + src.count));
  return { trial: trialIndex, metrics, elements: poses(model, draws), draws: bySource };
}
