import { and, asc, eq, inArray } from "drizzle-orm";
import type { Database } from "../db/client";
import { studies, studyResults } from "../db/schema";
import { recordActivity } from "./activity";

export type RunInput = { stack: Record<string, unknown>; study: Record<string, unknown> };
export type RunOptions = { signal: AbortSignal; onProgress: (done: number, total: number) => void };
/** Runs one study to its result file (MODEL.md §11 plus plot data); rejects on failure. */
export type StudyRunner = (input: RunInput, options: RunOptions) => Promise<{ result: Record<string, unknown>; passes: boolean | null }>;

const PROGRESS_EVERY_MS = 250;

export class CancelledError extends Error {
  constructor() {
    super("cancelled");
  }
}

/**
 * Runs queued studies one at a time, oldest first, in worker threads (through the runner), so
 * the API never waits on a study. State lives in the database: a study marked running when the
 * server starts was cut off by a stop and becomes "interrupted".
 */
export class StudyQueue {
  private current: { id: string; controller: AbortController; done: Promise<void> } | null = null;
  private stopped = true;
  private kicking = false;

  constructor(
    private readonly db: Database,
    private readonly runner: StudyRunner,
    private readonly log: (m: string, e?: unknown) => void,
  ) {}

  async start() {
    this.stopped = false;
    await this.db
      .update(studies)
      .set({ status: "interrupted", error: "The server stopped while this study was running. Run it again." })
      .where(eq(studies.status, "running"));
    this.kick();
  }

  /** Looks for queued work; safe to call any number of times. */
  kick() {
    if (this.stopped || this.current || this.kicking) return;
    this.kicking = true;
    void this.next()
      .catch((e) => this.log("study queue error", e))
      .finally(() => {
        this.kicking = false;
      });
  }

  isRunning(id: string) {
    return this.current?.id === id;
  }

  /** Cancels a queued or running study; true when it was found in one of those states. */
  async cancel(id: string): Promise<boolean> {
    if (this.current?.id === id) {
      this.current.controller.abort();
      await this.current.done;
      return true;
    }
    const rows = await this.db
      .update(studies)
      .set({ status: "cancelled", finishedAt: new Date() })
      .where(and(eq(studies.id, id), eq(studies.status, "queued")))
      .returning({ id: studies.id });
    return rows.length > 0;
  }

  /** Stops taking work and cancels the running study (server shutdown, tests). */
  async stop() {
    this.stopped = true;
    if (this.current) {
      this.current.controller.abort();
      await this.current.done;
    }
  }

  /** Stops without writing anything, as a crash would (used to test the restart path). */
  abandon() {
    this.stopped = true;
    const c = this.current;
    this.current = null;
    c?.controller.abort(new Error("abandoned"));
  }

  private async next() {
    while (!this.stopped && !this.current) {
      const [job] = await this.db
        .select({ id: studies.id, study: studies.study, stack: studies.stack, workspaceId: studies.workspaceId, projectId: studies.projectId, number: studies.number })
        .from(studies)
        .where(eq(studies.status, "queued"))
        .orderBy(asc(studies.createdAt))
        .limit(1);
      if (!job) return;
      const claimed = await this.db
        .update(studies)
        .set({ status: "running", startedAt: new Date(), trialsDone: 0, error: null })
        .where(and(eq(studies.id, job.id), eq(studies.status, "queued")))
        .returning({ id: studies.id });
      if (!claimed.length) continue;
      const controller = new AbortController();
      const done = this.run(job, controller).finally(() => {
        if (this.current?.id === job.id) this.current = null;
      });
      this.current = { id: job.id, controller, done };
      await done;
    }
  }

  private async run(job: { id: string; study: Record<string, unknown>; stack: Record<string, unknown>; workspaceId: string; projectId: string; number: number }, controller: AbortController) {
    const started = Date.now();
    let lastWrite = 0;
    let pending: Promise<unknown> = Promise.resolve();
    const onProgress = (done: number, total: number) => {
      const now = Date.now();
      if (now - lastWrite < PROGRESS_EVERY_MS && done < total) return;
      lastWrite = now;
      const rate = done / Math.max((now - started) / 1000, 1e-3);
      pending = pending.then(() =>
        this.db
          .update(studies)
          .set({ trialsDone: done, trialsTotal: total, trialsPerSecond: rate })
          .where(and(eq(studies.id, job.id), eq(studies.status, "running"))),
      );
    };
    try {
      const { result, passes } = await this.runner({ stack: job.stack, study: job.study }, { signal: controller.signal, onProgress });
      await pending;
      if (controller.signal.aborted) throw new CancelledError();
      const seconds = (Date.now() - started) / 1000;
      const trials = typeof result.trials === "number" ? result.trials : undefined;
      // One transaction: the result and the finished state land together or not at all.
      await this.db.transaction(async (tx) => {
        await tx.insert(studyResults).values({ studyId: job.id, result, passes });
        await tx
          .update(studies)
          .set({
            status: "finished",
            finishedAt: new Date(),
            ...(trials !== undefined ? { trialsDone: trials, trialsTotal: trials, trialsPerSecond: trials / Math.max(seconds, 1e-3) } : {}),
          })
          .where(eq(studies.id, job.id));
        await recordActivity(tx, {
          workspaceId: job.workspaceId,
          projectId: job.projectId,
          action: "study.finished",
          summary: `study ${job.number} finished${passes === null ? "" : passes ? ": every requirement met" : ": a requirement is not met"}`,
          data: { studyId: job.id },
        });
      });
    } catch (e) {
      await pending.catch(() => undefined);
      if (this.stopped && !this.current) return; // abandoned: leave the row as a crash would
      const cancelled = controller.signal.aborted;
      await this.db
        .update(studies)
        .set({
          status: cancelled ? "cancelled" : "failed",
          finishedAt: new Date(),
          error: cancelled ? null : e instanceof Error ? e.message : String(e),
        })
        .where(and(eq(studies.id, job.id), inArray(studies.status, ["running"])));
      if (!cancelled) this.log(`study ${job.id} failed`, e);
    } finally {
      setImmediate(() => this.kick());
    }
  }
}
