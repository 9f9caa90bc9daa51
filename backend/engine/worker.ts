/**
 * One engine worker thread of the warm pool (./pool.ts). It stays alive between studies and
 * holds one WorkerState per open study: "open" compiles the study, "run" adds a block's
 * integer counts to that study's state and posts the block's float partial back, "finish"
 * hands the state over (and, when asked, then computes the result's model parts) and forgets
 * the study, "close" forgets it (cancelled); "estimate" runs a live estimate and answers it,
 * so the server's request thread never runs trials. The thread is
 * loaded from its plain-JS bundle (./bundle.mjs), so it starts without a TypeScript loader.
 */
import { readlinkSync } from "node:fs";
import { setPriority } from "node:os";
import { parentPort, workerData } from "node:worker_threads";
import { createWorkerState, runBlock, transferablesOf, type WorkerState } from "../../shared/engine/accumulate";
import { prepareStudy, type PreparedStudy, type StudyOverrides } from "../../shared/engine/plan";
import { packParts, resultParts, type PackedParts, type PartsInput } from "../../shared/engine/result-parts";
import { estimate, type EstimateSummary, type LiveStudy } from "../../shared/engine/live-estimate";
import type { StackFile } from "../../shared/schemas/stack-file";
import type { StudyFile } from "../../shared/schemas/study-file";

export interface WorkerInit {
  /** niceness of this thread (Linux), so the server's own thread keeps answering requests */
  nice?: number;
}

export type ToWorker =
  | { type: "open"; job: number; stack: StackFile; study: StudyFile; overrides: StudyOverrides }
  | { type: "run"; job: number; block: number }
  /** hand over the state; with parts, then compute the study's ResultParts from those sums */
  | { type: "finish"; job: number; parts?: PartsInput }
  | { type: "close"; job: number }
  /** the live estimate of a validated stack (shared/engine/live-estimate.ts), answered at once */
  | { type: "estimate"; request: number; stack: StackFile; live: LiveStudy };
export type FromWorker =
  /** startedAt: when the block's first trial started, ms since the epoch (timeOrigin + now: comparable across threads) */
  | { type: "block"; job: number; partial: ReturnType<typeof runBlock>; startedAt: number }
  | { type: "dropped"; job: number; block: number }
  | { type: "state"; job: number; state: WorkerState }
  /** null when they could not be computed here (the pool then computes them itself) */
  | { type: "parts"; job: number; parts: PackedParts | null }
  | { type: "error"; job: number; block?: number; message: string }
  | { type: "estimate"; request: number; summary: EstimateSummary | null; message?: string };

const port = parentPort;
if (!port) throw new Error("backend/engine/worker.ts must run as a worker thread");
const init = (workerData ?? {}) as WorkerInit;
if (init.nice) {
  try {
    // On Linux a thread has its own id and its own nice value; /proc/thread-self names it.
    const tid = Number(readlinkSync("/proc/thread-self").split("/").pop());
    if (Number.isInteger(tid) && tid > 0) setPriority(tid, init.nice);
  } catch {
    // elsewhere the worker runs at the process's priority
  }
}

// V8 compiles typed-array access without detach checks until the thread's first ArrayBuffer
// is detached, then throws all that compiled code away. The first block's postMessage
// transfers (detaches) its buffers, which cost every fresh thread its whole trial code compiled
// twice; detaching a spare buffer before anything is compiled makes the first compile the last.
const spare = new ArrayBuffer(8);
structuredClone(spare, { transfer: [spare] });

const jobs = new Map<number, { prep: PreparedStudy; state: WorkerState }>();

port.on("message", (msg: ToWorker) => {
  if (msg.type === "estimate") {
    try {
      port.postMessage({ type: "estimate", request: msg.request, summary: estimate(msg.stack, msg.live) } satisfies FromWorker);
    } catch (e) {
      port.postMessage({
        type: "estimate",
        request: msg.request,
        summary: null,
        message: e instanceof Error ? e.message : String(e),
      } satisfies FromWorker);
    }
    return;
  }
  try {
    if (msg.type === "open") {
      const prep = prepareStudy(msg.stack, msg.study, msg.overrides);
      jobs.set(msg.job, { prep, state: createWorkerState(prep.model, prep.plan) });
    } else if (msg.type === "run") {
      const j = jobs.get(msg.job);
      // closed (cancelled) while the block waited: still answer, the pool counts replies
      if (!j) return port.postMessage({ type: "dropped", job: msg.job, block: msg.block } satisfies FromWorker);
      const startedAt = performance.timeOrigin + performance.now();
      const partial = runBlock(j.prep.model, j.prep.plan, j.state, msg.block);
      port.postMessage({ type: "block", job: msg.job, partial, startedAt } satisfies FromWorker, transferablesOf(partial));
    } else if (msg.type === "finish") {
      const j = jobs.get(msg.job);
      if (!j) throw new Error(`no open study ${msg.job}`);
      jobs.delete(msg.job);
      port.postMessage({ type: "state", job: msg.job, state: j.state } satisfies FromWorker, transferablesOf(j.state));
      if (msg.parts) {
        let parts: PackedParts | null = null;
        try {
          parts = packParts(resultParts(j.prep, msg.parts));
        } catch {
          // the pool computes them on its own thread, where an error reaches the study
        }
        port.postMessage({ type: "parts", job: msg.job, parts } satisfies FromWorker);
      }
    } else if (msg.type === "close") {
      jobs.delete(msg.job);
    }
  } catch (e) {
    jobs.delete(msg.job);
    port.postMessage({
      type: "error",
      job: msg.job,
      block: msg.type === "run" ? msg.block : undefined,
      message: e instanceof Error ? (e.stack ?? e.message) : String(e),
    } satisfies FromWorker);
  }
});
