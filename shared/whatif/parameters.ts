/**
 * What a sweep may vary and how one value of it enters the stack and the study. A source's
 * value replaces only its ± half-width T (distribution, sigmas, mean, stage and owner stay),
 * so a sweep point at today's T is exactly today's study.
 */
import { findSource, replaceSource } from "../datasets/sources";
import type { StackFile } from "../schemas/stack-file";
import type { StudyFile } from "../schemas/study-file";

export const INCLINATION = "inclinationDeg";
export const CALIBRATION_RESIDUAL = "calibration.residualDeg";

export type ParameterInfo = {
  parameter: string;
  kind: "source" | "inclination" | "calibration";
  unit: "um" | "deg";
  /** today's value (the source's T, the study's inclination or residual T) */
  current: number;
  /** the smallest and largest value a point may take */
  min: number;
  max: number;
};

/** Describes a sweep parameter, or gives the reason it cannot be swept. */
export function describeParameter(stack: StackFile, study: StudyFile, parameter: string): ParameterInfo | { error: string } {
  if (parameter === INCLINATION)
    return { parameter, kind: "inclination", unit: "deg", current: study.inclinationDeg, min: -89.9, max: 89.9 };
  if (parameter === CALIBRATION_RESIDUAL) {
    const r = study.calibration?.residualDeg;
    if (!study.calibration || study.calibration.after === "none" || !r)
      return { error: "the study calibrates nothing: set calibration.after and a residualDeg tolerance to sweep the residual" };
    if (r.dist === "data" || r.tol === undefined)
      return { error: "the calibration residual is a measured data set, which has no ± tolerance to vary" };
    return { parameter, kind: "calibration", unit: "deg", current: r.tol, min: 0, max: Infinity };
  }
  const s = findSource(stack, parameter);
  if (!s) return { error: `the stack has no tolerance source "${parameter}" (ids look like "mag.bondLine", "pkg.yaw", "mag.axis")` };
  if (s.tolerance.dist === "data" || s.tolerance.tol === undefined)
    return { error: `"${parameter}" is a measured data set, which has no ± tolerance to vary` };
  return { parameter, kind: "source", unit: s.unit, current: s.tolerance.tol, min: 0, max: Infinity };
}

/** The stack and study of one sweep point (copies; the inputs are not changed). */
export function atParameter(
  stack: StackFile,
  study: StudyFile,
  info: ParameterInfo,
  value: number,
): { stack: StackFile; study: StudyFile } {
  if (info.kind === "inclination") return { stack, study: { ...study, inclinationDeg: value } };
  if (info.kind === "calibration") {
    const cal = study.calibration!;
    return { stack, study: { ...study, calibration: { ...cal, residualDeg: { ...cal.residualDeg!, tol: value } } } };
  }
  return { stack: withTolerances(stack, { [info.parameter]: value }), study };
}

/** A copy of the stack with new half-widths T for the named sources (everything else kept). */
export function withTolerances(stack: StackFile, tolerances: Record<string, number>): StackFile {
  let out = stack;
  for (const [id, tol] of Object.entries(tolerances)) {
    const s = findSource(out, id);
    if (!s || s.tolerance.dist === "data") throw new Error(`no tolerance source "${id}" with a ± half-width`);
    const next = replaceSource(out, id, { ...s.tolerance, tol });
    if (!next) throw new Error(`could not set the tolerance of "${id}"`);
    out = next;
  }
  return out;
}
