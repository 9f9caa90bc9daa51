/**
 * Accumulating trials with bounded memory, mergeable across threads, and the same
 * numbers for any thread count.
 *
 * Two kinds of state:
 * - WorkerState (one per thread, any set of blocks): integer counts only (percentile
 *   histograms, yield counts, heading-envelope histograms), exact extremes and the
 *   worst trials (ties broken by trial index). Adding integers is exact, so these merge
 *   to the same totals in any order.
 * - BlockPartial (one per block, small): the floating-point sums (moments by Welford,
 *   regression cross-products) and the raw values of the few tracked metrics. The
 *   coordinator folds them strictly in block order, so float rounding is the same
 *   whatever thread ran which block.
 */
import { LogHistogram } from "./histogram";
import type { Model } from "./compile";
import { createScratch, evaluateTrial, meanDraws } from "./trial";
import { BLOCK_SIZE } from "./random";
import { blockSampler, blockTrials, type SamplingMode } from "./sampling";

/**
 * Percentile stores: metrics 2^-8 of the value over 2^-24..2^16; heading envelope
 * 2^-4 over 2^-14..2^8 deg (a plot, and small enough that the 180 stores of a sweep stay
 * in cache).
 */
export const METRIC_BITS = 8;
export const ENVELOPE_BITS = 4;
const METRIC_LOW_EXP = -24;
const ENVELOPE_LOW_EXP = -14;
export const metricStore = (counts?: Uint32Array) => new LogHistogram(METRIC_BITS, METRIC_LOW_EXP, 40, counts);
export const envelopeStore = (counts?: Uint32Array) => new LogHistogram(ENVELOPE_BITS, ENVELOPE_LOW_EXP, 22, counts);
const METRIC_LEN = 2 * metricStore(new Uint32Array(0)).perSign;
// bit layout of metricStore's buckets, for the inlined index in runBlock
const METRIC_SHIFT = 20 - METRIC_BITS;
const METRIC_BASE = (1023 + METRIC_LOW_EXP) << METRIC_BITS;
const F64 = new Float64Array(1);
const U32 = new Uint32Array(F64.buffer);
const HI_WORD = new Uint8Array(new Uint32Array([1]).buffer)[0] === 1 ? 1 : 0;
const ENVELOPE_LEN = 2 * envelopeStore(new Uint32Array(0)).perSign;
const ENVELOPE_SHIFT = 20 - ENVELOPE_BITS;
const ENVELOPE_BASE = (1023 + ENVELOPE_LOW_EXP) << ENVELOPE_BITS;
/** 1/(i+1) for the i-th trial of a block (Welford's step) */
const INV_COUNT = Float64Array.from({ length: BLOCK_SIZE }, (_, i) => 1 / (i + 1));

/**
 * The regression sums use the first REG_TRIALS_PER_BLOCK trials of every block (1/16 of
 * the sample): the cross-products cost p² per trial, and 1/16 of 10^6 trials (62,000)
 * already gives each share to about ±0.005.
 */
export const REG_TRIALS_PER_BLOCK = 256;

/**
 * The heading envelope (p5, p50, p95 per attitude, a plot) is filled from the first
 * ENV_TRIALS_PER_BLOCK trials of every block (1/4 of the sample): 180 stores per trial
 * were a third of the trial loop, and a quarter of the trials pins those percentiles to
 * a small fraction of the plot's line width (1,024 trials per block, 250,000 at 10^6).
 */
export const ENV_TRIALS_PER_BLOCK = 1024;

export interface TrackedSpec {
  metric: number; // index into model.metrics
  /** |v| limit of a requirement, or NaN */
  limit: number;
  /** coverage probability for adaptive stopping / convergence */
  p: number;
}

export interface RegressionSpec {
  /** draw indices used as regressors (non-degenerate draws) */
  cols: Int32Array;
  /** regressed metrics and their design: "linear" (signed metrics) or "squared" (magnitudes) */
  metrics: { metric: number; design: "linear" | "squared" }[];
  useLinear: boolean;
  useSquared: boolean;
}

export interface Plan {
  mode: SamplingMode;
  seed: number;
  trials: number; // maximum trials (adaptive) or exactly the trials
  blocks: number;
  requirements: { metric: number; max: number; yield: number; id: string }[];
  tracked: TrackedSpec[];
  regression: RegressionSpec;
  worstK: number;
}

