/**
 * npm run worker: a study worker process for server mode. Needs DATABASE_URL (the app's
 * PostgreSQL server); runs study jobs from the queue on WORKER_THREADS threads (default: one per
 * core) until SIGINT/SIGTERM. Start as many as you like, on any machine that reaches the server.
 */
import { openDatabase } from "./db/client";
import { parseEnv } from "./lib/env";
import { consoleSink, createLog } from "./lib/log";
import { defaultThreads } from "./engine/runner";
import { openJobQueue, StudyJobWorker } from "./services/study-jobs";
import { jobSettingsOf } from "./services/server-mode";

const env = parseEnv();
const log = createLog(consoleSink);
if (!env.DATABASE_URL) {
  log(
    "DATABASE_URL is not set: a worker serves a PostgreSQL server's job queue (one-machine installs run studies in the app)",
    new Error("DATABASE_URL missing"),
  );
  process.exit(2);
}
const handle = await openDatabase(env.DATABASE_URL, { poolSize: 4 });
const settings = jobSettingsOf(env);
const boss = await openJobQueue(env.DATABASE_URL, settings, log);
const threads = env.WORKER_THREADS ?? defaultThreads();
const worker = new StudyJobWorker(handle.db, boss, log, { threads, settings });
await worker.start();
log(`worker ${worker.id} taking study jobs on ${threads} thread${threads === 1 ? "" : "s"}`);

let stopping = false;
const stop = async () => {
  if (stopping) return;
  stopping = true;
  await worker.stop();
  await boss.stop({ graceful: false, close: true, wait: true }).catch(() => undefined);
  await handle.close();
  process.exit(0);
};
process.on("SIGINT", stop);
process.on("SIGTERM", stop);
