/**
 * The parts of a result file that need only the model and the folded regression sums, not
 * the merged worker state: the linearised contributions of the reported metrics and the
 * regression designs (a pseudo-inverse each). They run once per study, in code the JIT has
 * not compiled yet where a process is fresh, so the engine pool (backend/engine/pool.ts) has
 * one of its threads compute them while the main thread counts the percentiles; the result
 * is the same either way, to the bit.
 */
import { Matrix } from "ml-matrix";
import type { PreparedStudy } from "./plan";
import type { Coordinator } from "./coordinator";
import { linearisedContributions, regressionDesign, type LinearisedResult, type RegressionDesign } from "./contributors";

export interface ResultParts {
  lin: LinearisedResult[];
  designs: { linear: RegressionDesign | null; squared: RegressionDesign | null };
}

/** What the parts are computed from: the coordinator's regression sums after the last block. */
export interface PartsInput {
  n: number;
  xtxLin: Float64Array | null;
  xtxSq: Float64Array | null;
  /** whether the study regresses any metric (the coordinator holds z·y sums) */
  regress: boolean;
}

/** ResultParts as they cross a thread: the pseudo-inverses as plain rows. */
export interface PackedParts {
  lin: LinearisedResult[];
  designs: { linear: PackedDesign | null; squared: PackedDesign | null };
}
type PackedDesign = Omit<RegressionDesign, "pinv"> & { pinv: number[][] };

export function partsInput(coord: Coordinator): PartsInput {
  return { n: coord.trials, xtxLin: coord.xtxLin, xtxSq: coord.xtxSq, regress: coord.xty !== null };
}

/** The metrics the result reports linearised contributions for: the regressed ones, then every other signed one. */
function linearisedMetrics(prep: PreparedStudy): number[] {
  const reqMetrics = prep.plan.regression.metrics.map((r) => r.metric);
  const signed = prep.model.metrics.map((m, k) => (m.signed ? k : -1)).filter((k) => k >= 0 && !reqMetrics.includes(k));
  return [...reqMetrics, ...signed];
}

export function resultParts(prep: PreparedStudy, input: PartsInput): ResultParts {
  const cols = prep.plan.regression.cols;
  // one decomposition per design, shared by the metrics regressed on it
  const designOf = (tri: Float64Array | null) => (tri && input.regress && input.n > 0 ? regressionDesign(cols, tri) : null);
  return {
    lin: linearisedContributions(prep.model, linearisedMetrics(prep)),
    designs: { linear: designOf(input.xtxLin), squared: designOf(input.xtxSq) },
  };
}

const packDesign = (d: RegressionDesign | null): PackedDesign | null => d && { ...d, pinv: d.pinv.to2DArray() };
const unpackDesign = (d: PackedDesign | null): RegressionDesign | null => d && { ...d, pinv: new Matrix(d.pinv) };

export function packParts(p: ResultParts): PackedParts {
  return { lin: p.lin, designs: { linear: packDesign(p.designs.linear), squared: packDesign(p.designs.squared) } };
}

export function unpackParts(p: PackedParts): ResultParts {
  return { lin: p.lin, designs: { linear: unpackDesign(p.designs.linear), squared: unpackDesign(p.designs.squared) } };
}
