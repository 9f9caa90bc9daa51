import { randomBytes } from "node:crypto";
import { readFile } from "node:fs/promises";
import pg from "pg";
import { inject } from "vitest";
import { openDatabase, type DatabaseHandle } from "@backend/db/client";

/** The server-mode suite's cluster (project "backend-pg"), or undefined under PGlite. */
export function testPostgresUrl(): string | undefined {
  return inject("postgresUrl") || undefined;
}

const snapshotBlobs = new Map<string, Promise<Blob>>();
function snapshotBlob(file: string): Promise<Blob> {
  let blob = snapshotBlobs.get(file);
  if (!blob) {
    blob = readFile(file).then((bytes) => new Blob([bytes]));
    snapshotBlobs.set(file, blob);
  }
  return blob;
}

/**
 * A fresh, migrated database for one test app — with the demo workspace already in it when
 * `seeded` — copied from the run's snapshot (tests/setup/pglite-snapshots.ts): in-memory PGlite by
 * default; in the "backend-pg" project a new database in the throwaway PostgreSQL cluster, copied
 * from a template database and dropped on close. Without a snapshot (a file run outside those
 * projects' setup), an empty in-memory database is created and migrated.
 */
export async function openTestDatabase(opts: { seeded?: boolean } = {}): Promise<DatabaseHandle> {
  const kind = opts.seeded ? "seeded" : "migrated";
  const admin = testPostgresUrl();
  if (!admin) {
    const file = inject("pgliteSnapshots")?.[kind];
    return openDatabase("memory://", file ? { snapshot: await snapshotBlob(file) } : {});
  }
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
  await run(`create database ${name} template ${inject("postgresTemplates")[kind]}`);
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
