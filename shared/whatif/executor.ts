/**
 * The one function sweeps and allocations run studies through: the backend passes its
 * worker-thread runner, tests and the browser may pass the engine's in-thread runStudy.
 */
import type { ResultFile } from "../schemas/result-file";
import type { StackFile } from "../schemas/stack-file";
import type { StudyFile } from "../schemas/study-file";

export type StudyExecutor = (
  stack: StackFile,
  study: StudyFile,
  opts: { signal?: AbortSignal; onProgress?: (trialsDone: number, trialsTotal: number) => void },
) => Promise<ResultFile>;

export class WhatIfAbortedError extends Error {
  constructor() {
    super("cancelled");
    this.name = "AbortError";
  }
}
