/**
 * Tolerance allocation on a real stack: the allocation loop (./allocate-loop) fed by the
 * engine's linearised contributors and by verifying studies run through a StudyExecutor.
 * Every verifying run uses the study's seed (common random numbers across rounds).
 */
import { linearisedContributions } from "../engine/contributors";
import { prepareStudy } from "../engine/plan";
import { stackSources } from "../datasets/sources";
import type { StackFile } from "../schemas/stack-file";
import type { StudyFile } from "../schemas/study-file";
import { costAt, defaultCost, type CostModel } from "./cost";
import { allocate, type LoopSource, type Round, type VerifiedRequirement } from "./allocate-loop";
import type { StudyExecutor } from "./executor";
import { WhatIfAbortedError } from "./executor";
import { withTolerances } from "./parameters";

export type AllocationOptions = {
  free?: string[];
  costs?: Record<string, CostModel>;
  bounds?: Record<string, { min?: number; max?: number }>;
};

/** Default bounds: a tenth of today's T to three times it (a supplier's process seldom moves further in one step). */
export const DEFAULT_BOUND_FACTORS = { min: 0.1, max: 3 };

export type AllocationSourceRow = {
  source: string;
  unit: "um" | "deg";
  free: boolean;
  current: number;
  proposed: number;
  costCurrent: number;
  costProposed: number;
  cost: CostModel;
  min: number;
  max: number;
  atBound: "min" | "max" | null;
  /** no linearised influence on any requirement (kept as it is unless listed as free) */
  noInfluence: boolean;
};

export type AllocationRequirementRow = {
  metric: string;
  max: number;
  yield: number;
  predictedYield: number;
  ci: [number, number];
  passes: boolean;
  demonstrated: boolean;
  limitAtTarget: number;
  current: { predictedYield: number; ci: [number, number]; passes: boolean; limitAtTarget: number };
};

export type AllocationOutcome = {
  verified: boolean;
  feasible: boolean;
  allAtUpperBound: boolean;
  message: string;
  sources: AllocationSourceRow[];
  requirements: AllocationRequirementRow[];
  totalCostCurrent: number;
  totalCostProposed: number;
  rounds: { round: number; totalCost: number; demonstrated: boolean; closestShare: number; minLowerMargin: number }[];
  trials: number;
  seed: number;
  method: string;
};

export const ALLOCATION_METHOD =
  "Least cost on the linearised RSS model by Lagrange multipliers (Chase, Greenwood, Loosli & Hauglund, Manufacturing Review 3(1), 1990), reciprocal-power cost a + b/T^k, verified and corrected by Monte Carlo with common random numbers";

export type AllocationInput = AllocationOptions & {
  stack: StackFile;
  study: StudyFile;
  execute: StudyExecutor;
  signal?: AbortSignal;
  onProgress?: (done: number, total: number) => void;
  maxRounds?: number;
};

