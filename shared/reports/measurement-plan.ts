/**
 * The measurement plan of a supplier's report: for each of its tolerances, what to measure
 * on which units, in which unit and to which resolution, how many readings per unit, and
 * the window the readings must fall in. The PDF, the spreadsheet and the CSV print it alike.
 */
import { formatFixed } from "../format";
import type { ReportContent, ReportTolerance } from "../schemas/reports";
import { describeSupports, REPORT_RESOLUTION, sourceNominal } from "./nominals";

/**
 * The sample asked for a capability study: 25 subgroups of 5 consecutive units (125 units)
 * from at least 3 lots. Common practice for an initial process study (about 100 readings or
 * more in rational subgroups of 4 to 5); a Cpk from fewer units has too wide a bound to hold
 * a supplier to.
 */
export const MEASUREMENT_SAMPLE = { units: 125, subgroups: 25, subgroupSize: 5, lots: 3 } as const;

export type MeasurementStep = {
  tolerance: ReportTolerance;
  what: string;
  unit: "um" | "deg";
  resolution: number;
  readingsPerUnit: number;
  /** absolute limits of a reading, "11.0 – 19.0 µm"; null for a measured data set (no window) */
  window: string | null;
};

const STAGE_UNITS: Record<string, string> = {
  die: "on dies (wafer or die test)",
  package: "on assembled packages",
  board: "on packages mounted on the board",
  product: "on finished products",
};

export function measurementSteps(c: ReportContent): MeasurementStep[] {
  return c.tolerances.map((t) => {
    const e = c.stack.find((x) => x.id === t.elementId);
    const parent = e?.parent ? c.stack.find((x) => x.id === e.parent) : undefined;
    const name = t.elementName;
    const pName = parent?.name ?? e?.parent ?? "its parent";
    const field = t.source.slice(t.elementId.length + 1);
    const where = STAGE_UNITS[t.stage] ?? `at the ${t.stage} stage`;
    let what: string;
    if (field === "bondLine")
      what = `bond-line thickness between ${pName} and ${name} at ${e ? describeSupports(e) : "each support"}, ${where}`;
    else if (field === "yaw") what = `rotation of ${name}'s x edge from ${pName}'s x axis, ${where}`;
    else if (field === "x" || field === "y") what = `position of ${name}'s centre from ${pName}'s centre along ${field}, ${where}`;
    else if (field === "tiltX" || field === "tiltY")
      what = `tilt of ${name}'s top face against ${pName}'s top face about ${field === "tiltX" ? "x" : "y"}, ${where}`;
    else if (field === "bow") what = `bow of ${name}: centre height of its top face above its corners, ${where}`;
    else if (field.startsWith("axis")) what = `${t.quantity} of ${name}, ${where}`;
    else what = `${t.quantity}, ${where}`;
    const resolution = REPORT_RESOLUTION[t.unit];
    const nominal = e ? sourceNominal(t, c.stack).nominal : 0;
    const centre = nominal + t.mean;
    const u = t.unit === "deg" ? "°" : " µm";
    const window = t.tol === null ? null : `${formatFixed(centre - t.tol, resolution)} – ${formatFixed(centre + t.tol, resolution)}${u}`;
    return { tolerance: t, what, unit: t.unit, resolution, readingsPerUnit: t.draws, window };
  });
}
