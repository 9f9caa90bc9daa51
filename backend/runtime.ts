/**
 * Puts the server together from the parsed environment: the database, auth, mail, clock, the
 * study queue, the demo seed steps, and what starts and stops with the process. `server.ts`
 * uses `createRuntime(env)`; tests call `assembleRuntime` with their own parts.
 */
import { tmpdir } from "node:os";
import { createAuth } from "./auth";
import { storageGuard, storageSettingsOf, type StorageGuard } from "./lib/storage";
import { openDatabase, type DatabaseHandle } from "./db/client";
import { DEMO_SEED_STEPS } from "./demo/steps";
import { systemClock, type AppDeps, type Clock, type Log } from "./deps";
import { mailSettingsOf, type Env, type MailSettings } from "./lib/env";
import { loadSecret } from "./lib/secret";
import { seedDemo, type SeedStep } from "./seed";
import { createMailService, type MailService } from "./services/mail";
import { StudyQueue, type StudyRunner, type StudyScheduler } from "./services/study-queue";
import { jobSettingsOf, startServerMode } from "./services/server-mode";
import { engineRunner } from "./services/study-runner";
import { ENGINE_NICE, EnginePool } from "./engine/pool";
import { ReportRenderer } from "./services/report-renderer";
import { SESSION_CACHE_SECONDS, SessionCache } from "./middleware/session-cache";
import { SessionWrites } from "./db/session-writes";
import { poolExecutor, WhatIfQueue, type WhatIfExecutorFactory, type WhatIfScheduler } from "./services/what-if-queue";

/** Something that starts with the server and stops with it; stopped in reverse order. */
export type Lifecycle = { name: string; start?: () => Promise<void> | void; stop?: () => Promise<void> | void };

export type Runtime = {
  deps: AppDeps;
  handle: DatabaseHandle;
  /** The demo seed's steps; null when the demo is not seeded (SEED_DEMO=false). */
  seedSteps: readonly SeedStep[] | null;
  lifecycle: Lifecycle[];
  /** The members that session cookies resolved to, for createApp (server mode: shared, see SessionWrites). */
  sessionCache: SessionCache;
};

export type RuntimeParts = {
  handle: DatabaseHandle;
  auth: AppDeps["auth"];
  baseURL: string;
  log: Log;
  clock?: Clock;
  /** Settings to start a mail service from, or a service made already, or null for none. */
  mail: MailSettings | MailService | null;
  /** Runs the queue's studies; default the engine pool below (tests may pass their own). */
  runner?: StudyRunner;
  /** Runs the what-if queue's studies; default the engine pool (tests may pass their own). */
  whatIfExecutor?: WhatIfExecutorFactory;
  /** Worker threads of the engine pool; default one per core. */
  engineThreads?: number;
  seedSteps: readonly SeedStep[] | null;
  /** Whether closing the runtime closes the database too (tests may reopen it). */
  ownsDatabase?: boolean;
  /** Room on disk and the workspace quota; default: the temporary folder, nothing reserved, 2 GB per workspace. */
  storage?: StorageGuard;
  supplierUploadsPerHour?: number;
  /** Parse every answer with its response schema (development, tests); default off, as in production. */
  checkResponses?: boolean;
  /** Server mode: the app processes tell each other of their writes, for their session caches. */
  sessionWrites?: SessionWrites;
  /** Server mode: the job queue takes the place of the in-process study queue (and, when given, of the what-if queue). */
  serverMode?: {
    studyQueue: StudyScheduler;
    whatIfQueue?: WhatIfScheduler;
    queueStatus: AppDeps["queueStatus"];
    stop: () => Promise<void>;
  };
};

const isService = (m: MailSettings | MailService): m is MailService => "send" in m;

