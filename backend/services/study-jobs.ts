/**
 * Server mode (DATABASE_URL): studies run as jobs of pg-boss, a PostgreSQL job queue, so any
 * number of worker processes on any machine that reaches the database share them.
 *
 * A study is cut into parts (ranges of its fixed blocks, MODEL.md's seeded random streams). A
 * job runs one part and stores its block partials and worker state; the job that finds every
 * part finished merges them in block order (exactly as the thread runner does) and writes the
 * result in the same transaction that marks the study finished. A worker that dies leaves its
 * job active until pg-boss expires it; another worker runs the part again and overwrites the
 * part's row, so nothing is counted twice and nothing is lost. An adaptive study is cut one run
 * of blocks at a time: the merge decides whether the next run is needed.
 */
import { hostname } from "node:os";
import { randomUUID } from "node:crypto";
import { deserialize, serialize } from "node:v8";
import { and, asc, eq, gt, sql } from "drizzle-orm";
import PgBoss from "pg-boss";
import type { BlockPartial, WorkerState } from "@shared/engine/accumulate";
import { isPackedWorkerState, packWorkerState, unpackWorkerState, type PackedWorkerState } from "@shared/engine/packed-state";
import { adaptiveDone, finalizeStudy, mergeWorkerStates, newCoordinator, prepareStudy, type PreparedStudy } from "@shared/engine/study";
import { validateStackFile, type StackFile } from "@shared/schemas/stack-file";
import { validateStudy, type StudyFile } from "@shared/schemas/study-file";
import type { ResultFile } from "@shared/schemas/result-file";
import type { QueueStatus } from "@shared/schemas/server-status";
import type { Database } from "../db/client";
import { queueWorkers, studies, studyParts } from "../db/schema";
import { EngineError, PartThreads } from "../engine/block-range";
import { StudyAbortedError } from "../engine/pool";
import { writeFinishedStudy } from "./study-finish";
import type { StudyScheduler } from "./study-queue";
import { Kicker } from "./run-loop";
import { DEFAULT_WHAT_IF_EXPIRE_SECONDS, WHAT_IF_QUEUE, WhatIfJobRunner } from "./what-if-jobs";

export const STUDY_PARTS_QUEUE = "study-parts";
/** Blocks per job: 32 × 4,096 trials, a second or two of one core on the reference stack. */
export const PART_BLOCKS = 32;
const PROGRESS_EVERY_MS = 500;
const HEARTBEAT_EVERY_MS = 10_000;
/** A worker not seen for this long is not listed as present. */
const WORKER_SEEN_WITHIN_S = 60;

export type JobQueueSettings = {
  /** Seconds a job may stay active before pg-boss gives it to another worker. */
  expireSeconds: number;
  /** How often pg-boss looks for expired jobs. */
  maintenanceSeconds: number;
  /** How often an idle worker asks for a job. */
  pollSeconds: number;
  /** Blocks per job (tests use few to get many parts from a small study). */
  partBlocks?: number;
  /** Seconds a what-if run's job may stay active (a run is many studies) before another worker is given it. */
  whatIfExpireSeconds?: number;
};
export const DEFAULT_JOB_SETTINGS: JobQueueSettings = {
  expireSeconds: 300,
  maintenanceSeconds: 30,
  pollSeconds: 1,
  partBlocks: PART_BLOCKS,
  whatIfExpireSeconds: DEFAULT_WHAT_IF_EXPIRE_SECONDS,
};

export type { QueueStatus };

type Log = (message: string, err?: unknown) => void;
type PartJob = { studyId: string; part: number };
type StudyRow = {
  id: string;
  status: string;
  stack: StackFile;
  study: StudyFile;
  workspaceId: string;
  projectId: string;
  number: number;
  startedAt: Date | null;
};

