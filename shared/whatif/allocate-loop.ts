/**
 * The allocation loop: a least-cost answer on the linearised model, then a check of every
 * requirement by a verifying run, and corrections until each requirement's yield is shown
 * with the lower end of its 95 % interval (the heading and magnitude metrics are not linear
 * in the tolerances: the verifying run is what makes the answer true).
 *
 * The link from a requirement to its RSS budget: the run gives the metric's percentile at
 * the probe yield p* (the yield whose Wilson lower bound, at the run's trial count, equals
 * the target); assuming the percentile scales with the linearised spread σ_lin (exact for a
 * zero-mean metric that is homogeneous of degree one in the deviations, as tilts and heading
 * errors are to first order), the budget is S = σ_lin · max / percentile. Each round
 * measures that ratio again at the last proposal (a fixed-point correction), so a
 * requirement ends close to its limit rather than with a blanket safety factor.
 */
import { wilson } from "../engine/stats";
import { costAt, type CostModel } from "./cost";
import { leastCost } from "./least-cost";

/** The first extra budget cut for a requirement a round left short of being shown (then doubled). */
const STALL_CUT = 0.005;

export type LoopSource = { id: string; current: number; free: boolean; cost: CostModel; min: number; max: number };
export type LoopRequirement = { metric: string; max: number; yield: number };
export type VerifiedRequirement = {
  predictedYield: number;
  ci: [number, number];
  passes: boolean;
  probeLimit: number;
  limitAtTarget: number;
};

export type LoopInput = {
  sources: LoopSource[];
  requirements: LoopRequirement[];
  /** per requirement, per source: linearised contribution per unit T², at tolerances T */
  linearise: (T: number[]) => number[][];
  /** one verifying run at tolerances T; probeYields are the p* of each requirement */
  verify: (T: number[], probeYields: number[], round: number) => Promise<VerifiedRequirement[]>;
  /** trials of each verifying run (for p*) */
  trials: number;
  maxRounds?: number;
  /** a requirement counts as close to its limit above this share of it */
  closeShare?: number;
};

export type Round = {
  round: number;
  T: number[];
  cost: number;
  requirements: VerifiedRequirement[];
  demonstrated: boolean;
  closest: number;
};

export type LoopResult = {
  current: Round;
  rounds: Round[];
  /** the cheapest round whose every requirement is demonstrated; null when none is */
  chosen: Round | null;
  feasible: boolean;
  allAtUpperBound: boolean;
};

/** The yield whose Wilson 95 % lower bound at n trials equals the target; 1 when none below 1 does. */
export function probeYield(target: number, n: number): number {
  if (wilson(n, n)[0] < target) return 1;
  let lo = target,
    hi = 1;
  for (let i = 0; i < 60; i++) {
    const mid = (lo + hi) / 2;
    if (wilson(mid * n, n)[0] >= target) hi = mid;
    else lo = mid;
  }
  return hi;
}

/** Fewest trials at which a yield target can be shown at all (every trial passing). */
export function minTrialsFor(target: number): number {
  let n = 1;
  while (wilson(n, n)[0] < target) n = Math.ceil(n * 1.1) + 1;
  let lo = 1,
    hi = n;
  while (lo < hi) {
    const mid = Math.floor((lo + hi) / 2);
    if (wilson(mid, mid)[0] >= target) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

/** Three significant digits (a tolerance a drawing can carry), rounded down so the rounding never loosens it. */
export function roundTolerance(t: number): number {
  if (!(t > 0)) return t;
  const p = 10 ** (Math.floor(Math.log10(t)) - 2);
  return Number((Math.floor(t / p + 1e-9) * p).toPrecision(3));
}

export async function allocate(input: LoopInput): Promise<LoopResult> {
  const { sources, requirements } = input;
  const maxRounds = input.maxRounds ?? 6;
  const closeShare = input.closeShare ?? 0.97;
  const probes = requirements.map((r) => probeYield(r.yield, input.trials));
  const totalCost = (T: number[]) => sources.reduce((acc, s, j) => acc + (s.current > 0 ? costAt(s.cost, T[j]) : 0), 0);
  const spread = (A: number[][], T: number[]) => A.map((row) => Math.sqrt(row.reduce((acc, a, j) => acc + a * T[j] * T[j], 0)));
  const judge = async (T: number[], round: number): Promise<Round> => {
    const req = await input.verify(T, probes, round);
    const demonstrated = req.every((v, r) => v.ci[0] >= requirements[r].yield);
    const closest = Math.max(...req.map((v, r) => v.probeLimit / requirements[r].max));
    return { round, T, cost: totalCost(T), requirements: req, demonstrated, closest };
  };

  const T0 = sources.map((s) => s.current);
  const current = await judge(T0, 0);
  let A = input.linearise(T0);
  let budgets = budgetsFrom(A, T0, current, requirements, spread);
  const rounds: Round[] = [];
  let chosen: Round | null = null;
  let feasible = true;
  let allAtUpperBound = false;
  const short = requirements.map(() => 0);
  for (let round = 1; round <= maxRounds; round++) {
    const lc = leastCost(
      sources.map((s, j) => ({
        id: s.id,
        A: A.map((row) => row[j]),
        cost: s.cost,
        min: s.min,
        max: s.max,
        ...(s.free && s.current > 0 ? {} : { fixed: s.current }),
      })),
      budgets.map((b) => b * b),
    );
    feasible = lc.feasible;
    const T = lc.T.map((t, j) =>
      sources[j].free && sources[j].current > 0 ? Math.min(sources[j].max, Math.max(sources[j].min, roundTolerance(t))) : t,
    );
    allAtUpperBound = sources.every((s, j) => !s.free || s.current <= 0 || T[j] >= s.max * (1 - 1e-9));
    const r = await judge(T, round);
    rounds.push(r);
    if (r.demonstrated && (!chosen || r.cost < chosen.cost)) chosen = r;
    if (r.demonstrated && (r.closest >= closeShare || allAtUpperBound)) break;
    if (!feasible && !r.demonstrated) break;
    // correct the budgets with the ratio measured at this proposal; a requirement still not
    // shown gets a small extra cut that doubles each round it stays short: with common random
    // numbers the ratio alone can stall a hair above the limit, where a tiny change of the
    // tolerances moves no trial across it
    A = input.linearise(T);
    budgets = budgetsFrom(A, T, r, requirements, spread).map((b, k) => {
      if (r.requirements[k].ci[0] >= requirements[k].yield) return b;
      short[k]++;
      return b * (1 - Math.min(0.2, STALL_CUT * 2 ** (short[k] - 1)));
    });
  }
  return { current, rounds, chosen, feasible, allAtUpperBound };
}

function budgetsFrom(
  A: number[][],
  T: number[],
  at: Round,
  requirements: LoopRequirement[],
  spread: (A: number[][], T: number[]) => number[],
): number[] {
  const s = spread(A, T);
  return requirements.map((req, r) => {
    const L = at.requirements[r].probeLimit;
    if (!(L > 0) || !(s[r] > 0)) return Infinity;
    return (s[r] * req.max) / L;
  });
}
