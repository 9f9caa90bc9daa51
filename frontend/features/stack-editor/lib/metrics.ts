/**
 * The metric ids a stack offers (MODEL.md section 7, from the engine's metricIds), with a
 * label, a unit and a group for the requirement picker and the estimate.
 */
import { metricIds } from "@shared/engine/model";
import type { StackFile } from "@shared/schemas/stack-file";

export type MetricUnit = "%" | "deg";

export interface MetricOption {
  id: string;
  label: string;
  group: string;
  unit: MetricUnit;
}

export function metricUnit(id: string): MetricUnit {
  return /\.crossAxis(Total)?Pct\./.test(id) ? "%" : "deg";
}

export const METRIC_UNIT_LABEL: Record<MetricUnit, string> = { "%": "%", deg: "°" };

export function describeMetric(id: string): { label: string; group: string } {
  if (id === "heading.maxAbsDeg") return { label: "Heading error, largest over the sweep", group: "Compass heading" };
  if (id === "heading.rmsDeg") return { label: "Heading error, RMS over the sweep", group: "Compass heading" };
  let m = /^(.+)\.crossAxisPct\.([xyz])([xyz])$/.exec(id);
  if (m) return { label: `${m[1]} · cross-axis of ${m[2]} to ${m[3]}`, group: m[1] };
  m = /^(.+)\.crossAxisTotalPct\.([xyz])$/.exec(id);
  if (m) return { label: `${m[1]} · cross-axis total, ${m[2]} axis`, group: m[1] };
  m = /^(.+)\.axisMisalignDeg\.([xyz])$/.exec(id);
  if (m) return { label: `${m[1]} · axis misalignment, ${m[2]}`, group: m[1] };
  m = /^(.+)\.tiltDeg$/.exec(id);
  if (m) return { label: `${m[1]} · tilt`, group: "Element tilt" };
  m = /^(.+)~(.+)\.relRotDeg$/.exec(id);
  if (m) return { label: `${m[1]} to ${m[2]} · relative rotation`, group: "Relative rotation of sensor dies" };
  return { label: id, group: "Other" };
}

/** Options in the engine's report order, grouped for a <select>. */
export function metricOptions(stack: StackFile): MetricOption[] {
  let ids: string[] = [];
  try {
    ids = metricIds(stack, {});
  } catch {
    ids = [];
  }
  return ids.map((id) => ({ id, unit: metricUnit(id), ...describeMetric(id) }));
}

export function groupOptions(options: MetricOption[]): { group: string; options: MetricOption[] }[] {
  const out: { group: string; options: MetricOption[] }[] = [];
  const order = (g: string) => (g === "Compass heading" ? 0 : g === "Relative rotation of sensor dies" ? 2 : g === "Element tilt" ? 3 : 1);
  for (const o of options) {
    let g = out.find((x) => x.group === o.group);
    if (!g) out.push((g = { group: o.group, options: [] }));
    g.options.push(o);
  }
  return out.sort((a, b) => order(a.group) - order(b.group));
}
