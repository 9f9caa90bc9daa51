// runBlock counts a block's values metric by metric after its trial loop, with the
// histogram index inlined. This holds it to the plain definition: every trial's values added
// one at a time through LogHistogram.add, Welford's update, running extremes, the worst
// trials sorted by |value| (ties by trial index) and the heading envelope of the first
// ENV_TRIALS_PER_BLOCK trials.
import { describe, expect, it } from "vitest";
import {
  createWorkerState,
  ENV_TRIALS_PER_BLOCK,
  envelopeStore,
  mergeWorkerStates,
  metricStore,
  runBlock,
  type WorkerState,
} from "@shared/engine/accumulate";
import { prepareStudy } from "@shared/engine/plan";
import { isPackedWorkerState, packWorkerState, unpackWorkerState } from "@shared/engine/packed-state";
import { BLOCK_SIZE } from "@shared/engine/random";
import { blockSampler, blockTrials } from "@shared/engine/sampling";
import { createScratch, evaluateTrial } from "@shared/engine/trial";
import { fixture, referenceStack, studyOf } from "./helpers";

const stack = referenceStack();
const study = studyOf(fixture("study-reference.json"), stack);

/** The state and moments of one block, one trial at a time, by the textbook rules. */
function byDefinition(prep: ReturnType<typeof prepareStudy>, block: number) {
  const { model: m, plan } = prep;
  const n = blockTrials(block, plan.trials);
  const sampler = blockSampler(m, plan.mode, plan.seed, block, n);
  const s = createScratch(m);
  const draws = new Float64Array(m.drawCount);
  const nM = m.metrics.length;
  const hists = m.metrics.map(() => metricStore());
  const nAtt = m.heading ? m.heading.attitudes.count : 0;
  const envs = Array.from({ length: nAtt }, () => envelopeStore());
  const envMin = new Array<number>(nAtt).fill(Infinity);
  const envMax = new Array<number>(nAtt).fill(-Infinity);
  const mean = new Array<number>(nM).fill(0);
  const m2 = new Array<number>(nM).fill(0);
  const min = new Array<number>(nM).fill(Infinity);
  const max = new Array<number>(nM).fill(-Infinity);
  const values: number[][] = m.metrics.map(() => []);
  const pass = plan.requirements.map(() => 0);
  for (let i = 0; i < n; i++) {
    sampler.next(draws);
    s.perAttitude = i < ENV_TRIALS_PER_BLOCK;
    evaluateTrial(m, draws, s);
    for (let k = 0; k < nM; k++) {
      const v = s.metrics[k];
      const d = v - mean[k];
      mean[k] += d * (1 / (i + 1));
      m2[k] += d * (v - mean[k]);
      hists[k].add(v);
      min[k] = Math.min(min[k], v);
      max[k] = Math.max(max[k], v);
      values[k].push(v);
    }
    plan.requirements.forEach((r, j) => {
      if (Math.abs(s.metrics[r.metric]) <= r.max) pass[j]++;
    });
    if (i < ENV_TRIALS_PER_BLOCK)
      for (let a = 0; a < nAtt; a++) {
        const e = s.headingErr[a];
        envs[a].add(e);
        envMin[a] = Math.min(envMin[a], e);
        envMax[a] = Math.max(envMax[a], e);
      }
  }
  const worst = values.map((vs) =>
    vs
      .map((v, i) => ({ v, trial: block * BLOCK_SIZE + i }))
      .sort((a, b) => Math.abs(b.v) - Math.abs(a.v) || a.trial - b.trial)
      .slice(0, plan.worstK),
  );
  return { hists, envs, envMin, envMax, mean, m2, min, max, worst, pass };
}

function worstOf(st: WorkerState, k: number) {
  const out: { v: number; trial: number }[] = [];
  for (let j = 0; j < st.worstK; j++) {
    const t = st.worstTrial[k * st.worstK + j];
    if (t >= 0) out.push({ v: st.worstVal[k * st.worstK + j], trial: t });
  }
  return out;
}