/** pg-boss on the app's PostgreSQL server; its tables live in their own schema (`pgboss`). */
export async function openJobQueue(url: string, settings: JobQueueSettings, log: Log): Promise<PgBoss> {
  const boss = new PgBoss({
    connectionString: url,
    max: 4,
    maintenanceIntervalSeconds: settings.maintenanceSeconds,
    application_name: "orthostack-queue",
  });
  boss.on("error", (e) => log("job queue error", e));
  await boss.start();
  for (const name of [STUDY_PARTS_QUEUE, WHAT_IF_QUEUE]) {
    if (await boss.getQueue(name)) continue;
    await boss.createQueue(name).catch(async (e) => {
      // two processes starting at once: the other one made it
      if (!(await boss.getQueue(name))) throw e;
    });
  }
  return boss;
}

/** The stored files, validated; the engine thread compiles them itself, so only the dispatcher and the merge prepare here. */
function filesOf(row: { stack: unknown; study: unknown }): { stack: StackFile; study: StudyFile } {
  const stack = validateStackFile(row.stack);
  if (!stack.ok) throw new EngineInputError(`The stored stack is not valid: ${stack.issues[0]?.path} ${stack.issues[0]?.message}`);
  const study = validateStudy(row.study, stack.stack);
  if (!study.ok) throw new EngineInputError(`The stored study is not valid: ${study.issues[0]?.path} ${study.issues[0]?.message}`);
  return { stack: stack.stack, study: study.study };
}

function preparedOf(row: { stack: unknown; study: unknown }): PreparedStudy {
  const { stack, study } = filesOf(row);
  return prepareStudy(stack, study, {});
}

/** A study that cannot run whoever tries: it fails, it is not retried. */
class EngineInputError extends Error {}

/** The parts of the next stage: every block (fixed), or the next run of blocks (adaptive). */
function stageParts(prep: PreparedStudy, fromBlock: number, firstPart: number, partBlocks = PART_BLOCKS) {
  const end = prep.adaptive ? Math.min(prep.plan.blocks, fromBlock + prep.adaptive.runBlocks) : prep.plan.blocks;
  const parts: { part: number; blockFrom: number; blockTo: number }[] = [];
  for (let b = fromBlock, i = firstPart; b < end; b += partBlocks, i++)
    parts.push({ part: i, blockFrom: b, blockTo: Math.min(end, b + partBlocks) });
  return parts;
}

function jobsOf(studyId: string, parts: { part: number }[], settings: JobQueueSettings): PgBoss.JobInsert<PartJob>[] {
  return parts.map((p) => ({
    name: STUDY_PARTS_QUEUE,
    data: { studyId, part: p.part },
    expireInSeconds: settings.expireSeconds,
    retryLimit: 20,
    retryDelay: 1,
  }));
}

async function failStudy(db: Database, id: string, message: string) {
  await db
    .update(studies)
    .set({ status: "failed", finishedAt: new Date(), error: message })
    .where(and(eq(studies.id, id), eq(studies.status, "running")));
}

/**
 * The app's side: claims queued studies, cuts them into parts and puts their jobs on the queue.
 * Several app processes may do this at once (a claim is one conditional update).
 */
export class JobStudyQueue implements StudyScheduler {
  private readonly kicker: Kicker;

  constructor(
    private readonly db: Database,
    private readonly boss: PgBoss,
    log: Log,
    private readonly settings: JobQueueSettings = DEFAULT_JOB_SETTINGS,
  ) {
    this.kicker = new Kicker(() => this.dispatch(), log, "job dispatch");
  }

  async start() {
    this.kicker.start();
    this.kick();
  }

  kick() {
    this.kicker.kick();
  }

  async cancel(id: string): Promise<boolean> {
    // Running jobs see the state change between blocks and stop; queued ones find it and end.
    const rows = await this.db
      .update(studies)
      .set({ status: "cancelled", finishedAt: new Date() })
      .where(and(eq(studies.id, id), sql`${studies.status} in ('queued', 'running')`))
      .returning({ id: studies.id });
    return rows.length > 0;
  }

  async stop() {
    this.kicker.stop();
  }

