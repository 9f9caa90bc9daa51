/**
 * What changed between two stack revisions, in words a reviewer would use: "mag: bond-line
 * height tolerance" with its unit, not a JSON path. Elements are matched by id, requirements
 * by metric; every other field is compared leaf by leaf. Pure: the server answers the diff
 * route with it and the client could show a live one with the same labels.
 */
import { unitText } from "../format";
import { metricLabel, metricUnit } from "../metrics";
import type { StackElement, StackFile } from "../schemas/stack-file";

export type ChangeKind = "added" | "removed" | "changed";
export type Scalar = string | number | boolean | null;
export type StackChange = { path: string; label: string; kind: ChangeKind; before: Scalar; after: Scalar; unit: string | null };
export type RequirementLike = { metric: string; max: number; yield: number; name?: string };

type FieldWords = { label: string; unit: string | null };

/** An element's own fields (not tolerances). */
const ELEMENT_FIELDS: Record<string, FieldWords> = {
  kind: { label: "kind", unit: null },
  parent: { label: "parent", unit: null },
  name: { label: "name", unit: null },
  notes: { label: "notes", unit: null },
  stage: { label: "assembly stage", unit: null },
  "position.x": { label: "position x on its parent", unit: "mm" },
  "position.y": { label: "position y on its parent", unit: "mm" },
  yawDeg: { label: "yaw on its parent", unit: "°" },
  "size.x": { label: "length (x)", unit: "mm" },
  "size.y": { label: "width (y)", unit: "mm" },
  "size.z": { label: "thickness", unit: "mm" },
  "bondLine.thicknessUm": { label: "bond-line thickness", unit: "µm" },
  "bondLine.supports": { label: "bond-line support points", unit: null },
};

/** Where a tolerance sits on an element, and the unit of its half-width. */
const TOLERANCES: Record<string, FieldWords> = {
  "bondLine.heightTol": { label: "bond-line height tolerance", unit: "µm" },
  "tiltTol.x": { label: "tilt about x tolerance", unit: "°" },
  "tiltTol.y": { label: "tilt about y tolerance", unit: "°" },
  "tiltTol.xy": { label: "tilt x and y tolerance (measured together)", unit: "°" },
  "placementTol.xUm": { label: "placement x tolerance", unit: "µm" },
  "placementTol.yUm": { label: "placement y tolerance", unit: "µm" },
  "placementTol.yawDeg": { label: "placement yaw tolerance", unit: "°" },
  bowUm: { label: "bow tolerance", unit: "µm" },
  axisTol: { label: "sensing-axis alignment tolerance", unit: "°" },
};

/** A tolerance's own fields: the half-width carries the tolerance's unit, the rest their own. */
const TOLERANCE_PARTS: Record<string, (unit: string | null) => { suffix: string; unit: string | null }> = {
  tol: (u) => ({ suffix: "", unit: u }),
  mean: (u) => ({ suffix: " mean", unit: u }),
  dist: () => ({ suffix: " distribution", unit: null }),
  sigmas: () => ({ suffix: " sigmas", unit: "σ" }),
  stage: () => ({ suffix: " stage", unit: null }),
  owner: () => ({ suffix: " owner", unit: null }),
  values: () => ({ suffix: " measured values", unit: null }),
  rows: () => ({ suffix: " measured rows", unit: null }),
};

type Leaf = { path: string; label: string; unit: string | null; value: Scalar };

/** A list or record shown as one value: a count for long data, the text for short lists. */
function summarise(v: unknown): Scalar {
  if (v === undefined) return null;
  if (v === null || typeof v === "string" || typeof v === "number" || typeof v === "boolean") return v;
  if (Array.isArray(v) && v.length > 8) return `${v.length} entries`;
  return JSON.stringify(v);
}

function toleranceLeaves(prefix: string, label: string, unit: string | null, tol: unknown, out: Leaf[]) {
  if (!tol || typeof tol !== "object") return;
  for (const [k, v] of Object.entries(tol as Record<string, unknown>)) {
    const part = TOLERANCE_PARTS[k]?.(unit) ?? { suffix: ` ${k}`, unit: null };
    out.push({ path: `${prefix}.${k}`, label: `${label}${part.suffix}`, unit: part.unit, value: summarise(v) });
  }
}