/** Builds the deps from parts; starts the mail service (the catcher listens at once), nothing else. */
export async function assembleRuntime(parts: RuntimeParts): Promise<Runtime> {
  const { handle, log } = parts;
  const mail = parts.mail === null ? null : isService(parts.mail) ? parts.mail : await createMailService(handle.db, parts.mail, log);
  if (mail)
    log(mail.mode === "catcher" ? `mail catcher on ${mail.address}: mail shows in the outbox` : `mail goes out through ${mail.address}`);
  // Warm worker threads for every study; niced, so the request thread keeps answering while they work.
  const enginePool = new EnginePool({ threads: parts.engineThreads, nice: ENGINE_NICE, log });
  const studyQueue = parts.serverMode?.studyQueue ?? new StudyQueue(handle.db, parts.runner ?? engineRunner(enginePool), log);
  const whatIfQueue = parts.serverMode?.whatIfQueue ?? new WhatIfQueue(handle.db, parts.whatIfExecutor ?? poolExecutor(enginePool), log);
  const reportRenderer = new ReportRenderer(log);
  const deps: AppDeps = {
    db: handle.db,
    auth: parts.auth,
    baseURL: parts.baseURL,
    log,
    clock: parts.clock ?? systemClock,
    mail,
    studyQueue,
    enginePool,
    reportRenderer,
    whatIfQueue,
    queueStatus: parts.serverMode?.queueStatus,
    storage: parts.storage ?? storageGuard({ paths: [tmpdir()], reserveBytes: 0, workspaceQuotaBytes: 2048 * 1024 * 1024 }),
    supplierUploadsPerHour: parts.supplierUploadsPerHour ?? 30,
    checkResponses: parts.checkResponses ?? false,
  };
  const lifecycle: Lifecycle[] = [
    { name: "database", stop: parts.ownsDatabase === false ? undefined : () => handle.close() },
    { name: "mail", stop: mail ? () => mail.close() : undefined },
    { name: "engine pool", stop: () => enginePool.stop() },
    { name: "report renderer", stop: () => reportRenderer.stop() },
    { name: "job queue", stop: parts.serverMode ? () => parts.serverMode!.stop() : undefined },
    { name: "study queue", start: () => studyQueue.start(), stop: () => studyQueue.stop() },
    { name: "what-if queue", start: () => whatIfQueue.start(), stop: () => whatIfQueue.stop() },
  ];
  const writes = parts.sessionWrites;
  if (writes) lifecycle.push({ name: "session writes", start: () => writes.start(), stop: () => writes.stop() });
  const sessionCache = writes?.cache ?? new SessionCache(SESSION_CACHE_SECONDS * 1000);
  return { deps, handle, seedSteps: parts.seedSteps, lifecycle, sessionCache };
}

/** The runtime of `npm start`: everything from the environment. */
export async function createRuntime(env: Env, log: Log): Promise<Runtime> {
  const handle = await openDatabase(env.DATABASE_URL ?? env.DATA_DIR);
  const baseURL = env.APP_URL ?? `http://localhost:${env.PORT}`;
  const auth = createAuth({
    db: handle.db,
    baseURL,
    secret: loadSecret(env.DATA_DIR, env.BETTER_AUTH_SECRET),
    trustedOrigins: env.TRUSTED_ORIGINS,
    signInPerMinute: env.SIGN_IN_PER_MINUTE,
  });
  // With DATABASE_URL, studies and what-if runs go through the job queue (and `npm run worker` processes).
  const serverMode =
    handle.kind === "postgres"
      ? await startServerMode(handle, {
          settings: jobSettingsOf(env),
          runStudies: env.RUN_STUDIES,
          threads: env.WORKER_THREADS ?? env.STUDY_THREADS,
          log,
        })
      : undefined;
  // several app processes may share a PostgreSQL server: a write in one must reach the others' caches
  const sessionWrites =
    handle.kind === "postgres" ? new SessionWrites(handle.url!, handle.db, new SessionCache(SESSION_CACHE_SECONDS * 1000), log) : undefined;
  return assembleRuntime({
    handle,
    auth,
    sessionWrites,
    baseURL,
    log,
    serverMode,
    mail: mailSettingsOf(env),
    storage: storageGuard(storageSettingsOf(env)),
    supplierUploadsPerHour: env.SUPPLIER_UPLOADS_PER_HOUR,
    checkResponses: env.NODE_ENV !== "production",
    engineThreads: env.STUDY_THREADS,
    seedSteps: env.SEED_DEMO ? DEMO_SEED_STEPS : null,
  });
}

/** Seeds the demo (when asked), then starts each part in order. */
export async function startRuntime(rt: Runtime): Promise<void> {
  if (rt.seedSteps) {
    const outcome = await seedDemo(rt.deps.db, rt.deps.auth, rt.seedSteps);
    rt.deps.log(outcome === "seeded" ? "seeded the demo workspace" : "database has a workspace; demo seed skipped");
  }
  for (const part of rt.lifecycle) await part.start?.();
}

/** Stops each part in reverse order; one failing does not keep the others running. */
export async function stopRuntime(rt: Runtime): Promise<void> {
  for (const part of [...rt.lifecycle].reverse()) {
    try {
      await part.stop?.();
    } catch (err) {
      rt.deps.log(`stopping the ${part.name} failed`, err);
    }
  }
}
