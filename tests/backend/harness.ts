import type { AddressInfo } from "node:net";
import type { Server } from "node:http";
import { createApp } from "@backend/app";
import { createAuth } from "@backend/auth";
import { eq } from "drizzle-orm";
import type { Database, DatabaseHandle } from "@backend/db/client";
import { openTestDatabase } from "./test-database";
import { TEST_AUTH_SECRET, TEST_BASE_URL } from "../setup/demo-seed";
import { recordServerLog } from "../setup/logged-errors";
import type { SessionCache } from "@backend/middleware/session-cache";
import { EventEmitter } from "node:events";
import type { Request, Response } from "express";
import { members, studies, users } from "@backend/db/schema";
import { DEMO_SEED_STEPS } from "@backend/demo/steps";
import type { AppDeps, Clock } from "@backend/deps";
import { mailSettings } from "@backend/lib/env";
import { keepConnectionsLonger } from "@backend/lib/http-server";
import { assembleRuntime, startRuntime, stopRuntime } from "@backend/runtime";
import { DEMO_PASSWORD } from "@backend/seed";
import type { StudyRunner, StudyScheduler } from "@backend/services/study-queue";
import type { WhatIfScheduler } from "@backend/services/what-if-queue";

export type TestApp = {
  url: string;
  deps: AppDeps;
  handle: DatabaseHandle;
  /** Signs in with e-mail and password and returns the session cookie. */
  signIn: (email: string, password?: string) => Promise<string>;
  /** fetch against the app with JSON body and optional cookie. */
  call: (
    method: string,
    path: string,
    opts?: { cookie?: string; body?: unknown; raw?: string; headers?: Record<string, string> },
  ) => Promise<{ status: number; body: any; headers: Headers }>;
  /**
   * Reads a shared record (GET `path`) and returns its ETag as an If-Match header, the way a
   * client sends back the version it last read with a change (backend/lib/versions.ts).
   */
  ifMatch: (path: string, cookie: string) => Promise<{ "if-match": string }>;
  close: () => Promise<void>;
  /** Stops like a crash: the server goes, the running study is dropped without a word to the database. */
  crash: () => Promise<void>;
};

/** A fresh app on an in-memory PGlite, migrated from drizzle/ and seeded with the demo workspace. */
export type TestAppOptions = {
  seed?: boolean;
  signInPerMinute?: number;
  runner?: StudyRunner;
  /** An open database to use (and leave open); a fresh in-memory one otherwise. */
  handle?: DatabaseHandle;
  keepDemoStudy?: boolean;
  /** Mail settings read from this environment instead of the test process's (SMTP_URL, ...). */
  mailEnv?: NodeJS.ProcessEnv;
  clock?: Clock;
  /** Server mode: a job-queue scheduler and its status, in place of the in-process queue. */
  scheduler?: StudyScheduler;
  /** Server mode: what-if runs through the job queue too (with `scheduler`); the in-process queue otherwise. */
  whatIfScheduler?: WhatIfScheduler;
  queueStatus?: AppDeps["queueStatus"];
  /** Room on disk and the workspace quota (tests inject a full disk); the runtime's default otherwise. */
  storage?: AppDeps["storage"];
  supplierUploadsPerHour?: number;
  /** The app's session cache (server mode's tests pass one shared through SessionWrites); default the app's own. */
  sessionCache?: SessionCache;
};

// The seed queues the demo study; most tests want the queue to themselves.
const cancelQueuedStudies = async (db: Database) => {
  await db.update(studies).set({ status: "cancelled" }).where(eq(studies.status, "queued"));
};