function elementLeaves(e: StackElement): Leaf[] {
  const out: Leaf[] = [];
  const base = `elements[${e.id}]`;
  const get = (path: string) =>
    path.split(".").reduce<unknown>((o, k) => (o && typeof o === "object" ? (o as Record<string, unknown>)[k] : undefined), e);
  for (const [path, w] of Object.entries(ELEMENT_FIELDS)) {
    const v = get(path);
    if (v !== undefined) out.push({ path: `${base}.${path}`, label: `${e.id}: ${w.label}`, unit: w.unit, value: summarise(v) });
  }
  for (const [path, w] of Object.entries(TOLERANCES)) {
    const v = get(path);
    if (Array.isArray(v)) {
      v.forEach((t, k) => toleranceLeaves(`${base}.${path}[${k}]`, `${e.id}: sensing-axis alignment g${k + 1} tolerance`, w.unit, t, out));
    } else {
      toleranceLeaves(`${base}.${path}`, `${e.id}: ${w.label}`, w.unit, v, out);
    }
  }
  if (e.meta !== undefined) out.push({ path: `${base}.meta`, label: `${e.id}: metadata`, unit: null, value: summarise(e.meta) });
  return out;
}

function compareLeaves(before: Leaf[], after: Leaf[], out: StackChange[]) {
  const a = new Map(after.map((l) => [l.path, l]));
  const b = new Map(before.map((l) => [l.path, l]));
  for (const l of before) {
    const n = a.get(l.path);
    if (!n) out.push({ path: l.path, label: l.label, kind: "removed", before: l.value, after: null, unit: l.unit });
    else if (n.value !== l.value)
      out.push({ path: l.path, label: l.label, kind: "changed", before: l.value, after: n.value, unit: n.unit ?? l.unit });
  }
  for (const l of after)
    if (!b.has(l.path)) out.push({ path: l.path, label: l.label, kind: "added", before: null, after: l.value, unit: l.unit });
}

const describeElement = (e: StackElement) => `${e.name ?? e.id} (${e.kind}${e.parent ? ` on ${e.parent}` : ""})`;

/** Every change from `before` to `after`: stack fields, elements (added, removed, each field), requirements. */
export function diffRevisions(
  before: { stack: StackFile; requirements: RequirementLike[] },
  after: { stack: StackFile; requirements: RequirementLike[] },
): StackChange[] {
  const out: StackChange[] = [];
  const stackLeaves = (s: StackFile): Leaf[] =>
    (["name", "notes"] as const)
      .filter((k) => s[k] !== undefined)
      .map((k) => ({ path: k, label: `stack ${k}`, unit: null, value: s[k] ?? null }));
  compareLeaves(stackLeaves(before.stack), stackLeaves(after.stack), out);

  const oldById = new Map(before.stack.elements.map((e) => [e.id, e]));
  const newById = new Map(after.stack.elements.map((e) => [e.id, e]));
  for (const e of before.stack.elements) {
    const n = newById.get(e.id);
    if (!n)
      out.push({
        path: `elements[${e.id}]`,
        label: `${e.id}: element`,
        kind: "removed",
        before: describeElement(e),
        after: null,
        unit: null,
      });
    else compareLeaves(elementLeaves(e), elementLeaves(n), out);
  }
  for (const e of after.stack.elements) {
    if (!oldById.has(e.id))
      out.push({
        path: `elements[${e.id}]`,
        label: `${e.id}: element`,
        kind: "added",
        before: null,
        after: describeElement(e),
        unit: null,
      });
  }

  const reqLeaves = (rs: RequirementLike[]): Leaf[] =>
    rs.flatMap((r) => {
      const what = r.name ? `${r.name} (${metricLabel(r.metric)})` : metricLabel(r.metric);
      return [
        { path: `requirements[${r.metric}].max`, label: `requirement: ${what}, limit`, unit: unitText(metricUnit(r.metric)), value: r.max },
        {
          path: `requirements[${r.metric}].yield`,
          label: `requirement: ${what}, yield target`,
          unit: "%",
          value: Math.round(r.yield * 1e6) / 1e4,
        },
      ];
    });
  compareLeaves(reqLeaves(before.requirements), reqLeaves(after.requirements), out);
  return out;
}
