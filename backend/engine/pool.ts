/**
 * The warm engine pool: worker threads that stay alive between studies and run the blocks
 * of every study handed to it, shared fairly between the people who asked (block by block).
 *
 * Design, kept explicit because a job queue across processes will reuse it: a study is cut
 * into fixed blocks (shared/engine/random BLOCK_SIZE). A worker adds a block's integer
 * counts to its own WorkerState for that study and posts the block's float partial back;
 * the pool folds partials in block order (Coordinator) and, at the end, merges the workers'
 * states (exact integer sums). So the result depends on stack, study and seed only, never on
 * the thread count, on which worker ran which block, or on a worker dying half-way: its
 * blocks are run again on its replacement (their partials, already folded, are not folded
 * twice).
 *
 * The end of a study: the workers hand over their states, and the first of them then computes
 * the result's model parts (linearised contributions, regression designs; result-parts.ts)
 * while this thread merges the states and counts the percentiles. Where that worker dies or
 * fails, this thread computes the parts itself: the same numbers either way.
 *
 * Fairness: when a worker has room (two blocks in flight each), the next block goes to the
 * owner after the last one served, round robin, and within an owner to its studies in turn.
 * A person with one long study and a person with a short one each get every other block.
 *
 * The pool also runs the server's live estimates (`estimate`: the requirement check of a draft)
 * on its least busy thread, so the thread that answers requests never runs trials.
 */
import { availableParallelism } from "node:os";
import type { Worker } from "node:worker_threads";
import { mergeWorkerStates, type BlockPartial, type WorkerState } from "@shared/engine/accumulate";
import {
  adaptiveDone,
  assembleResult,
  newCoordinator,
  prepareStudy,
  type PreparedStudy,
  type Progress,
  type StudyOverrides,
  stateFigures,
} from "@shared/engine/study";
import { partsInput, resultParts, unpackParts, type ResultParts } from "@shared/engine/result-parts";
import type { Coordinator } from "@shared/engine/coordinator";
import type { EstimateSummary, LiveStudy } from "@shared/engine/live-estimate";
import type { ResultFile } from "@shared/schemas/result-file";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import { startEngineThread } from "./thread";
import type { FromWorker, ToWorker } from "./worker";

export class StudyAbortedError extends Error {
  constructor(message = "the study was cancelled") {
    super(message);
    this.name = "AbortError";
  }
}

export interface PoolOptions {
  /** worker threads; default one per core */
  threads?: number;
  /** niceness of the worker threads on Linux (0 = as the process; the server uses 10) */
  nice?: number;
  /** told when a worker thread died and was replaced */
  log?: (message: string, err?: unknown) => void;
}

export interface PoolRunOptions extends StudyOverrides {
  /** whose study this is: blocks are shared fairly between owners; default one shared owner */
  owner?: string;
  onProgress?: (p: Progress) => void;
  signal?: AbortSignal;
}

/**
 * Niceness of the server's worker threads: at 10 a busy worker gets about a tenth of the CPU
 * share of the request thread when both want the same core (Linux CFS weights 110 vs 1024).
 */
export const ENGINE_NICE = 10;

/** In flight per worker: one running, one waiting, so a worker never idles between blocks. */
const SLOTS = 2;
/** A study whose blocks were on this many dying workers fails rather than loop. */
const MAX_WORKER_DEATHS = 3;

export function defaultThreads(): number {
  return Math.max(1, availableParallelism());
}

interface PoolWorker {
  w: Worker;
  inFlight: number;
  open: Set<number>;
  alive: boolean;
  /** live estimates asked of this thread, by request number (null: the thread died) */
  estimates: Map<number, (answer: { summary: EstimateSummary | null; message?: string } | null) => void>;
}

/** Threads a live estimate is tried on before it fails (one dying under it is replaced). */
const ESTIMATE_TRIES = 3;

