/**
 * The stack model of MODEL.md sections 3-7, compiled once per study into flat arrays so
 * that one trial is a pure function of its draw vector:
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
import { compileDist, type CompiledDist } from "./distributions";
import { identity, invert, mat3, mul, mulTB, type Mat3 } from "./mat3";
import { rotVec, rotZ, tiltToSlope } from "./rotation";
import { buildAttitudes, type Attitudes, headingSweep } from "./heading";
import { atan2To, sinCosTo, tanTo } from "./fastmath";

// module-local: an imported binding costs a property load per use in the hot loop
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
  crossAxis: 0, crossAxisTotal: 1, axisMisalign: 2, tilt: 3, relRot: 4, headingMax: 5, headingRms: 6,
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
  heading: { accel: number; mag: number; attitudes: Attitudes } | null;
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
  let sx = 0, sy = 0, sxx = 0, syy = 0, sxy = 0;
  for (const p of pts) {
    sx += p.x; sy += p.y; sxx += p.x * p.x; syy += p.y * p.y; sxy += p.x * p.y;
  }
  const N = new Float64Array([n, sx, sy, sx, sxx, sxy, sy, sxy, syy]);
  const Ni = new Float64Array(9);
  if (!invert(N, Ni)) throw new Error("support points are collinear");
  const pa = new Float64Array(n), pb = new Float64Array(n), pc = new Float64Array(n);
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

function metricCatalogue(stack: StackFile, study: Pick<StudyFile, "headingSensors" | "heading">, sensorsIdx?: Map<string, number>, elIdx?: Map<string, number>): MetricInfo[] {
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
        id: `${sensors[i].id}~${sensors[j].id}.relRotDeg`, kind: "relRot", signed: false, unit: "deg",
        a: sensorsIdx?.get(sensors[i].id) ?? i, b: sensorsIdx?.get(sensors[j].id) ?? j, row: 0,
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
    const dist = compileDist(tol);
    const stage = tol.stage ?? defaultStage;
    const offset = drawDist.length;
    for (let k = 0; k < count; k++) {
      drawDist.push(dist);
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
    d.tiltXOff = addSource(`${e.id}.tiltX`, e.tiltTol?.x, 1, st, "deg");
    d.tiltYOff = addSource(`${e.id}.tiltY`, e.tiltTol?.y, 1, st, "deg");
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
  const sensors: SensorInfo[] = sensorList.map((e) => ({ element: idx.get(e.id)!, id: e.id, kind: e.kind as SensorInfo["kind"], calOff: -1 }));
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
    const x = e.position?.x ?? 0, y = e.position?.y ?? 0;
    let kx = 0, ky = 0;
    if (parent >= 0) {
      const p = byId.get(e.parent!)!;
      const rd2 = (p.size.x / 2) ** 2 + (p.size.y / 2) ** 2;
      // z = w(1 − r²/Rd²): dz/dx = −2wx/Rd², w in um -> mm
      kx = (-2e-3 * x) / rd2;
      ky = (-2e-3 * y) / rd2;
    }
    const fit = d.nSup! > 0 ? planeFitRows(supportPoints(e)) : { pa: new Float64Array(0), pb: new Float64Array(0), pc: new Float64Array(0) };
    const Rnom = mat3();
    if (parent >= 0) mul(elements[parent].Rnom, rotZ((e.yawDeg ?? 0) * DEG, mat3()), Rnom);
    else identity(Rnom);
    elements[i] = {
      id: e.id,
      kind: e.kind,
      fileIndex: stack.elements.indexOf(e),
      parent,
      stage: elementStage(e),
      x, y,
      yaw: (e.yawDeg ?? 0) * DEG,
      cosYaw: Math.cos((e.yawDeg ?? 0) * DEG),
      sinYaw: Math.sin((e.yawDeg ?? 0) * DEG),
      size: e.size,
      bondThickness: (e.bondLine?.thicknessUm ?? 0) * 1e-3,
      kx, ky,
      bowOff: d.bowOff!,
      supOff: d.supOff!,
      nSup: d.nSup!,
      pa: fit.pa, pb: fit.pb, pc: fit.pc,
      tiltXOff: d.tiltXOff!, tiltYOff: d.tiltYOff!,
      dxOff: d.dxOff!, dyOff: d.dyOff!, yawOff: d.yawOff!,
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

/** Per-worker scratch space: one trial allocates nothing. */
export interface Scratch {
  R: Float64Array; // 9 per element, all sources
  Rk: Float64Array; // 9 per element, sources up to the calibration stage
  masked: Float64Array; // draws with the later stages at zero
  C: Float64Array; // 9 per sensor, C_eff after evaluate
  Ck: Float64Array;
  delta: Float64Array; // 9 per sensor, R·Rnomᵀ
  t1: Mat3; t2: Mat3; t3: Mat3; t4: Mat3;
  /** small results of the fast-math helpers (six axis tangents, a sine and cosine) */
  fm: Float64Array;
  metrics: Float64Array;
  headingErr: Float64Array; // deg, per attitude
}

