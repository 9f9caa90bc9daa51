/**
 * The tolerance sources of a stack (MODEL.md §8) as a measured data set sees them: which
 * tolerance a source id names, in which unit, and how to put a measured one in its place.
 * Element ids hold no dots, so a source id is "<element>.<field>" or "<element>.axis.gK".
 */
import type { StackElement, StackFile, Tolerance } from "../schemas/stack-file";
import { isSensorKind } from "../schemas/stack-file";
import type { SourceUnit } from "./units";

/** One of several columns a pooled source takes: a support point, a tilt component, an axis angle. */
export type SourcePart = { index: number; label: string; tolerance: Tolerance };

export type StackSource = {
  id: string;
  elementId: string;
  /** plain words for the mapping list */
  quantity: string;
  unit: SourceUnit;
  tolerance: Tolerance;
  /** the design value of an absolute measurement of this source, in its unit (bond-line thickness, position; 0 for angles) */
  nominal: number;
  /**
   * Set for a source measured as several columns of one unit (pooled): the bond line's
   * support heights in support order, the tilt's x and y, the six axis angles g1..g6.
   */
  parts: SourcePart[] | null;
};

type Field = {
  suffix: string;
  quantity: string;
  unit: SourceUnit;
  get: (e: StackElement) => Tolerance | undefined;
  set: (e: StackElement, t: Tolerance) => void;
  nominal?: (e: StackElement) => number;
};

/** Support point labels in MODEL.md's order: the corners (−x/2, −y/2), (+x/2, −y/2), (+x/2, +y/2), (−x/2, +y/2), or the file's list. */
export function supportLabels(e: StackElement): string[] {
  const s = e.bondLine?.supports;
  if (Array.isArray(s)) return s.map((p, i) => `support ${i} (${p.x}, ${p.y}) mm`);
  return ["support 0 (−x/2, −y/2)", "support 1 (+x/2, −y/2)", "support 2 (+x/2, +y/2)", "support 3 (−x/2, +y/2)"];
}

const FIELDS: Field[] = [
  { suffix: "bow", quantity: "bow", unit: "um", get: (e) => e.bowUm, set: (e, t) => void (e.bowUm = t) },
  {
    suffix: "bondLine",
    quantity: "bond-line height at each support",
    unit: "um",
    get: (e) => e.bondLine?.heightTol,
    set: (e, t) => void (e.bondLine = { ...e.bondLine, heightTol: t }),
    nominal: (e) => e.bondLine?.thicknessUm ?? 0,
  },
  {
    suffix: "tiltX",
    quantity: "direct tilt about x",
    unit: "deg",
    get: (e) => e.tiltTol?.x,
    set: (e, t) => void (e.tiltTol = { ...e.tiltTol, x: t }),
  },
  {
    suffix: "tiltY",
    quantity: "direct tilt about y",
    unit: "deg",
    get: (e) => e.tiltTol?.y,
    set: (e, t) => void (e.tiltTol = { ...e.tiltTol, y: t }),
  },
  {
    suffix: "yaw",
    quantity: "placement rotation",
    unit: "deg",
    get: (e) => e.placementTol?.yawDeg,
    set: (e, t) => void (e.placementTol = { ...e.placementTol, yawDeg: t }),
  },
  {
    suffix: "x",
    quantity: "placement offset in x",
    unit: "um",
    get: (e) => e.placementTol?.xUm,
    set: (e, t) => void (e.placementTol = { ...e.placementTol, xUm: t }),
    nominal: (e) => (e.position?.x ?? 0) * 1000,
  },
  {
    suffix: "y",
    quantity: "placement offset in y",
    unit: "um",
    get: (e) => e.placementTol?.yUm,
    set: (e, t) => void (e.placementTol = { ...e.placementTol, yUm: t }),
    nominal: (e) => (e.position?.y ?? 0) * 1000,
  },
];

/** Every tolerance source of the stack, in file order (the calibration residual is a study setting, not listed). */
export function stackSources(stack: StackFile): StackSource[] {
  const out: StackSource[] = [];
  for (const e of stack.elements) {
    for (const f of FIELDS) {
      const t = f.get(e);
      if (!t) continue;
      const parts = f.suffix === "bondLine" ? supportLabels(e).map((label, index) => ({ index, label, tolerance: t })) : null;
      out.push({
        id: `${e.id}.${f.suffix}`,
        elementId: e.id,
        quantity: f.quantity,
        unit: f.unit,
        tolerance: t,
        nominal: f.nominal?.(e) ?? 0,
        parts,
      });
    }
    // the tilt's two components measured on the same unit, pooled
    const tx = e.tiltTol?.x,
      ty = e.tiltTol?.y;
    if (tx || ty) {
      const zero: Tolerance = { dist: "normal", tol: 0 };
      out.push({
        id: `${e.id}.tilt`,
        elementId: e.id,
        quantity: "direct tilt, x and y of one unit together",
        unit: "deg",
        tolerance: (tx ?? ty)!,
        nominal: 0,
        parts: [
          { index: 0, label: "tilt about x", tolerance: tx ?? zero },
          { index: 1, label: "tilt about y", tolerance: ty ?? zero },
        ],
      });
    }
    if (isSensorKind(e.kind) && e.axisTol) {
      const axis = e.axisTol;
      const parts = Array.from({ length: 6 }, (_, k) => ({
        index: k,
        label: `g${k + 1}`,
        tolerance: Array.isArray(axis) ? axis[k] : axis,
      }));
      if (Array.isArray(axis)) {
        axis.forEach((t, k) =>
          out.push({
            id: `${e.id}.axis.g${k + 1}`,
            elementId: e.id,
            quantity: `sensing-axis angle g${k + 1}`,
            unit: "deg",
            tolerance: t,
            nominal: 0,
            parts: null,
          }),
        );
        out.push({
          id: `${e.id}.axis`,
          elementId: e.id,
          quantity: "sensing-axis angles g1..g6 of one unit together",
          unit: "deg",
          tolerance: axis[0],
          nominal: 0,
          parts,
        });
      } else {
        out.push({
          id: `${e.id}.axis`,
          elementId: e.id,
          quantity: "sensing-axis angles (each of six)",
          unit: "deg",
          tolerance: axis,
          nominal: 0,
          parts,
        });
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
  if (rest === "tilt") {
    if (!e.tiltTol?.x && !e.tiltTol?.y) return null;
    // measured x and y together replace both components (MODEL.md: tiltTol.xy, rows of two)
    e.tiltTol = { xy: tolerance };
    return copy;
  }
  if (!isSensorKind(e.kind) || !e.axisTol) return null;
  if (rest === "axis" && (!Array.isArray(e.axisTol) || tolerance.rows)) {
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
/** The tolerance one column of a source stands for: its part's, or the source's own. */
export function partTolerance(src: StackSource, part: number | null): Tolerance {
  return part !== null && src.parts ? (src.parts[part]?.tolerance ?? src.tolerance) : src.tolerance;
}

export function toleranceLimits(t: Tolerance): { lsl: number; usl: number; target: number } | null {
  if (t.dist === "data" || t.tol === undefined || !(t.tol > 0)) return null;
  const m = t.mean ?? 0;
  return { lsl: m - t.tol, usl: m + t.tol, target: m };
}