export interface WorkerState {
  n: number;
  nMetrics: number;
  hist: Uint32Array; // nMetrics × 2·perSign
  minAbs: Float64Array;
  maxAbs: Float64Array;
  min: Float64Array;
  max: Float64Array;
  pass: Float64Array; // per requirement
  nAtt: number;
  env: Uint32Array; // nAtt × 2·perSignEnv
  envMin: Float64Array;
  envMax: Float64Array;
  worstK: number;
  worstVal: Float64Array; // nMetrics × K, signed values, sorted by |v| descending
  worstTrial: Float64Array; // nMetrics × K, -1 = empty
}

export interface BlockPartial {
  block: number;
  n: number;
  /** per metric: mean, M2 (Welford within the block) */
  moments: Float64Array;
  /** n × tracked.length raw values, trial-major */
  tracked: Float64Array;
  /** upper triangles of Σ z zᵀ (z = [1, regressors]) for the linear and squared designs */
  xtxLin: Float64Array | null;
  xtxSq: Float64Array | null;
  /** per regressed metric: Σ z·y (length p+1) then Σ y² */
  xty: Float64Array | null;
}

/** Metric k's store, its occupied buckets known from the state's extremes (no scan). */
export function metricHistogram(st: WorkerState, k: number): LogHistogram {
  return metricStore(st.hist.subarray(k * METRIC_LEN, (k + 1) * METRIC_LEN)).knownExtremes(st.minAbs[k], st.maxAbs[k]);
}

export function envelopeHistogram(st: WorkerState, k: number): LogHistogram {
  return envelopeStore(st.env.subarray(k * ENVELOPE_LEN, (k + 1) * ENVELOPE_LEN));
}

export function createWorkerState(m: Model, plan: Plan): WorkerState {
  const nM = m.metrics.length;
  const hLen = METRIC_LEN;
  const eLen = ENVELOPE_LEN;
  const nAtt = m.heading ? m.heading.attitudes.count : 0;
  const K = plan.worstK;
  return {
    n: 0,
    nMetrics: nM,
    hist: new Uint32Array(nM * hLen),
    minAbs: new Float64Array(nM).fill(Infinity),
    maxAbs: new Float64Array(nM).fill(0),
    min: new Float64Array(nM).fill(Infinity),
    max: new Float64Array(nM).fill(-Infinity),
    pass: new Float64Array(plan.requirements.length),
    nAtt,
    env: new Uint32Array(nAtt * eLen),
    envMin: new Float64Array(nAtt).fill(Infinity),
    envMax: new Float64Array(nAtt).fill(-Infinity),
    worstK: K,
    worstVal: new Float64Array(nM * K),
    worstTrial: new Float64Array(nM * K).fill(-1),
  };
}

function insertWorst(st: WorkerState, k: number, v: number, trial: number): void {
  const K = st.worstK;
  if (K === 0) return;
  const o = k * K;
  const a = Math.abs(v);
  const wv = st.worstVal,
    wt = st.worstTrial;
  // last slot is the smallest kept; order: |v| descending, then trial ascending
  const lastT = wt[o + K - 1];
  if (lastT >= 0) {
    const la = Math.abs(wv[o + K - 1]);
    if (a < la || (a === la && trial > lastT)) return;
  }
  let i = K - 1;
  while (i > 0) {
    const pt = wt[o + i - 1];
    if (pt >= 0) {
      const pa = Math.abs(wv[o + i - 1]);
      if (pa > a || (pa === a && pt < trial)) break;
    }
    wv[o + i] = wv[o + i - 1];
    wt[o + i] = wt[o + i - 1];
    i--;
  }
  wv[o + i] = v;
  wt[o + i] = trial;
}