export async function startTestApp(opts: TestAppOptions = {}): Promise<TestApp> {
  const seeded = opts.seed !== false;
  // A database of its own, with the demo already in it from the run's snapshot when seeded (the
  // runtime's seed then finds the workspace and skips, as a restarted server would).
  const handle = opts.handle ?? (await openTestDatabase({ seeded }));
  if (!opts.handle && seeded && !opts.keepDemoStudy) await cancelQueuedStudies(handle.db);
  const baseURL = TEST_BASE_URL;
  const auth = createAuth({
    db: handle.db,
    baseURL,
    secret: TEST_AUTH_SECRET,
    signInPerMinute: opts.signInPerMinute ?? 1000,
  });
  // An error the server logs fails the test it happens in (tests/setup/fail-on-errors.ts).
  const log = recordServerLog;
  const runtime = await assembleRuntime({
    handle,
    auth,
    baseURL,
    log,
    clock: opts.clock,
    mail: mailSettings(opts.mailEnv ?? {}),
    runner: opts.runner,
    engineThreads: 2,
    seedSteps: !seeded ? null : opts.keepDemoStudy ? DEMO_SEED_STEPS : [...DEMO_SEED_STEPS, (db) => cancelQueuedStudies(db)],
    ownsDatabase: !opts.handle,
    storage: opts.storage,
    supplierUploadsPerHour: opts.supplierUploadsPerHour,
    // every answer is parsed with its response schema (backend/lib/respond.ts)
    checkResponses: true,
    serverMode: opts.scheduler
      ? { studyQueue: opts.scheduler, whatIfQueue: opts.whatIfScheduler, queueStatus: opts.queueStatus, stop: async () => undefined }
      : undefined,
  });
  const { deps } = runtime;
  const { studyQueue } = deps;
  await startRuntime(runtime);
  const app = createApp(deps, { sessionCache: opts.sessionCache });
  const server: Server = await new Promise((resolve) => {
    const s = keepConnectionsLonger(app.listen(0, "127.0.0.1", () => resolve(s)));
  });
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;

  const call: TestApp["call"] = async (method, path, o = {}) => {
    const headers: Record<string, string> = { origin: baseURL, ...(o.headers ?? {}) };
    if (o.cookie) headers.cookie = o.cookie;
    let body: string | undefined;
    if (o.raw !== undefined) {
      body = o.raw;
      headers["content-type"] ??= "application/json";
    } else if (o.body !== undefined) {
      body = JSON.stringify(o.body);
      headers["content-type"] = "application/json";
    }
    const res = await fetch(url + path, { method, headers, body, redirect: "manual" });
    const text = await res.text();
    let parsed: unknown = text;
    try {
      parsed = text ? JSON.parse(text) : null;
    } catch {
      /* not JSON: leave the text */
    }
    // An answer that broke its own contract fails the test that asked for it, whatever it expected.
    const code = (parsed as { error?: { code?: unknown } } | null)?.error?.code;
    if (code === "response_mismatch") throw new Error(`${method} ${path}: ${(parsed as { error: { message: string } }).error.message}`);
    return { status: res.status, body: parsed, headers: res.headers };
  };

  const signIn = async (email: string, password = DEMO_PASSWORD) => {
    const res = await fetch(`${url}/api/auth/sign-in/email`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: baseURL },
      body: JSON.stringify({ email, password }),
    });
    if (!res.ok) throw new Error(`sign-in failed for ${email}: ${res.status}`);
    return res.headers
      .getSetCookie()
      .map((c) => c.split(";")[0])
      .join("; ");
  };

  const ifMatch: TestApp["ifMatch"] = async (path, cookie) => {
    const res = await call("GET", path, { cookie });
    const tag = res.headers.get("etag");
    if (res.status !== 200 || !tag) throw new Error(`no version for ${path}: ${res.status} ${JSON.stringify(res.body)}`);
    return { "if-match": tag };
  };

  return {
    url,
    deps,
    handle,
    signIn,
    call,
    ifMatch,
    crash: async () => {
      studyQueue.abandon?.();
      await deps.enginePool.stop();
      await new Promise((r) => server.close(r));
    },
    close: async () => {
      await new Promise((r) => server.close(r));
      await stopRuntime(runtime);
    },
  };
}

/** The member id of the user with this e-mail address in the test database, if any. */
export async function memberIdOf(db: Database, email: string): Promise<string | undefined> {
  const [row] = await db
    .select({ id: members.id })
    .from(members)
    .innerJoin(users, eq(users.id, members.userId))
    .where(eq(users.email, email));
  return row?.id;
}

/** A request of this method through the session cache's own middleware, its response done at once. */
export function throughSessionCache(cache: SessionCache, method: string): void {
  const res = new EventEmitter();
  cache.clearOnWrites()({ method } as Request, res as unknown as Response, () => undefined);
  res.emit("finish");
  res.emit("close");
}