interface Job {
  id: number;
  owner: string;
  prep: PreparedStudy;
  coord: Coordinator;
  queue: number[];
  delivered: Set<number>;
  /** blocks whose counts live in a worker's state (run or in flight there) */
  ranOn: Map<PoolWorker, Set<number>>;
  states: Map<PoolWorker, (s: WorkerState | null) => void>;
  deaths: number;
  failed: Error | null;
  wake: (() => void) | null;
  onProgress?: (p: Progress) => void;
  /** when the first of its blocks started on a worker (ms since the epoch), NaN before */
  firstTrialAt: number;
  /** the worker computing the result's model parts, and their promise (null: not asked) */
  parts: { on: PoolWorker; promise: Promise<ResultParts | null>; resolve: (p: ResultParts | null) => void } | null;
}

export class EnginePool {
  private workers: PoolWorker[] = [];
  private jobs = new Map<number, Job>();
  private nextJob = 1;
  private owners: string[] = [];
  private ownerTurn = 0;
  private jobTurn = new Map<string, number>();
  private stopped = false;
  private nextEstimate = 1;
  readonly size: number;

  constructor(private readonly opts: PoolOptions = {}) {
    this.size = Math.max(1, opts.threads ?? defaultThreads());
    for (let i = 0; i < this.size; i++) this.workers.push(this.spawn());
  }

  /** Studies open in the pool (running or finishing). */
  get activeStudies(): number {
    return this.jobs.size;
  }

  /** The worker threads, for tests that stop one to see it replaced. */
  threadsForTest(): Worker[] {
    return this.workers.map((p) => p.w);
  }

  /** Run a validated study; resolves to its result file. Rejects with StudyAbortedError on abort. */
  async run(stack: StackFile, study: StudyFile, opts: PoolRunOptions = {}): Promise<ResultFile> {
    if (this.stopped) throw new StudyAbortedError("the engine pool is stopped");
    if (opts.signal?.aborted) throw new StudyAbortedError();
    const prep = prepareStudy(stack, study, { trials: opts.trials, seed: opts.seed });
    const job: Job = {
      id: this.nextJob++,
      owner: opts.owner ?? "",
      prep,
      coord: newCoordinator(prep),
      queue: [],
      delivered: new Set(),
      ranOn: new Map(),
      states: new Map(),
      deaths: 0,
      failed: null,
      wake: null,
      onProgress: opts.onProgress,
      firstTrialAt: NaN,
      parts: null,
    };
    this.jobs.set(job.id, job);
    if (!this.owners.includes(job.owner)) this.owners.push(job.owner);
    const onAbort = () => this.fail(job, new StudyAbortedError());
    opts.signal?.addEventListener("abort", onAbort, { once: true });
    try {
      const blocks = prep.plan.blocks;
      // fixed studies: every block at once; adaptive: one run of blocks at a time (JCGM 101 7.9)
      const step = prep.adaptive ? prep.adaptive.runBlocks : blocks;
      let next = 0;
      while (next < blocks) {
        const end = Math.min(blocks, next + step);
        for (let b = next; b < end; b++) job.queue.push(b);
        next = end;
        this.pump();
        await this.until(job, () => job.coord.merged >= end);
        if (prep.adaptive && adaptiveDone(prep, job.coord)) break;
      }
      const states = await this.collectStates(job);
      const figures = stateFigures(prep, job.coord, mergeWorkerStates(states));
      const fromWorker = job.parts ? await job.parts.promise : null;
      if (job.failed) throw job.failed;
      if (!fromWorker) this.opts.log?.("engine: the result's model parts were computed on the pool's own thread");
      return assembleResult(prep, job.coord, figures, fromWorker ?? resultParts(prep, partsInput(job.coord)));
    } finally {
      opts.signal?.removeEventListener("abort", onAbort);
      this.close(job);
    }
  }