/** Run one block of trials into the worker state; returns the block's float partial. */
export function runBlock(m: Model, plan: Plan, st: WorkerState, block: number): BlockPartial {
  const n = blockTrials(block, plan.trials);
  const nM = m.metrics.length;
  const nT = plan.tracked.length;
  const reg = plan.regression;
  const zLen = reg.cols.length + 1;
  const triLen = (zLen * (zLen + 1)) / 2;
  const nR = reg.metrics.length;
  const sums = new RegressionSums(
    reg.cols,
    Float64Array.from(reg.cols, (c) => m.drawDist[c].mean),
    reg.metrics,
    reg.useLinear ? new Float64Array(triLen) : null,
    reg.useSquared ? new Float64Array(triLen) : null,
    nR > 0 ? new Float64Array(nR * (zLen + 1)) : null,
    zLen,
  );
  const tracked = new Float64Array(n * nT);
  // the block's values, trial-major: metrics, and every attitude's heading error of the
  // envelope's trials; counted metric by metric (attitude by attitude) after the trial loop
  const nEnv = st.nAtt > 0 ? Math.min(n, ENV_TRIALS_PER_BLOCK) : 0;
  const blockVals = blockBuffer(0, n * nM);
  const envVals = blockBuffer(1, nEnv * st.nAtt);
  const sampler = blockSampler(m, plan.mode, plan.seed, block, n);
  // The loop and the counting are functions of their own: V8 optimises each apart, and code
  // first reached after a loop (no type feedback yet) no longer throws the loop's optimised
  // code away at the end of the first blocks.
  trialLoop(m, plan, st, sampler, n, blockVals, envVals, nEnv, tracked, sums);
  const moments = new Float64Array(2 * nM);
  countMetrics(st, moments, blockVals, n, block * BLOCK_SIZE);
  countEnvelope(st, envVals, nEnv);
  st.n += n;
  return { block, n, moments, tracked, xtxLin: sums.xtxLin, xtxSq: sums.xtxSq, xty: sums.xty };
}

/** Whether this thread has primed the screened sweep yet (see trialLoop). */
let screenedSeen = false;
const PRIME_TRIALS = 12;

/**
 * The regression's sums of a block (see BlockPartial) and their scratch. A class, not an
 * object literal: V8 builds a literal made anew per block from a boilerplate on its second
 * run, whose fields' recorded types differ from the first object's, and throws away every
 * optimised function that read the first (the trial loop among them) at the second block.
 */
class RegressionSums {
  readonly zLin: Float64Array;
  readonly zSq: Float64Array;
  constructor(
    readonly cols: Int32Array,
    readonly mu: Float64Array,
    readonly specs: RegressionSpec["metrics"],
    readonly xtxLin: Float64Array | null,
    readonly xtxSq: Float64Array | null,
    readonly xty: Float64Array | null,
    zLen: number,
  ) {
    this.zLin = new Float64Array(zLen);
    this.zSq = new Float64Array(zLen);
  }
}

/**
 * The trials of a block: each one's metrics into blockVals and its heading errors into
 * envVals (trial-major), its tracked values, requirement passes and (the first
 * REG_TRIALS_PER_BLOCK) regression sums.
 */
function trialLoop(
  m: Model,
  plan: Plan,
  st: WorkerState,
  sampler: ReturnType<typeof blockSampler>,
  n: number,
  blockVals: Float64Array,
  envVals: Float64Array,
  nEnv: number,
  tracked: Float64Array,
  sums: RegressionSums,
): void {
  const s = createScratch(m);
  const draws = new Float64Array(m.drawCount);
  const nM = m.metrics.length;
  const nT = plan.tracked.length;
  const trackedIdx = Int32Array.from(plan.tracked, (t) => t.metric);
  const reqs = plan.requirements;
  const pass = st.pass;
  const nAtt = st.nAtt;
  const regTrials = sums.specs.length > 0 ? REG_TRIALS_PER_BLOCK : 0;
  if (!screenedSeen && m.heading?.screened && n > ENV_TRIALS_PER_BLOCK) {
    // A thread's first block: a few screened trials at the sources' means before the loop
    // (their figures are overwritten by the first real trial). The block's first
    // ENV_TRIALS_PER_BLOCK trials take the per-attitude sweep, so V8 would compile the loop
    // before it had seen the screened one and throw that code away at trial 1,024; a dozen
    // calls, because V8 records type feedback only from a function's first few calls on.
    // Measured on a fresh thread: the first three blocks 260-310 ms instead of 300-380 ms.
    screenedSeen = true;
    s.perAttitude = false;
    const mean = meanDraws(m);
    for (let k = 0; k < PRIME_TRIALS; k++) evaluateTrial(m, mean, s);
  }
  for (let i = 0; i < n; i++) {
    sampler.next(draws);
    // the envelope needs every attitude's error; the other trials may take the screened sweep
    s.perAttitude = i < ENV_TRIALS_PER_BLOCK;
    evaluateTrial(m, draws, s);
    const vals = s.metrics;
    blockVals.set(vals, i * nM);
    if (i < nEnv) envVals.set(s.headingErr, i * nAtt);
    for (let t = 0; t < nT; t++) tracked[i * nT + t] = vals[trackedIdx[t]];
    for (let r = 0; r < reqs.length; r++) {
      const v = vals[reqs[r].metric];
      if ((v < 0 ? -v : v) <= reqs[r].max) pass[r]++;
    }
    if (i < regTrials) addRegression(sums, draws, vals);
  }
}

