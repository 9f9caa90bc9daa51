/**
 * The adapter between the engine and the 3D view: which draw vector a pose uses
 * (design intent, the tolerances' means, or one study trial regenerated from its seed),
 * and the element poses that follow from it, in flat arrays the scene reads.
 *
 * Everything here comes from shared/engine: prepareStudy (the study's plan: sampling
 * mode, seed and the trial count its blocks were cut from, which for an adaptive study
 * is not `trials`), drawsOfTrial, poses and evaluateTrial: the same steps as the
 * engine's poseOfTrial, kept as a draw vector because the view also needs the sensing
 * axes and re-exaggerates the pose on every slider move.
 */
import { compileModel, createScratch, evaluateTrial, meanDraws, poses, type Model } from "@shared/engine/model";
import { drawsOfTrial, type SamplingMode } from "@shared/engine/sampling";
import { prepareStudy } from "@shared/engine/study";
import { isSensorKind, type ElementKind, type StackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import { zAxisAngle } from "./rotation-math";

/** The study used when none is given: enough for nominal and mean poses. */
export const MINIMAL_STUDY: StudyFile = { format: "orthostack.study/1", trials: 1, seed: 0, inclinationDeg: 60 };

export type PoseChoice = { kind: "nominal" } | { kind: "mean" } | { kind: "trial"; index: number };

export interface ViewerModel {
  model: Model;
  study: StudyFile;
  /** true when a real study was given, so trials can be regenerated */
  hasStudy: boolean;
  /** how the study's trials were drawn: what regenerating one needs */
  plan: { mode: SamplingMode; seed: number; trials: number };
  /** false when the study does not fit the stack (mid-edit): trials are then only approximate */
  exact: boolean;
}

/**
 * Compile the stack for the view. A study that does not fit the stack (a requirement on
 * a metric the edited stack no longer has, compass sensors that are gone) still gives
 * poses: the view compiles without those parts and says that trials are approximate.
 */
export function compileForViewer(stack: StackFile, study: StudyFile | undefined): ViewerModel {
  if (!study) {
    const model = compileModel(stack, MINIMAL_STUDY);
    return { model, study: MINIMAL_STUDY, hasStudy: false, plan: { mode: "random", seed: 0, trials: 1 }, exact: true };
  }
  try {
    const prep = prepareStudy(stack, study);
    return {
      model: prep.model,
      study: prep.study,
      hasStudy: true,
      plan: { mode: prep.plan.mode, seed: prep.plan.seed, trials: prep.plan.trials },
      exact: true,
    };
  } catch {
    const loose: StudyFile = { ...study, heading: false, headingSensors: undefined, requirements: undefined, adaptive: undefined };
    const model = compileModel(stack, loose);
    return {
      model,
      study: loose,
      hasStudy: true,
      plan: { mode: study.sampling ?? "random", seed: study.seed, trials: study.trials },
      exact: false,
    };
  }
}

/** The draws of a trial, regenerated from the study's seed (engine: drawsOfTrial on the study's plan). */
export function trialDraws(vm: ViewerModel, index: number): Float64Array {
  return drawsOfTrial(vm.model, vm.plan.mode, vm.plan.seed, vm.plan.trials, index);
}

export function drawsFor(vm: ViewerModel, choice: PoseChoice): Float64Array {
  if (choice.kind === "mean") return meanDraws(vm.model);
  if (choice.kind === "trial") return trialDraws(vm, choice.index);
  return new Float64Array(vm.model.drawCount);
}

/** Poses of every element in file order, plus what the scene needs to rebuild them. */
export interface PoseSet {
  count: number;
  ids: string[];
  kinds: ElementKind[];
  /** file index of the parent, -1 for the board */
  parent: Int32Array;
  /** file indices, parents before children */
  order: Int32Array;
  /** world orientation and nominal orientation, row-major 3x3 per element */
  R: Float64Array;
  Rnom: Float64Array;
  /** world position of the bottom-face centre (mm), actual and nominal */
  P: Float64Array;
  Pnom: Float64Array;
  /** the bottom-face centre in the parent's frame (mm): placement, bow, bond line */
  L: Float64Array;
  /** sensing axes u_x, u_y, u_z as rows, in the die's own frame (identity for non-sensors) */
  U: Float64Array;
  /** angle between R·ez and Rnom·ez (deg), the engine's die tilt */
  tiltDeg: Float64Array;
  /** every metric of the model for these draws (model.metrics order) */
  metrics: Float64Array;
  metricIds: string[];
  metricUnits: string[];
}

const DEG = Math.PI / 180;

export function poseSet(vm: ViewerModel, stack: StackFile, draws: Float64Array): PoseSet {
  const m = vm.model;
  const list = poses(m, draws);
  const n = list.length;
  const index = new Map(stack.elements.map((e, i) => [e.id, i] as const));
  const parent = new Int32Array(n);
  stack.elements.forEach((e, i) => (parent[i] = e.parent === null ? -1 : index.get(e.parent)!));
  const order = Int32Array.from(m.elements.map((e) => e.fileIndex));
  const R = new Float64Array(9 * n),
    Rnom = new Float64Array(9 * n);
  const P = new Float64Array(3 * n),
    Pnom = new Float64Array(3 * n),
    L = new Float64Array(3 * n);
  const U = new Float64Array(9 * n);
  const tiltDeg = new Float64Array(n);
  list.forEach((p, i) => {
    R.set(p.R, 9 * i);
    Rnom.set(p.Rnom, 9 * i);
    P.set(p.position, 3 * i);
    Pnom.set(p.positionNominal, 3 * i);
  });
  for (let i = 0; i < n; i++) {
    const q = parent[i];
    if (q < 0) {
      L.set(P.subarray(3 * i, 3 * i + 3), 3 * i);
    } else {
      const dx = P[3 * i] - P[3 * q],
        dy = P[3 * i + 1] - P[3 * q + 1],
        dz = P[3 * i + 2] - P[3 * q + 2];
      for (let r = 0; r < 3; r++) L[3 * i + r] = R[9 * q + r] * dx + R[9 * q + 3 + r] * dy + R[9 * q + 6 + r] * dz;
    }
    tiltDeg[i] = q < 0 ? 0 : zAxisAngle(R, Rnom, 9 * i) / DEG;
  }
  // sensing axes from the six alignment draws (MODEL.md section 4)
  for (const ce of m.elements) {
    const i = ce.fileIndex,
      o = 9 * i;
    U[o] = 1;
    U[o + 4] = 1;
    U[o + 8] = 1;
    if (!isSensorKind(ce.kind) || ce.axisOff < 0) continue;
    const g = (k: number) => Math.tan(draws[ce.axisOff + k] * DEG);
    const rows = [
      [1, g(0), g(1)],
      [g(2), 1, g(3)],
      [g(4), g(5), 1],
    ];
    rows.forEach((row, r) => {
      const len = Math.hypot(row[0], row[1], row[2]);
      for (let c = 0; c < 3; c++) U[o + 3 * r + c] = row[c] / len;
    });
  }
  const s = createScratch(m);
  evaluateTrial(m, draws, s);
  return {
    count: n,
    ids: list.map((p) => p.id),
    kinds: list.map((p) => p.kind as ElementKind),
    parent,
    order,
    R,
    Rnom,
    P,
    Pnom,
    L,
    U,
    tiltDeg,
    metrics: s.metrics.slice(),
    metricIds: m.metrics.map((x) => x.id),
    metricUnits: m.metrics.map((x) => x.unit),
  };
}
