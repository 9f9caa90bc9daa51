import { randomBytes } from "node:crypto";
import pg from "pg";
import { inject } from "vitest";
import { openDatabase, type DatabaseHandle } from "@backend/db/client";

/** The server-mode suite's cluster (project "backend-pg"), or undefined under PGlite. */
export function testPostgresUrl(): string | undefined {
  return inject("postgresUrl") || undefined;
}

/**
 * A fresh, migrated database for one test app: in-memory PGlite by default; in the "backend-pg"
 * project a new database in the throwaway PostgreSQL cluster, dropped on close.
 */
export async function openTestDatabase(): Promise<DatabaseHandle> {
  const admin = testPostgresUrl();
  if (!admin) return openDatabase("memory://");
  const name = `t_${randomBytes(6).toString("hex")}`;
  const run = async (sql: string) => {
    const c = new pg.Client({ connectionString: admin });
    await c.connect();
    try {
      await c.query(sql);
    } finally {
      await c.end();
    }
  };
  await run(`create database ${name}`);
  const url = admin.replace(/\/[^/]*$/, `/${name}`);
  const handle = await openDatabase(url, { poolSize: 5 });
  return {
    ...handle,
    close: async () => {
      await handle.close();
      await run(`drop database if exists ${name} with (force)`);
    },
  };
}
