/**
 * The capability a report asks of a supplier, and the process spread it implies.
 *
 * A tolerance mean m ± T is read as the specification window [m − T, m + T] around the
 * target m. With Cpk = min(USL − μ, μ − LSL) / (3σ), a process centred on the target meets
 * Cpk when σ ≤ T / (3·Cpk). The study itself sampled the tolerance with its own σ (T/k for a
 * normal tolerance of k sigmas, T/√3 uniform, T/√6 triangular); when that σ is smaller than
 * the one the asked Cpk allows, the study's predictions hold only for the tighter process, so
 * the report raises the ask to the study's assumption.
 */
import type { Tolerance } from "../schemas/stack-file";

export const DEFAULT_CPK = 1.33;
export const MIN_CPK = 0.5;
export const MAX_CPK = 3;

/** The standard deviation the study sampled for a tolerance (null for measured data sets). */
export function modelledSigma(t: Tolerance): number | null {
  if (t.dist === "data" || t.tol === undefined) return null;
  if (t.dist === "normal") return t.tol / (t.sigmas ?? 3);
  if (t.dist === "uniform") return t.tol / Math.sqrt(3);
  return t.tol / Math.sqrt(6);
}

/** Largest σ of a centred process that meets `cpk` inside ±T. */
export function sigmaForCpk(halfWidth: number, cpk: number): number {
  return halfWidth / (3 * cpk);
}

export type CapabilityAsk = {
  /** the Cpk the report asks for this source */
  cpk: number;
  /** the Cpk chosen for the report (or its override for this source) before any raise */
  cpkChosen: number;
  /** true: the study assumed a tighter process than cpkChosen allows, so cpk was raised to it */
  raised: boolean;
  /** σ the asked Cpk allows (unit of the tolerance) */
  sigmaMax: number | null;
  sigmaModelled: number | null;
};

export function capabilityAsk(t: Tolerance, cpkChosen: number): CapabilityAsk {
  const sm = modelledSigma(t);
  if (sm === null || t.tol === undefined || t.tol === 0)
    return { cpk: cpkChosen, cpkChosen, raised: false, sigmaMax: null, sigmaModelled: sm };
  const cpkModel = t.tol / (3 * sm);
  // a small margin so that 3 sigmas against 1.0 is not shown as "raised" by rounding
  const raised = cpkModel > cpkChosen + 1e-9;
  const cpk = raised ? cpkModel : cpkChosen;
  return { cpk, cpkChosen, raised, sigmaMax: sigmaForCpk(t.tol, cpk), sigmaModelled: sm };
}
