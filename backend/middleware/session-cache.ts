import type { RequestHandler } from "express";
import type { Actor } from "./session";

type Entry = { actor: Actor; until: number };

/** How long a resolved session cookie is reused in the app process (common practice: seconds, not minutes). */
export const SESSION_CACHE_SECONDS = 30;

/**
 * The member a session cookie resolved to, kept for a few seconds in this process so that a
 * read does not cost a session and a member query every time (issue 15 item 4).
 *
 * It must never let a signed-out session, a removed member, an old password's session or an old
 * role through: every request that may change any of these is a write (sign-out, password change
 * and reset, member removal and role change, an accepted invitation), so every request that is
 * not GET or HEAD empties the cache when it starts and again when its response is done. A lookup
 * that began before a write finished is not stored (the generation moved on). Entries are keyed by
 * the exact Cookie header better-auth accepted, end with the session at the latest, and are bounded
 * in number. With several app processes on one PostgreSQL server (server mode) a write in one must
 * empty the others' caches too: each process tells the others when a write is done and empties its
 * own when told (backend/db/session-writes.ts), and caches nothing while it cannot hear them
 * (suspended).
 */
export class SessionCache {
  private entries = new Map<string, Entry>();
  private gen = 0;
  private suspended = false;
  private onWriteDone: (() => void) | undefined;

  constructor(
    private readonly ttlMs: number,
    private readonly maxEntries = 10_000,
    private readonly now: () => number = Date.now,
  ) {}

  get generation(): number {
    return this.gen;
  }

  get(key: string): Actor | undefined {
    if (this.suspended) return undefined;
    const e = this.entries.get(key);
    if (!e) return undefined;
    if (e.until <= this.now()) {
      this.entries.delete(key);
      return undefined;
    }
    return e.actor;
  }

  /** Stores the actor unless something was written since `generation` was read. */
  set(key: string, actor: Actor, sessionEnds: Date, generation: number): void {
    if (generation !== this.gen || this.suspended) return;
    if (this.entries.size >= this.maxEntries) {
      // the oldest entry (Map keeps insertion order)
      const first = this.entries.keys().next();
      if (!first.done) this.entries.delete(first.value);
    }
    this.entries.set(key, { actor, until: Math.min(this.now() + this.ttlMs, sessionEnds.getTime()) });
  }

  clear(): void {
    this.gen++;
    this.entries.clear();
  }

  /** Empty, and answer and keep nothing until resumed (server mode: while other processes' writes cannot be heard). */
  suspend(): void {
    this.suspended = true;
    this.clear();
  }

  resume(): void {
    this.clear();
    this.suspended = false;
  }

  get isSuspended(): boolean {
    return this.suspended;
  }

  /** Called once after every write request is done (server mode: to tell the other processes). */
  afterWrites(fn: () => void): void {
    this.onWriteDone = fn;
  }

  /** Empties the cache around every request that may write (see the class comment). */
  clearOnWrites(): RequestHandler {
    return (req, res, next) => {
      if (req.method !== "GET" && req.method !== "HEAD") {
        this.clear();
        let done = false;
        const after = () => {
          this.clear();
          if (done) return;
          done = true;
          this.onWriteDone?.();
        };
        res.once("finish", after);
        res.once("close", after);
      }
      next();
    };
  }
}
