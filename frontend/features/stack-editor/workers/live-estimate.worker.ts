/// <reference lib="webworker" />
/**
 * Runs the editor's live estimate off the main thread with the engine of real studies
 * (its trial loop and percentile store; see lib/live-estimate.ts).
 * One message in ({ runId, stack, requirements }), one answer out per run. A stale run
 * is not interrupted here: the page terminates this worker and starts a fresh one.
 */
import { validateStackFile } from "@shared/schemas/stack-file";
import type { Requirement } from "@shared/schemas/study-file";
import { estimate, liveStudy, type EstimateSummary } from "../lib/live-estimate";

export type EstimateRequest = { runId: number; stack: unknown; requirements: Requirement[] };
export type EstimateAnswer =
  { runId: number; type: "result"; summary: EstimateSummary; ms: number } | { runId: number; type: "error"; message: string };

// the project compiles with the DOM library, where `self` is a Window; in this file it is the worker's scope
const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (event: MessageEvent<EstimateRequest>) => {
  const { runId, stack, requirements } = event.data;
  const started = performance.now();
  try {
    const v = validateStackFile(stack);
    if (!v.ok) throw new Error(`the stack has ${v.issues.length} problem${v.issues.length === 1 ? "" : "s"}`);
    const live = liveStudy(v.stack, requirements);
    const answer: EstimateAnswer = { runId, type: "result", summary: estimate(v.stack, live), ms: performance.now() - started };
    scope.postMessage(answer);
  } catch (error) {
    const answer: EstimateAnswer = { runId, type: "error", message: error instanceof Error ? error.message : String(error) };
    scope.postMessage(answer);
  }
};