export function createScratch(m: Model): Scratch {
  const nE = m.elements.length, nS = m.sensors.length;
  return {
    R: new Float64Array(9 * nE),
    Rk: new Float64Array(9 * nE),
    masked: new Float64Array(m.drawCount),
    C: new Float64Array(9 * nS),
    Ck: new Float64Array(9 * nS),
    delta: new Float64Array(9 * nS),
    t1: mat3(), t2: mat3(), t3: mat3(), t4: mat3(),
    fm: new Float64Array(8),
    metrics: new Float64Array(m.metrics.length),
    headingErr: new Float64Array(m.heading ? m.heading.attitudes.count : 0),
  };
}

/** R_e = R_parent · W · Rz(yaw + dYaw) · Bl · D for every element (MODEL.md section 3). */
export function orientations(m: Model, draws: Float64Array, R: Float64Array, s: Scratch): void {
  const els = m.elements;
  const W = s.t1, Z = s.t2, B = s.t3, T = s.t4;
  for (let i = 0; i < els.length; i++) {
    const e = els[i];
    const o = 9 * i;
    if (e.parent < 0) {
      for (let k = 0; k < 9; k++) R[o + k] = k % 4 === 0 ? 1 : 0;
      continue;
    }
    const p = els[e.parent];
    const w = p.bowOff >= 0 ? draws[p.bowOff] : 0;
    tiltToSlope(w * e.kx, w * e.ky, W);
    // Rz(yaw + dYaw) by angle addition: the deviation is small, the nominal yaw exact
    if (e.yawOff >= 0) {
      sinCosTo(draws[e.yawOff] * DEG, s.fm, 6);
      const sd = s.fm[6], cd = s.fm[7];
      const c = e.cosYaw * cd - e.sinYaw * sd, sn = e.sinYaw * cd + e.cosYaw * sd;
      Z[0] = c; Z[1] = -sn; Z[2] = 0; Z[3] = sn; Z[4] = c; Z[5] = 0; Z[6] = 0; Z[7] = 0; Z[8] = 1;
    } else rotZ(e.yaw, Z);
    mul(W, Z, T);
    if (e.supOff >= 0) {
      let b = 0, c = 0;
      for (let k = 0; k < e.nSup; k++) {
        const h = draws[e.supOff + k];
        b += e.pb[k] * h;
        c += e.pc[k] * h;
      }
      tiltToSlope(b, c, B);
      mul(T, B, T);
    }
    if (e.tiltXOff >= 0 || e.tiltYOff >= 0) {
      const tx = e.tiltXOff >= 0 ? draws[e.tiltXOff] * DEG : 0;
      const ty = e.tiltYOff >= 0 ? draws[e.tiltYOff] * DEG : 0;
      rotVec(tx, ty, 0, B);
      mul(T, B, T);
    }
    // R_e = R_parent · T, written into the flat array
    const po = 9 * e.parent;
    for (let r = 0; r < 3; r++) {
      const p0 = R[po + 3 * r], p1 = R[po + 3 * r + 1], p2 = R[po + 3 * r + 2];
      R[o + 3 * r] = p0 * T[0] + p1 * T[3] + p2 * T[6];
      R[o + 3 * r + 1] = p0 * T[1] + p1 * T[4] + p2 * T[7];
      R[o + 3 * r + 2] = p0 * T[2] + p1 * T[5] + p2 * T[8];
    }
  }
}

/** C = Rnom · U · Rᵀ of sensor si into out[9·si..] (MODEL.md section 4). */
function crossAxisMatrix(m: Model, si: number, draws: Float64Array, R: Float64Array, out: Float64Array, s: Scratch): void {
  const e = m.elements[m.sensors[si].element];
  const U = s.t1;
  if (e.axisOff >= 0) {
    const o = e.axisOff;
    const G = s.fm;
    tanTo(draws, o, DEG, 6, G, 0);
    const g1 = G[0], g2 = G[1], g3 = G[2], g4 = G[3], g5 = G[4], g6 = G[5];
    const nx = 1 / Math.sqrt(1 + g1 * g1 + g2 * g2);
    const ny = 1 / Math.sqrt(g3 * g3 + 1 + g4 * g4);
    const nz = 1 / Math.sqrt(g5 * g5 + g6 * g6 + 1);
    U[0] = nx; U[1] = g1 * nx; U[2] = g2 * nx;
    U[3] = g3 * ny; U[4] = ny; U[5] = g4 * ny;
    U[6] = g5 * nz; U[7] = g6 * nz; U[8] = nz;
  } else identity(U);
  mul(e.Rnom, U, s.t2);
  const Re = s.t3;
  const ro = 9 * m.sensors[si].element;
  for (let k = 0; k < 9; k++) Re[k] = R[ro + k];
  mulTB(s.t2, Re, s.t4);
  for (let k = 0; k < 9; k++) out[9 * si + k] = s.t4[k];
}

