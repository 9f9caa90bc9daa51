import type { MetricStats } from "@shared/schemas/result-file";

/** The percentiles the result file reports for every metric (of |value|). */
export const PERCENTILES = [
  { key: "p50", label: "p50", p: 0.5 },
  { key: "p95", label: "p95", p: 0.95 },
  { key: "p99", label: "p99", p: 0.99 },
  { key: "p9973", label: "p99.73", p: 0.9973 },
] as const satisfies ReadonlyArray<{ key: keyof MetricStats; label: string; p: number }>;

export type PercentileKey = (typeof PERCENTILES)[number]["key"];

export const percentileLabel = (key: PercentileKey) => PERCENTILES.find((p) => p.key === key)!.label;
