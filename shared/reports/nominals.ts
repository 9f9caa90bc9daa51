/**
 * What each tolerance of a report is measured from: its nominal (the design value the
 * tolerance sits on) and its datum (the face, edge or point it is measured from), read from
 * the stack as frozen in the report. One place, so the PDF, the spreadsheet and the CSV say
 * the same thing.
 */
import { formatFixed } from "../format";
import type { ReportContent } from "../schemas/reports";

type El = ReportContent["stack"][number];

/** The stated resolution of the report's numbers, per unit (dimensions in mm, small heights in µm, angles in °). */
export const REPORT_RESOLUTION = { mm: 0.001, um: 0.1, deg: 0.001 } as const;
/** Standard deviations are given one decimal finer than the readings they describe. */
export const SIGMA_RESOLUTION = { um: 0.01, deg: 0.0001 } as const;
/** Yields and shares in the files, as fractions. */
export const FRACTION_RESOLUTION = { yield: 0.000001, share: 0.001, cpk: 0.01 } as const;

export type SourceNominal = {
  /** the nominal in the tolerance's own unit (µm or °), so nominal ± tolerance reads directly */
  nominal: number;
  /** the nominal as a drawing states it: "15.0 µm", "−0.300 mm", "90.000°" */
  text: string;
  /** what the value is measured from */
  datum: string;
};

const mm = (v: number) => `${formatFixed(v, REPORT_RESOLUTION.mm)} mm`;
const um = (v: number) => `${formatFixed(v, REPORT_RESOLUTION.um)} µm`;
const deg = (v: number) => `${formatFixed(v, REPORT_RESOLUTION.deg)}°`;

/** Support points of an element in its own frame (mm): the frozen list, or the four corners. */
export function elementSupports(e: Pick<El, "size" | "supports">): Array<{ x: number; y: number }> {
  if (e.supports && e.supports.length) return e.supports;
  const hx = e.size.x / 2;
  const hy = e.size.y / 2;
  return [
    { x: -hx, y: -hy },
    { x: hx, y: -hy },
    { x: hx, y: hy },
    { x: -hx, y: hy },
  ];
}

/** "the four corners (±0.800, ±0.700 mm)" or "3 points: (−0.400, −0.400), … mm". */
export function describeSupports(e: Pick<El, "size" | "supports">): string {
  if (!e.supports || e.supports.length === 0)
    return `the four corners (±${formatFixed(e.size.x / 2, 0.001)}, ±${formatFixed(e.size.y / 2, 0.001)} mm)`;
  const pts = e.supports.map((p) => `(${formatFixed(p.x, 0.001)}, ${formatFixed(p.y, 0.001)})`);
  return `${pts.length} points ${pts.join(", ")} mm`;
}

/** The reference point of an element's position: the centre of its parent's top face. */
export function positionReference(parentName: string): string {
  return `centre of ${parentName}'s top face, in ${parentName}'s x and y`;
}

/** The nominal and datum of one tolerance source ("gyro.bondLine", "mag.yaw", "pkg.x", "mag.axis.g3"). */
export function sourceNominal(source: { source: string; elementId: string }, stack: readonly El[]): SourceNominal {
  const e = stack.find((x) => x.id === source.elementId);
  const field = source.source.slice(source.elementId.length + 1);
  if (!e) return { nominal: 0, text: "0", datum: "" };
  const parent = e.parent ? stack.find((x) => x.id === e.parent) : undefined;
  const pName = parent?.name ?? e.parent ?? "the board";
  switch (field) {
    case "bondLine":
      return {
        nominal: e.bondThicknessUm,
        text: um(e.bondThicknessUm),
        datum: `${pName}'s top face, under ${e.name}'s supports at ${describeSupports(e)} from its centre`,
      };
    case "bow":
      return { nominal: 0, text: um(0), datum: `plane through the corners of ${e.name}'s top face (flat)` };
    case "tiltX":
    case "tiltY":
      return { nominal: 0, text: deg(0), datum: `${pName}'s top face (${e.name} parallel to it), about ${field === "tiltX" ? "x" : "y"}` };
    case "yaw":
      return { nominal: e.yawDeg, text: deg(e.yawDeg), datum: `${pName}'s x axis, to ${e.name}'s x edge, about ${e.name}'s centre` };
    case "x":
    case "y": {
      const v = field === "x" ? e.position.x : e.position.y;
      return { nominal: v * 1000, text: mm(v), datum: `centre of ${pName}'s top face, to ${e.name}'s centre along ${pName}'s ${field}` };
    }
    default:
      if (field === "axis" || field.startsWith("axis.")) {
        return { nominal: 0, text: deg(0), datum: `${e.name}'s die edges (x, y) and its normal (z)` };
      }
      return { nominal: 0, text: "0", datum: "" };
  }
}
