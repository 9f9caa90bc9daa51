/**
 * Metric ids of MODEL.md section 7 (made by the engine's metricIds) in words: the one place
 * the editor, the study screens, the reports and the PDF read a metric's label, short label,
 * unit and group from. Ids: `<sensor>.crossAxisPct.<ij>`, `<sensor>.crossAxisTotalPct.<i>`,
 * `<sensor>.axisMisalignDeg.<i>`, `<element>.tiltDeg`, `<a>~<b>.relRotDeg`, `heading.*`.
 */
import { unitText } from "./format";

export type MetricKind = "heading" | "crossAxis" | "crossAxisTotal" | "misalign" | "tilt" | "relRot" | "other";

/** The unit a metric is computed in (the engine's and the result file's word). */
export type MetricUnit = "%" | "deg";

export interface MetricParts {
  id: string;
  kind: MetricKind;
  /** the sensor or element; for relRot the first die */
  element: string;
  /** the second die of a relative rotation */
  other?: string;
  /** "x", or "xy" for a cross-axis term; for heading "maxAbsDeg" or "rmsDeg" */
  axis?: string;
}

export interface MetricInfo {
  id: string;
  /** the full name, for pickers, tables, reports: "mag cross-axis total, x" */
  label: string;
  /** a few characters for a narrow column or a chart tick: "total x", "z←y" */
  shortLabel: string;
  unit: MetricUnit;
  /** the unit as printed after a value: "%" or "°" */
  unitSymbol: string;
  /** the picker group: "Heading", a sensor's id, "Relative rotation", "Tilt" */
  group: string;
}

export function parseMetric(id: string): MetricParts {
  if (id.startsWith("heading.")) return { id, kind: "heading", element: "heading", axis: id.slice(8) };
  const rel = /^(.+)~(.+)\.relRotDeg$/.exec(id);
  if (rel) return { id, kind: "relRot", element: rel[1], other: rel[2] };
  const m = /^(.+)\.(crossAxisPct|crossAxisTotalPct|axisMisalignDeg)\.([xyz]{1,2})$/.exec(id);
  if (m) {
    const kind = m[2] === "crossAxisPct" ? "crossAxis" : m[2] === "crossAxisTotalPct" ? "crossAxisTotal" : "misalign";
    return { id, kind, element: m[1], axis: m[3] };
  }
  const tilt = /^(.+)\.tiltDeg$/.exec(id);
  if (tilt) return { id, kind: "tilt", element: tilt[1] };
  return { id, kind: "other", element: id };
}

export function metricUnit(id: string): MetricUnit {
  const kind = parseMetric(id).kind;
  return kind === "crossAxis" || kind === "crossAxisTotal" ? "%" : "deg";
}

/** The full name of a metric: "mag cross-axis total, x", "accel ↔ mag relative rotation". */
export function metricLabel(id: string): string {
  const p = parseMetric(id);
  switch (p.kind) {
    case "heading":
      return p.axis === "maxAbsDeg" ? "Heading error, max over the sweep" : p.axis === "rmsDeg" ? "Heading error, RMS over the sweep" : id;
    case "crossAxis":
      return `${p.element} cross-axis ${p.axis![0]}←${p.axis![1]}`;
    case "crossAxisTotal":
      return `${p.element} cross-axis total, ${p.axis}`;
    case "misalign":
      return `${p.element} axis misalignment, ${p.axis}`;
    case "tilt":
      return `${p.element} tilt`;
    case "relRot":
      return `${p.element} ↔ ${p.other} relative rotation`;
    default:
      return id;
  }
}

/** The name within its group (the group says the sensor): "total x", "z←y", "misalign. x". */
export function metricShortLabel(id: string): string {
  const p = parseMetric(id);
  switch (p.kind) {
    case "heading":
      return p.axis === "maxAbsDeg" ? "heading max" : p.axis === "rmsDeg" ? "heading RMS" : id;
    case "crossAxis":
      return `${p.axis![0]}←${p.axis![1]}`;
    case "crossAxisTotal":
      return `total ${p.axis}`;
    case "misalign":
      return `misalign. ${p.axis}`;
    case "tilt":
      return p.element;
    case "relRot":
      return `${p.element} ↔ ${p.other}`;
    default:
      return id;
  }
}

export function metricGroup(id: string): string {
  const p = parseMetric(id);
  return p.kind === "heading" ? "Heading" : p.kind === "relRot" ? "Relative rotation" : p.kind === "tilt" ? "Tilt" : p.element;
}

export function metricInfo(id: string): MetricInfo {
  const unit = metricUnit(id);
  return { id, label: metricLabel(id), shortLabel: metricShortLabel(id), unit, unitSymbol: unitText(unit), group: metricGroup(id) };
}

const KIND_ORDER: MetricKind[] = ["heading", "crossAxisTotal", "crossAxis", "misalign", "relRot", "tilt", "other"];

/** Groups for a metric picker: heading first, then each sensor, then relative rotations and tilts. */
export function groupMetrics(ids: string[], elementOrder: string[] = []): { label: string; ids: string[] }[] {
  const rank = (e: string) => {
    const i = elementOrder.indexOf(e);
    return i < 0 ? elementOrder.length : i;
  };
  const groups = new Map<string, MetricParts[]>();
  for (const p of ids.map(parseMetric)) {
    const g = metricGroup(p.id);
    const list = groups.get(g) ?? [];
    list.push(p);
    groups.set(g, list);
  }
  const order = (g: string, list: MetricParts[]) =>
    g === "Heading" ? -2 : g === "Relative rotation" ? 1e6 : g === "Tilt" ? 1e6 + 1 : rank(list[0].element);
  return [...groups.entries()]
    .sort((a, b) => order(a[0], a[1]) - order(b[0], b[1]))
    .map(([label, list]) => ({
      label,
      ids: list
        .sort(
          (a, b) =>
            KIND_ORDER.indexOf(a.kind) - KIND_ORDER.indexOf(b.kind) ||
            rank(a.element) - rank(b.element) ||
            (a.axis ?? a.other ?? "").localeCompare(b.axis ?? b.other ?? ""),
        )
        .map((p) => p.id),
    }));
}

/** Every metric id in picker order. */
export function orderedMetrics(ids: string[], elementOrder: string[] = []): string[] {
  return groupMetrics(ids, elementOrder).flatMap((g) => g.ids);
}