export async function runAllocation(input: AllocationInput): Promise<AllocationOutcome> {
  const { stack, study } = input;
  const requirements = (study.requirements ?? []).map((r) => ({ metric: r.metric, max: r.max, yield: r.yield }));
  if (requirements.length === 0) throw new Error("the study has no requirements to allocate against");
  const maxRounds = input.maxRounds ?? 6;

  // stack sources with a ± half-width; measured and study-owned sources stay fixed
  const stackRows = stackSources(stack).filter((s) => s.tolerance.dist !== "data" && (s.tolerance.tol ?? 0) > 0);
  const linAt = (st: StackFile) => {
    const prep = prepareStudy(st, study);
    const idx = requirements.map((r) => prep.model.metricIndex.get(r.metric)!);
    return linearisedContributions(prep.model, idx);
  };
  const lin0 = linAt(stack);
  const contribution0 = (r: number, id: string) => lin0[r].sources.find((s) => s.source === id)?.contribution ?? 0;
  const influence = (id: string) => requirements.some((_, r) => contribution0(r, id) > 0);
  const freeSet = new Set(input.free ?? stackRows.filter((s) => influence(s.id)).map((s) => s.id));
  const loopSources: LoopSource[] = stackRows.map((s) => {
    const T = s.tolerance.tol!;
    const b = input.bounds?.[s.id];
    return {
      id: s.id,
      current: T,
      free: freeSet.has(s.id),
      cost: input.costs?.[s.id] ?? defaultCost(s.id),
      min: b?.min ?? T * DEFAULT_BOUND_FACTORS.min,
      max: b?.max ?? T * DEFAULT_BOUND_FACTORS.max,
    };
  });
  // everything else that spreads a requirement (data sets, calibration residual): a fixed, costless term
  const others = [...new Set(lin0.flatMap((l) => l.sources.map((s) => s.source)))].filter((id) => !stackRows.some((s) => s.id === id));
  const allSources: LoopSource[] = [
    ...loopSources,
    ...others.map((id) => ({ id, current: 1, free: false, cost: { a: 0, b: 0, k: 1 }, min: 1, max: 1 })),
  ];
  const nStack = loopSources.length;

  const stackAt = (T: number[]) => withTolerances(stack, Object.fromEntries(loopSources.map((s, j) => [s.id, T[j]])));
  const linearise = (T: number[]) => {
    const lin = linAt(stackAt(T));
    return requirements.map((_, r) =>
      allSources.map((s, j) => {
        const c = lin[r].sources.find((x) => x.source === s.id)?.contribution ?? 0;
        return j < nStack ? c / (T[j] * T[j]) : c;
      }),
    );
  };
  const total = (maxRounds + 1) * study.trials;
  const verify = async (T: number[], probes: number[], round: number): Promise<VerifiedRequirement[]> => {
    if (input.signal?.aborted) throw new WhatIfAbortedError();
    const withProbes: StudyFile = {
      ...study,
      requirements: [...requirements, ...requirements.map((r, i) => ({ metric: r.metric, max: r.max, yield: probes[i] }))],
    };
    const res = await input.execute(stackAt(T.slice(0, nStack)), withProbes, {
      signal: input.signal,
      onProgress: (done) => input.onProgress?.(round * study.trials + done, total),
    });
    return requirements.map((_, i) => {
      const r = res.requirements[i];
      return {
        predictedYield: r.predictedYield,
        ci: r.ci,
        passes: r.passes,
        limitAtTarget: r.limitAtTarget ?? NaN,
        probeLimit: res.requirements[requirements.length + i].limitAtTarget ?? NaN,
      };
    });
  };

  const out = await allocate({ sources: allSources, requirements, linearise, verify, trials: study.trials, maxRounds });
  input.onProgress?.(total, total);
  const pick: Round = out.chosen ?? out.rounds[out.rounds.length - 1] ?? out.current;
  const sources: AllocationSourceRow[] = loopSources.map((s, j) => {
    const proposed = pick.T[j];
    return {
      source: s.id,
      unit: stackRows[j].unit,
      free: s.free,
      current: s.current,
      proposed,
      costCurrent: costAt(s.cost, s.current),
      costProposed: costAt(s.cost, proposed),
      cost: s.cost,
      min: s.min,
      max: s.max,
      atBound: !s.free ? null : proposed <= s.min * (1 + 1e-9) ? "min" : proposed >= s.max * (1 - 1e-9) ? "max" : null,
      noInfluence: !influence(s.id),
    };
  });
  const reqRows: AllocationRequirementRow[] = requirements.map((r, i) => {
    const v = pick.requirements[i],
      c = out.current.requirements[i];
    return {
      ...r,
      predictedYield: v.predictedYield,
      ci: v.ci,
      passes: v.passes,
      demonstrated: v.ci[0] >= r.yield,
      limitAtTarget: v.limitAtTarget,
      current: { predictedYield: c.predictedYield, ci: c.ci, passes: c.passes, limitAtTarget: c.limitAtTarget },
    };
  });
  const verified = out.chosen !== null;
  const message = verified
    ? out.allAtUpperBound
      ? "Every requirement is shown with margin even with every free tolerance at its upper bound."
      : `Every requirement is shown by the lower end of its 95 % interval; the tightest ends at ${(100 * pick.closest).toFixed(1)} % of its limit.`
    : !out.feasible
      ? "No allocation within the bounds meets every requirement on the linearised model: widen the lower bounds, free more sources or relax a requirement."
      : `No round showed every requirement by its interval's lower end within ${maxRounds} rounds; the last proposal is shown, not verified.`;
  return {
    verified,
    feasible: out.feasible,
    allAtUpperBound: out.allAtUpperBound,
    message,
    sources,
    requirements: reqRows,
    totalCostCurrent: sources.reduce((a, s) => a + s.costCurrent, 0),
    totalCostProposed: sources.reduce((a, s) => a + s.costProposed, 0),
    rounds: [out.current, ...out.rounds].map((r) => ({
      round: r.round,
      totalCost: r.cost,
      demonstrated: r.demonstrated,
      closestShare: r.closest,
      minLowerMargin: Math.min(...r.requirements.map((v, i) => v.ci[0] - requirements[i].yield)),
    })),
    trials: study.trials,
    seed: study.seed,
    method: ALLOCATION_METHOD,
  };
}
