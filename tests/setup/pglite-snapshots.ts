// vitest globalSetup of the "backend" project: creating a PGlite database (initdb), migrating it
// and seeding the demo takes seconds per test app. They are done once here; each test app then
// starts from a copy of the data folder (tests/backend/test-database.ts).
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { TestProject } from "vitest/node";
import { openDatabase } from "@backend/db/client";
import { seedDemoInto } from "./demo-seed";

export default async function setup(project: TestProject) {
  const dir = mkdtempSync(join(tmpdir(), "orthostack-snapshots-"));
  const handle = await openDatabase("memory://");
  const save = async (name: string) => {
    const file = join(dir, name);
    writeFileSync(file, Buffer.from(await (await handle.snapshot!()).arrayBuffer()));
    return file;
  };
  try {
    const migrated = await save("migrated.tar");
    await seedDemoInto(handle.db);
    const seeded = await save("seeded.tar");
    project.provide("pgliteSnapshots", { migrated, seeded });
  } finally {
    await handle.close();
  }
  return () => rmSync(dir, { recursive: true, force: true });
}

declare module "vitest" {
  export interface ProvidedContext {
    /** Files holding PGlite data folders: migrated only, and migrated with the demo seeded. */
    pgliteSnapshots: { migrated: string; seeded: string };
  }
}
