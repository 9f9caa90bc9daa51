/**
 * What-if runs (sweeps and allocations): how one runs, and the in-process queue that runs them
 * on one machine, oldest first, beside the study queue and on the same warm engine pool (the
 * pool shares its threads block by block between everyone who asked). Each point of a sweep and
 * each verifying run of an allocation is an ordinary study with the request's seed. In server
 * mode the job queue takes this queue's place (./what-if-jobs.ts) and runs the same
 * `executeWhatIf` in worker processes. A run marked running when a one-machine server starts
 * was cut off by a stop and becomes "interrupted".
 */
import { and, asc, eq } from "drizzle-orm";
import { describeParameter } from "@shared/whatif/parameters";
import type { StudyExecutor } from "@shared/whatif/executor";
import { runSweep, type SweepPoint } from "@shared/whatif/sweep";
import { runAllocation } from "@shared/whatif/allocation";
import type { StackFile } from "@shared/schemas/stack-file";
import type { Database } from "../db/client";
import { whatIfRuns } from "../db/schema";
import type { EnginePool } from "../engine/pool";
import { LocalRunLoop, type RunContext } from "./run-loop";
import { allocationInputOf, sweepInputOf } from "./what-if-runs";
import type { WhatIfResult } from "@shared/schemas/what-if";

export type { StoredSweepInput as SweepInput, StoredAllocationInput as AllocationInput } from "@shared/schemas/what-if";
export type WhatIfRow = typeof whatIfRuns.$inferSelect;

/** What-if runs at once; each already keeps the pool busy with one study at a time. */
export const MAX_RUNNING_WHAT_IF = 2;
const PROGRESS_EVERY_MS = 250;

type Log = (m: string, e?: unknown) => void;

/** Runs studies for what-if runs on the warm pool; `owner` shares the threads fairly. */
export type WhatIfExecutorFactory = (owner: string) => StudyExecutor;

export function poolExecutor(pool: EnginePool): WhatIfExecutorFactory {
  return (owner) =>
    (stack, study, { signal, onProgress }) =>
      pool.run(stack, study, { owner, signal, onProgress: (p) => onProgress?.(p.trialsDone, p.trialsTotal) });
}

/** What the routes need of whatever runs what-if runs: the in-process queue or server mode's job queue. */
export interface WhatIfScheduler {
  start(): Promise<void>;
  /** Looks for queued runs; safe to call any number of times. */
  kick(): void;
  /**
   * Stops a run this process is running at once (the cancel itself is the row's state, which the
   * service writes with its activity record; a run elsewhere sees it at its next progress write).
   */
  cancel(id: string): Promise<boolean>;
  stop(): Promise<void>;
}

/** The process is stopping: the run is left as it is (running), for a restart or another worker. */
export class WhatIfLeftError extends Error {}

/**
 * Runs one claimed (running) what-if run to its end state: finished with its result, failed, or
 * cancelled. Progress and a sweep's finished points are written as they come, only while the row
 * is still running: a write that finds it cancelled (by anyone, in any process) aborts the run,
 * so a cancel reaches a run between two progress writes. `ctx.reason()` "stopping" or
 * "abandoned" leaves the row untouched and throws WhatIfLeftError.
 */
