/**
 * The convergence record of a tracked metric as chart rows: the chosen statistic per
 * checkpoint, and the yield with its 95 % Wilson interval at each checkpoint (the same
 * interval the requirement cards use, from the count of trials inside the limit).
 */
import { wilson } from "@shared/engine/stats";
import type { ResultFile } from "@shared/schemas/result-file";

type Tracked = ResultFile["convergence"][number];
export type ConvergenceStat = "pAtCoverage" | "p95" | "p99" | "p9973" | "mean";

export function statRows(t: Tracked, stat: ConvergenceStat) {
  return t.points.map((p) => ({ trials: p.trials, value: p[stat] }));
}

export interface YieldRow {
  trials: number;
  /** % */
  yield: number;
  /** % lower, upper */
  band: [number, number];
}

export function yieldRows(t: Tracked): YieldRow[] {
  return t.points
    .filter((p) => p.yield !== null)
    .map((p) => {
      const n = p.trials;
      const k = Math.round(p.yield! * n);
      const [lo, hi] = wilson(k, n);
      return { trials: n, yield: 100 * p.yield!, band: [100 * lo, 100 * hi] };
    });
}

/** Where the estimate stands relative to the last checkpoint: the largest relative move over the last half of the run, %. */
export function lateDrift(rows: { trials: number; value: number }[]): number | null {
  if (rows.length < 3) return null;
  const last = rows[rows.length - 1];
  if (!last.value) return null;
  const late = rows.filter((r) => r.trials >= last.trials / 2);
  return Math.max(...late.map((r) => Math.abs(r.value - last.value) / Math.abs(last.value))) * 100;
}
