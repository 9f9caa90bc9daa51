/**
 * Least-cost tolerance allocation on the linearised model, by Lagrange multipliers, as in
 * Chase, Greenwood, Loosli and Hauglund, "Least cost tolerance allocation for mechanical
 * assemblies with automated process selection", Manufacturing Review 3(1), 1990 (the BYU
 * ADCATS group): minimise Σ_j (a_j + b_j / T_j^k_j) subject to the RSS condition of each
 * requirement r, Σ_j A_rj T_j² ≤ S_r².
 *
 * A_rj is source j's linearised contribution to requirement r's variance (or mean square)
 * per unit T_j², so the condition is the root-sum-square stack-up. With one requirement and
 * no bounds, the stationarity condition k_j b_j T_j^-(k_j+1) = 2 λ A_j T_j gives the
 * paper's closed form T_j = (k_j b_j / (2 λ A_j))^(1/(k_j+2)), λ set by the condition.
 *
 * Several requirements: one multiplier each. In x_j = T_j² the cost is convex and the
 * conditions linear, so the problem is convex; for given multipliers μ each T_j has the
 * closed form above with λA_j → Σ_r μ_r A_rj (clamped to its bounds), and the multipliers
 * are found by exact coordinate ascent on the dual (each μ_r by bisection so that its
 * condition holds with equality, or 0 when it holds without it).
 */
import type { CostModel } from "./cost";

export type LcSource = {
  id: string;
  /** per requirement: contribution per unit T² */
  A: number[];
  cost: CostModel;
  min: number;
  max: number;
  /** a fixed source keeps T = fixed */
  fixed?: number;
};

export type LcResult = { T: number[]; multipliers: number[]; feasible: boolean; binding: boolean[] };

function tOf(s: LcSource, w: number): number {
  if (s.fixed !== undefined) return s.fixed;
  if (!(w > 0)) return s.max;
  const t = ((s.cost.k * s.cost.b) / (2 * w)) ** (1 / (s.cost.k + 2));
  return Math.min(s.max, Math.max(s.min, t));
}

/** budgets: S_r² per requirement (same units as the A's times T²). */
export function leastCost(sources: LcSource[], budgets: number[]): LcResult {
  const R = budgets.length;
  const mu = new Array<number>(R).fill(0);
  const weights = () => sources.map((s) => s.A.reduce((acc, a, r) => acc + a * mu[r], 0));
  const usage = (r: number, T: number[]) => sources.reduce((acc, s, j) => acc + s.A[r] * T[j] * T[j], 0);
  const tAll = () => {
    const w = weights();
    return sources.map((s, j) => tOf(s, w[j]));
  };
  // feasibility: with every free source at its lower bound
  const tightest = sources.map((s) => s.fixed ?? s.min);
  const feasible = budgets.every((b, r) => usage(r, tightest) <= b * (1 + 1e-12));
  if (!feasible) return { T: tightest, multipliers: mu, feasible, binding: budgets.map(() => true) };

  for (let sweep = 0; sweep < 500; sweep++) {
    let change = 0;
    for (let r = 0; r < R; r++) {
      const old = mu[r];
      mu[r] = 0;
      if (usage(r, tAll()) <= budgets[r]) {
        change = Math.max(change, old > 0 ? 1 : 0);
        continue;
      }
      // bracket the multiplier (usage falls as μ_r grows), then bisect in log space
      let lo = 0,
        hi = Math.max(old, 1e-30);
      mu[r] = hi;
      while (usage(r, tAll()) > budgets[r] && hi < 1e300) {
        lo = hi;
        hi *= 16;
        mu[r] = hi;
      }
      for (let it = 0; it < 200; it++) {
        const mid = lo > 0 ? Math.sqrt(lo * hi) : hi / 2;
        mu[r] = mid;
        if (usage(r, tAll()) > budgets[r]) lo = mid;
        else hi = mid;
        if (hi - lo <= 1e-13 * hi) break;
      }
      mu[r] = hi;
      change = Math.max(change, Math.abs(hi - old) / Math.max(hi, old, 1e-300));
    }
    if (change < 1e-10) break;
  }
  const T = tAll();
  return { T, multipliers: mu.slice(), feasible, binding: mu.map((m) => m > 0) };
}
