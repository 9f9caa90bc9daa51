/**
 * A sweep: one ordinary study per parameter value, every point with the study's own seed
 * (common random numbers: the same trials, only the parameter differs, so neighbouring
 * points differ by the parameter's effect and not by sampling noise).
 */
import type { StackFile } from "../schemas/stack-file";
import type { StudyFile } from "../schemas/study-file";
import type { StudyExecutor } from "./executor";
import { WhatIfAbortedError } from "./executor";
import { atParameter, type ParameterInfo } from "./parameters";

export type SweepRequirement = {
  metric: string;
  max: number;
  yield: number;
  predictedYield: number;
  ci: [number, number];
  passes: boolean;
  limitAtTarget: number;
};
export type SweepPoint = { value: number; requirements: SweepRequirement[] };
export type Crossing = { metric: string; max: number; value: number | null };

export type SweepInput = {
  stack: StackFile;
  study: StudyFile;
  info: ParameterInfo;
  values: number[];
  execute: StudyExecutor;
  signal?: AbortSignal;
  /** after each block of each point: trials done over the whole sweep */
  onProgress?: (done: number, total: number) => void;
  /** after each finished point (to store partial results) */
  onPoint?: (points: SweepPoint[]) => void | Promise<void>;
};

/** Ascending, without repeats (a sweep's x axis). */
export function sweepValues(values: number[]): number[] {
  return [...new Set(values)].sort((a, b) => a - b);
}

export async function runSweep(input: SweepInput): Promise<{ points: SweepPoint[]; crossings: Crossing[] }> {
  const values = sweepValues(input.values);
  const total = values.length * input.study.trials;
  const points: SweepPoint[] = [];
  for (const [i, value] of values.entries()) {
    if (input.signal?.aborted) throw new WhatIfAbortedError();
    const at = atParameter(input.stack, input.study, input.info, value);
    const result = await input.execute(at.stack, at.study, {
      signal: input.signal,
      onProgress: (done) => input.onProgress?.(i * input.study.trials + done, total),
    });
    points.push({
      value,
      requirements: result.requirements.map((r) => ({
        metric: r.metric,
        max: r.max,
        yield: r.yield,
        predictedYield: r.predictedYield,
        ci: r.ci,
        passes: r.passes,
        limitAtTarget: r.limitAtTarget ?? NaN,
      })),
    });
    await input.onPoint?.(points);
  }
  return { points, crossings: crossings(points) };
}

/**
 * Where each requirement's predicted yield meets its target: linear interpolation between the
 * first pair of neighbouring points on either side of the target (ascending values); null
 * when every point is on the same side.
 */
export function crossings(points: SweepPoint[]): Crossing[] {
  if (points.length === 0) return [];
  return points[0].requirements.map((r0, k) => {
    let value: number | null = null;
    for (let i = 0; i + 1 < points.length && value === null; i++) {
      const a = points[i],
        b = points[i + 1];
      const ya = a.requirements[k].predictedYield - r0.yield;
      const yb = b.requirements[k].predictedYield - r0.yield;
      if (ya === 0) value = a.value;
      else if (ya * yb < 0) value = a.value + ((b.value - a.value) * ya) / (ya - yb);
    }
    if (value === null && points[points.length - 1].requirements[k].predictedYield === r0.yield) value = points[points.length - 1].value;
    return { metric: r0.metric, max: r0.max, value };
  });
}
