import { mkdirSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { PGlite } from "@electric-sql/pglite";
import { drizzle } from "drizzle-orm/pglite";
import { migrate } from "drizzle-orm/pglite/migrator";
import * as schema from "./schema";

export type Database = ReturnType<typeof drizzle<typeof schema>>;
export type DatabaseHandle = { db: Database; client: PGlite; close: () => Promise<void> };

const migrationsFolder = fileURLToPath(new URL("../../drizzle", import.meta.url));

/**
 * Opens PGlite (in `dataDir`, or in memory when it is "memory://") and applies every migration
 * of `drizzle/` before anything else touches it.
 */
export async function openDatabase(dataDir: string): Promise<DatabaseHandle> {
  const inMemory = dataDir === "memory://";
  if (!inMemory) mkdirSync(dataDir, { recursive: true });
  const client = inMemory ? new PGlite() : new PGlite(dataDir);
  await client.waitReady;
  const db = drizzle({ client, schema });
  await migrate(db, { migrationsFolder });
  return { db, client, close: () => client.close() };
}