/** One trial into the regression sums: z = [1, regressors] (linear) or [1, (x − μ)²] (squared). */
function addRegression(g: RegressionSums, draws: Float64Array, vals: Float64Array): void {
  const p = g.cols.length;
  const zLen = p + 1;
  const zLin = g.zLin,
    zSq = g.zSq,
    xty = g.xty!;
  zLin[0] = 1;
  zSq[0] = 1;
  for (let j = 0; j < p; j++) {
    const x = draws[g.cols[j]];
    zLin[j + 1] = x;
    const dx = x - g.mu[j];
    zSq[j + 1] = dx * dx;
  }
  if (g.xtxLin) accumulateTri(g.xtxLin, zLin, zLen);
  if (g.xtxSq) accumulateTri(g.xtxSq, zSq, zLen);
  for (let r = 0; r < g.specs.length; r++) {
    const spec = g.specs[r];
    const z = spec.design === "linear" ? zLin : zSq;
    const v = vals[spec.metric];
    const y = spec.design === "linear" ? v : v * v;
    const o = r * (zLen + 1);
    for (let j = 0; j < zLen; j++) xty[o + j] += z[j] * y;
    xty[o + zLen] += y * y;
  }
}

/**
 * Buffers of the block's values, kept between blocks (a thread runs one block at a time):
 * 1.5 MB each for the reference study, too much garbage to make per block.
 */
const blockBuffers: Float64Array[] = [new Float64Array(0), new Float64Array(0)];
function blockBuffer(which: 0 | 1, length: number): Float64Array {
  if (blockBuffers[which].length < length) blockBuffers[which] = new Float64Array(length);
  return blockBuffers[which];
}

/** |v| a value must reach to enter metric k's worst list (−1 while it has room, ∞ if none kept). */
function worstThreshold(st: WorkerState, k: number): number {
  const K = st.worstK;
  if (K === 0) return Infinity;
  return st.worstTrial[k * K + K - 1] >= 0 ? Math.abs(st.worstVal[k * K + K - 1]) : -1;
}

/**
 * The block's n trials, their metrics trial-major in vals, into the histograms, moments
 * (Welford within the block: mean and M2 per metric), extremes and worst lists; metric by
 * metric so that each histogram stays in cache while its values go in. Same arithmetic in
 * the same order of trials as counting trial by trial.
 */
function countMetrics(st: WorkerState, moments: Float64Array, vals: Float64Array, n: number, firstTrial: number): void {
  const nM = st.nMetrics;
  const hist = st.hist;
  const perSign = METRIC_LEN / 2;
  for (let k = 0; k < nM; k++) {
    let mean = 0,
      m2 = 0,
      lo = st.minAbs[k],
      hiA = st.maxAbs[k],
      mn = st.min[k],
      mx = st.max[k],
      // |v| a value must reach to enter the worst list (−1 while the list has room)
      th = worstThreshold(st, k);
    const ho = k * METRIC_LEN;
    for (let i = 0, o = k; i < n; i++, o += nM) {
      const v = vals[o];
      const d = v - mean;
      const nm = mean + d * INV_COUNT[i];
      mean = nm;
      m2 += d * (v - nm);
      // metricStore().index(v), inlined
      F64[0] = v;
      const hi = U32[HI_WORD];
      let b = ((hi & 0x7fffffff) >>> METRIC_SHIFT) - METRIC_BASE + 1;
      if (b < 1) b = 0;
      else if (b > perSign - 2) b = perSign - 1;
      hist[ho + (hi >>> 31) * perSign + b]++;
      const a = Math.abs(v);
      if (a < lo) lo = a;
      if (a > hiA) hiA = a;
      if (v < mn) mn = v;
      if (v > mx) mx = v;
      if (a >= th) {
        insertWorst(st, k, v, firstTrial + i);
        th = worstThreshold(st, k);
      }
    }
    moments[2 * k] = mean;
    moments[2 * k + 1] = m2;
    st.minAbs[k] = lo;
    st.maxAbs[k] = hiA;
    st.min[k] = mn;
    st.max[k] = mx;
  }
}

