import { mkdirSync } from "node:fs";
import { fileURLToPath } from "node:url";
import type { PgDatabase, PgQueryResultHKT } from "drizzle-orm/pg-core";
import { drizzle as drizzlePglite } from "drizzle-orm/pglite";
import { migrate as migratePglite } from "drizzle-orm/pglite/migrator";
import { drizzle as drizzlePg } from "drizzle-orm/node-postgres";
import { migrate as migratePg } from "drizzle-orm/node-postgres/migrator";
import pg from "pg";
import { DrizzlePGlite } from "./pglite-client";
import * as schema from "./schema";

/**
 * The database as the rest of the code sees it: Drizzle's PostgreSQL dialect, whichever driver
 * is underneath (PGlite in a folder or in memory, or a PostgreSQL server through node-postgres).
 * Nothing outside this file knows which one it is.
 */
export type Database = PgDatabase<PgQueryResultHKT, typeof schema>;
export type DatabaseHandle = {
  db: Database;
  /** "pglite" or "postgres", for the health page and logs only. */
  kind: "pglite" | "postgres";
  /** The PostgreSQL server's address when kind is "postgres" (the job queue connects to it too). */
  url?: string;
  close: () => Promise<void>;
  /** PGlite only: a copy of the data folder, for `openDatabase("memory://", { snapshot })`. */
  snapshot?: () => Promise<Blob>;
};

const migrationsFolder = fileURLToPath(new URL("../../drizzle", import.meta.url));

/**
 * An arbitrary but fixed key for the advisory lock held while migrating, so that several app
 * processes starting at once against one server apply `drizzle/` one after the other (the second
 * finds everything applied and does nothing).
 */
const MIGRATION_LOCK_KEY = 7_310_552_041;

/** Where the data lives: a PostgreSQL URL, "memory://", or a folder for PGlite. */
export function isPostgresUrl(location: string): boolean {
  return /^postgres(ql)?:\/\//.test(location);
}

/**
 * Opens the database and applies every migration of `drizzle/` before anything else touches it:
 * a PostgreSQL server when `location` is a postgres:// URL, else PGlite (in `location`, or in
 * memory when it is "memory://").
 */
export async function openDatabase(location: string, opts: { poolSize?: number; snapshot?: Blob } = {}): Promise<DatabaseHandle> {
  if (isPostgresUrl(location)) return openPostgres(location, opts.poolSize ?? 10);
  const inMemory = location === "memory://";
  if (!inMemory) mkdirSync(location, { recursive: true });
  // An in-memory database can start from a copy of another one's data folder (PGlite's
  // dumpDataDir), which skips initdb: the test suite starts each app from one migrated snapshot.
  const client = inMemory ? new DrizzlePGlite(undefined, opts.snapshot ? { loadDataDir: opts.snapshot } : {}) : new DrizzlePGlite(location);
  await client.waitReady;
  const db = drizzlePglite({ client, schema });
  await migratePglite(db, { migrationsFolder });
  return {
    db: db as Database,
    kind: "pglite",
    close: () => client.close(),
    snapshot: () => client.dumpDataDir("none"),
  };
}

async function openPostgres(url: string, max: number): Promise<DatabaseHandle> {
  const pool = new pg.Pool({ connectionString: url, max });
  // An idle client that loses its server (restart, failover) must not take the process down.
  pool.on("error", () => undefined);
  const db = drizzlePg({ client: pool, schema });
  const lockClient = await pool.connect();
  try {
    await lockClient.query("select pg_advisory_lock($1)", [MIGRATION_LOCK_KEY]);
    await migratePg(db, { migrationsFolder });
  } finally {
    await lockClient.query("select pg_advisory_unlock($1)", [MIGRATION_LOCK_KEY]).catch(() => undefined);
    lockClient.release();
  }
  return { db: db as Database, kind: "postgres", url, close: () => pool.end() };
}
