/**
 * Runs queued what-if runs (sweeps and allocations), oldest first, beside the study queue and
 * on the same warm engine pool (the pool shares its threads block by block between everyone
 * who asked). Each point of a sweep and each verifying run of an allocation is an ordinary
 * study with the request's seed. State lives in the database like a study's: a run marked
 * running when the server starts was cut off by a stop and becomes "interrupted".
 */
import { and, asc, eq } from "drizzle-orm";
import { describeParameter } from "@shared/whatif/parameters";
import type { StudyExecutor } from "@shared/whatif/executor";
import { runSweep, type SweepPoint } from "@shared/whatif/sweep";
import { runAllocation, type AllocationOptions } from "@shared/whatif/allocation";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import type { Database } from "../db/client";
import { whatIfRuns } from "../db/schema";
import type { EnginePool } from "../engine/pool";

export type SweepInput = { study: StudyFile; parameter: string; values: number[] };
export type AllocationInput = AllocationOptions & { study: StudyFile };

/** What-if runs at once; each already keeps the pool busy with one study at a time. */
export const MAX_RUNNING_WHAT_IF = 2;
const PROGRESS_EVERY_MS = 250;

/** Runs studies for what-if runs on the warm pool; `owner` shares the threads fairly. */
export type WhatIfExecutorFactory = (owner: string) => StudyExecutor;

export function poolExecutor(pool: EnginePool): WhatIfExecutorFactory {
  return (owner) =>
    (stack, study, { signal, onProgress }) =>
      pool.run(stack, study, { owner, signal, onProgress: (p) => onProgress?.(p.trialsDone, p.trialsTotal) });
}

export class WhatIfQueue {
  private running = new Map<string, { controller: AbortController; done: Promise<void> }>();
  private stopped = true;
  private kicking = false;
  private kickAgain = false;

  constructor(
    private readonly db: Database,
    private readonly executor: WhatIfExecutorFactory,
    private readonly log: (m: string, e?: unknown) => void,
    private readonly maxRunning = MAX_RUNNING_WHAT_IF,
  ) {}

  async start() {
    this.stopped = false;
    await this.db
      .update(whatIfRuns)
      .set({ status: "interrupted", error: "The server stopped while this run was going. Start it again." })
      .where(eq(whatIfRuns.status, "running"));
    this.kick();
  }

  kick() {
    if (this.stopped) return;
    if (this.kicking) {
      this.kickAgain = true;
      return;
    }
    this.kicking = true;
    void this.next()
      .catch((e) => this.log("what-if queue error", e))
      .finally(() => {
        this.kicking = false;
        if (this.kickAgain) {
          this.kickAgain = false;
          this.kick();
        }
      });
  }

  /** Cancels a queued or running run; true when it was found in one of those states. */
  async cancel(id: string): Promise<boolean> {
    const run = this.running.get(id);
    if (run) {
      run.controller.abort();
      await run.done;
      return true;
    }
    const rows = await this.db
      .update(whatIfRuns)
      .set({ status: "cancelled", finishedAt: new Date() })
      .where(and(eq(whatIfRuns.id, id), eq(whatIfRuns.status, "queued")))
      .returning({ id: whatIfRuns.id });
    return rows.length > 0;
  }

  async stop() {
    this.stopped = true;
    const runs = [...this.running.values()];
    for (const r of runs) r.controller.abort();
    await Promise.all(runs.map((r) => r.done));
  }

  private async next() {
    while (!this.stopped && this.running.size < this.maxRunning) {
      const queued = await this.db
        .select({ id: whatIfRuns.id })
        .from(whatIfRuns)
        .where(eq(whatIfRuns.status, "queued"))
        .orderBy(asc(whatIfRuns.createdAt))
        .limit(this.maxRunning * 2);
      const job = queued.find((q) => !this.running.has(q.id));
      if (!job) return;
      const [row] = await this.db
        .update(whatIfRuns)
        .set({ status: "running", startedAt: new Date(), progressDone: 0, error: null })
        .where(and(eq(whatIfRuns.id, job.id), eq(whatIfRuns.status, "queued")))
        .returning();
      if (!row) continue;
      const controller = new AbortController();
      const entry = { controller, done: Promise.resolve() };
      this.running.set(row.id, entry);
      entry.done = this.run(row, controller).finally(() => {
        if (this.running.get(row.id) === entry) this.running.delete(row.id);
        setImmediate(() => this.kick());
      });
    }
  }

  private async run(row: typeof whatIfRuns.$inferSelect, controller: AbortController) {
    let lastWrite = 0;
    let pending: Promise<unknown> = Promise.resolve();
    const write = (set: Partial<typeof whatIfRuns.$inferInsert>) => {
      pending = pending.then(() =>
        this.db
          .update(whatIfRuns)
          .set(set)
          .where(and(eq(whatIfRuns.id, row.id), eq(whatIfRuns.status, "running"))),
      );
    };
    const onProgress = (done: number, total: number) => {
      const now = Date.now();
      if (now - lastWrite < PROGRESS_EVERY_MS && done < total) return;
      lastWrite = now;
      write({ progressDone: done, progressTotal: total });
    };
    const execute = this.executor(row.createdBy ?? "");
    const signal = controller.signal;
    const stack = row.stack as StackFile;
    try {
      let result: Record<string, unknown>;
      if (row.kind === "sweep") {
        const input = row.input as unknown as SweepInput;
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
        result = out as unknown as Record<string, unknown>;
      } else {
        const input = row.input as unknown as AllocationInput;
        const out = await runAllocation({ ...input, stack, execute, signal, onProgress });
        result = out as unknown as Record<string, unknown>;
      }
      await pending;
      if (signal.aborted) throw new Error("cancelled");
      await this.db
        .update(whatIfRuns)
        .set({ status: "finished", result, finishedAt: new Date(), progressDone: row.progressTotal })
        .where(and(eq(whatIfRuns.id, row.id), eq(whatIfRuns.status, "running")));
    } catch (e) {
      await pending.catch(() => undefined);
      const cancelled = signal.aborted;
      await this.db
        .update(whatIfRuns)
        .set({
          status: cancelled ? "cancelled" : "failed",
          finishedAt: new Date(),
          error: cancelled ? null : e instanceof Error ? e.message : String(e),
        })
        .where(and(eq(whatIfRuns.id, row.id), eq(whatIfRuns.status, "running")));
      if (!cancelled) this.log(`what-if run ${row.id} failed`, e);
    }
  }
}