export async function executeWhatIf(db: Database, row: WhatIfRow, execute: StudyExecutor, ctx: RunContext, log: Log): Promise<void> {
  const { controller } = ctx;
  let lastWrite = 0;
  let pending: Promise<unknown> = Promise.resolve();
  const write = (set: Partial<typeof whatIfRuns.$inferInsert>) => {
    pending = pending
      .then(() =>
        db
          .update(whatIfRuns)
          .set(set)
          .where(and(eq(whatIfRuns.id, row.id), eq(whatIfRuns.status, "running")))
          .returning({ id: whatIfRuns.id }),
      )
      .then((rows) => {
        if (!rows.length) controller.abort(); // cancelled (or ended elsewhere): stop here
      });
  };
  const onProgress = (done: number, total: number) => {
    const now = Date.now();
    if (now - lastWrite < PROGRESS_EVERY_MS && done < total) return;
    lastWrite = now;
    write({ progressDone: done, progressTotal: total });
  };
  const signal = controller.signal;
  const stack = row.stack as StackFile;
  try {
    let result: WhatIfResult;
    if (row.kind === "sweep") {
      const input = sweepInputOf(row.input);
      const info = describeParameter(stack, input.study, input.parameter);
      if ("error" in info) throw new Error(info.error);
      const out = await runSweep({
        stack,
        study: input.study,
        info,
        values: input.values,
        execute,
        signal,
        onProgress,
        onPoint: (points: SweepPoint[]) => write({ result: { points, crossings: [] } }),
      });
      result = out;
    } else {
      const input = allocationInputOf(row.input);
      result = await runAllocation({ ...input, stack, execute, signal, onProgress });
    }
    await pending;
    if (signal.aborted) throw new Error("cancelled");
    await db
      .update(whatIfRuns)
      .set({ status: "finished", result, finishedAt: new Date(), progressDone: row.progressTotal })
      .where(and(eq(whatIfRuns.id, row.id), eq(whatIfRuns.status, "running")));
  } catch (e) {
    await pending.catch(() => undefined);
    const reason = ctx.reason();
    if (reason === "stopping" || reason === "abandoned") throw new WhatIfLeftError("the process stopped during the run", { cause: e });
    const cancelled = signal.aborted;
    await db
      .update(whatIfRuns)
      .set({
        status: cancelled ? "cancelled" : "failed",
        finishedAt: new Date(),
        error: cancelled ? null : e instanceof Error ? e.message : String(e),
      })
      .where(and(eq(whatIfRuns.id, row.id), eq(whatIfRuns.status, "running")));
    if (!cancelled) log(`what-if run ${row.id} failed`, e);
  }
}

/** One machine: what-if runs in this process, on the warm pool, through the shared loop. */
export class WhatIfQueue implements WhatIfScheduler {
  private readonly loop: LocalRunLoop<WhatIfRow>;

  constructor(db: Database, executor: WhatIfExecutorFactory, log: Log, maxRunning = MAX_RUNNING_WHAT_IF) {
    this.loop = new LocalRunLoop<WhatIfRow>(
      {
        what: "what-if queue",
        maxRunning,
        interruptLeftovers: async () => {
          await db
            .update(whatIfRuns)
            .set({ status: "interrupted", error: "The server stopped while this run was going. Start it again." })
            .where(eq(whatIfRuns.status, "running"));
        },
        claim: async (busy) => {
          const queued = await db
            .select({ id: whatIfRuns.id })
            .from(whatIfRuns)
            .where(eq(whatIfRuns.status, "queued"))
            .orderBy(asc(whatIfRuns.createdAt))
            .limit(maxRunning * 2);
          const next = queued.find((q) => !busy.ids.has(q.id));
          if (!next) return null;
          const [row] = await db
            .update(whatIfRuns)
            .set({ status: "running", startedAt: new Date(), progressDone: 0, error: null })
            .where(and(eq(whatIfRuns.id, next.id), eq(whatIfRuns.status, "queued")))
            .returning();
          return row ? { id: row.id, owner: row.createdBy ?? "", job: row } : "lost";
        },
        run: async ({ job, owner }, ctx) => {
          // a stop leaves the run as it is: the next start marks it interrupted, as after a crash
          await executeWhatIf(db, job, executor(owner), ctx, log).catch((e) => {
            if (!(e instanceof WhatIfLeftError)) throw e;
          });
        },
        cancelQueued: async (id) => {
          const rows = await db
            .update(whatIfRuns)
            .set({ status: "cancelled", finishedAt: new Date() })
            .where(and(eq(whatIfRuns.id, id), eq(whatIfRuns.status, "queued")))
            .returning({ id: whatIfRuns.id });
          return rows.length > 0;
        },
      },
      log,
    );
  }

  start() {
    return this.loop.start();
  }

  kick() {
    this.loop.kick();
  }

  cancel(id: string) {
    return this.loop.cancel(id);
  }

  stop() {
    return this.loop.stop();
  }
}
