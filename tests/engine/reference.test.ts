// Agreement with tests/fixtures/*.expected.json: results of an independent implementation
// of MODEL.md (10^6 trials, another seed). Every tolerance is derived from the Monte Carlo
// error of both runs: standard error of the mean s/√n, of the standard deviation
// s·√((κ − 1)/4n) with the kurtosis κ from a pilot sample, of a percentile
// √(p(1 − p)/n)/f(q) with the density f from the pilot's order statistics, and the
// binomial error √(p(1 − p)/n) of a yield; the two runs' errors add in quadrature and
// Z = 4.5 standard errors are allowed (about 3e-3 chance of one false alarm over the
// ~500 comparisons).
import { describe, expect, it } from "vitest";
import { runStudyOnThreads } from "@backend/engine/runner";
import { createScratch, evaluateTrial } from "@shared/engine/model";
import { blockSampler } from "@shared/engine/sampling";
import { prepareStudy } from "@shared/engine/study";
import type { StudyFile } from "@shared/schemas/study-file";
import { fixture, referenceStack, studyOf } from "./helpers";

const Z = 4.5;
const N = 100_000;
const PILOT = 20_000;

interface Expected {
  trials: number;
  metrics: Record<string, { mean: number; std: number; p50: number; p95: number; p99: number; p9973: number; max: number }>;
  requirements: { metric: string; predictedYield: number }[];
}

/** Raw metric values of a pilot sample (seed unrelated to both runs). */
function pilot(study: StudyFile) {
  const prep = prepareStudy(referenceStack(), study, { trials: PILOT, seed: 987_654 });
  const m = prep.model;
  const s = createScratch(m);
  const d = new Float64Array(m.drawCount);
  const vals = m.metrics.map(() => new Float64Array(PILOT));
  let i = 0;
  for (let b = 0; i < PILOT; b++) {
    const samp = blockSampler(m, "random", 987_654, b, 4096);
    for (let k = 0; k < 4096 && i < PILOT; k++, i++) {
      samp.next(d);
      evaluateTrial(m, d, s);
      m.metrics.forEach((_, j) => (vals[j][i] = s.metrics[j]));
    }
  }
  return new Map(m.metrics.map((mi, j) => [mi.id, vals[j]] as const));
}

function kurtosis(v: Float64Array): number {
  let mean = 0;
  for (const x of v) mean += x;
  mean /= v.length;
  let m2 = 0,
    m4 = 0;
  for (const x of v) {
    const d = (x - mean) ** 2;
    m2 += d;
    m4 += d * d;
  }
  m2 /= v.length;
  m4 /= v.length;
  return m4 / (m2 * m2);
}

/** Density of |v| at its p-quantile, from the pilot's order statistics around p. */
function densityAt(absSorted: Float64Array, p: number): number {
  const n = absSorted.length;
  const w = Math.min(0.02, (1 - p) * 0.8, p * 0.8);
  const q = (x: number) => absSorted[Math.min(n - 1, Math.max(0, Math.round(x * (n - 1))))];
  return (2 * w) / (q(p + w) - q(p - w));
}

async function compare(studyName: string) {
  const stack = referenceStack();
  const study = studyOf(fixture(`${studyName}.json`), stack);
  const exp = fixture(`${studyName}.expected.json`) as Expected;
  const r = await runStudyOnThreads(stack, study, { trials: N, threads: 2 });
  const pil = pilot(study);
  const n1 = r.trials,
    n2 = exp.trials;
  const fails: string[] = [];
  let checks = 0;
  let worstZ = 0,
    worstWhat = "";
  const check = (what: string, got: number, want: number, se: number) => {
    checks++;
    const z = Math.abs(got - want) / se;
    if (z > worstZ) {
      worstZ = z;
      worstWhat = what;
    }
    if (!(Math.abs(got - want) <= Z * se))
      fails.push(`${what}: ${got} vs ${want} (|Δ| = ${Math.abs(got - want).toExponential(2)}, allowed ${(Z * se).toExponential(2)})`);
  };
  expect(Object.keys(r.metrics).sort()).toEqual(Object.keys(exp.metrics).sort());
  for (const [id, e] of Object.entries(exp.metrics)) {
    const g = r.metrics[id];
    const raw = pil.get(id)!;
    const abs = Float64Array.from(raw, Math.abs).sort();
    check(`${id} mean`, g.mean, e.mean, Math.sqrt(g.std ** 2 / n1 + e.std ** 2 / n2));
    const k = kurtosis(raw);
    check(`${id} std`, g.std, e.std, Math.sqrt(((k - 1) / 4) * (g.std ** 2 / n1 + e.std ** 2 / n2)));
    for (const [key, p] of [
      ["p50", 0.5],
      ["p95", 0.95],
      ["p99", 0.99],
      ["p9973", 0.9973],
    ] as const) {
      const f = densityAt(abs, p);
      check(`${id} ${key}`, g[key], e[key], Math.sqrt(p * (1 - p) * (1 / n1 + 1 / n2)) / f);
    }
  }
  for (const req of exp.requirements) {
    const g = r.requirements.find((x) => x.metric === req.metric)!;
    const p = req.predictedYield;
    check(`${req.metric} yield`, g.predictedYield, p, Math.sqrt(p * (1 - p) * (1 / n1 + 1 / n2)));
  }
  if (process.env.ORTHOSTACK_REPORT)
    process.stdout.write(`${studyName}: ${checks} checks, largest |Δ|/SE = ${worstZ.toFixed(2)} (${worstWhat})\n`);
  return { fails, checks };
}

describe("agreement with the independent implementation within Monte Carlo error", () => {
  it("reference study (no calibration, 180-attitude sweep)", async () => {
    const { fails, checks } = await compare("study-reference");
    expect(checks).toBeGreaterThan(250);
    expect(fails).toEqual([]);
  });

  it("reference study calibrated after package with a 0.05 deg residual", async () => {
    const { fails, checks } = await compare("study-reference-calibrated");
    expect(checks).toBeGreaterThan(250);
    expect(fails).toEqual([]);
  });
});