  /**
   * The live estimate of a validated stack (shared/engine/live-estimate.ts), on the least busy
   * engine thread: the same figures as the editor's, without running trials on the caller's
   * thread (on the server, the one that answers requests). Rejects with StudyAbortedError when
   * the pool is stopped, with the engine's message when the estimate fails.
   */
  async estimate(stack: StackFile, live: LiveStudy): Promise<EstimateSummary> {
    for (let tries = 0; tries < ESTIMATE_TRIES; tries++) {
      if (this.stopped) throw new StudyAbortedError("the engine pool is stopped");
      const p = this.workers.filter((w) => w.alive).sort((a, b) => a.inFlight + a.estimates.size - (b.inFlight + b.estimates.size))[0];
      if (!p) break;
      const request = this.nextEstimate++;
      const answer = await new Promise<{ summary: EstimateSummary | null; message?: string } | null>((resolve) => {
        p.estimates.set(request, resolve);
        p.w.postMessage({ type: "estimate", request, stack, live } satisfies ToWorker);
      });
      if (answer?.summary) return answer.summary;
      if (answer) throw new Error(`the live estimate failed: ${answer.message ?? "no figures"}`);
      // the thread died under it: a replacement is starting, ask again
    }
    throw new StudyAbortedError("no engine thread could run the live estimate");
  }

  /** Stops every worker; running studies reject with StudyAbortedError. */
  async stop(): Promise<void> {
    if (this.stopped) return;
    this.stopped = true;
    for (const job of this.jobs.values()) this.fail(job, new StudyAbortedError("the engine pool stopped"));
    const ws = this.workers;
    this.workers = [];
    for (const p of ws) {
      p.alive = false;
      for (const answer of p.estimates.values()) answer(null);
      p.estimates.clear();
    }
    await Promise.all(ws.map((p) => p.w.terminate()));
  }

  private spawn(): PoolWorker {
    const w = startEngineThread(this.opts.nice);
    const p: PoolWorker = { w, inFlight: 0, open: new Set(), alive: true, estimates: new Map() };
    w.on("message", (msg: FromWorker) => this.onMessage(p, msg));
    w.on("error", (e) => this.opts.log?.("engine worker error", e));
    w.on("exit", () => this.onExit(p));
    return p;
  }

  private onMessage(p: PoolWorker, msg: FromWorker) {
    if (msg.type === "estimate") {
      const answer = p.estimates.get(msg.request);
      p.estimates.delete(msg.request);
      answer?.({ summary: msg.summary, message: msg.message });
      return;
    }
    const job = this.jobs.get(msg.job);
    if (msg.type === "block" || msg.type === "dropped" || (msg.type === "error" && msg.block !== undefined)) p.inFlight--;
    if (msg.type === "block" && job && !job.failed) {
      const partial = msg.partial as BlockPartial;
      if (!(msg.startedAt >= job.firstTrialAt)) job.firstTrialAt = msg.startedAt;
      // a block run again after a worker died: its partial was folded the first time
      if (!job.delivered.has(partial.block)) {
        job.delivered.add(partial.block);
        if (job.coord.add(partial))
          job.onProgress?.({ trialsDone: job.coord.trials, trialsTotal: job.prep.plan.trials, firstTrialAt: job.firstTrialAt });
      }
      this.notify(job);
    } else if (msg.type === "state" && job) {
      // a worker asked for the parts keeps the study open until it has sent them
      if (job.parts?.on !== p) p.open.delete(job.id);
      job.states.get(p)?.(msg.state);
    } else if (msg.type === "parts" && job && job.parts?.on === p) {
      p.open.delete(job.id);
      job.parts.resolve(msg.parts && unpackParts(msg.parts));
    } else if (msg.type === "error" && job) {
      p.open.delete(job.id);
      this.fail(job, new Error(`engine worker failed: ${msg.message}`));
    }
    this.pump();
  }

  private onExit(p: PoolWorker) {
    if (!p.alive) return;
    p.alive = false;
    for (const answer of p.estimates.values()) answer(null);
    p.estimates.clear();
    const i = this.workers.indexOf(p);
    if (i < 0) return;
    this.opts.log?.("an engine worker thread stopped; starting a replacement");
    this.workers[i] = this.spawn();
    for (const job of this.jobs.values()) {
      const lost = job.ranOn.get(p);
      job.ranOn.delete(p);
      job.states.get(p)?.(null);
      if (job.parts?.on === p) job.parts.resolve(null);
      if (!lost || lost.size === 0) continue;
      if (++job.deaths > MAX_WORKER_DEATHS) {
        this.fail(job, new Error("engine worker threads stopped repeatedly while running this study"));
        continue;
      }
      // its counts died with it: run those blocks again, first
      job.queue.unshift(...[...lost].sort((a, b) => a - b));
    }
    this.pump();
  }

