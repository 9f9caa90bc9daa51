/**
 * A measured column as a production record: the units in the order they were made, grouped
 * by lot when the file names one, and the capability of the process with the uncertainty
 * a small first build leaves in it.
 *
 * Choices, each named where it is used:
 * - Overall performance Pp, Ppk: σ is the sample standard deviation of every unit (n − 1).
 * - Within-lot capability Cp, Cpk: σ is the pooled within-lot standard deviation,
 *   √(Σ (nᵢ − 1)·sᵢ² / Σ (nᵢ − 1)) over the lots that hold at least two units (common
 *   practice for rational subgroups of unequal size; no c4 bias correction). Without lots of
 *   several units there is no within-lot σ and Cp, Cpk are reported as Pp, Ppk.
 * - Lower 95 % confidence bound of Cpk: Bissell's normal approximation (A. F. Bissell, 1990,
 *   "How reliable is your capability index?", Applied Statistics 39(3), 331–340):
 *   Ĉpk − z₀.₉₅ · √(1/(9n) + Ĉpk² / (2ν)), one-sided, with ν = n − 1 for the overall σ and
 *   ν = Σ (nᵢ − 1) for the pooled within-lot σ.
 * - Individuals and moving-range chart (Shewhart): moving ranges of consecutive units
 *   (span 2), centre lines x̄ and MR̄, limits x̄ ± 3·MR̄/d₂ and [D₃·MR̄, D₄·MR̄] with the
 *   constants for subgroups of two, d₂ = 1.128, D₃ = 0, D₄ = 3.267 (the table of control-chart
 *   constants in ASTM E2587 and in Montgomery's Introduction to Statistical Quality Control,
 *   appendix VI; d₂ = 2/√π exactly for n = 2).
 */
import { normalCdf, summarize } from "./statistics";

/** Control-chart constants for moving ranges of two consecutive units. */
export const SHEWHART_N2 = { d2: 1.128, d3: 0.853, D3: 0, D4: 3.267 } as const;
export const SHEWHART_SOURCE = "ASTM E2587 / Montgomery, Introduction to Statistical Quality Control, appendix VI (n = 2)";

