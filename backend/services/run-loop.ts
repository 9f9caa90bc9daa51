/**
 * The one loop behind every queue that takes work from a database table: the in-process study
 * queue, the in-process what-if queue, and the dispatchers that hand work to the job queue of
 * server mode. `Kicker` serialises "look for work" (a kick while one is going runs once more
 * after it); `LocalRunLoop` claims rows and runs them in this process, several at once, each
 * with its own AbortController, and stops or abandons them on shutdown.
 */

type Log = (message: string, err?: unknown) => void;

/** Calls `step` on each kick, never twice at once; a kick during a step runs it once more after. */
export class Kicker {
  private stopped = true;
  private kicking = false;
  private again = false;

  constructor(
    private readonly step: () => Promise<void>,
    private readonly log: Log,
    private readonly what: string,
  ) {}

  get isStopped() {
    return this.stopped;
  }

  start() {
    this.stopped = false;
  }

  stop() {
    this.stopped = true;
  }

  kick() {
    if (this.stopped) return;
    if (this.kicking) {
      this.again = true;
      return;
    }
    this.kicking = true;
    void this.step()
      .catch((e) => this.log(`${this.what} error`, e))
      .finally(() => {
        this.kicking = false;
        if (this.again) {
          this.again = false;
          this.kick();
        }
      });
  }
}

/** A row claimed for this process: its id, whose it is (fair sharing), and what the run needs. */
export type Claimed<J> = { id: string; owner: string; job: J };

/** Why a run was aborted: a person's cancel, or the process stopping (leave the row as a crash would). */
export type StopReason = "cancelled" | "stopping" | "abandoned";

export type RunContext = {
  controller: AbortController;
  /** Why the controller was aborted, once it is. */
  reason: () => StopReason | null;
};

export type LocalRunLoopOptions<J> = {
  /** Names the loop in the log. */
  what: string;
  maxRunning: number;
  /** At most one running row per owner (studies: one person's long queue does not hold back another's). */
  onePerOwner?: boolean;
  /** Marks rows left running by a previous process (this loop owns them all: single process). */
  interruptLeftovers: () => Promise<void>;
  /**
   * The oldest queued row not already running here (and, with onePerOwner, of an owner not busy),
   * claimed with a conditional update: null when there is none, "lost" when another claim won.
   */
  claim: (busy: { ids: Set<string>; owners: Set<string> }) => Promise<Claimed<J> | "lost" | null>;
  /** Runs a claimed row to its end state; on abort, `ctx.reason()` says why. */
  run: (claimed: Claimed<J>, ctx: RunContext) => Promise<void>;
  /** Marks a queued (not yet claimed) row cancelled; true when it was queued. */
  cancelQueued: (id: string) => Promise<boolean>;
};

export class LocalRunLoop<J> {
  private readonly running = new Map<
    string,
    { owner: string; controller: AbortController; reason: StopReason | null; done: Promise<void> }
  >();
  private readonly kicker: Kicker;

  constructor(
    private readonly opts: LocalRunLoopOptions<J>,
    log: Log,
  ) {
    this.kicker = new Kicker(() => this.next(), log, opts.what);
  }

  async start() {
    this.kicker.start();
    await this.opts.interruptLeftovers();
    this.kick();
  }

  /** Looks for queued work; safe to call any number of times. */
  kick() {
    this.kicker.kick();
  }

  isRunning(id: string) {
    return this.running.has(id);
  }

  /** Cancels a queued or running row; true when it was found in one of those states. */
  async cancel(id: string): Promise<boolean> {
    const run = this.running.get(id);
    if (run) {
      run.reason ??= "cancelled";
      run.controller.abort();
      await run.done;
      return true;
    }
    return this.opts.cancelQueued(id);
  }

  /** Stops taking work and aborts what runs (server shutdown, tests). */
  async stop() {
    this.kicker.stop();
    const runs = [...this.running.values()];
    for (const r of runs) {
      r.reason ??= "stopping";
      r.controller.abort();
    }
    await Promise.all(runs.map((r) => r.done));
  }

  /** Stops without writing anything, as a crash would (used to test the restart path). */
  abandon() {
    this.kicker.stop();
    const runs = [...this.running.values()];
    this.running.clear();
    for (const r of runs) {
      r.reason = "abandoned";
      r.controller.abort(new Error("abandoned"));
    }
  }

  private async next() {
    while (!this.kicker.isStopped && this.running.size < this.opts.maxRunning) {
      const busy = {
        ids: new Set(this.running.keys()),
        owners: new Set(this.opts.onePerOwner ? [...this.running.values()].map((r) => r.owner) : []),
      };
      const claimed = await this.opts.claim(busy);
      if (claimed === null) return;
      if (claimed === "lost") continue;
      const controller = new AbortController();
      const entry = { owner: claimed.owner, controller, reason: null as StopReason | null, done: Promise.resolve() };
      this.running.set(claimed.id, entry);
      entry.done = this.opts
        .run(claimed, { controller, reason: () => entry.reason ?? (controller.signal.aborted ? "cancelled" : null) })
        .finally(() => {
          if (this.running.get(claimed.id) === entry) this.running.delete(claimed.id);
          setImmediate(() => this.kick());
        });
    }
  }
}
