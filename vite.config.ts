import { fileURLToPath } from "node:url";
import react from "@vitejs/plugin-react";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vitest/config";

const here = (p: string) => fileURLToPath(new URL(p, import.meta.url));

// A console.error or a server error logged during a test fails it (the browser files check the
// page and the server's output themselves).
const failOnErrors = ["tests/setup/fail-on-errors.ts"];

// One alias scheme for tsc (tsconfig "paths"), Vite and vitest.
const alias = {
  "@shared": here("./shared"),
  "@backend": here("./backend"),
  "@frontend": here("./frontend"),
};

export default defineConfig({
  root: here("./frontend"),
  publicDir: false,
  plugins: [react(), tailwindcss()],
  resolve: { alias },
  worker: { format: "es" },
  build: {
    outDir: here("./dist/client"),
    emptyOutDir: true,
    chunkSizeWarningLimit: 1800,
  },
  test: {
    root: here("."),
    // Vitest's default on 2 cores is one worker (cores - 1), which runs every file one after the
    // other. Two workers run the engine, backend and client files side by side. The browser files
    // run one at a time (fileParallelism false below); vitest would put them in a group of their
    // own after the rest, so `npm test` starts them in a second vitest process beside the first
    // (package.json): they mostly wait on their server and chromium.
    maxWorkers: 2,
    // `isolate: false` in the unit projects: each worker loads the modules once and runs its
    // files one after another in that process, about half the CPU of a fresh module graph per
    // file (docs/decisions/038-test-files-share-a-process.md). A file leaves no global state behind.
    projects: [
      {
        resolve: { alias },
        test: {
          name: "engine",
          root: here("."),
          isolate: false,
          environment: "node",
          setupFiles: failOnErrors,
          include: ["tests/engine/**/*.test.ts"],
          testTimeout: 60_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: "backend",
          root: here("."),
          isolate: false,
          environment: "node",
          setupFiles: failOnErrors,
          include: ["tests/backend/**/*.test.ts"],
          // one migrated (and one seeded) database made per run, copied by every test app
          globalSetup: ["tests/setup/pglite-snapshots.ts"],
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
      {
        // The same backend suite against a real PostgreSQL server (DATABASE_URL mode): a
        // throwaway cluster started for the run, a database per test app.
        resolve: { alias },
        test: {
          name: "backend-pg",
          root: here("."),
          isolate: false,
          environment: "node",
          setupFiles: failOnErrors,
          include: ["tests/backend/**/*.test.ts"],
          // the role probes do not depend on the database driver, and the PGlite client's own test
          // has nothing of PostgreSQL's to test: they run once, under PGlite
          exclude: ["tests/backend/roles.test.ts", "tests/backend/pglite-client.test.ts"],
          globalSetup: ["tests/setup/postgres-global.ts"],
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
      {
        plugins: [react()],
        resolve: { alias },
        test: {
          name: "frontend",
          root: here("."),
          isolate: false,
          environment: "jsdom",
          setupFiles: failOnErrors,
          include: ["tests/frontend/**/*.test.tsx", "tests/frontend/**/*.test.ts"],
        },
      },
      {
        resolve: { alias },
        test: {
          name: "e2e",
          root: here("."),
          environment: "node",
          include: ["tests/e2e/**/*.test.ts"],
          // the demo seeded once into a data folder that each file's server copies
          globalSetup: ["tests/setup/e2e-data.ts"],
          testTimeout: 120_000,
          hookTimeout: 180_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