/** z with Φ(z) = p, by bisection on our Φ (no table): accurate to 1e-10 for 0 < p < 1. */
export function normalQuantile(p: number): number {
  let lo = -40,
    hi = 40;
  for (let i = 0; i < 200 && hi - lo > 1e-12; i++) {
    const mid = (lo + hi) / 2;
    if (normalCdf(mid) < p) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

const Z95 = normalQuantile(0.95);

/**
 * Bissell's approximate one-sided lower confidence bound of Cpk (header), at `confidence`
 * (0.95 by default); `dof` is the degrees of freedom of σ (n − 1 for one sample).
 */
export function cpkLowerBound(cpk: number, n: number, confidence = 0.95, dof = n - 1): number {
  if (!(n >= 2) || !(dof >= 1) || !Number.isFinite(cpk)) return NaN;
  const z = confidence === 0.95 ? Z95 : normalQuantile(confidence);
  return cpk - z * Math.sqrt(1 / (9 * n) + (cpk * cpk) / (2 * dof));
}

export type Lot = { lot: string; n: number; mean: number; std: number; min: number; max: number; ppk: number | null };

export type ProcessCapability = {
  lsl: number;
  usl: number;
  /** units the figures rest on */
  n: number;
  pp: number;
  ppk: number;
  /** within lots when lots hold several units, otherwise equal to pp, ppk */
  cp: number;
  cpk: number;
  basis: "within lots" | "overall";
  sigmaOverall: number;
  sigmaWithin: number | null;
  /** one-sided 95 % lower confidence bound of cpk (Bissell 1990) */
  cpkLower: number;
  confidence: number;
  /** fraction outside the limits of the fitted (overall) normal, in ppm */
  expectedPpm: number;
  observedOut: number;
  observedPpm: number;
};

/** Pooled within-lot σ and its degrees of freedom, or null when no lot holds two units. */
export function pooledWithin(values: ArrayLike<number>, lots: ArrayLike<string>): { sigma: number; dof: number; lots: number } | null {
  const groups = new Map<string, number[]>();
  for (let i = 0; i < values.length; i++) {
    const g = groups.get(lots[i]);
    if (g) g.push(values[i]);
    else groups.set(lots[i], [values[i]]);
  }
  let ss = 0,
    dof = 0,
    used = 0;
  for (const g of groups.values()) {
    if (g.length < 2) continue;
    const s = summarize(g);
    ss += (g.length - 1) * s.std * s.std;
    dof += g.length - 1;
    used++;
  }
  // one lot of several units is the same σ as the overall one: nothing "within" to report
  if (dof === 0 || groups.size < 2) return null;
  return { sigma: Math.sqrt(ss / dof), dof, lots: used };
}

/** Pp, Ppk over every unit; Cp, Cpk within lots where there are lots; Cpk's lower bound. */
export function processCapability(
  values: ArrayLike<number>,
  lsl: number,
  usl: number,
  lots?: ArrayLike<string> | null,
): ProcessCapability | null {
  const { mean, std, n } = summarize(values);
  if (!(std > 0) || !(usl > lsl) || n < 2) return null;
  const index = (sigma: number) => ({ c: (usl - lsl) / (6 * sigma), ck: Math.min(usl - mean, mean - lsl) / (3 * sigma) });
  const overall = index(std);
  const within = lots ? pooledWithin(values, lots) : null;
  const w = within && within.sigma > 0 ? index(within.sigma) : null;
  let out = 0;
  for (let i = 0; i < n; i++) if (values[i] < lsl || values[i] > usl) out++;
  const cpk = w ? w.ck : overall.ck;
  return {
    lsl,
    usl,
    n,
    pp: overall.c,
    ppk: overall.ck,
    cp: w ? w.c : overall.c,
    cpk,
    basis: w ? "within lots" : "overall",
    sigmaOverall: std,
    sigmaWithin: w ? within!.sigma : null,
    cpkLower: cpkLowerBound(cpk, n, 0.95, w ? within!.dof : n - 1),
    confidence: 0.95,
    expectedPpm: 1e6 * (normalCdf((lsl - mean) / std) + normalCdf(-(usl - mean) / std)),
    observedOut: out,
    observedPpm: (1e6 * out) / n,
  };
}

/** Statistics of each lot, in the order lots first appear in the file. */
export function lotStatistics(values: ArrayLike<number>, lots: ArrayLike<string>, limits?: { lsl: number; usl: number } | null): Lot[] {
  const order: string[] = [];
  const groups = new Map<string, number[]>();
  for (let i = 0; i < values.length; i++) {
    let g = groups.get(lots[i]);
    if (!g) {
      g = [];
      groups.set(lots[i], g);
      order.push(lots[i]);
    }
    g.push(values[i]);
  }
  return order.map((lot) => {
    const g = groups.get(lot)!;
    const s = summarize(g);
    const ppk = limits && s.std > 0 ? Math.min(limits.usl - s.mean, s.mean - limits.lsl) / (3 * s.std) : null;
    return { lot, n: s.n, mean: s.mean, std: s.std, min: s.min, max: s.max, ppk };
  });
}

export type ControlChart = {
  method: string;
  constants: { d2: number; D3: number; D4: number; source: string };
  /** x in production order; mr[i] = |x[i] − x[i−1]| (null for the first unit) */
  points: { order: number; row: number; lot: string | null; x: number; mr: number | null; outX: boolean; outMr: boolean }[];
  x: { centre: number; lcl: number; ucl: number };
  mr: { centre: number; lcl: number; ucl: number };
  /** the σ the moving ranges estimate, MR̄/d₂ */
  sigmaShortTerm: number;
  /** units beyond a limit */
  signals: number;
};

/** Shewhart's individuals and moving-range chart over the values in production order (header). */
export function individualsChart(values: ArrayLike<number>, rows: ArrayLike<number>, lots?: ArrayLike<string> | null): ControlChart | null {
  const n = values.length;
  if (n < 3) return null;
  const { mean } = summarize(values);
  let mrSum = 0;
  for (let i = 1; i < n; i++) mrSum += Math.abs(values[i] - values[i - 1]);
  const mrBar = mrSum / (n - 1);
  const { d2, D3, D4 } = SHEWHART_N2;
  const half = (3 * mrBar) / d2;
  const x = { centre: mean, lcl: mean - half, ucl: mean + half };
  const mr = { centre: mrBar, lcl: D3 * mrBar, ucl: D4 * mrBar };
  let signals = 0;
  const points = Array.from({ length: n }, (_, i) => {
    const m = i === 0 ? null : Math.abs(values[i] - values[i - 1]);
    const outX = mrBar > 0 && (values[i] > x.ucl || values[i] < x.lcl);
    const outMr = m !== null && mrBar > 0 && m > mr.ucl;
    if (outX || outMr) signals++;
    return { order: i + 1, row: rows[i], lot: lots ? lots[i] : null, x: values[i], mr: m, outX, outMr };
  });
  return {
    method: "individuals and moving range (Shewhart), moving ranges of two consecutive units",
    constants: { d2, D3, D4, source: SHEWHART_SOURCE },
    points,
    x,
    mr,
    sigmaShortTerm: mrBar / d2,
    signals,
  };
}
