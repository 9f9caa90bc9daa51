/**
 * Compiling a stack (MODEL.md sections 3-7): the stack and study become flat arrays once per
 * study, so that one trial (trial.ts) is a pure function of its draw vector:
 *
 *   draws (Float64Array, physical units: um, deg) -> orientations -> C matrices -> metrics.
 *
 * Every tolerance of the stack (and the study's calibration residual) owns a fixed slice
 * of the draw vector; that layout is what makes a trial regenerable from its index, and
 * what the contributor analysis perturbs.
 */
import type { StackElement, StackFile, Tolerance } from "../schemas/stack-file";
import { isSensorKind, supportPoints } from "./elements";
import type { StudyFile } from "../schemas/study-file";
import { compileDist, compileRows, type CompiledDist } from "./distributions";
import { identity, invert, mat3, mul, type Mat3 } from "./mat3";
import { rotZ } from "./rotation";
import { buildAttitudes, type Attitudes } from "./heading";

const DEG = Math.PI / 180;

export const STAGE_RANK: Record<string, number> = { die: 0, package: 1, board: 2, product: 3 };
const AXES = ["x", "y", "z"] as const;

export interface Source {
  /** MODEL.md section 8 source id, e.g. "mag.bondLine", "calibration.mag" */
  id: string;
  /** first draw and number of draws (all from the same distribution) */
  offset: number;
  count: number;
  dist: CompiledDist;
  stage: string;
  owner?: string;
  /** unit of the draws, for reports */
  unit: "um" | "deg";
}

export interface CompiledElement {
  id: string;
  kind: string;
  fileIndex: number;
  parent: number; // index in model.elements (topological order), -1 for the board
  stage: string;
  x: number; // nominal position on the parent (mm)
  y: number;
  yaw: number; // rad
  cosYaw: number;
  sinYaw: number;
  size: { x: number; y: number; z: number };
  bondThickness: number; // mm
  /** child slope factors: the parent's bow w (um) gives dz/dx = w·kx at this element */
  kx: number;
  ky: number;
  bowOff: number; // own bow draw, -1 if none
  supOff: number; // first support-height draw, -1 if none
  nSup: number;
  /** plane-fit rows: a = Σ pa·h, b = Σ pb·h, c = Σ pc·h (h in um, a in mm, b and c slopes) */
  pa: Float64Array;
  pb: Float64Array;
  pc: Float64Array;
  tiltXOff: number;
  tiltYOff: number;
  dxOff: number;
  dyOff: number;
  yawOff: number;
  axisOff: number; // six draws g1..g6 (deg), -1 if none
  sensor: number; // index into model.sensors, -1 if not a sensor
  Rnom: Mat3;
}

export interface SensorInfo {
  element: number; // index in model.elements
  id: string;
  kind: "gyro" | "accel" | "mag";
  calOff: number; // three residual draws (deg), -1 if none
}

export type MetricKind = "crossAxis" | "crossAxisTotal" | "axisMisalign" | "tilt" | "relRot" | "headingMax" | "headingRms";

const KIND_CODE: Record<MetricKind, number> = {
  crossAxis: 0,
  crossAxisTotal: 1,
  axisMisalign: 2,
  tilt: 3,
  relRot: 4,
  headingMax: 5,
  headingRms: 6,
};

export interface MetricInfo {
  id: string;
  kind: MetricKind;
  /** kind as a small integer, for the switch of the trial loop */
  code: number;
  /** signed metrics can be negative; the others are magnitudes (>= 0) */
  signed: boolean;
  unit: "%" | "deg";
  a: number; // sensor or element index
  b: number; // second sensor (relRot) or column index
  row: number;
}

export interface Model {
  elements: CompiledElement[];
  sensors: SensorInfo[];
  sources: Source[];
  drawCount: number;
  /** per draw: its distribution and stage rank */
  drawDist: CompiledDist[];
  drawRank: Int8Array;
  drawSource: Int32Array;
  metrics: MetricInfo[];
  metricIndex: Map<string, number>;
  calibrationRank: number; // -1: none
  /** screened: max and RMS of the sweep by headingSweepScreened where no per-attitude error is needed */
  heading: { accel: number; mag: number; attitudes: Attitudes; screened: boolean } | null;
}

