/**
 * Every tolerance source of a stack (MODEL.md section 8), in the engine's order, with what a
 * supplier needs to read it: the element, the quantity, the unit, the stage and the owner.
 * Pure functions: the server builds reports with them, the client shows owners with them.
 */
import type { StackElement, StackFile, Tolerance } from "../schemas/stack-file";
import { isSensorKind } from "../schemas/stack-file";

export type SourceUnit = "um" | "deg";

export interface ToleranceSource {
  /** e.g. "gyro.bondLine", "pkg.yaw", "mag.axis", "mag.axis.g3" */
  id: string;
  elementId: string;
  elementName: string;
  elementKind: string;
  /** plain words: "bond-line height at each support" */
  quantity: string;
  unit: SourceUnit;
  stage: string;
  /** how many independent draws share the tolerance (four corners, six axis angles) */
  draws: number;
  tolerance: Tolerance;
  owner: string | null;
}

const AXIS_WORDS = ["x toward y", "x toward z", "y toward x", "y toward z", "z toward x", "z toward y"];

function elementStage(e: StackElement): string {
  if (e.parent === null) return "board";
  return e.stage ?? "package";
}

function supportCount(e: StackElement): number {
  const s = e.bondLine?.supports;
  return Array.isArray(s) ? s.length : 4;
}

/** The sources of a stack in the order the engine lays out its draws (file order, then field order). */
export function toleranceSources(stack: StackFile): ToleranceSource[] {
  const out: ToleranceSource[] = [];
  for (const e of stack.elements) {
    const st = elementStage(e);
    const add = (suffix: string, tol: Tolerance | undefined, quantity: string, unit: SourceUnit, draws: number, defaultStage = st) => {
      if (!tol) return;
      out.push({
        id: `${e.id}.${suffix}`,
        elementId: e.id,
        elementName: e.name ?? e.id,
        elementKind: e.kind,
        quantity,
        unit,
        stage: tol.stage ?? defaultStage,
        draws,
        tolerance: tol,
        owner: tol.owner?.trim() ? tol.owner.trim() : null,
      });
    };
    add("bow", e.bowUm, "bow (dome warpage, centre above corners)", "um", 1);
    const n = supportCount(e);
    add("bondLine", e.bondLine?.heightTol, `bond-line height at each of ${n} supports`, "um", n);
    add("tiltX", e.tiltTol?.x, "direct tilt about x", "deg", 1);
    add("tiltY", e.tiltTol?.y, "direct tilt about y", "deg", 1);
    add("yaw", e.placementTol?.yawDeg, "placement rotation (yaw)", "deg", 1);
    add("x", e.placementTol?.xUm, "placement offset in x", "um", 1);
    add("y", e.placementTol?.yUm, "placement offset in y", "um", 1);
    if (isSensorKind(e.kind) && e.axisTol) {
      if (Array.isArray(e.axisTol)) {
        e.axisTol.forEach((t, k) => add(`axis.g${k + 1}`, t, `sensing-axis alignment g${k + 1} (${AXIS_WORDS[k]})`, "deg", 1, "die"));
      } else {
        add("axis", e.axisTol, "sensing-axis alignment, each of six angles", "deg", 6, "die");
      }
    }
  }
  return out;
}

export type SupplierRef = { id: string; name: string };

/**
 * The supplier company an owner text names: the same name ignoring case and surrounding
 * spaces, or the company's id. Anything else (an in-house step, a typo) is no company.
 */
export function matchOwner<S extends SupplierRef>(owner: string | null | undefined, suppliers: readonly S[]): S | null {
  const o = owner?.trim();
  if (!o) return null;
  const lower = o.toLowerCase();
  return suppliers.find((s) => s.id.toLowerCase() === lower) ?? suppliers.find((s) => s.name.trim().toLowerCase() === lower) ?? null;
}
