/**
 * Runs a study over Node worker threads. Blocks are handed out one at a time (two in
 * flight per worker), partials are folded in block order by the engine's Coordinator,
 * and the worker states are merged at the end: the result is the same for any thread
 * count. Progress is reported per block; an AbortSignal stops the workers.
 */
import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import { mergeWorkerStates, type BlockPartial, type WorkerState } from "@shared/engine/accumulate";
import {
  adaptiveDone,
  finalizeStudy,
  newCoordinator,
  prepareStudy,
  type Progress,
  type StudyOverrides,
} from "@shared/engine/study";
import type { ResultFile } from "@shared/schemas/result-file";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import type { FromWorker, ToWorker, WorkerInit } from "./worker";

export interface RunnerOptions extends StudyOverrides {
  /** worker threads; default: the machine's available parallelism */
  threads?: number;
  onProgress?: (p: Progress) => void;
  signal?: AbortSignal;
}

export class StudyAbortedError extends Error {
  constructor() {
    super("the study was cancelled");
    this.name = "AbortError";
  }
}

const WORKER_URL = new URL("./worker-entry.mjs", import.meta.url);

export function defaultThreads(): number {
  return Math.max(1, availableParallelism());
}

/** Run a validated study on worker threads and return its result file. */
export async function runStudyOnThreads(stack: StackFile, study: StudyFile, opts: RunnerOptions = {}): Promise<ResultFile> {
  const overrides: StudyOverrides = { trials: opts.trials, seed: opts.seed };
  const prep = prepareStudy(stack, study, overrides);
  const coord = newCoordinator(prep);
  const total = prep.plan.trials;
  const threads = Math.max(1, Math.min(opts.threads ?? defaultThreads(), prep.plan.blocks));
  if (opts.signal?.aborted) throw new StudyAbortedError();

  const init: WorkerInit = { stack, study: prep.study, overrides: {} };
  const workers = Array.from({ length: threads }, () => new Worker(WORKER_URL, { workerData: init, execArgv: [] }));
  let done = 0;
  let failed: Error | null = null;
  let wake: (() => void) | null = null;
  const inFlight = new Map<Worker, number>();
  const queue: number[] = [];
  const pendingStates = new Map<Worker, { resolve: (s: WorkerState) => void; reject: (e: Error) => void }>();

  const notify = () => {
    const w = wake;
    wake = null;
    w?.();
  };
  const feed = (w: Worker) => {
    while ((inFlight.get(w) ?? 0) < 2 && queue.length > 0) {
      const block = queue.shift()!;
      inFlight.set(w, (inFlight.get(w) ?? 0) + 1);
      w.postMessage({ type: "run", block } satisfies ToWorker);
    }
  };
  const fail = (e: Error) => {
    failed ??= e;
    for (const p of pendingStates.values()) p.reject(failed);
    notify();
  };
  const onAbort = () => fail(new StudyAbortedError());
  opts.signal?.addEventListener("abort", onAbort, { once: true });

  for (const w of workers) {
    inFlight.set(w, 0);
    w.on("message", (msg: FromWorker) => {
      if (msg.type === "block") {
        inFlight.set(w, (inFlight.get(w) ?? 1) - 1);
        coord.add(msg.partial as BlockPartial);
        done += msg.partial.n;
        opts.onProgress?.({ trialsDone: done, trialsTotal: total });
        if (!failed) feed(w);
        notify();
      } else if (msg.type === "state") {
        pendingStates.get(w)?.resolve(msg.state as WorkerState);
      } else {
        fail(new Error(`engine worker failed: ${msg.message}`));
      }
    });
    w.on("error", (e) => fail(e instanceof Error ? e : new Error(String(e))));
  }

  const waitAll = async (until: () => boolean) => {
    while (!failed && !until()) await new Promise<void>((r) => (wake = r));
  };

  try {
    // fixed studies: every block; adaptive: one run of blocks at a time (JCGM 101 7.9)
    const step = prep.adaptive ? prep.adaptive.runBlocks : prep.plan.blocks;
    let next = 0;
    while (!failed && next < prep.plan.blocks) {
      const end = Math.min(prep.plan.blocks, next + step);
      for (let b = next; b < end; b++) queue.push(b);
      next = end;
      for (const w of workers) feed(w);
      await waitAll(() => coord.merged >= end);
      if (prep.adaptive && adaptiveDone(prep, coord)) break;
    }
    if (failed) throw failed;
    const states = await Promise.all(
      workers.map(
        (w) =>
          new Promise<WorkerState>((resolve, reject) => {
            pendingStates.set(w, { resolve, reject });
            w.postMessage({ type: "finish" } satisfies ToWorker);
          }),
      ),
    );
    return finalizeStudy(prep, coord, mergeWorkerStates(states));
  } finally {
    opts.signal?.removeEventListener("abort", onAbort);
    await Promise.all(workers.map((w) => w.terminate()));
  }
}
