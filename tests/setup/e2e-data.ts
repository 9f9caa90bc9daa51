// vitest globalSetup of the "e2e" project: the demo workspace seeded once into a PGlite data
// folder, which each browser file's server copies as its DATA_DIR (tests/e2e/support/server.ts),
// instead of every server running initdb, the migrations and the seed on start. The server finds
// the workspace and skips its own seed, as `npm start` does on a second start.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { TestProject } from "vitest/node";
import { openDatabase } from "@backend/db/client";
import { seedDemoInto } from "./demo-seed";

export default async function setup(project: TestProject) {
  const root = mkdtempSync(join(tmpdir(), "orthostack-e2e-seed-"));
  const dataDir = join(root, "data");
  const handle = await openDatabase(dataDir);
  try {
    await seedDemoInto(handle.db);
  } finally {
    await handle.close();
  }
  project.provide("e2eSeededDataDir", dataDir);
  return () => rmSync(root, { recursive: true, force: true });
}

declare module "vitest" {
  export interface ProvidedContext {
    /** A PGlite data folder holding the migrated database with the demo seeded. */
    e2eSeededDataDir: string;
  }
}
