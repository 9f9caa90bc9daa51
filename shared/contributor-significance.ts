/**
 * Which Monte Carlo contributor shares stand out from the sampling noise, and the interval of
 * each. The regression's draws are independent by construction (random or Latin hypercube
 * sampling, one column per draw), so the standard error of a standardised regression
 * coefficient is the normal-theory one with uncorrelated regressors, √((1 − R²)/(n − p − 1)).
 * A source with d draws gets d coefficients; its √SRC² is given a 95 % half-width of
 * 1.96·se·√d, and the share's interval scales with its SRC². A source is significant when the
 * interval stays above zero. Sources whose linearised sensitivity is exactly zero cannot
 * move the metric and are left out whatever the regression's noise gives them.
 */
import type { ResultFile } from "./schemas/result-file";

type Contributors = ResultFile["contributors"][number];

export interface McShare {
  source: string;
  /** share (0..1) and its 95 % interval */
  share: number;
  lo: number;
  hi: number;
  significant: boolean;
}

export function mcShares(c: Contributors, trials: number, drawsOf: (source: string) => number): Map<string, McShare> {
  const out = new Map<string, McShare>();
  if (c.mcR2 === null) return out;
  const p = c.sources.reduce((n, s) => n + Math.max(1, drawsOf(s.source)), 0);
  const dof = trials - p - 1;
  const se = dof > 0 ? Math.sqrt(Math.max(0, 1 - c.mcR2) / dof) : Infinity;
  for (const s of c.sources) {
    if (s.mcShare === null || s.src2 === null || s.linearContribution === 0) continue;
    const src = Math.sqrt(Math.max(0, s.src2));
    const half = 1.96 * se * Math.sqrt(Math.max(1, drawsOf(s.source)));
    const scale = s.src2 > 0 ? s.mcShare / s.src2 : 0;
    const lo = Number.isFinite(half) ? Math.max(0, src - half) ** 2 * scale : 0;
    const hi = Number.isFinite(half) ? Math.min(1, (src + half) ** 2 * scale) : 1;
    out.set(s.source, { source: s.source, share: s.mcShare, lo, hi, significant: Number.isFinite(half) && src - half > 0 && scale > 0 });
  }
  return out;
}