  private async dispatch() {
    while (!this.kicker.isStopped) {
      const [row] = await this.db
        .select({ id: studies.id })
        .from(studies)
        .where(eq(studies.status, "queued"))
        .orderBy(asc(studies.createdAt))
        .limit(1);
      if (!row) return;
      const [claimed] = await this.db
        .update(studies)
        .set({ status: "running", startedAt: new Date(), trialsDone: 0, trialsPerSecond: null, error: null })
        .where(and(eq(studies.id, row.id), eq(studies.status, "queued")))
        .returning({ id: studies.id, stack: studies.stack, study: studies.study });
      if (!claimed) continue;
      let prep: PreparedStudy;
      try {
        prep = preparedOf(claimed);
      } catch (e) {
        await failStudy(this.db, claimed.id, e instanceof Error ? e.message : String(e));
        continue;
      }
      const parts = stageParts(prep, 0, 0, this.settings.partBlocks);
      await this.db.transaction(async (tx) => {
        await tx.delete(studyParts).where(eq(studyParts.studyId, claimed.id));
        await tx.insert(studyParts).values(parts.map((p) => ({ studyId: claimed.id, ...p })));
        await tx.update(studies).set({ trialsTotal: prep.plan.trials }).where(eq(studies.id, claimed.id));
      });
      await this.boss.insert(jobsOf(claimed.id, parts, this.settings));
    }
  }
}

/**
 * A worker's side: `threads` warm engine threads, each taking part jobs one at a time, and one
 * what-if run at a time (./what-if-jobs.ts) on the same threads. Runs in `npm run worker`
 * processes and, unless RUN_STUDIES=false, in the app process too.
 */
export class StudyJobWorker {
  readonly id = `${hostname()}-${process.pid}-${randomUUID().slice(0, 8)}`;
  private heartbeat: NodeJS.Timeout | undefined;
  private jobsDone = 0;
  private readonly startedAt = new Date();
  private readonly running = new Set<AbortController>();
  private stopping = false;
  private engine: PartThreads | undefined;
  private readonly whatIf: WhatIfJobRunner;

  constructor(
    private readonly db: Database,
    private readonly boss: PgBoss,
    private readonly log: Log,
    private readonly opts: { threads: number; settings?: JobQueueSettings; nice?: number },
  ) {
    this.whatIf = new WhatIfJobRunner(db, log);
  }

  async start() {
    this.engine = new PartThreads(this.opts.threads, { nice: this.opts.nice });
    await this.beat();
    this.heartbeat = setInterval(() => void this.beat().catch((e) => this.log("worker heartbeat failed", e)), HEARTBEAT_EVERY_MS);
    this.heartbeat.unref();
    const settings = this.opts.settings ?? DEFAULT_JOB_SETTINGS;
    // one poller per thread, each taking one job at a time
    for (let i = 0; i < this.opts.threads; i++) {
      await this.boss.work<PartJob>(STUDY_PARTS_QUEUE, { batchSize: 1, pollingIntervalSeconds: settings.pollSeconds }, async ([job]) => {
        if (job) await this.runPart(job.data);
      });
    }
    // what-if runs: one at a time per worker (each keeps every thread busy with its studies)
    await this.boss.work<{ runId: string }>(
      WHAT_IF_QUEUE,
      { batchSize: 1, pollingIntervalSeconds: settings.pollSeconds },
      async ([job]) => {
        if (!job || !this.engine) return;
        await this.whatIf.run(job.data, this.engine);
        this.jobsDone++;
      },
    );
  }

  /** Stops taking jobs; a part in progress is abandoned (its job expires and runs elsewhere). */
  async stop() {
    this.stopping = true;
    clearInterval(this.heartbeat);
    for (const c of this.running) c.abort();
    this.whatIf.stop();
    await this.boss.offWork(STUDY_PARTS_QUEUE).catch(() => undefined);
    await this.boss.offWork(WHAT_IF_QUEUE).catch(() => undefined);
    await this.engine?.stop();
    await this.db
      .delete(queueWorkers)
      .where(eq(queueWorkers.id, this.id))
      .catch(() => undefined);
  }

