/**
 * Folds block partials in block order (buffering the ones that arrive early), and on
 * that ordered stream keeps: moments, regression sums, the convergence record of the
 * tracked metrics and the adaptive-stopping runs of JCGM 101 section 7.9.
 */
import type { BlockPartial, Plan } from "./accumulate";
import { metricStore } from "./accumulate";
import type { LogHistogram } from "./histogram";
import type { Model } from "./compile";
import { BLOCK_SIZE } from "./random";

export interface ConvergencePoint {
  trials: number;
  mean: number;
  std: number;
  p95: number;
  p99: number;
  p9973: number;
  /** percentile at the metric's coverage p (its yield target, or the adaptive coverage) */
  pAtCoverage: number;
  /** fraction with |v| <= limit, for requirement metrics */
  yield: number | null;
}

export interface AdaptiveConfig {
  significantDigits: 1 | 2;
  /** trials per run (M of JCGM 101 rounded up to whole blocks) */
  runTrials: number;
  runBlocks: number;
  maxRuns: number;
  /** M before rounding: max(100/(1−p), 10^4) */
  M: number;
}

export interface AdaptiveRun {
  mean: number[];
  std: number[];
  q: number[];
}

class Welford {
  n = 0;
  mean = 0;
  m2 = 0;
  add(v: number) {
    this.n++;
    const d = v - this.mean;
    this.mean += d / this.n;
    this.m2 += d * (v - this.mean);
  }
  std() {
    return this.n > 1 ? Math.sqrt(this.m2 / (this.n - 1)) : 0;
  }
}

interface TrackState {
  hist: LogHistogram;
  minAbs: number;
  maxAbs: number;
  pass: number;
  w: Welford;
}

function newTrack(): TrackState {
  return { hist: metricStore(), minAbs: Infinity, maxAbs: 0, pass: 0, w: new Welford() };
}

function addTrack(st: TrackState, v: number, limit: number): void {
  const a = Math.abs(v);
  st.hist.add(v);
  if (a < st.minAbs) st.minAbs = a;
  if (a > st.maxAbs) st.maxAbs = a;
  if (a <= limit) st.pass++;
  st.w.add(v);
}

/** |v| percentiles of a tracked metric, from one pass over its buckets. */
function trackPercentiles(t: TrackState, qs: number[]): number[] {
  return t.hist.knownExtremes(t.minAbs, t.maxAbs).quantilesAbs(qs, t.minAbs, t.maxAbs);
}

export class Coordinator {
  readonly model: Model;
  readonly plan: Plan;
  /** blocks folded so far (a prefix 0..merged-1) */
  merged = 0;
  trials = 0;
  readonly count: Float64Array;
  readonly mean: Float64Array;
  readonly m2: Float64Array;
  xtxLin: Float64Array | null = null;
  xtxSq: Float64Array | null = null;
  xty: Float64Array | null = null;
  readonly convergence: ConvergencePoint[][];
  readonly adaptive: AdaptiveConfig | null;
  readonly runs: AdaptiveRun[] = [];
  private pending = new Map<number, BlockPartial>();
  private prefix: TrackState[];
  private run: TrackState[];
  private lastCheckpoint = 0;

  constructor(model: Model, plan: Plan, adaptive: AdaptiveConfig | null) {
    this.model = model;
    this.plan = plan;
    this.adaptive = adaptive;
    const nM = model.metrics.length;
    this.count = new Float64Array(nM);
    this.mean = new Float64Array(nM);
    this.m2 = new Float64Array(nM);
    this.prefix = plan.tracked.map(newTrack);
    this.run = plan.tracked.map(newTrack);
    this.convergence = plan.tracked.map(() => []);
  }

  /**
   * Accept a partial in any order; folds every partial that is now next in line. True when the
   * folded trials grew, false when the block waits for an earlier one (no progress to report).
   */
  add(p: BlockPartial): boolean {
    if (p.block < this.merged || this.pending.has(p.block)) throw new Error(`block ${p.block} delivered twice`);
    this.pending.set(p.block, p);
    const before = this.merged;
    for (let next = this.pending.get(this.merged); next; next = this.pending.get(this.merged)) {
      this.pending.delete(this.merged);
      this.fold(next);
    }
    return this.merged > before;
  }

