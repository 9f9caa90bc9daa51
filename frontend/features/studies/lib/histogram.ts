import type { ResultFile } from "@shared/schemas/result-file";

type Histogram = ResultFile["histograms"][string];

export interface HistogramRow {
  /** bin centre */
  x: number;
  lo: number;
  hi: number;
  count: number;
  /** share of all trials, % */
  pct: number;
  /** the whole bin lies beyond the limit (|value| > max) */
  beyond: boolean;
  /** the limit falls inside this bin */
  straddles: boolean;
}

/** The plot bins of a metric, with the share of trials and which bins lie past the limit. */
export function histogramRows(h: Histogram, limit?: number): HistogramRow[] {
  const total = h.counts.reduce((a, b) => a + b, 0);
  return h.counts.map((count, i) => {
    const lo = h.edges[i];
    const hi = h.edges[i + 1];
    const outside = (v: number) => limit !== undefined && Math.abs(v) > limit;
    const beyond = limit !== undefined && (lo >= 0 ? lo >= limit : hi <= -limit);
    const straddles = limit !== undefined && !beyond && (outside(lo) || outside(hi));
    return { x: (lo + hi) / 2, lo, hi, count, pct: total > 0 ? (100 * count) / total : 0, beyond, straddles };
  });
}