/** The first `rows` rows of vals (every attitude's heading error, trial-major) into the envelope, attitude by attitude. */
function countEnvelope(st: WorkerState, vals: Float64Array, rows: number): void {
  const nAtt = st.nAtt;
  const env = st.env;
  const perSign = ENVELOPE_LEN / 2;
  for (let k = 0; k < nAtt; k++) {
    let lo = st.envMin[k],
      hiE = st.envMax[k];
    const eo = k * ENVELOPE_LEN;
    for (let i = 0, o = k; i < rows; i++, o += nAtt) {
      const e = vals[o];
      // envelopeStore().index(e), inlined
      F64[0] = e;
      const hi = U32[HI_WORD];
      let b = ((hi & 0x7fffffff) >>> ENVELOPE_SHIFT) - ENVELOPE_BASE + 1;
      if (b < 1) b = 0;
      else if (b > perSign - 2) b = perSign - 1;
      env[eo + (hi >>> 31) * perSign + b]++;
      if (e < lo) lo = e;
      if (e > hiE) hiE = e;
    }
    st.envMin[k] = lo;
    st.envMax[k] = hiE;
  }
}

function accumulateTri(tri: Float64Array, z: Float64Array, len: number): void {
  let o = 0;
  for (let a = 0; a < len; a++) {
    const za = z[a];
    for (let b = a; b < len; b++) tri[o++] += za * z[b];
  }
}

/**
 * Merge worker states into the first, which is returned (exact: integer counts, extremes,
 * worst lists); the others are left as they were. Callers hand over states they own (each
 * engine thread's, received once). A metric's counts are added over the buckets its extremes
 * say are occupied (histogram.ts knownExtremes), a few octaves of the forty.
 */
export function mergeWorkerStates(states: WorkerState[]): WorkerState {
  const [out, ...rest] = states;
  const perSign = METRIC_LEN / 2;
  for (const s of rest) {
    out.n += s.n;
    for (let k = 0; k < out.nMetrics; k++) {
      const o = k * METRIC_LEN;
      const [first, last] = metricHistogram(s, k).occupied();
      for (let b = first; b <= last; b++) {
        out.hist[o + b] += s.hist[o + b];
        out.hist[o + perSign + b] += s.hist[o + perSign + b];
      }
    }
    for (let i = 0; i < out.env.length; i++) out.env[i] += s.env[i];
    for (let k = 0; k < out.nMetrics; k++) {
      out.minAbs[k] = Math.min(out.minAbs[k], s.minAbs[k]);
      out.maxAbs[k] = Math.max(out.maxAbs[k], s.maxAbs[k]);
      out.min[k] = Math.min(out.min[k], s.min[k]);
      out.max[k] = Math.max(out.max[k], s.max[k]);
      for (let j = 0; j < s.worstK; j++) {
        const t = s.worstTrial[k * s.worstK + j];
        if (t >= 0) insertWorst(out, k, s.worstVal[k * s.worstK + j], t);
      }
    }
    for (let r = 0; r < out.pass.length; r++) out.pass[r] += s.pass[r];
    for (let k = 0; k < out.nAtt; k++) {
      out.envMin[k] = Math.min(out.envMin[k], s.envMin[k]);
      out.envMax[k] = Math.max(out.envMax[k], s.envMax[k]);
    }
  }
  return out;
}

/** Typed arrays of a worker state, for a zero-copy postMessage transfer list. */
export function transferablesOf(x: WorkerState | BlockPartial): ArrayBuffer[] {
  const out: ArrayBuffer[] = [];
  for (const v of Object.values(x)) if (ArrayBuffer.isView(v)) out.push(v.buffer as ArrayBuffer);
  return out;
}
