/**
 * The metric ids a stack offers (from the engine's metricIds), with their words from
 * shared/metrics.ts, for the requirement picker and the estimate.
 */
import { metricIds } from "@shared/engine/model";
import { groupMetrics, metricInfo, type MetricInfo } from "@shared/metrics";
import type { StackFile } from "@shared/schemas/stack-file";

/** Options grouped for a <select>, heading first, then the sensors in stack order. */
export function metricOptions(stack: StackFile): { group: string; options: MetricInfo[] }[] {
  let ids: string[] = [];
  try {
    ids = metricIds(stack, {});
  } catch {
    // a stack the engine cannot compile yet offers no metrics; the validator names the problem
    ids = [];
  }
  const order = stack.elements.map((e) => e.id);
  return groupMetrics(ids, order).map((g) => ({ group: g.label, options: g.ids.map(metricInfo) }));
}
