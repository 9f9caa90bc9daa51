/**
 * The live estimate's study (./live-estimate.ts): the stack's requirements that name one of
 * its metrics, at the estimate's fixed trials, seed and inclination. Apart from the estimate
 * itself because it checks the requirements with zod, which the engine threads do not load.
 */
import { metricIds } from "@shared/engine/model";
import type { StackFile } from "@shared/schemas/stack-file";
import { RequirementSchema, type Requirement } from "@shared/schemas/study-file";
import { LIVE_INCLINATION_DEG, LIVE_SEED, LIVE_TRIALS, type LiveStudy } from "./live-estimate";

/** The estimate's study; requirements that are incomplete or name no metric of the stack are left out. */
export function liveStudy(stack: StackFile, requirements: Requirement[]): LiveStudy {
  const ids = new Set(metricIds(stack, {}));
  const kept: Requirement[] = [];
  const requirementIndexes: number[] = [];
  requirements.forEach((r, i) => {
    const parsed = RequirementSchema.safeParse(r);
    if (parsed.success && ids.has(parsed.data.metric)) {
      kept.push({ metric: parsed.data.metric, max: parsed.data.max, yield: parsed.data.yield });
      requirementIndexes.push(i);
    }
  });
  return {
    study: {
      format: "orthostack.study/1",
      trials: LIVE_TRIALS,
      seed: LIVE_SEED,
      inclinationDeg: LIVE_INCLINATION_DEG,
      requirements: kept,
      worstTrials: 1,
    },
    requirementIndexes,
  };
}
