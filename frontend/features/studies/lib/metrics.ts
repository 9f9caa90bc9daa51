/**
 * Metric ids of MODEL.md section 7, read back into their parts so the screens can name,
 * group and order them: `<sensor>.crossAxisPct.<ij>`, `<sensor>.crossAxisTotalPct.<i>`,
 * `<sensor>.axisMisalignDeg.<i>`, `<element>.tiltDeg`, `<a>~<b>.relRotDeg`, `heading.*`.
 */

export type MetricKind = "heading" | "crossAxis" | "crossAxisTotal" | "misalign" | "tilt" | "relRot" | "other";

export interface MetricParts {
  id: string;
  kind: MetricKind;
  /** the sensor or element; for relRot the first die */
  element: string;
  /** the second die of a relative rotation */
  other?: string;
  /** "x", or "xy" for a cross-axis term */
  axis?: string;
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

/** A plain name for a metric id: "mag cross-axis total, x", "accel ↔ mag relative rotation". */
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

const KIND_ORDER: MetricKind[] = ["heading", "crossAxisTotal", "crossAxis", "misalign", "relRot", "tilt", "other"];

/** Groups for a metric picker: heading first, then each sensor, then relative rotations and tilts. */
export function groupMetrics(ids: string[], elementOrder: string[] = []): { label: string; ids: string[] }[] {
  const rank = (e: string) => {
    const i = elementOrder.indexOf(e);
    return i < 0 ? elementOrder.length : i;
  };
  const parts = ids.map(parseMetric);
  const groups = new Map<string, MetricParts[]>();
  const groupOf = (p: MetricParts) =>
    p.kind === "heading" ? "Heading" : p.kind === "relRot" ? "Relative rotation" : p.kind === "tilt" ? "Tilt" : p.element;
  for (const p of parts) {
    const g = groupOf(p);
    if (!groups.has(g)) groups.set(g, []);
    groups.get(g)!.push(p);
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