export interface HeadingOptions {
  inclinationDeg: number;
  headingStepDeg?: number;
  tilts?: { pitchDeg: number; rollDeg: number }[];
}

function elementStage(e: StackElement): string {
  return e.stage ?? (e.kind === "board" ? "board" : "package");
}

/** Least-squares plane z = a + b·x + c·y through the support points, as rows acting on h. */
function planeFitRows(pts: { x: number; y: number }[]): { pa: Float64Array; pb: Float64Array; pc: Float64Array } {
  const n = pts.length;
  // normal equations of [1 x y]
  let sx = 0,
    sy = 0,
    sxx = 0,
    syy = 0,
    sxy = 0;
  for (const p of pts) {
    sx += p.x;
    sy += p.y;
    sxx += p.x * p.x;
    syy += p.y * p.y;
    sxy += p.x * p.y;
  }
  const N = new Float64Array([n, sx, sy, sx, sxx, sxy, sy, sxy, syy]);
  const Ni = new Float64Array(9);
  if (!invert(N, Ni)) throw new Error("support points are collinear");
  const pa = new Float64Array(n),
    pb = new Float64Array(n),
    pc = new Float64Array(n);
  pts.forEach((p, k) => {
    // (NᵀN)⁻¹ Xᵀ, heights in um -> mm
    pa[k] = (Ni[0] + Ni[1] * p.x + Ni[2] * p.y) * 1e-3;
    pb[k] = (Ni[3] + Ni[4] * p.x + Ni[5] * p.y) * 1e-3;
    pc[k] = (Ni[6] + Ni[7] * p.x + Ni[8] * p.y) * 1e-3;
  });
  return { pa, pb, pc };
}

/** Which accelerometer and magnetometer feed the compass, or null when there is none. */
export function headingPair(stack: StackFile, study: Pick<StudyFile, "headingSensors">): { accel: string; mag: string } | null {
  if (study.headingSensors) return study.headingSensors;
  const a = stack.elements.find((e) => e.kind === "accel");
  const m = stack.elements.find((e) => e.kind === "mag");
  return a && m ? { accel: a.id, mag: m.id } : null;
}

/** The metric ids a stack has, in report order (MODEL.md section 7). */
export function metricIds(stack: StackFile, study: Pick<StudyFile, "headingSensors" | "heading">): string[] {
  return metricCatalogue(stack, study).map((m) => m.id);
}

function metricCatalogue(
  stack: StackFile,
  study: Pick<StudyFile, "headingSensors" | "heading">,
  sensorsIdx?: Map<string, number>,
  elIdx?: Map<string, number>,
): MetricInfo[] {
  const out: Omit<MetricInfo, "code">[] = [];
  const sensors = stack.elements.filter((e) => isSensorKind(e.kind));
  sensors.forEach((s, si) => {
    const sIdx = sensorsIdx?.get(s.id) ?? si;
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) {
        if (j === i) continue;
        out.push({ id: `${s.id}.crossAxisPct.${AXES[i]}${AXES[j]}`, kind: "crossAxis", signed: true, unit: "%", a: sIdx, b: j, row: i });
      }
      out.push({ id: `${s.id}.crossAxisTotalPct.${AXES[i]}`, kind: "crossAxisTotal", signed: false, unit: "%", a: sIdx, b: 0, row: i });
      out.push({ id: `${s.id}.axisMisalignDeg.${AXES[i]}`, kind: "axisMisalign", signed: false, unit: "deg", a: sIdx, b: 0, row: i });
    }
  });
  for (const e of stack.elements) {
    if (e.parent === null) continue;
    out.push({ id: `${e.id}.tiltDeg`, kind: "tilt", signed: false, unit: "deg", a: elIdx?.get(e.id) ?? 0, b: 0, row: 0 });
  }
  for (let i = 0; i < sensors.length; i++)
    for (let j = i + 1; j < sensors.length; j++) {
      out.push({
        id: `${sensors[i].id}~${sensors[j].id}.relRotDeg`,
        kind: "relRot",
        signed: false,
        unit: "deg",
        a: sensorsIdx?.get(sensors[i].id) ?? i,
        b: sensorsIdx?.get(sensors[j].id) ?? j,
        row: 0,
      });
    }
  if (study.heading !== false && headingPair(stack, study)) {
    out.push({ id: "heading.maxAbsDeg", kind: "headingMax", signed: false, unit: "deg", a: 0, b: 0, row: 0 });
    out.push({ id: "heading.rmsDeg", kind: "headingRms", signed: false, unit: "deg", a: 0, b: 0, row: 0 });
  }
  return out.map((m) => ({ ...m, code: KIND_CODE[m.kind] }));
}

