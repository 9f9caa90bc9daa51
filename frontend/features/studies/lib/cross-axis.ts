/**
 * Each sensor's cross-axis matrix at one percentile, from the per-term metrics
 * `<sensor>.crossAxisPct.<ij>` (S_ij = 100·C_ij/C_ii, MODEL.md §4). The diagonal is 100 %
 * by definition; it carries the axis misalignment `<sensor>.axisMisalignDeg.<i>` instead.
 * Percentiles are of |S_ij|, so every off-diagonal cell is a magnitude.
 */
import type { MetricStats } from "@shared/schemas/result-file";
import type { PercentileKey } from "./percentiles";

export const AXES = ["x", "y", "z"] as const;

export interface CrossAxisMatrix {
  sensor: string;
  /** cells[i][j]: |S_ij| at the percentile (%); null on the diagonal or when the metric is missing */
  cells: (number | null)[][];
  /** axis misalignment of each axis at the percentile (deg), null when missing */
  misalignDeg: (number | null)[];
  /** the largest off-diagonal cell (%) */
  max: number;
}

/** The sensors with cross-axis metrics, in the order their metrics first appear (or `order`). */
export function crossAxisSensors(metrics: Record<string, MetricStats>, order: string[] = []): string[] {
  const found = new Set<string>();
  for (const id of Object.keys(metrics)) {
    const m = /^(.+)\.crossAxisPct\.[xyz]{2}$/.exec(id);
    if (m) found.add(m[1]);
  }
  const rank = (s: string) => (order.includes(s) ? order.indexOf(s) : order.length);
  return [...found].sort((a, b) => rank(a) - rank(b));
}

export function crossAxisMatrix(metrics: Record<string, MetricStats>, sensor: string, pct: PercentileKey): CrossAxisMatrix {
  let max = 0;
  const cells = AXES.map((i) =>
    AXES.map((j) => {
      if (i === j) return null;
      const stats = metrics[`${sensor}.crossAxisPct.${i}${j}`];
      if (!stats) return null;
      const v = stats[pct];
      if (Number.isFinite(v)) max = Math.max(max, v);
      return v;
    }),
  );
  const misalignDeg = AXES.map((i) => metrics[`${sensor}.axisMisalignDeg.${i}`]?.[pct] ?? null);
  return { sensor, cells, misalignDeg, max };
}

/**
 * How strongly to shade a cell: its share of `scale` (the largest cell over every sensor
 * shown), so one sensor's bad row stands out against the others. 0..1.
 */
export function heat(value: number | null, scale: number): number {
  if (value === null || !Number.isFinite(value) || !(scale > 0)) return 0;
  return Math.min(1, Math.max(0, value / scale));
}
