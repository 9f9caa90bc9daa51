/**
 * Server mode: app processes that share one PostgreSQL server tell each other when a write
 * request is done, with PostgreSQL's LISTEN/NOTIFY, so that each may keep its SessionCache
 * (backend/middleware/session-cache.ts) and still let no signed-out session, removed member or old
 * role through for longer than a notification takes to arrive (milliseconds on one network).
 *
 * Each process listens on a connection of its own. While that connection is down (not yet open,
 * lost, being reopened) the cache is suspended: every request checks its session in the database,
 * as without a cache. A write's notification goes out through the app's own connection pool
 * after the response is done, so after its transaction committed. A change made outside the app
 * (SQL by hand) reaches no cache: it holds for at most the cache's 30 s, as in a single process.
 */
import { randomUUID } from "node:crypto";
import pg from "pg";
import { sql } from "drizzle-orm";
import type { Database } from "./client";
import type { SessionCache } from "../middleware/session-cache";
import type { Log } from "../deps";

export const SESSION_WRITES_CHANNEL = "orthostack_session_writes";

/** Reopening a lost listening connection: first after this, doubling up to RETRY_MAX_MS. */
const RETRY_FIRST_MS = 250;
const RETRY_MAX_MS = 10_000;

export class SessionWrites {
  /** told in every notification, so a process can tell its own writes from the others' */
  readonly processId = randomUUID();
  private listener: pg.Client | null = null;
  private retry: NodeJS.Timeout | null = null;
  private retryMs = RETRY_FIRST_MS;
  private stopped = false;

  constructor(
    private readonly url: string,
    private readonly db: Database,
    /** the process's cache, suspended until the listening connection is open */
    readonly cache: SessionCache,
    private readonly log: Log,
  ) {
    cache.suspend();
    cache.afterWrites(() => this.publish());
  }

  /** Opens the listening connection; the cache answers once it is open. */
  async start(): Promise<void> {
    this.stopped = false;
    await this.listen();
  }

  async stop(): Promise<void> {
    this.stopped = true;
    if (this.retry) clearTimeout(this.retry);
    this.retry = null;
    const c = this.listener;
    this.listener = null;
    this.cache.suspend();
    await c?.end().catch(() => undefined);
  }

  /** Whether the other processes' writes are being heard (the cache is in use). */
  get listening(): boolean {
    return this.listener !== null;
  }

  private async listen(): Promise<void> {
    // named, so that an operator sees what the connection is for (pg_stat_activity)
    const c = new pg.Client({ connectionString: this.url, application_name: `orthostack session writes ${this.processId}` });
    let lost = false;
    const onLost = (err?: unknown) => {
      if (lost) return;
      lost = true;
      this.lost(c, err);
    };
    c.on("notification", (n) => {
      if (n.channel === SESSION_WRITES_CHANNEL && n.payload !== this.processId) this.cache.clear();
    });
    c.on("error", onLost);
    c.on("end", () => onLost());
    try {
      await c.connect();
      await c.query(`LISTEN ${SESSION_WRITES_CHANNEL}`);
    } catch (err) {
      onLost(err);
      return;
    }
    if (this.stopped || lost) {
      await c.end().catch(() => undefined);
      return;
    }
    this.listener = c;
    this.retryMs = RETRY_FIRST_MS;
    // what was written while nobody listened is unknown: begin empty
    this.cache.resume();
  }

  private lost(c: pg.Client, err?: unknown): void {
    if (this.listener === c) this.listener = null;
    this.cache.suspend();
    void c.end().catch(() => undefined);
    if (this.stopped) return;
    this.log(`session writes: not listening to the other app processes; sessions are checked in the database until it is back`, err);
    if (this.retry) return;
    this.retry = setTimeout(() => {
      this.retry = null;
      if (!this.stopped) void this.listen();
    }, this.retryMs);
    this.retryMs = Math.min(RETRY_MAX_MS, this.retryMs * 2);
  }

  /** After a write request: the other processes empty their caches. */
  private publish(): void {
    if (this.stopped) return;
    this.db.execute(sql`select pg_notify(${SESSION_WRITES_CHANNEL}, ${this.processId})`).catch((err: unknown) => {
      this.log("session writes: could not tell the other app processes of a write", err);
    });
  }
}