describe("a block's accumulation equals adding its trials one by one", () => {
  // 5,000 trials: a whole block, then a short one of 904 (fewer than the envelope's 1,024)
  const prep = prepareStudy(stack, study, { trials: 5_000, seed: 11 });

  for (const block of [0, 1]) {
    it(`block ${block}: histograms, moments, extremes, worst trials, yields and envelope`, () => {
      const st = createWorkerState(prep.model, prep.plan);
      const partial = runBlock(prep.model, prep.plan, st, block);
      const want = byDefinition(prep, block);
      const nM = prep.model.metrics.length;
      const hLen = want.hists[0].counts.length;
      expect(st.n).toBe(block === 0 ? 4096 : 904);
      for (let k = 0; k < nM; k++) {
        expect(Array.from(st.hist.subarray(k * hLen, (k + 1) * hLen))).toEqual(Array.from(want.hists[k].counts));
        expect(partial.moments[2 * k]).toBe(want.mean[k]);
        expect(partial.moments[2 * k + 1]).toBe(want.m2[k]);
        expect(st.min[k]).toBe(want.min[k]);
        expect(st.max[k]).toBe(want.max[k]);
        expect(st.maxAbs[k]).toBe(Math.max(Math.abs(want.min[k]), Math.abs(want.max[k])));
        expect(worstOf(st, k)).toEqual(want.worst[k]);
      }
      expect(Array.from(st.pass)).toEqual(want.pass);
      const eLen = want.envs[0].counts.length;
      expect(st.nAtt).toBeGreaterThan(0);
      for (let a = 0; a < st.nAtt; a++) {
        expect(Array.from(st.env.subarray(a * eLen, (a + 1) * eLen))).toEqual(Array.from(want.envs[a].counts));
        expect(st.envMin[a]).toBe(want.envMin[a]);
        expect(st.envMax[a]).toBe(want.envMax[a]);
      }
      // the tracked metrics' raw values, trial-major
      const nT = prep.plan.tracked.length;
      expect(partial.tracked.length).toBe(st.n * nT);
    });
  }
});

describe("merging worker states", () => {
  const prep = prepareStudy(stack, study, { trials: 3 * BLOCK_SIZE, seed: 5 });
  const run = (blocks: number[]) => {
    const st = createWorkerState(prep.model, prep.plan);
    for (const b of blocks) runBlock(prep.model, prep.plan, st, b);
    return st;
  };

  it("adds into the first state exactly what one state running every block holds, and leaves the others as they were", () => {
    const whole = run([0, 1, 2]);
    const a = run([1]),
      b = run([0, 2]);
    const bBefore = structuredClone(b);
    const merged = mergeWorkerStates([a, b]);
    expect(merged).toBe(a);
    // first index where two arrays differ, −1 if none (a deep equality of 1.9 million counts is slow)
    const differsAt = (x: ArrayLike<number>, y: ArrayLike<number>) => {
      if (x.length !== y.length) return -2;
      for (let i = 0; i < x.length; i++) if (!Object.is(x[i], y[i])) return i;
      return -1;
    };
    const arrays = ["hist", "env", "minAbs", "maxAbs", "min", "max", "pass", "envMin", "envMax", "worstVal", "worstTrial"] as const;
    // counts added over only the buckets the extremes call occupied: every bucket must still agree
    for (const key of arrays) expect(differsAt(merged[key], whole[key]), key).toBe(-1);
    expect(merged.n).toBe(whole.n);
    for (const key of arrays) expect(differsAt(b[key], bBefore[key]), key).toBe(-1);
    expect(b.n).toBe(bBefore.n);
  });
});

describe("a worker state packed for storage", () => {
  const prep = prepareStudy(stack, study, { trials: 2 * BLOCK_SIZE, seed: 9 });

  it("unpacks to the very same counts, with empty stores and a NaN in the overflow bucket, in under a third of the counts", () => {
    const st = createWorkerState(prep.model, prep.plan);
    const empty = structuredClone(st);
    for (const b of [0, 1]) runBlock(prep.model, prep.plan, st, b);
    // a NaN value is counted in the overflow bucket and left out of the extremes (countMetrics)
    const len = st.hist.length / st.nMetrics;
    st.hist[3 * len + len / 2 - 1] += 1;
    for (const s of [st, empty]) {
      const packed = packWorkerState(s);
      // a part stored before packing holds the whole state: told apart when read back
      expect([isPackedWorkerState(packed), isPackedWorkerState(s)]).toEqual([true, false]);
      const back = unpackWorkerState(structuredClone(packed));
      expect(back.hist.length).toBe(s.hist.length);
      let differs = -1;
      for (let i = 0; i < s.hist.length && differs < 0; i++) if (back.hist[i] !== s.hist[i]) differs = i;
      expect(differs).toBe(-1);
      expect(Array.from(back.minAbs)).toEqual(Array.from(s.minAbs));
      expect(back.n).toBe(s.n);
      expect(packed.histCounts.length).toBeLessThan(s.hist.length / 3);
    }
  });
});
