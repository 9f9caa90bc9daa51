/**
 * Contributors to one requirement metric as a Pareto chart: sources ranked by their share
 * of the variance (or mean square, for magnitudes), with the running total. Two methods
 * from the result file: the linearised model at nominal and the Monte Carlo regression
 * (squared standardised regression coefficients), each ranked on its own.
 */
import type { ResultFile } from "@shared/schemas/result-file";

export type ContributorMethod = "linear" | "mc";
type Contributors = ResultFile["contributors"][number];

export interface ParetoRow {
  source: string;
  /** share in % (0..100) */
  share: number;
  /** running total in %, the last row 100 when nothing is folded away */
  cumulative: number;
  /** the other method's share for the same source, in % (null when it has none) */
  otherShare: number | null;
  /** how many sources this row stands for (more than one for the folded tail) */
  count: number;
}

/** Sources below this share (%) are folded into one "others" bar, so the chart stays legible. */
export const FOLD_BELOW_PCT = 0.5;

/** `keep`: only these sources (the Monte Carlo shares that stand out from the noise). */
export function paretoRows(
  c: Contributors,
  method: ContributorMethod,
  foldBelowPct = FOLD_BELOW_PCT,
  keep?: ReadonlySet<string>,
): ParetoRow[] {
  const share = (s: Contributors["sources"][number], m: ContributorMethod) => (m === "linear" ? s.linearShare : s.mcShare);
  if (method === "mc" && c.sources.every((s) => s.mcShare === null)) return [];
  const other: ContributorMethod = method === "linear" ? "mc" : "linear";
  const ranked = c.sources
    .filter((s) => !keep || keep.has(s.source))
    .map((s) => ({ source: s.source, share: 100 * (share(s, method) ?? 0), other: share(s, other) }))
    .filter((s) => s.share > 0)
    .sort((a, b) => b.share - a.share || a.source.localeCompare(b.source));
  const kept = ranked.filter((s) => s.share >= foldBelowPct);
  const tail = ranked.filter((s) => s.share < foldBelowPct);
  const rows: ParetoRow[] = [];
  let running = 0;
  for (const s of kept) {
    running += s.share;
    rows.push({ source: s.source, share: s.share, cumulative: running, otherShare: s.other === null ? null : 100 * s.other, count: 1 });
  }
  if (tail.length === 1) {
    const s = tail[0];
    running += s.share;
    rows.push({ source: s.source, share: s.share, cumulative: running, otherShare: s.other === null ? null : 100 * s.other, count: 1 });
  } else if (tail.length > 1) {
    const sum = tail.reduce((a, s) => a + s.share, 0);
    const otherSum = tail.some((s) => s.other === null) ? null : 100 * tail.reduce((a, s) => a + (s.other ?? 0), 0);
    running += sum;
    rows.push({ source: `${tail.length} others`, share: sum, cumulative: running, otherShare: otherSum, count: tail.length });
  }
  return rows;
}

/** How many of the ranked sources it takes to reach `pct` % of the total (the "vital few"). */
export function sourcesToReach(rows: ParetoRow[], pct = 80): number {
  let n = 0;
  for (const r of rows) {
    n += r.count;
    if (r.cumulative >= pct - 1e-9) return n;
  }
  return n;
}
