/**
 * Every tolerance source of a stack as one row (MODEL.md section 8 source ids), for the
 * editor's table: where it lives in the file, its unit, its stage after the defaults,
 * and sorting and filtering of the rows.
 */
import { isSensorKind, type StackElement, type StackFile, type Tolerance } from "@shared/schemas/stack-file";

export type ToleranceUnit = "um" | "deg";

/** The tolerance slots of an element: path inside the element, source id suffix, label, unit. */
export interface SlotSpec {
  path: ReadonlyArray<string | number>;
  suffix: string;
  label: string;
  unit: ToleranceUnit;
  /** which elements have this slot */
  applies: (e: Pick<StackElement, "kind" | "parent">) => boolean;
}

const notBoard = (e: Pick<StackElement, "parent">) => e.parent !== null;
const always = () => true;
const sensor = (e: Pick<StackElement, "kind">) => isSensorKind(e.kind);

export const AXIS_ANGLE_LABELS = [
  "g1 · x toward y",
  "g2 · x toward z",
  "g3 · y toward x",
  "g4 · y toward z",
  "g5 · z toward x",
  "g6 · z toward y",
] as const;

export const SLOTS: SlotSpec[] = [
  { path: ["bondLine", "heightTol"], suffix: "bondLine", label: "Bond-line height", unit: "um", applies: notBoard },
  { path: ["tiltTol", "x"], suffix: "tiltX", label: "Direct tilt about x", unit: "deg", applies: notBoard },
  { path: ["tiltTol", "y"], suffix: "tiltY", label: "Direct tilt about y", unit: "deg", applies: notBoard },
  { path: ["placementTol", "yawDeg"], suffix: "yaw", label: "Placement rotation", unit: "deg", applies: notBoard },
  { path: ["placementTol", "xUm"], suffix: "x", label: "Placement offset x", unit: "um", applies: notBoard },
  { path: ["placementTol", "yUm"], suffix: "y", label: "Placement offset y", unit: "um", applies: notBoard },
  { path: ["bowUm"], suffix: "bow", label: "Bow (dome warpage)", unit: "um", applies: always },
  { path: ["axisTol"], suffix: "axis", label: "Sensing-axis alignment", unit: "deg", applies: sensor },
];

export interface ToleranceRow {
  /** MODEL.md source id, e.g. "mag.bondLine", "gyro.axis.g3" */
  sourceId: string;
  elementId: string;
  elementIndex: number;
  elementKind: StackElement["kind"];
  /** path of the tolerance inside the element */
  path: ReadonlyArray<string | number>;
  label: string;
  unit: ToleranceUnit;
  tol: Tolerance;
  /** the stage this source belongs to after the defaults (MODEL.md section 5) */
  stage: string;
  /** true when the stage comes from the element (or "die" for an axis), not the tolerance */
  stageInherited: boolean;
  /** how many draws it makes: support points, six axis angles, or one */
  draws: number;
}

export function elementStage(e: Pick<StackElement, "stage" | "kind">): string {
  return e.stage ?? (e.kind === "board" ? "board" : "package");
}

const isTol = (v: unknown): v is Tolerance => typeof v === "object" && v !== null && !Array.isArray(v) && "dist" in v;