  /** Hand out blocks while workers have room: owners round robin, then their studies in turn. */
  private pump() {
    if (this.stopped) return;
    for (;;) {
      const p = this.freeWorker();
      if (!p) return;
      const job = this.pickJob();
      if (!job) return;
      const block = job.queue.shift()!;
      if (!p.open.has(job.id)) {
        const { stack, study } = job.prep;
        p.w.postMessage({ type: "open", job: job.id, stack, study, overrides: {} } satisfies ToWorker);
        p.open.add(job.id);
      }
      let set = job.ranOn.get(p);
      if (!set) job.ranOn.set(p, (set = new Set()));
      set.add(block);
      p.inFlight++;
      p.w.postMessage({ type: "run", job: job.id, block } satisfies ToWorker);
    }
  }

  private freeWorker(): PoolWorker | null {
    let best: PoolWorker | null = null;
    for (const p of this.workers) if (p.alive && p.inFlight < SLOTS && (!best || p.inFlight < best.inFlight)) best = p;
    return best;
  }

  private pickJob(): Job | null {
    const n = this.owners.length;
    for (let k = 0; k < n; k++) {
      const oi = (this.ownerTurn + k) % n;
      const owner = this.owners[oi];
      const mine = [...this.jobs.values()].filter((j) => j.owner === owner && !j.failed && j.queue.length > 0);
      if (!mine.length) continue;
      const t = this.jobTurn.get(owner) ?? 0;
      const job = mine[t % mine.length];
      this.jobTurn.set(owner, t + 1);
      this.ownerTurn = oi + 1;
      return job;
    }
    return null;
  }

  /**
   * Asks every worker holding counts of the study for its state. A worker that dies before
   * answering had its blocks queued again (onExit); they run elsewhere and that worker is asked.
   */
  private async collectStates(job: Job): Promise<WorkerState[]> {
    const collected: WorkerState[] = [];
    for (;;) {
      // finish is sent after the runs on the same port, so a worker answers with every block
      await this.until(job, () => job.queue.length === 0);
      const holders = [...job.ranOn.keys()];
      if (holders.length === 0) return collected;
      const got = await Promise.all(
        holders.map(
          (p, i) =>
            new Promise<WorkerState | null>((resolve) => {
              job.states.set(p, resolve);
              // the first holder of the first round computes the parts after its state
              const asked = i === 0 && !job.parts;
              if (asked) this.askParts(job, p);
              p.w.postMessage({ type: "finish", job: job.id, parts: asked ? partsInput(job.coord) : undefined } satisfies ToWorker);
            }),
        ),
      );
      job.states.clear();
      if (job.failed) throw job.failed;
      holders.forEach((p, i) => {
        const st = got[i];
        if (st) {
          collected.push(st);
          job.ranOn.delete(p);
        }
      });
    }
  }

  /** The parts will come from p, once it has sent them (null if it cannot). */
  private askParts(job: Job, p: PoolWorker): void {
    let resolve!: (r: ResultParts | null) => void;
    const promise = new Promise<ResultParts | null>((r) => (resolve = r));
    job.parts = { on: p, promise, resolve };
  }

  private async until(job: Job, cond: () => boolean) {
    while (!job.failed && !cond()) await new Promise<void>((r) => (job.wake = r));
    if (job.failed) throw job.failed;
  }

  private notify(job: Job) {
    const w = job.wake;
    job.wake = null;
    w?.();
  }

  private fail(job: Job, e: Error) {
    job.failed ??= e;
    job.queue.length = 0;
    for (const r of job.states.values()) r(null);
    job.parts?.resolve(null);
    this.notify(job);
  }

  private close(job: Job) {
    this.jobs.delete(job.id);
    for (const p of this.workers) {
      if (p.open.has(job.id) && p.alive) p.w.postMessage({ type: "close", job: job.id } satisfies ToWorker);
      p.open.delete(job.id);
    }
    if (![...this.jobs.values()].some((j) => j.owner === job.owner)) {
      this.owners = this.owners.filter((o) => o !== job.owner);
      this.jobTurn.delete(job.owner);
    }
  }
}
