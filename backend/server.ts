import type { Express } from "express";
import { createApp } from "./app";
import { createAuth } from "./auth";
import { buildClientIfNeeded, mountDevClient, mountStaticClient } from "./client";
import { openDatabase } from "./db/client";
import { parseEnv } from "./lib/env";
import { loadSecret } from "./lib/secret";
import { seedDemo } from "./seed";
import { StudyQueue } from "./services/study-queue";
import { engineRunner } from "./services/study-runner";
import { startHooks } from "./start-hooks";

const env = parseEnv();
const log = (message: string, err?: unknown) => {
  if (err) console.error(`[orthostack] ${message}`, err);
  else console.info(`[orthostack] ${message}`);
};

const { db, close, kind } = await openDatabase(env.DATABASE_URL ?? env.DATA_DIR);
const baseURL = env.APP_URL ?? `http://localhost:${env.PORT}`;
const auth = createAuth({
  db,
  baseURL,
  secret: loadSecret(env.DATA_DIR, env.BETTER_AUTH_SECRET),
  trustedOrigins: env.TRUSTED_ORIGINS,
  signInPerMinute: env.SIGN_IN_PER_MINUTE,
});
const studyQueue = new StudyQueue(db, engineRunner({ threads: env.STUDY_THREADS }), log);
const deps = { db, auth, baseURL, log, studyQueue };

if (env.SEED_DEMO) {
  const outcome = await seedDemo(db, auth);
  log(outcome === "seeded" ? "seeded the demo workspace" : "database has a workspace; demo seed skipped");
}
await startHooks.run(deps);
await studyQueue.start();

const dev = env.NODE_ENV === "development";
let devApp: Express | undefined;
if (!dev) await buildClientIfNeeded(log);
const app = createApp(deps, {
  strictCsp: !dev,
  trustedOrigins: env.TRUSTED_ORIGINS,
  trustProxy: env.TRUST_PROXY,
  mountClient: dev ? (a) => void (devApp = a) : mountStaticClient,
});
if (devApp) await mountDevClient(devApp);

const server = app.listen(env.PORT, env.HOST, () => {
  log(`serving on ${baseURL} (data ${kind === "postgres" ? "in the PostgreSQL server of DATABASE_URL" : `in ${env.DATA_DIR}`})`);
});

let stopping = false;
const stop = async () => {
  if (stopping) return;
  stopping = true;
  server.close();
  await studyQueue.stop();
  await startHooks.stop();
  await close();
  process.exit(0);
};
process.on("SIGINT", stop);
process.on("SIGTERM", stop);