export function toleranceRows(stack: StackFile): ToleranceRow[] {
  const rows: ToleranceRow[] = [];
  stack.elements.forEach((e, elementIndex) => {
    const own = elementStage(e);
    for (const slot of SLOTS) {
      let v: unknown = e;
      for (const k of slot.path) v = v && typeof v === "object" ? (v as Record<string, unknown>)[k as string] : undefined;
      const base = { elementId: e.id, elementIndex, elementKind: e.kind, unit: slot.unit };
      const inherited = slot.suffix === "axis" ? "die" : own;
      if (slot.suffix === "axis" && Array.isArray(v)) {
        v.forEach((t, k) => {
          if (!isTol(t)) return;
          rows.push({
            ...base,
            sourceId: `${e.id}.axis.g${k + 1}`,
            path: [...slot.path, k],
            label: `Sensing axis ${AXIS_ANGLE_LABELS[k] ?? `g${k + 1}`}`,
            tol: t,
            stage: t.stage ?? inherited,
            stageInherited: t.stage === undefined,
            draws: 1,
          });
        });
        continue;
      }
      if (!isTol(v)) continue;
      const draws = slot.suffix === "axis" ? 6 : slot.suffix === "bondLine" ? supportCount(e) : 1;
      rows.push({
        ...base,
        sourceId: `${e.id}.${slot.suffix}`,
        path: slot.path,
        label: slot.label,
        tol: v,
        stage: v.stage ?? inherited,
        stageInherited: v.stage === undefined,
        draws,
      });
    }
  });
  return rows;
}

function supportCount(e: StackElement): number {
  const s = e.bondLine?.supports;
  return Array.isArray(s) ? s.length : 4;
}

// ---------------------------------------------------------------- sorting, filtering

export type SortKey = "element" | "source" | "dist" | "tol" | "sigmas" | "mean" | "stage" | "owner" | "sigma";
export type SortDir = "asc" | "desc";

const STAGE_ORDER: Record<string, number> = { die: 0, package: 1, board: 2, product: 3 };

/** One standard deviation of the source, in its unit (normal: tol / sigmas; uniform: tol/√3; triangular: tol/√6). */
export function sigmaOf(t: Tolerance): number {
  const T = t.tol ?? 0;
  if (t.dist === "normal") return T / (t.sigmas ?? 3);
  if (t.dist === "uniform") return T / Math.sqrt(3);
  if (t.dist === "triangular") return T / Math.sqrt(6);
  const vs = t.values ?? [];
  if (vs.length < 2) return 0;
  const m = vs.reduce((a, b) => a + b, 0) / vs.length;
  return Math.sqrt(vs.reduce((a, b) => a + (b - m) ** 2, 0) / (vs.length - 1));
}

function sortValue(r: ToleranceRow, key: SortKey): string | number {
  switch (key) {
    case "element":
      return r.elementIndex;
    case "source":
      return r.sourceId;
    case "dist":
      return r.tol.dist;
    case "tol":
      return r.tol.tol ?? -1;
    case "sigmas":
      return r.tol.dist === "normal" ? (r.tol.sigmas ?? 3) : -1;
    case "mean":
      return r.tol.mean ?? 0;
    case "stage":
      return STAGE_ORDER[r.stage] ?? 9;
    case "owner":
      return (r.tol.owner ?? "").toLowerCase() || "\uffff";
    case "sigma":
      return sigmaOf(r.tol);
  }
}

/** A stable sort: rows that tie keep file order. */
export function sortRows(rows: ToleranceRow[], key: SortKey, dir: SortDir): ToleranceRow[] {
  const sign = dir === "asc" ? 1 : -1;
  return rows
    .map((r, i) => ({ r, i }))
    .sort((a, b) => {
      const va = sortValue(a.r, key),
        vb = sortValue(b.r, key);
      const c = typeof va === "number" && typeof vb === "number" ? va - vb : String(va).localeCompare(String(vb));
      return c !== 0 ? c * sign : a.i - b.i;
    })
    .map(({ r }) => r);
}

export interface RowFilter {
  text?: string;
  stage?: string;
  owner?: string;
}

/** `text` matches the source id, the label, the element and the owner; "" for owner means none set. */
export function filterRows(rows: ToleranceRow[], f: RowFilter): ToleranceRow[] {
  const q = (f.text ?? "").trim().toLowerCase();
  return rows.filter((r) => {
    if (f.stage && r.stage !== f.stage) return false;
    if (f.owner !== undefined && f.owner !== "*" && (r.tol.owner ?? "") !== f.owner) return false;
    if (!q) return true;
    return [r.sourceId, r.label, r.elementId, r.tol.owner ?? "", r.tol.dist].some((s) => s.toLowerCase().includes(q));
  });
}
