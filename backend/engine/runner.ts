/**
 * A study on worker threads for a one-off caller (the command line, the benchmark, tests):
 * a pool of `threads` workers made for this study and stopped after it. The server keeps one
 * warm pool instead (./pool.ts, created at start). The result is the same for any thread
 * count; progress is reported per block; an AbortSignal stops the study.
 */
import { BLOCK_SIZE, type Progress, type StudyOverrides } from "@shared/engine/study";
import type { ResultFile } from "@shared/schemas/result-file";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import { defaultThreads, EnginePool, StudyAbortedError } from "./pool";

export { defaultThreads, StudyAbortedError };

/** Blocks a fresh thread must have before it pays for itself (see threadsForTrials). */
const BLOCKS_PER_THREAD = 12;

/**
 * Threads for a one-off study of `trials` trials (the command line): a fresh thread costs its
 * start and compiling the trial code (about 0.3 s of CPU), which pays only from about a dozen
 * blocks on. Measured from the command line on 2 cores, one thread against two: 10^4 trials
 * 0.82 s against 0.91 s, 4·10^4 1.20 s against 1.26 s, 6·10^4 about even. One thread per 12
 * blocks (49,152 trials), up to one per core. The result is the same for any count.
 */
export function threadsForTrials(trials: number): number {
  return Math.max(1, Math.min(defaultThreads(), Math.ceil(trials / (BLOCKS_PER_THREAD * BLOCK_SIZE))));
}

/**
 * Threads for one study, started before the study is ready: the command line starts them
 * before it loads the schemas and validates its files, which a fresh thread's start (about
 * 0.1 s) then overlaps. Hand them to runStudyOnThreads as `pool`.
 */
export function startStudyThreads(threads?: number): EnginePool {
  return new EnginePool({ threads });
}

export interface RunnerOptions extends StudyOverrides {
  /** worker threads; default: the machine's available parallelism */
  threads?: number;
  /** threads from startStudyThreads, used instead of new ones (and stopped after the study, as those) */
  pool?: EnginePool;
  onProgress?: (p: Progress) => void;
  signal?: AbortSignal;
}

/** Run a validated study on worker threads and return its result file. */
export async function runStudyOnThreads(stack: StackFile, study: StudyFile, opts: RunnerOptions = {}): Promise<ResultFile> {
  const pool = opts.pool ?? new EnginePool({ threads: opts.threads });
  try {
    if (opts.signal?.aborted) throw new StudyAbortedError();
    return await pool.run(stack, study, { trials: opts.trials, seed: opts.seed, onProgress: opts.onProgress, signal: opts.signal });
  } finally {
    await pool.stop();
  }
}
