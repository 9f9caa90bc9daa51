/**
 * Starting an engine worker thread (./worker.ts, from its plain-JS bundle), for the warm pool
 * (./pool.ts) and the server-mode part threads (./block-range.ts).
 *
 * An engine thread compiles its hot functions on itself. By default V8 hands a function that
 * became hot to a background compiler thread and goes on running it unoptimised meanwhile;
 * with both cores running blocks those compiler threads get a third of a core, so a fresh
 * thread ran most of its first block (4,096 trials at ~160 µs each unoptimised, ~11 µs
 * compiled) before its code was ready. Compiling on the engine thread itself stops it for the
 * few milliseconds a function takes and resumes it compiled: a fresh pool's first block comes
 * back sooner and a study costs less CPU (docs/engine.md, "Engine threads compile on
 * themselves"). V8 reads the flag when it creates an isolate, so it is set before the first
 * engine thread starts and holds for threads started later; the process's own thread (the
 * server's request thread) was created before and keeps compiling in the background.
 */
import { pathToFileURL } from "node:url";
import { setFlagsFromString } from "node:v8";
import { Worker } from "node:worker_threads";
import { ensureBundle } from "./bundle.mjs";
import type { WorkerInit } from "./worker";

let flagSet = false;

/** A new engine thread at niceness `nice` (Linux; 0 = as the process). */
export function startEngineThread(nice = 0): Worker {
  if (!flagSet) {
    setFlagsFromString("--no-concurrent-recompilation");
    flagSet = true;
  }
  return new Worker(pathToFileURL(ensureBundle("worker")), { workerData: { nice } satisfies WorkerInit, execArgv: [] });
}
