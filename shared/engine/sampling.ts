/**
 * Uniform numbers of a block of trials, random or Latin hypercube.
 *
 * random: trial i of a block takes the next drawCount uniforms of the block's stream
 *   (2 outputs of xoshiro128** each), so trial i starts at output 2·drawCount·i.
 * lhs: each block is its own Latin hypercube: for every draw dimension the block's n
 *   trials get one uniform in each of the n strata [k/n, (k+1)/n), in an order shuffled
 *   by Fisher-Yates. Stratifying within fixed blocks keeps the result independent of the
 *   thread count; the variance reduction is that of an n-point hypercube per block.
 */
import { blockStream, BLOCK_SIZE, type Xoshiro128ss } from "./random";
import { sampleInto } from "./distributions";
import type { Model } from "./compile";

export type SamplingMode = "random" | "lhs";

export function blockTrials(block: number, totalTrials: number): number {
  return Math.max(0, Math.min(BLOCK_SIZE, totalTrials - block * BLOCK_SIZE));
}

/** Source of draw vectors for the trials of one block. */
export interface BlockSampler {
  /** fills draws for the next trial of the block */
  next(draws: Float64Array): void;
}

class RandomSampler implements BlockSampler {
  private readonly u: Float64Array;
  constructor(
    private readonly m: Model,
    private readonly rng: Xoshiro128ss,
  ) {
    this.u = new Float64Array(m.drawCount);
  }
  next(draws: Float64Array): void {
    this.rng.fillOpen01(this.u, this.u.length);
    sampleInto(this.m.drawDist, this.u, 0, draws);
  }
}

class LhsSampler implements BlockSampler {
  private i = 0;
  constructor(
    private readonly m: Model,
    private readonly u: Float64Array,
  ) {}
  next(draws: Float64Array): void {
    sampleInto(this.m.drawDist, this.u, this.i * this.m.drawCount, draws);
    this.i++;
  }
}

/** Uniforms of a Latin-hypercube block, n trials × D dimensions, trial-major. */
export function lhsUniforms(rng: Xoshiro128ss, n: number, D: number): Float64Array {
  const u = new Float64Array(n * D);
  const perm = new Int32Array(n);
  for (let k = 0; k < D; k++) {
    for (let i = 0; i < n; i++) perm[i] = i;
    for (let i = n - 1; i > 0; i--) {
      const j = Math.floor(rng.nextOpen01() * (i + 1));
      const t = perm[i];
      perm[i] = perm[j];
      perm[j] = t;
    }
    for (let i = 0; i < n; i++) u[i * D + k] = (perm[i] + rng.nextOpen01()) / n;
  }
  return u;
}

export function blockSampler(m: Model, mode: SamplingMode, seed: number, block: number, n: number): BlockSampler {
  const rng = blockStream(seed, block);
  if (mode === "lhs") return new LhsSampler(m, lhsUniforms(rng, n, m.drawCount));
  return new RandomSampler(m, rng);
}

/** The draws of one trial, regenerated from the seed (for worst trials and the 3D view). */
export function drawsOfTrial(m: Model, mode: SamplingMode, seed: number, totalTrials: number, trial: number): Float64Array {
  const block = Math.floor(trial / BLOCK_SIZE);
  const i = trial - block * BLOCK_SIZE;
  const n = blockTrials(block, totalTrials);
  if (i >= n) throw new RangeError(`trial ${trial} is outside the study's ${totalTrials} trials`);
  const draws = new Float64Array(m.drawCount);
  const rng = blockStream(seed, block);
  if (mode === "lhs") {
    sampleInto(m.drawDist, lhsUniforms(rng, n, m.drawCount), i * m.drawCount, draws);
    return draws;
  }
  rng.skip(2 * m.drawCount * i);
  const u = new Float64Array(m.drawCount);
  for (let k = 0; k < m.drawCount; k++) u[k] = rng.nextOpen01();
  sampleInto(m.drawDist, u, 0, draws);
  return draws;
}