  private async beat() {
    const now = new Date();
    await this.db
      .insert(queueWorkers)
      .values({
        id: this.id,
        host: hostname(),
        pid: process.pid,
        threads: this.opts.threads,
        jobsDone: this.jobsDone,
        startedAt: this.startedAt,
        seenAt: now,
      })
      .onConflictDoUpdate({ target: queueWorkers.id, set: { seenAt: now, jobsDone: this.jobsDone } });
  }

  private async runPart({ studyId, part }: PartJob) {
    const [s] = await this.db.select().from(studies).where(eq(studies.id, studyId));
    if (!s || s.status !== "running") return;
    const [p] = await this.db
      .select({ blockFrom: studyParts.blockFrom, blockTo: studyParts.blockTo, finishedAt: studyParts.finishedAt })
      .from(studyParts)
      .where(and(eq(studyParts.studyId, studyId), eq(studyParts.part, part)));
    if (!p) return;
    if (!p.finishedAt) {
      const ran = await this.compute(s as StudyRow, part, p.blockFrom, p.blockTo);
      if (!ran) return;
    }
    const next = await this.tryMerge(studyId);
    if (next.length) await this.boss.insert(jobsOf(studyId, next, this.opts.settings ?? DEFAULT_JOB_SETTINGS));
    this.jobsDone++;
  }

  /** Runs the part's blocks and stores them; false when the study was cancelled or failed meanwhile. */
  private async compute(s: StudyRow, part: number, blockFrom: number, blockTo: number): Promise<boolean> {
    let files: ReturnType<typeof filesOf>;
    try {
      files = filesOf(s);
    } catch (e) {
      await failStudy(this.db, s.id, e instanceof Error ? e.message : String(e));
      return false;
    }
    const controller = new AbortController();
    this.running.add(controller);
    let done = 0;
    let lastWrite = 0;
    let pending: Promise<unknown> = Promise.resolve();
    const onBlock = (b: BlockPartial) => {
      done += b.n;
      const now = Date.now();
      if (now - lastWrite < PROGRESS_EVERY_MS) return;
      lastWrite = now;
      const trials = done;
      pending = pending.then(() => this.progress(s.id, part, trials, controller)).catch((e) => this.log("progress write failed", e));
    };
    const blocks = Array.from({ length: blockTo - blockFrom }, (_, i) => blockFrom + i);
    let out: { partials: BlockPartial[]; state: WorkerState };
    try {
      if (!this.engine) throw new Error("the worker is not started");
      out = await this.engine.run(files, blocks, { signal: controller.signal, onBlock });
    } catch (e) {
      await pending;
      if (this.stopping) throw new Error("worker stopping; the part will run again", { cause: e });
      if (e instanceof StudyAbortedError || controller.signal.aborted) return false;
      // a thread that died is the machine's fault: throw, and the queue runs the part again
      if (!(e instanceof EngineError)) throw e;
      await failStudy(this.db, s.id, e.message);
      this.log(`study ${s.id} failed in part ${part}`, e);
      return false;
    } finally {
      this.running.delete(controller);
    }
    await pending;
    await this.db
      .update(studyParts)
      // the state's histograms cut to their occupied buckets: about a fifth of the bytes
      .set({ data: serialize({ partials: out.partials, state: packWorkerState(out.state) }), trialsDone: done, finishedAt: new Date() })
      .where(and(eq(studyParts.studyId, s.id), eq(studyParts.part, part)));
    return true;
  }

  private async progress(studyId: string, part: number, trials: number, controller: AbortController) {
    await this.db
      .update(studyParts)
      .set({ trialsDone: trials })
      .where(and(eq(studyParts.studyId, studyId), eq(studyParts.part, part)));
    const rows = await this.db
      .update(studies)
      .set({
        trialsDone: sql`(select coalesce(sum(${studyParts.trialsDone}), 0) from ${studyParts} where ${studyParts.studyId} = ${studyId})`,
        trialsPerSecond: sql`${studies.trialsDone} / greatest(extract(epoch from now() - ${studies.startedAt}), 0.001)`,
      })
      .where(and(eq(studies.id, studyId), eq(studies.status, "running")))
      .returning({ id: studies.id });
    if (!rows.length) controller.abort(); // cancelled (or failed elsewhere): stop this part
  }

