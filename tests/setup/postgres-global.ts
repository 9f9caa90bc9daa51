// vitest globalSetup of the "backend-pg" project: one throwaway cluster for the run. Each test
// app then gets a database of its own in it (tests/backend/test-database.ts).
import type { TestProject } from "vitest/node";
import { startCluster } from "./postgres-cluster";

export default async function setup(project: TestProject) {
  const cluster = await startCluster();
  project.provide("postgresUrl", cluster.url);
  return () => cluster.stop();
}

declare module "vitest" {
  export interface ProvidedContext {
    postgresUrl: string;
  }
}