/**
 * One trial: fills s.metrics (MODEL.md section 7 order of model.metrics) and
 * s.headingErr (deg per attitude). Pure function of the draws.
 */
export function evaluateTrial(m: Model, draws: Float64Array, s: Scratch): void {
  orientations(m, draws, s.R, s);
  const nS = m.sensors.length;
  for (let si = 0; si < nS; si++) crossAxisMatrix(m, si, draws, s.R, s.C, s);

  if (m.calibrationRank >= 0) {
    const masked = s.masked;
    for (let k = 0; k < m.drawCount; k++) masked[k] = m.drawRank[k] <= m.calibrationRank ? draws[k] : 0;
    orientations(m, masked, s.Rk, s);
    for (let si = 0; si < nS; si++) {
      crossAxisMatrix(m, si, masked, s.Rk, s.Ck, s);
      // C_eff = (E · C_k)⁻¹ · C_total
      const sen = m.sensors[si];
      const E = s.t1, EC = s.t2, inv = s.t3, Ct = s.t4;
      if (sen.calOff >= 0) rotVec(draws[sen.calOff] * DEG, draws[sen.calOff + 1] * DEG, draws[sen.calOff + 2] * DEG, E);
      else identity(E);
      for (let k = 0; k < 9; k++) Ct[k] = s.Ck[9 * si + k];
      mul(E, Ct, EC);
      if (!invert(EC, inv)) identity(inv);
      for (let k = 0; k < 9; k++) Ct[k] = s.C[9 * si + k];
      mul(inv, Ct, EC);
      for (let k = 0; k < 9; k++) s.C[9 * si + k] = EC[k];
    }
  }

  // Δ = R·Rnomᵀ per sensor, for relative rotations
  for (let si = 0; si < nS; si++) {
    const e = m.elements[m.sensors[si].element];
    const o = 9 * m.sensors[si].element;
    const Rn = e.Rnom;
    for (let r = 0; r < 3; r++) {
      const a0 = s.R[o + 3 * r], a1 = s.R[o + 3 * r + 1], a2 = s.R[o + 3 * r + 2];
      s.delta[9 * si + 3 * r] = a0 * Rn[0] + a1 * Rn[1] + a2 * Rn[2];
      s.delta[9 * si + 3 * r + 1] = a0 * Rn[3] + a1 * Rn[4] + a2 * Rn[5];
      s.delta[9 * si + 3 * r + 2] = a0 * Rn[6] + a1 * Rn[7] + a2 * Rn[8];
    }
  }

  let hMax = 0, hRms = 0;
  if (m.heading) {
    const r = headingSweep(s.C, 9 * m.heading.accel, s.C, 9 * m.heading.mag, m.heading.attitudes, s.headingErr);
    hMax = r.maxAbs;
    hRms = r.rms;
  }

  const out = s.metrics;
  const C = s.C, R = s.R;
  const ms = m.metrics;
  for (let k = 0; k < ms.length; k++) {
    const mi = ms[k];
    switch (mi.code) {
      case 0: {
        const o = 9 * mi.a + 3 * mi.row;
        out[k] = (100 * C[o + mi.b]) / C[o + mi.row];
        break;
      }
      case 1:
      case 2: {
        const o = 9 * mi.a + 3 * mi.row;
        const i = mi.row, j = i === 2 ? 0 : i + 1, l = i === 0 ? 2 : i - 1;
        const off = Math.sqrt(C[o + j] * C[o + j] + C[o + l] * C[o + l]);
        if (mi.code === 1) out[k] = (100 * off) / Math.abs(C[o + i]);
        else {
          atan2To(off, C[o + i], out, k);
          out[k] /= DEG;
        }
        break;
      }
      case 3: {
        const o = 9 * mi.a;
        const Rn = m.elements[mi.a].Rnom;
        // angle between R·ez and Rnom·ez
        const ax = R[o + 2], ay = R[o + 5], az = R[o + 8], bx = Rn[2], by = Rn[5], bz = Rn[8];
        const cx = ay * bz - az * by, cy = az * bx - ax * bz, cz = ax * by - ay * bx;
        atan2To(Math.sqrt(cx * cx + cy * cy + cz * cz), ax * bx + ay * by + az * bz, out, k);
        out[k] /= DEG;
        break;
      }
      case 4:
        relativeAngleTo(s.delta, 9 * mi.a, 9 * mi.b, out, k);
        out[k] /= DEG;
        break;
      case 5:
        out[k] = hMax;
        break;
      case 6:
        out[k] = hRms;
        break;
    }
  }
}

