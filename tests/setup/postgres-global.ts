// vitest globalSetup of the "backend-pg" project: one throwaway cluster for the run, with two
// template databases made once (migrated; migrated and seeded with the demo). Each test app then
// gets a database of its own copied from one of them (tests/backend/test-database.ts).
import type { TestProject } from "vitest/node";
import pg from "pg";
import { openDatabase } from "@backend/db/client";
import { startCluster } from "./postgres-cluster";
import { seedDemoInto } from "./demo-seed";

export const TEMPLATE_MIGRATED = "orthostack_migrated";
export const TEMPLATE_SEEDED = "orthostack_seeded";

export default async function setup(project: TestProject) {
  const cluster = await startCluster();
  try {
    const admin = new pg.Client({ connectionString: cluster.url });
    await admin.connect();
    try {
      for (const name of [TEMPLATE_MIGRATED, TEMPLATE_SEEDED]) {
        await admin.query(`create database ${name}`);
        const handle = await openDatabase(cluster.url.replace(/\/[^/]*$/, `/${name}`), { poolSize: 2 });
        try {
          if (name === TEMPLATE_SEEDED) await seedDemoInto(handle.db);
        } finally {
          // a template must have no open connection when it is copied
          await handle.close();
        }
      }
    } finally {
      await admin.end();
    }
  } catch (error) {
    await cluster.stop();
    throw error;
  }
  project.provide("postgresUrl", cluster.url);
  project.provide("postgresTemplates", { migrated: TEMPLATE_MIGRATED, seeded: TEMPLATE_SEEDED });
  return () => cluster.stop();
}

declare module "vitest" {
  export interface ProvidedContext {
    postgresUrl: string;
    /** Databases to copy a test app's database from (`create database … template …`). */
    postgresTemplates: { migrated: string; seeded: string };
  }
}
