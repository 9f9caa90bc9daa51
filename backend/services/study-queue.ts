import { and, asc, eq, inArray } from "drizzle-orm";
import type { Database } from "../db/client";
import { studies } from "../db/schema";
import { writeFinishedStudy } from "./study-finish";

export type RunInput = { stack: Record<string, unknown>; study: Record<string, unknown> };
export type RunOptions = {
  signal: AbortSignal;
  onProgress: (done: number, total: number) => void;
  /** who asked (the study's creator): the engine pool shares its threads fairly between owners */
  owner: string;
};
/** Runs one study to its result file (MODEL.md §11 plus plot data); rejects on failure. */
export type StudyRunner = (input: RunInput, options: RunOptions) => Promise<{ result: Record<string, unknown>; passes: boolean | null }>;

const PROGRESS_EVERY_MS = 250;

export class CancelledError extends Error {
  constructor() {
    super("cancelled");
  }
}

/** What the routes need of whatever runs studies: the in-process queue or the server's job queue. */
export interface StudyScheduler {
  start(): Promise<void>;
  /** Looks for queued work; safe to call any number of times. */
  kick(): void;
  /** Cancels a queued or running study; true when it was found in one of those states. */
  cancel(id: string): Promise<boolean>;
  stop(): Promise<void>;
  /** Stops without writing anything, as a crash would (tests of the restart path). */
  abandon?(): void;
}

/** Studies running at once; the engine pool shares its worker threads between them block by block. */
export const MAX_RUNNING_STUDIES = 4;

/**
 * Runs queued studies, oldest first, in worker threads (through the runner), so the API never
 * waits on a study. Several run at once (up to MAX_RUNNING_STUDIES), at most one per person,
 * so one person's queue of long studies does not hold back another's short one; the runner's
 * pool shares the threads between them. State lives in the database: a study marked running
 * when the server starts was cut off by a stop and becomes "interrupted".
 */
export class StudyQueue implements StudyScheduler {
  private running = new Map<string, { owner: string; controller: AbortController; done: Promise<void> }>();
  private stopped = true;
  private kicking = false;
  private kickAgain = false;

  constructor(
    private readonly db: Database,
    private readonly runner: StudyRunner,
    private readonly log: (m: string, e?: unknown) => void,
    private readonly maxRunning = MAX_RUNNING_STUDIES,
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
    if (this.stopped) return;
    if (this.kicking) {
      this.kickAgain = true;
      return;
    }
    this.kicking = true;
    void this.next()
      .catch((e) => this.log("study queue error", e))
      .finally(() => {
        this.kicking = false;
        if (this.kickAgain) {
          this.kickAgain = false;
          this.kick();
        }
      });
  }

  isRunning(id: string) {
    return this.running.has(id);
  }

  /** Cancels a queued or running study; true when it was found in one of those states. */
  async cancel(id: string): Promise<boolean> {
    const run = this.running.get(id);
    if (run) {
      run.controller.abort();
      await run.done;
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
    const runs = [...this.running.values()];
    for (const r of runs) r.controller.abort();
    await Promise.all(runs.map((r) => r.done));
  }

  /** Stops without writing anything, as a crash would (used to test the restart path). */
  abandon() {
    this.stopped = true;
    const runs = [...this.running.values()];
    this.running.clear();
    for (const r of runs) r.controller.abort(new Error("abandoned"));
  }

  private async next() {
    while (!this.stopped && this.running.size < this.maxRunning) {
      const busy = new Set([...this.running.values()].map((r) => r.owner));
      const queued = await this.db
        .select({
          id: studies.id,
          study: studies.study,
          stack: studies.stack,
          workspaceId: studies.workspaceId,
          projectId: studies.projectId,
          number: studies.number,
          createdBy: studies.createdBy,
        })
        .from(studies)
        .where(eq(studies.status, "queued"))
        .orderBy(asc(studies.createdAt))
        .limit(this.maxRunning * 4);
      // oldest first, skipping people who already have a study running
      const job = queued.find((q) => !busy.has(q.createdBy ?? "") && !this.running.has(q.id));
      if (!job) return;
      const claimed = await this.db
        .update(studies)
        .set({ status: "running", startedAt: new Date(), trialsDone: 0, error: null })
        .where(and(eq(studies.id, job.id), eq(studies.status, "queued")))
        .returning({ id: studies.id });
      if (!claimed.length) continue;
      const owner = job.createdBy ?? "";
      const controller = new AbortController();
      const entry = { owner, controller, done: Promise.resolve() };
      this.running.set(job.id, entry);
      entry.done = this.run(job, owner, controller).finally(() => {
        if (this.running.get(job.id) === entry) this.running.delete(job.id);
      });
    }
  }

  private async run(
    job: {
      id: string;
      study: Record<string, unknown>;
      stack: Record<string, unknown>;
      workspaceId: string;
      projectId: string;
      number: number;
    },
    owner: string,
    controller: AbortController,
  ) {
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
      const { result, passes } = await this.runner(
        { stack: job.stack, study: job.study },
        { signal: controller.signal, onProgress, owner },
      );
      await pending;
      if (controller.signal.aborted) throw new CancelledError();
      const seconds = (Date.now() - started) / 1000;
      // One transaction: the result and the finished state land together or not at all.
      await this.db.transaction((tx) => writeFinishedStudy(tx, job, { result, passes, seconds }));
    } catch (e) {
      await pending.catch(() => undefined);
      if (this.stopped && !this.running.has(job.id)) return; // abandoned: leave the row as a crash would
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
