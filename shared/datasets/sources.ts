/**
 * The tolerance sources of a stack (MODEL.md §8) as a measured data set sees them: which
 * tolerance a source id names, in which unit, and how to put a measured one in its place.
 * Element ids hold no dots, so a source id is "<element>.<field>" or "<element>.axis.gK".
 */
import type { StackElement, StackFile, Tolerance } from "../schemas/stack-file";
import { isSensorKind } from "../schemas/stack-file";
import type { SourceUnit } from "./units";

export type StackSource = {
  id: string;
  elementId: string;
  /** plain words for the mapping list */
  quantity: string;
  unit: SourceUnit;
  tolerance: Tolerance;
};

type Field = { suffix: string; quantity: string; unit: SourceUnit; get: (e: StackElement) => Tolerance | undefined; set: (e: StackElement, t: Tolerance) => void };

const FIELDS: Field[] = [
  { suffix: "bow", quantity: "bow", unit: "um", get: (e) => e.bowUm, set: (e, t) => void (e.bowUm = t) },
  {
    suffix: "bondLine",
    quantity: "bond-line height at each support",
    unit: "um",
    get: (e) => e.bondLine?.heightTol,
    set: (e, t) => void (e.bondLine = { ...e.bondLine, heightTol: t }),
  },
  { suffix: "tiltX", quantity: "direct tilt about x", unit: "deg", get: (e) => e.tiltTol?.x, set: (e, t) => void (e.tiltTol = { ...e.tiltTol, x: t }) },
  { suffix: "tiltY", quantity: "direct tilt about y", unit: "deg", get: (e) => e.tiltTol?.y, set: (e, t) => void (e.tiltTol = { ...e.tiltTol, y: t }) },
  {
    suffix: "yaw",
    quantity: "placement rotation",
    unit: "deg",
    get: (e) => e.placementTol?.yawDeg,
    set: (e, t) => void (e.placementTol = { ...e.placementTol, yawDeg: t }),
  },
  { suffix: "x", quantity: "placement offset in x", unit: "um", get: (e) => e.placementTol?.xUm, set: (e, t) => void (e.placementTol = { ...e.placementTol, xUm: t }) },
  { suffix: "y", quantity: "placement offset in y", unit: "um", get: (e) => e.placementTol?.yUm, set: (e, t) => void (e.placementTol = { ...e.placementTol, yUm: t }) },
];

/** Every tolerance source of the stack, in file order (the calibration residual is a study setting, not listed). */
export function stackSources(stack: StackFile): StackSource[] {
  const out: StackSource[] = [];
  for (const e of stack.elements) {
    for (const f of FIELDS) {
      const t = f.get(e);
      if (t) out.push({ id: `${e.id}.${f.suffix}`, elementId: e.id, quantity: f.quantity, unit: f.unit, tolerance: t });
    }
    if (isSensorKind(e.kind) && e.axisTol) {
      if (Array.isArray(e.axisTol)) {
        e.axisTol.forEach((t, k) =>
          out.push({ id: `${e.id}.axis.g${k + 1}`, elementId: e.id, quantity: `sensing-axis angle g${k + 1}`, unit: "deg", tolerance: t }),
        );
      } else {
        out.push({ id: `${e.id}.axis`, elementId: e.id, quantity: "sensing-axis angles (each of six)", unit: "deg", tolerance: e.axisTol });
      }
    }
  }
  return out;
}

export function findSource(stack: StackFile, id: string): StackSource | null {
  return stackSources(stack).find((s) => s.id === id) ?? null;
}

/**
 * A copy of the stack with the tolerance of source `id` replaced. Returns null when the
 * stack has no such source. The input is never changed.
 */
export function replaceSource(stack: StackFile, id: string, tolerance: Tolerance): StackFile | null {
  const copy = structuredClone(stack) as StackFile;
  const dot = id.indexOf(".");
  if (dot <= 0) return null;
  const elementId = id.slice(0, dot);
  const rest = id.slice(dot + 1);
  const e = copy.elements.find((x) => x.id === elementId);
  if (!e) return null;
  const field = FIELDS.find((f) => f.suffix === rest);
  if (field) {
    if (!field.get(e)) return null;
    field.set(e, tolerance);
    return copy;
  }
  if (!isSensorKind(e.kind) || !e.axisTol) return null;
  if (rest === "axis" && !Array.isArray(e.axisTol)) {
    e.axisTol = tolerance;
    return copy;
  }
  const g = /^axis\.g([1-6])$/.exec(rest);
  if (g && Array.isArray(e.axisTol)) {
    e.axisTol[Number(g[1]) - 1] = tolerance;
    return copy;
  }
  return null;
}

/** The specification window a ± tolerance stands for: mean ± T (null for a measured or zero tolerance). */
export function toleranceLimits(t: Tolerance): { lsl: number; usl: number; target: number } | null {
  if (t.dist === "data" || t.tol === undefined || !(t.tol > 0)) return null;
  const m = t.mean ?? 0;
  return { lsl: m - t.tol, usl: m + t.tol, target: m };
}
