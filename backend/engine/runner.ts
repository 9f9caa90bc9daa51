/**
 * A study on worker threads for a one-off caller (the command line, the benchmark, tests):
 * a pool of `threads` workers made for this study and stopped after it. The server keeps one
 * warm pool instead (./pool.ts, created at start). The result is the same for any thread
 * count; progress is reported per block; an AbortSignal stops the study.
 */
import type { Progress, StudyOverrides } from "@shared/engine/study";
import type { ResultFile } from "@shared/schemas/result-file";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import { defaultThreads, EnginePool, StudyAbortedError } from "./pool";

export { defaultThreads, StudyAbortedError };

export interface RunnerOptions extends StudyOverrides {
  /** worker threads; default: the machine's available parallelism */
  threads?: number;
  onProgress?: (p: Progress) => void;
  signal?: AbortSignal;
}

/** Run a validated study on worker threads and return its result file. */
export async function runStudyOnThreads(stack: StackFile, study: StudyFile, opts: RunnerOptions = {}): Promise<ResultFile> {
  if (opts.signal?.aborted) throw new StudyAbortedError();
  const pool = new EnginePool({ threads: opts.threads });
  try {
    return await pool.run(stack, study, { trials: opts.trials, seed: opts.seed, onProgress: opts.onProgress, signal: opts.signal });
  } finally {
    await pool.stop();
  }
}
