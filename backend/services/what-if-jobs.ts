/**
 * Server mode (DATABASE_URL): what-if runs through the job queue, like studies, so worker
 * processes run them and the app processes stay free. One job per run (a sweep's points and an
 * allocation's rounds follow each other: an allocation's next round depends on the last), whose
 * pg-boss id is the run's id, so any number of app processes may hand the same queued run to the
 * queue and it is there once. A worker takes the job, claims the run and runs it on its part
 * threads (shared with study parts). A worker that dies leaves its job active until it expires
 * (WHAT_IF_JOB_EXPIRE_SECONDS); another worker then finds the run still `running` and runs it
 * again from the start: every study of a run has the request's seed, so the result is the same.
 */
import { and, asc, eq } from "drizzle-orm";
import type PgBoss from "pg-boss";
import type { Database } from "../db/client";
import { whatIfRuns } from "../db/schema";
import { partThreadsExecutor, type PartThreads } from "../engine/block-range";
import { Kicker, type RunContext, type StopReason } from "./run-loop";
import { executeWhatIf, type WhatIfScheduler } from "./what-if-queue";

export const WHAT_IF_QUEUE = "what-if-runs";
/** A run is several studies; a job may run this long before another worker is given it. */
export const DEFAULT_WHAT_IF_EXPIRE_SECONDS = 1800;

type Log = (message: string, err?: unknown) => void;
type RunJob = { runId: string };

export function whatIfJobOf(runId: string, expireSeconds: number): PgBoss.JobInsert<RunJob> & { id: string } {
  return { id: runId, name: WHAT_IF_QUEUE, data: { runId }, expireInSeconds: expireSeconds, retryLimit: 20, retryDelay: 1 };
}

/**
 * The app's side: hands queued runs to the job queue. The run stays `queued` until a worker
 * claims it; cancel is the row's state (the service writes it), which the worker sees.
 */
export class JobWhatIfQueue implements WhatIfScheduler {
  private readonly kicker: Kicker;

  constructor(
    private readonly db: Database,
    private readonly boss: PgBoss,
    log: Log,
    private readonly expireSeconds = DEFAULT_WHAT_IF_EXPIRE_SECONDS,
  ) {
    this.kicker = new Kicker(() => this.dispatch(), log, "what-if dispatch");
  }

  async start() {
    this.kicker.start();
    this.kick();
  }

  kick() {
    this.kicker.kick();
  }

  async cancel() {
    return false;
  }

  async stop() {
    this.kicker.stop();
  }

  private async dispatch() {
    const queued = await this.db
      .select({ id: whatIfRuns.id })
      .from(whatIfRuns)
      .where(eq(whatIfRuns.status, "queued"))
      .orderBy(asc(whatIfRuns.createdAt));
    // a run already on the queue keeps its job (same id: pg-boss inserts it once)
    if (queued.length) await this.boss.insert(queued.map((q) => whatIfJobOf(q.id, this.expireSeconds)));
  }
}

/**
 * A worker's side of what-if jobs: claims the run (or takes over one whose worker died) and runs
 * it on the worker's part threads. Part of every StudyJobWorker (./study-jobs.ts).
 */
export class WhatIfJobRunner {
  private readonly running = new Map<AbortController, { reason: StopReason | null }>();

  constructor(
    private readonly db: Database,
    private readonly log: Log,
  ) {}

  async run({ runId }: RunJob, engine: PartThreads): Promise<void> {
    const [row] = await this.db.select().from(whatIfRuns).where(eq(whatIfRuns.id, runId));
    if (!row || (row.status !== "queued" && row.status !== "running")) return; // cancelled, or done already
    // queued: claim it; running: its worker died and the job expired, so start it over
    const [claimed] = await this.db
      .update(whatIfRuns)
      .set({ status: "running", startedAt: new Date(), progressDone: 0, result: null, error: null })
      .where(and(eq(whatIfRuns.id, runId), eq(whatIfRuns.status, row.status)))
      .returning();
    if (!claimed) return;
    const controller = new AbortController();
    const entry = { reason: null as StopReason | null };
    this.running.set(controller, entry);
    const ctx: RunContext = { controller, reason: () => entry.reason ?? (controller.signal.aborted ? "cancelled" : null) };
    try {
      // a WhatIfLeftError (the worker stopping) fails the job: pg-boss gives it to another worker
      await executeWhatIf(this.db, claimed, partThreadsExecutor(engine), ctx, this.log);
    } finally {
      this.running.delete(controller);
    }
  }

  /** The worker stops: its runs are left running, for another worker to take over. */
  stop() {
    for (const [controller, entry] of this.running) {
      entry.reason = "stopping";
      controller.abort();
    }
  }
}
