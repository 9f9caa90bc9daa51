/**
 * The reciprocal-power cost-tolerance model C(T) = a + b / T^k (one of the classic
 * cost-tolerance curves of the least-cost allocation literature), with starting values per
 * kind of source. The defaults are invented placeholders in relative cost units, not
 * quotes: the engineer replaces them with what the suppliers charge.
 */
export type CostModel = { a: number; b: number; k: number };

/** By the source id's last part (MODEL.md §8). Units: T in µm or degrees, as the source's. */
export const DEFAULT_COSTS: Record<string, CostModel & { what: string }> = {
  bondLine: { a: 0.05, b: 0.5, k: 1, what: "bond-line height (µm)" },
  bow: { a: 0.05, b: 2, k: 1, what: "bow / warpage (µm)" },
  tiltX: { a: 0.05, b: 0.02, k: 1, what: "direct tilt (°)" },
  tiltY: { a: 0.05, b: 0.02, k: 1, what: "direct tilt (°)" },
  yaw: { a: 0.02, b: 0.05, k: 1, what: "placement rotation (°)" },
  x: { a: 0.02, b: 2, k: 1, what: "placement offset (µm)" },
  y: { a: 0.02, b: 2, k: 1, what: "placement offset (µm)" },
  axis: { a: 0.1, b: 0.05, k: 2, what: "sensing-axis alignment of the die (°)" },
};

export function sourceKind(id: string): string {
  const parts = id.split(".");
  return parts[1] === "axis" ? "axis" : parts[parts.length - 1];
}

export function defaultCost(id: string): CostModel {
  const d = DEFAULT_COSTS[sourceKind(id)] ?? DEFAULT_COSTS.bondLine;
  return { a: d.a, b: d.b, k: d.k };
}

export function costAt(c: CostModel, T: number): number {
  return T > 0 ? c.a + c.b / T ** c.k : Infinity;
}
