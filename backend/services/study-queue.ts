import { and, asc, eq, inArray } from "drizzle-orm";
import type { ResultFile } from "@shared/schemas/result-file";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import type { Database } from "../db/client";
import { studies } from "../db/schema";
import { writeFinishedStudy } from "./study-finish";
import { LocalRunLoop, type Claimed, type RunContext } from "./run-loop";

export type RunInput = { stack: StackFile; study: StudyFile };
export type RunOptions = {
  signal: AbortSignal;
  onProgress: (done: number, total: number) => void;
  /** who asked (the study's creator): the engine pool shares its threads fairly between owners */
  owner: string;
};
/** Runs one study to its result file (MODEL.md §11 plus plot data); rejects on failure. */
export type StudyRunner = (input: RunInput, options: RunOptions) => Promise<{ result: ResultFile; passes: boolean | null }>;

const PROGRESS_EVERY_MS = 250;

type StudyJob = {
  id: string;
  study: StudyFile;
  stack: StackFile;
  workspaceId: string;
  projectId: string;
  number: number;
};

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
 * when the server starts was cut off by a stop and becomes "interrupted". The claiming, the
 * running set and shutdown are the shared loop's (./run-loop.ts).
 */
export class StudyQueue implements StudyScheduler {
  private readonly loop: LocalRunLoop<StudyJob>;

  constructor(
    private readonly db: Database,
    private readonly runner: StudyRunner,
    private readonly log: (m: string, e?: unknown) => void,
    maxRunning = MAX_RUNNING_STUDIES,
  ) {
    this.loop = new LocalRunLoop<StudyJob>(
      {
        what: "study queue",
        maxRunning,
        onePerOwner: true,
        interruptLeftovers: async () => {
          await db
            .update(studies)
            .set({ status: "interrupted", error: "The server stopped while this study was running. Run it again." })
            .where(eq(studies.status, "running"));
        },
        claim: (busy) => this.claim(busy, maxRunning),
        run: ({ job, owner }, ctx) => this.run(job, owner, ctx),
        cancelQueued: async (id) => {
          const rows = await db
            .update(studies)
            .set({ status: "cancelled", finishedAt: new Date() })
            .where(and(eq(studies.id, id), eq(studies.status, "queued")))
            .returning({ id: studies.id });
          return rows.length > 0;
        },
      },
      log,
    );
  }

  start() {
    return this.loop.start();
  }

  /** Looks for queued work; safe to call any number of times. */
  kick() {
    this.loop.kick();
  }

  isRunning(id: string) {
    return this.loop.isRunning(id);
  }

  /** Cancels a queued or running study; true when it was found in one of those states. */
  cancel(id: string): Promise<boolean> {
    return this.loop.cancel(id);
  }

  /** Stops taking work and cancels the running study (server shutdown, tests). */
  stop() {
    return this.loop.stop();
  }

  /** Stops without writing anything, as a crash would (used to test the restart path). */
  abandon() {
    this.loop.abandon();
  }

  private async claim(busy: { ids: Set<string>; owners: Set<string> }, maxRunning: number): Promise<Claimed<StudyJob> | "lost" | null> {
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
      .limit(maxRunning * 4);
    // oldest first, skipping people who already have a study running
    const job = queued.find((q) => !busy.owners.has(q.createdBy ?? "") && !busy.ids.has(q.id));
    if (!job) return null;
    const claimed = await this.db
      .update(studies)
      .set({ status: "running", startedAt: new Date(), trialsDone: 0, error: null })
      .where(and(eq(studies.id, job.id), eq(studies.status, "queued")))
      .returning({ id: studies.id });
    if (!claimed.length) return "lost";
    return { id: job.id, owner: job.createdBy ?? "", job };
  }

  private async run(job: StudyJob, owner: string, { controller, reason }: RunContext) {
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
      if (reason() === "abandoned") return; // leave the row as a crash would
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
    }
  }
}
