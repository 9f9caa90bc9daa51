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

/** Round axis ticks inside [lo, hi]: about `count` of them, at 1, 2 or 5 × 10^k. */
export function niceTicks(lo: number, hi: number, count = 5): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / count;
  const e = Math.pow(10, Math.floor(Math.log10(raw)));
  const step = [1, 2, 2.5, 5, 10].map((f) => f * e).find((s) => s >= raw) ?? 10 * e;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step - 1e-9) * step; v <= hi + 1e-9 * step; v += step)
    out.push(Math.abs(v) < step * 1e-9 ? 0 : Number(v.toPrecision(12)));
  return out;
}
