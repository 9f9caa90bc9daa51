/**
 * Warm engine threads for the server-mode job queue: each thread runs one job (a range of one
 * study's blocks) at a time and hands back what the engine needs to merge that job with the
 * others later: every block's partial, and the worker state those blocks were counted into.
 * The threads are the warm pool's (./worker.ts, loaded from its plain-JS bundle) and speak its
 * protocol; they live as long as the worker process. Partials and states do not depend on the
 * thread, so the merged study equals the in-process runner's for the same files and seed.
 */
import type { Worker } from "node:worker_threads";
import { mergeWorkerStates, type BlockPartial, type WorkerState } from "@shared/engine/accumulate";
import { adaptiveDone, finalizeStudy, newCoordinator, prepareStudy } from "@shared/engine/study";
import type { StudyExecutor } from "@shared/whatif/executor";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import { StudyAbortedError } from "./pool";
import { startEngineThread } from "./thread";
import type { FromWorker, ToWorker } from "./worker";

export type BlockRangeResult = { partials: BlockPartial[]; state: WorkerState };

export type BlockRangeOptions = {
  signal?: AbortSignal;
  /** After each block, in the order they finish. */
  onBlock?: (p: BlockPartial) => void;
};

/** The engine refused the study (bad input, a failed block): running it again would not help. */
export class EngineError extends Error {}

/** One block running and one waiting, so the thread never idles between blocks. */
const IN_FLIGHT = 2;

type Slot = { w: Worker; busy: boolean };

export class PartThreads {
  private readonly slots: Slot[] = [];
  private nextJob = 1;
  private waiting: (() => void)[] = [];
  private stopped = false;

  constructor(
    readonly size: number,
    private readonly opts: { nice?: number } = {},
  ) {
    for (let i = 0; i < size; i++) this.slots.push({ w: this.spawn(), busy: false });
  }

  private spawn(): Worker {
    return startEngineThread(this.opts.nice);
  }

  async stop() {
    this.stopped = true;
    await Promise.all(this.slots.map((s) => s.w.terminate()));
  }

  /** Runs `blocks` of the study on the next free thread. */
  async run(files: { stack: StackFile; study: StudyFile }, blocks: number[], opts: BlockRangeOptions = {}): Promise<BlockRangeResult> {
    let slot = this.slots.find((s) => !s.busy);
    while (!slot) {
      await new Promise<void>((r) => this.waiting.push(r));
      if (this.stopped) throw new StudyAbortedError("the worker is stopping");
      slot = this.slots.find((s) => !s.busy);
    }
    slot.busy = true;
    try {
      return await this.runOn(slot, files, blocks, opts);
    } finally {
      slot.busy = false;
      this.waiting.shift()?.();
    }
  }

  private runOn(
    slot: Slot,
    files: { stack: StackFile; study: StudyFile },
    blocks: number[],
    opts: BlockRangeOptions,
  ): Promise<BlockRangeResult> {
    const job = this.nextJob++;
    const w = slot.w;
    const queue = [...blocks];
    const partials: BlockPartial[] = [];
    let inFlight = 0;
    return new Promise<BlockRangeResult>((resolve, reject) => {
      const cleanup = () => {
        w.off("message", onMessage);
        w.off("exit", onExit);
        opts.signal?.removeEventListener("abort", onAbort);
      };
      const settle = (e: Error | null, r?: BlockRangeResult) => {
        cleanup();
        if (e) reject(e);
        else resolve(r!);
      };
      const feed = () => {
        while (inFlight < IN_FLIGHT && queue.length) {
          inFlight++;
          w.postMessage({ type: "run", job, block: queue.shift()! } satisfies ToWorker);
        }
        if (inFlight === 0 && !queue.length) w.postMessage({ type: "finish", job } satisfies ToWorker);
      };
      const onMessage = (msg: FromWorker) => {
        if (msg.type === "estimate" || msg.job !== job) return;
        if (msg.type === "block") {
          inFlight--;
          partials.push(msg.partial as BlockPartial);
          opts.onBlock?.(msg.partial as BlockPartial);
          feed();
        } else if (msg.type === "state") {
          partials.sort((a, b) => a.block - b.block);
          settle(null, { partials, state: msg.state });
        } else if (msg.type === "error") {
          w.postMessage({ type: "close", job } satisfies ToWorker);
          settle(new EngineError(msg.message.split("\n")[0]));
        }
      };
      // A thread that dies takes its job with it: replace the thread; the queue runs the job again.
      const onExit = () => {
        if (!this.stopped) slot.w = this.spawn();
        settle(new Error("an engine thread stopped during the job"));
      };
      const onAbort = () => {
        w.postMessage({ type: "close", job } satisfies ToWorker);
        settle(new StudyAbortedError());
      };
      w.on("message", onMessage);
      w.on("exit", onExit);
      if (opts.signal?.aborted) return onAbort();
      opts.signal?.addEventListener("abort", onAbort, { once: true });
      w.postMessage({ type: "open", job, stack: files.stack, study: files.study, overrides: {} } satisfies ToWorker);
      feed();
    });
  }
}

/**
 * A whole study on the part threads, as the warm pool runs one: every thread takes a contiguous
 * run of the blocks (adaptive: of the next run of blocks), and the partials are folded in block
 * order and the states merged, so the result is the pool's and the command-line runner's for the
 * same files and seed. What-if runs in a server-mode worker go through it, sharing the threads
 * with study parts (each range waits for a free thread).
 */
export function partThreadsExecutor(engine: PartThreads): StudyExecutor {
  return async (stack, study, { signal, onProgress }) => {
    const prep = prepareStudy(stack, study, {});
    const coord = newCoordinator(prep);
    const states: WorkerState[] = [];
    const blocks = prep.plan.blocks;
    const step = prep.adaptive ? prep.adaptive.runBlocks : blocks;
    // folded as they come (the coordinator holds early blocks back until their turn)
    const onBlock = (b: BlockPartial) => {
      if (coord.add(b)) onProgress?.(coord.trials, prep.plan.trials);
    };
    for (let from = 0; from < blocks;) {
      const end = Math.min(blocks, from + step);
      const per = Math.ceil((end - from) / engine.size);
      const ranges: number[][] = [];
      for (let b = from; b < end; b += per) ranges.push(Array.from({ length: Math.min(per, end - b) }, (_, i) => b + i));
      // one range failing stops the others
      const stage = new AbortController();
      const onAbort = () => stage.abort();
      signal?.addEventListener("abort", onAbort, { once: true });
      try {
        if (signal?.aborted) throw new StudyAbortedError();
        const outs = await Promise.all(
          ranges.map((r) =>
            engine.run({ stack, study }, r, { signal: stage.signal, onBlock }).catch((e: unknown) => {
              stage.abort();
              throw e;
            }),
          ),
        );
        for (const o of outs) states.push(o.state);
      } finally {
        signal?.removeEventListener("abort", onAbort);
      }
      from = end;
      if (prep.adaptive && adaptiveDone(prep, coord)) break;
    }
    return finalizeStudy(prep, coord, mergeWorkerStates(states));
  };
}