/** out[i] = rotation angle of aᵀ·b for a, b at offsets of d (see rotation.relativeAngle). */
function relativeAngleTo(d: Float64Array, oa: number, ob: number, out: Float64Array, i: number): void {
  let tr = 0;
  for (let k = 0; k < 9; k++) tr += d[oa + k] * d[ob + k];
  // M_ij = Σ_r a_ri b_rj
  const m21 = d[oa + 2] * d[ob + 1] + d[oa + 5] * d[ob + 4] + d[oa + 8] * d[ob + 7];
  const m12 = d[oa + 1] * d[ob + 2] + d[oa + 4] * d[ob + 5] + d[oa + 7] * d[ob + 8];
  const m02 = d[oa] * d[ob + 2] + d[oa + 3] * d[ob + 5] + d[oa + 6] * d[ob + 8];
  const m20 = d[oa + 2] * d[ob] + d[oa + 5] * d[ob + 3] + d[oa + 8] * d[ob + 6];
  const m10 = d[oa + 1] * d[ob] + d[oa + 4] * d[ob + 3] + d[oa + 7] * d[ob + 6];
  const m01 = d[oa] * d[ob + 1] + d[oa + 3] * d[ob + 4] + d[oa + 6] * d[ob + 7];
  const sx = m21 - m12, sy = m02 - m20, sz = m10 - m01;
  atan2To(Math.sqrt(sx * sx + sy * sy + sz * sz), tr - 1, out, i);
}

/** Draw vector at the means of every source (the point the linearised model uses). */
export function meanDraws(m: Model, out: Float64Array = new Float64Array(m.drawCount)): Float64Array {
  for (let k = 0; k < m.drawCount; k++) out[k] = m.drawDist[k].mean;
  return out;
}

/** Pose of every element for one draw vector: R, nominal R, position with placement offsets (mm). */
export interface ElementPose {
  id: string;
  kind: string;
  R: number[];
  Rnom: number[];
  position: [number, number, number];
  positionNominal: [number, number, number];
}

export function poses(m: Model, draws: Float64Array): ElementPose[] {
  const s = createScratch(m);
  orientations(m, draws, s.R, s);
  const zero = new Float64Array(m.drawCount);
  const pos = new Float64Array(3 * m.elements.length);
  const posN = new Float64Array(3 * m.elements.length);
  const place = (d: Float64Array, Rs: Float64Array, P: Float64Array) => {
    m.elements.forEach((e, i) => {
      if (e.parent < 0) {
        P[3 * i] = 0; P[3 * i + 1] = 0; P[3 * i + 2] = -e.size.z;
        return;
      }
      const p = m.elements[e.parent];
      const w = p.bowOff >= 0 ? d[p.bowOff] * 1e-3 : 0;
      const rd2 = (p.size.x / 2) ** 2 + (p.size.y / 2) ** 2;
      let a = 0;
      for (let k = 0; k < e.nSup; k++) a += e.pa[k] * d[e.supOff + k];
      const lx = e.x + (e.dxOff >= 0 ? d[e.dxOff] * 1e-3 : 0);
      const ly = e.y + (e.dyOff >= 0 ? d[e.dyOff] * 1e-3 : 0);
      const lz = p.size.z + w * (1 - (e.x * e.x + e.y * e.y) / rd2) + e.bondThickness + a;
      const o = 9 * e.parent;
      for (let r = 0; r < 3; r++) P[3 * i + r] = P[3 * e.parent + r] + Rs[o + 3 * r] * lx + Rs[o + 3 * r + 1] * ly + Rs[o + 3 * r + 2] * lz;
    });
  };
  place(draws, s.R, pos);
  const sN = createScratch(m);
  orientations(m, zero, sN.R, sN);
  place(zero, sN.R, posN);
  // report in file order
  const list = m.elements.map((e, i) => ({
    fileIndex: e.fileIndex,
    pose: {
      id: e.id,
      kind: e.kind,
      R: Array.from(s.R.subarray(9 * i, 9 * i + 9)),
      Rnom: Array.from(e.Rnom),
      position: [pos[3 * i], pos[3 * i + 1], pos[3 * i + 2]] as [number, number, number],
      positionNominal: [posN[3 * i], posN[3 * i + 1], posN[3 * i + 2]] as [number, number, number],
    },
  }));
  list.sort((a, b) => a.fileIndex - b.fileIndex);
  return list.map((l) => l.pose);
}