/** Compile a validated stack and study. */
export function compileModel(stack: StackFile, study: StudyFile): Model {
  const byId = new Map(stack.elements.map((e) => [e.id, e] as const));
  // topological order: parents before children, otherwise file order
  const order: StackElement[] = [];
  const placed = new Set<string>();
  while (order.length < stack.elements.length) {
    let progressed = false;
    for (const e of stack.elements) {
      if (placed.has(e.id)) continue;
      if (e.parent === null || placed.has(e.parent)) {
        order.push(e);
        placed.add(e.id);
        progressed = true;
      }
    }
    if (!progressed) throw new Error("stack is not a tree (validate it first)");
  }
  const idx = new Map(order.map((e, i) => [e.id, i] as const));

  const sources: Source[] = [];
  const drawDist: CompiledDist[] = [];
  const drawRank: number[] = [];
  const drawSource: number[] = [];
  const addSource = (id: string, tol: Tolerance | undefined, count: number, defaultStage: string, unit: "um" | "deg"): number => {
    if (!tol) return -1;
    // measured rows: draw k of the source is column k of one unit's row
    const perDraw = tol.rows ? compileRows(tol.rows, count) : null;
    const dist = perDraw ? perDraw[0] : compileDist(tol);
    const stage = tol.stage ?? defaultStage;
    const offset = drawDist.length;
    for (let k = 0; k < count; k++) {
      drawDist.push(perDraw ? perDraw[k] : dist);
      drawRank.push(STAGE_RANK[stage]);
      drawSource.push(sources.length);
    }
    sources.push({ id, offset, count, dist, stage, owner: tol.owner, unit });
    return offset;
  };

  const sensorList = stack.elements.filter((e) => isSensorKind(e.kind));
  const sensorIdx = new Map(sensorList.map((e, i) => [e.id, i] as const));
  const elements: CompiledElement[] = new Array(order.length);

  // Draw layout follows file order, so it does not change when the tree is re-ordered.
  const perElementDraws = new Map<string, Partial<CompiledElement>>();
  for (const e of stack.elements) {
    const st = elementStage(e);
    const d: Partial<CompiledElement> = {};
    d.bowOff = addSource(`${e.id}.bow`, e.bowUm, 1, st, "um");
    const sup = supportPoints(e);
    d.nSup = e.bondLine?.heightTol ? sup.length : 0;
    d.supOff = addSource(`${e.id}.bondLine`, e.bondLine?.heightTol, sup.length, st, "um");
    if (e.tiltTol?.xy) {
      // both components measured together on each unit: one source, two draws (x, y)
      d.tiltXOff = addSource(`${e.id}.tilt`, e.tiltTol.xy, 2, st, "deg");
      d.tiltYOff = d.tiltXOff + 1;
    } else {
      d.tiltXOff = addSource(`${e.id}.tiltX`, e.tiltTol?.x, 1, st, "deg");
      d.tiltYOff = addSource(`${e.id}.tiltY`, e.tiltTol?.y, 1, st, "deg");
    }
    d.yawOff = addSource(`${e.id}.yaw`, e.placementTol?.yawDeg, 1, st, "deg");
    d.dxOff = addSource(`${e.id}.x`, e.placementTol?.xUm, 1, st, "um");
    d.dyOff = addSource(`${e.id}.y`, e.placementTol?.yUm, 1, st, "um");
    d.axisOff = -1;
    if (isSensorKind(e.kind) && e.axisTol) {
      if (Array.isArray(e.axisTol)) {
        e.axisTol.forEach((t, k) => {
          const off = addSource(`${e.id}.axis.g${k + 1}`, t, 1, "die", "deg");
          if (k === 0) d.axisOff = off;
        });
      } else {
        d.axisOff = addSource(`${e.id}.axis`, e.axisTol, 6, "die", "deg");
      }
    }
    perElementDraws.set(e.id, d);
  }

  const calibrationRank = study.calibration && study.calibration.after !== "none" ? STAGE_RANK[study.calibration.after] : -1;
  const sensors: SensorInfo[] = sensorList.map((e) => ({
    element: idx.get(e.id)!,
    id: e.id,
    kind: e.kind as SensorInfo["kind"],
    calOff: -1,
  }));
  if (calibrationRank >= 0 && study.calibration?.residualDeg) {
    for (const s of sensors) {
      // the residual belongs to no assembly stage: it only enters E
      s.calOff = addSource(`calibration.${s.id}`, study.calibration.residualDeg, 3, "product", "deg");
      for (let k = 0; k < 3; k++) drawRank[s.calOff + k] = 99;
    }
  }

  order.forEach((e, i) => {
    const d = perElementDraws.get(e.id)!;
    const parent = e.parent === null ? -1 : idx.get(e.parent)!;
    const x = e.position?.x ?? 0,
      y = e.position?.y ?? 0;
    let kx = 0,
      ky = 0;
    if (parent >= 0) {
      const p = byId.get(e.parent!)!;
      const rd2 = (p.size.x / 2) ** 2 + (p.size.y / 2) ** 2;
      // z = w(1 − r²/Rd²): dz/dx = −2wx/Rd², w in um -> mm
      kx = (-2e-3 * x) / rd2;
      ky = (-2e-3 * y) / rd2;
    }
    const fit =
      d.nSup! > 0 ? planeFitRows(supportPoints(e)) : { pa: new Float64Array(0), pb: new Float64Array(0), pc: new Float64Array(0) };
    const Rnom = mat3();
    if (parent >= 0) mul(elements[parent].Rnom, rotZ((e.yawDeg ?? 0) * DEG, mat3()), Rnom);
    else identity(Rnom);
    elements[i] = {
      id: e.id,
      kind: e.kind,
      fileIndex: stack.elements.indexOf(e),
      parent,
      stage: elementStage(e),
      x,
      y,
      yaw: (e.yawDeg ?? 0) * DEG,
      cosYaw: Math.cos((e.yawDeg ?? 0) * DEG),
      sinYaw: Math.sin((e.yawDeg ?? 0) * DEG),
      size: e.size,
      bondThickness: (e.bondLine?.thicknessUm ?? 0) * 1e-3,
      kx,
      ky,
      bowOff: d.bowOff!,
      supOff: d.supOff!,
      nSup: d.nSup!,
      pa: fit.pa,
      pb: fit.pb,
      pc: fit.pc,
      tiltXOff: d.tiltXOff!,
      tiltYOff: d.tiltYOff!,
      dxOff: d.dxOff!,
      dyOff: d.dyOff!,
      yawOff: d.yawOff!,
      axisOff: d.axisOff!,
      sensor: sensorIdx.get(e.id) ?? -1,
      Rnom,
    };
  });

  const metrics = metricCatalogue(stack, study, sensorIdx, idx);
  let heading: Model["heading"] = null;
  const pair = study.heading === false ? null : headingPair(stack, study);
  if (pair) {
    heading = {
      accel: sensorIdx.get(pair.accel)!,
      mag: sensorIdx.get(pair.mag)!,
      attitudes: buildAttitudes(study),
      screened: study.headingEvaluation !== "exact",
    };
  }
  return {
    elements,
    sensors,
    sources,
    drawCount: drawDist.length,
    drawDist,
    drawRank: Int8Array.from(drawRank),
    drawSource: Int32Array.from(drawSource),
    metrics,
    metricIndex: new Map(metrics.map((m, i) => [m.id, i] as const)),
    calibrationRank,
    heading,
  };
}
