/**
 * One engine worker thread: compiles the study once, runs the blocks it is sent into its
 * own WorkerState, posts each block's partial back, and hands over its state at the end.
 * Relative imports (not the @shared alias) so the file also loads under plain
 * `node --import tsx` without the bundler's alias.
 */
import { parentPort, workerData } from "node:worker_threads";
import { createWorkerState, runBlock, transferablesOf } from "../../shared/engine/accumulate";
import { prepareStudy, type StudyOverrides } from "../../shared/engine/plan";
import type { StackFile } from "../../shared/schemas/stack-file";
import type { StudyFile } from "../../shared/schemas/study-file";

export interface WorkerInit {
  stack: StackFile;
  study: StudyFile;
  overrides: StudyOverrides;
}

export type ToWorker = { type: "run"; block: number } | { type: "finish" };
export type FromWorker =
  | { type: "block"; partial: ReturnType<typeof runBlock> }
  | { type: "state"; state: ReturnType<typeof createWorkerState> }
  | { type: "error"; message: string };

const port = parentPort;
if (!port) throw new Error("backend/engine/worker.ts must run as a worker thread");
const init = workerData as WorkerInit;
const prep = prepareStudy(init.stack, init.study, init.overrides);
const state = createWorkerState(prep.model, prep.plan);

port.on("message", (msg: ToWorker) => {
  try {
    if (msg.type === "run") {
      const partial = runBlock(prep.model, prep.plan, state, msg.block);
      port.postMessage({ type: "block", partial } satisfies FromWorker, transferablesOf(partial));
    } else if (msg.type === "finish") {
      port.postMessage({ type: "state", state } satisfies FromWorker, transferablesOf(state));
    }
  } catch (e) {
    port.postMessage({ type: "error", message: e instanceof Error ? e.stack ?? e.message : String(e) } satisfies FromWorker);
  }
});