  private fold(p: BlockPartial): void {
    const nM = this.model.metrics.length;
    // Chan et al.: combine (n_a, mean_a, M2_a) with the block's (n_b, mean_b, M2_b)
    for (let k = 0; k < nM; k++) {
      const na = this.count[k],
        nb = p.n;
      if (nb === 0) continue;
      const mb = p.moments[2 * k],
        m2b = p.moments[2 * k + 1];
      const n = na + nb;
      const d = mb - this.mean[k];
      this.mean[k] += (d * nb) / n;
      this.m2[k] += m2b + (d * d * na * nb) / n;
      this.count[k] = n;
    }
    const addInto = (acc: Float64Array | null, x: Float64Array | null): Float64Array | null => {
      if (!x) return acc;
      if (!acc) return x.slice();
      for (let i = 0; i < x.length; i++) acc[i] += x[i];
      return acc;
    };
    this.xtxLin = addInto(this.xtxLin, p.xtxLin);
    this.xtxSq = addInto(this.xtxSq, p.xtxSq);
    this.xty = addInto(this.xty, p.xty);

    const tr = this.plan.tracked;
    const nT = tr.length;
    for (let i = 0; i < p.n; i++) {
      for (let t = 0; t < nT; t++) {
        const v = p.tracked[i * nT + t];
        addTrack(this.prefix[t], v, tr[t].limit);
        addTrack(this.run[t], v, tr[t].limit);
      }
    }
    this.merged++;
    this.trials += p.n;
    // checkpoints at 1, 2, 4, 8 ... blocks
    if ((this.merged & (this.merged - 1)) === 0) this.checkpoint();
    if (this.adaptive && this.merged % this.adaptive.runBlocks === 0) this.closeRun();
  }

  checkpoint(): void {
    if (this.lastCheckpoint === this.trials || this.trials === 0) return;
    this.lastCheckpoint = this.trials;
    this.plan.tracked.forEach((t, i) => {
      const st = this.prefix[i];
      const [p95, p99, p9973, pAtCoverage] = trackPercentiles(st, [0.95, 0.99, 0.9973, t.p]);
      this.convergence[i].push({
        trials: this.trials,
        mean: st.w.mean,
        std: st.w.std(),
        p95,
        p99,
        p9973,
        pAtCoverage,
        yield: Number.isNaN(t.limit) ? null : st.pass / st.w.n,
      });
    });
  }

  private closeRun(): void {
    const r: AdaptiveRun = { mean: [], std: [], q: [] };
    this.plan.tracked.forEach((t, i) => {
      const st = this.run[i];
      r.mean.push(st.w.mean);
      r.std.push(st.w.std());
      r.q.push(trackPercentiles(st, [t.p])[0]);
    });
    this.runs.push(r);
    this.run = this.plan.tracked.map(newTrack);
  }

  /** All trials of the study are folded (fixed-size studies), or no block is missing. */
  get pendingCount(): number {
    return this.pending.size;
  }

  /**
   * JCGM 101 7.9.4 f)-i): with h >= 2 runs, the standard deviation of the run averages
   * s = sqrt(Σ(x_r − x̄)² / (h(h−1))) of the mean, standard deviation and coverage
   * percentile of every tracked metric must satisfy 2s <= δ, δ = ½·10^l from u(y) =
   * c·10^l with significantDigits digits in c (u(y) from all trials so far).
   */
  adaptiveStatus(): { stable: boolean; details: { metric: string; delta: number; sMean: number; sStd: number; sQ: number }[] } {
    const h = this.runs.length;
    const details: { metric: string; delta: number; sMean: number; sStd: number; sQ: number }[] = [];
    if (!this.adaptive || h < 2) return { stable: false, details };
    let stable = true;
    const sdev = (xs: number[]) => {
      const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
      return Math.sqrt(xs.reduce((a, b) => a + (b - mean) ** 2, 0) / (xs.length * (xs.length - 1)));
    };
    this.plan.tracked.forEach((t, i) => {
      const k = t.metric;
      const u = this.count[k] > 1 ? Math.sqrt(this.m2[k] / (this.count[k] - 1)) : 0;
      const delta = numericalTolerance(u, this.adaptive!.significantDigits);
      const sMean = sdev(this.runs.map((r) => r.mean[i]));
      const sStd = sdev(this.runs.map((r) => r.std[i]));
      const sQ = sdev(this.runs.map((r) => r.q[i]));
      details.push({ metric: this.model.metrics[k].id, delta, sMean, sStd, sQ });
      if (!(2 * sMean <= delta && 2 * sStd <= delta && 2 * sQ <= delta)) stable = false;
    });
    return { stable, details };
  }
}

/** δ = ½·10^l where u = c·10^l and c has `digits` significant digits (JCGM 101 7.9.2). */
export function numericalTolerance(u: number, digits: 1 | 2): number {
  if (!(u > 0) || !Number.isFinite(u)) return 0;
  const l = Math.floor(Math.log10(u)) - (digits - 1);
  return 0.5 * 10 ** l;
}

/** Runs of M = max(100/(1−p), 10^4) trials, rounded up to whole blocks. */
export function adaptiveConfig(pMax: number, significantDigits: 1 | 2, maxTrials: number): AdaptiveConfig {
  const M = Math.max(Math.ceil(100 / (1 - pMax) - 1e-9), 10_000);
  const runBlocks = Math.ceil(M / BLOCK_SIZE);
  const runTrials = runBlocks * BLOCK_SIZE;
  const maxRuns = Math.max(2, Math.floor(maxTrials / runTrials));
  return { significantDigits, runTrials, runBlocks, maxRuns, M };
}