  /**
   * When every part is finished: merge them in block order and either write the result (same
   * transaction as `finished`) or, for an adaptive study that is not yet stable, return the
   * next run's parts. The study row is locked, so two jobs finishing at once merge once.
   */
  private async tryMerge(studyId: string): Promise<{ part: number; blockFrom: number; blockTo: number }[]> {
    return this.db.transaction(async (tx) => {
      const [s] = await tx.select().from(studies).where(eq(studies.id, studyId)).for("update");
      if (!s || s.status !== "running") return [];
      const open = await tx
        .select({ part: studyParts.part })
        .from(studyParts)
        .where(and(eq(studyParts.studyId, studyId), sql`${studyParts.finishedAt} is null`))
        .limit(1);
      if (open.length) return [];
      const rows = await tx
        .select({ part: studyParts.part, blockTo: studyParts.blockTo, data: studyParts.data })
        .from(studyParts)
        .where(eq(studyParts.studyId, studyId))
        .orderBy(asc(studyParts.part));
      const prep = preparedOf(s);
      const coord = newCoordinator(prep);
      const states: WorkerState[] = [];
      let lastBlock = 0;
      for (const r of rows) {
        if (!r.data) throw new Error(`study ${studyId}: part ${r.part} finished without its data`);
        // a part stored before states were packed (a running study across an upgrade) is whole
        const { partials, state } = deserialize(r.data) as { partials: BlockPartial[]; state: WorkerState | PackedWorkerState };
        for (const b of partials) coord.add(b);
        states.push(isPackedWorkerState(state) ? unpackWorkerState(state) : state);
        lastBlock = Math.max(lastBlock, r.blockTo);
      }
      if (!adaptiveDone(prep, coord)) {
        const next = stageParts(prep, lastBlock, rows.length, (this.opts.settings ?? DEFAULT_JOB_SETTINGS).partBlocks);
        await tx.insert(studyParts).values(next.map((p) => ({ studyId, ...p })));
        return next;
      }
      const result = finalizeStudy(prep, coord, mergeWorkerStates(states));
      const passes = result.requirements.length ? result.requirements.every((r) => r.passes) : null;
      const seconds = s.startedAt ? (Date.now() - s.startedAt.getTime()) / 1000 : 0;
      // A JSON document like the in-process runner's (drops the engine's class prototypes).
      const plain: ResultFile = JSON.parse(JSON.stringify(result));
      await writeFinishedStudy(tx, s, { result: plain, passes, seconds });
      // The parts' data is only needed until the merge.
      await tx.update(studyParts).set({ data: null }).where(eq(studyParts.studyId, studyId));
      return [];
    });
  }
}

/** The queue's depth and the workers seen in the last minute. */
export async function queueStatus(db: Database, boss: PgBoss): Promise<QueueStatus> {
  // study parts and what-if runs alike
  let depth = 0;
  let active = 0;
  for (const name of [STUDY_PARTS_QUEUE, WHAT_IF_QUEUE]) {
    depth += await boss.getQueueSize(name);
    active += await boss.getQueueSize(name, { before: "completed" });
  }
  const seen = await db
    .select()
    .from(queueWorkers)
    .where(gt(queueWorkers.seenAt, new Date(Date.now() - WORKER_SEEN_WITHIN_S * 1000)))
    .orderBy(asc(queueWorkers.startedAt));
  return {
    depth,
    active: Math.max(0, active - depth),
    workers: seen.map((w) => ({
      id: w.id,
      host: w.host,
      pid: w.pid,
      threads: w.threads,
      jobsDone: w.jobsDone,
      startedAt: w.startedAt.toISOString(),
      seenAt: w.seenAt.toISOString(),
    })),
  };
}
