// Server mode (DATABASE_URL): studies through the pg-boss job queue, cut into parts run by
// worker processes and merged in block order. Runs in the "backend-pg" project, which has a real
// PostgreSQL server; under PGlite (project "backend") there is no job queue to test.
import { spawn, type ChildProcess } from "node:child_process";
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import type PgBoss from "pg-boss";
import type { DatabaseHandle } from "@backend/db/client";
import { studies, studyParts, studyResults } from "@backend/db/schema";
import { JobStudyQueue, openJobQueue, queueStatus, StudyJobWorker, type JobQueueSettings } from "@backend/services/study-jobs";
import { runStudy } from "@shared/engine/study";
import { validateStackFile } from "@shared/schemas/stack-file";
import { validateStudy } from "@shared/schemas/study-file";
import { startTestApp, type TestApp } from "./harness";
import { openTestDatabase, testPostgresUrl } from "./test-database";

const fixture = (name: string) => JSON.parse(readFileSync(new URL(`../fixtures/${name}`, import.meta.url), "utf8"));
const stack = fixture("stack-reference.json");
const root = fileURLToPath(new URL("../..", import.meta.url));

async function until<T>(fn: () => Promise<T>, ok: (v: T) => boolean, ms = 90_000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await fn();
    if (ok(v)) return v;
    if (Date.now() > end) throw new Error(`timed out; last value ${JSON.stringify(v).slice(0, 300)}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** The result the in-process engine gives for the study's frozen files. */
async function inProcessResult(handle: DatabaseHandle, id: string) {
  const [row] = await handle.db.select().from(studies).where(eq(studies.id, id));
  const s = validateStackFile(row.stack);
  if (!s.ok) throw new Error("stack");
  const st = validateStudy(row.study, s.stack);
  if (!st.ok) throw new Error("study");
  return JSON.parse(JSON.stringify(runStudy(s.stack, st.study)));
}

describe.skipIf(!testPostgresUrl())("server mode: studies through the job queue", () => {
  // Small parts so that a small study has several; an expiry short enough that a killed worker's
  // job comes back within the test, long enough that a loaded machine finishes a part before it.
  const settings: JobQueueSettings = { expireSeconds: 20, maintenanceSeconds: 1, pollSeconds: 0.5, partBlocks: 2 };
  const log = () => undefined;
  let handle: DatabaseHandle;
  let boss: PgBoss;
  let t: TestApp;
  let eng: string;
  let revisionId: string;
  const workers: StudyJobWorker[] = [];
  let child: ChildProcess | undefined;

  beforeAll(async () => {
    handle = await openTestDatabase();
    boss = await openJobQueue(handle.url!, settings, log);
    const scheduler = new JobStudyQueue(handle.db, boss, log, settings);
    t = await startTestApp({ handle, scheduler, queueStatus: () => queueStatus(handle.db, boss) });
    eng = await t.signIn("engineer@example.com");
    const p = await t.call("POST", "/api/projects", { cookie: eng, body: { name: "Server mode" } });
    const rev = await t.call("POST", `/api/projects/${p.body.id}/revisions`, { cookie: eng, body: { stack } });
    revisionId = rev.body.id;
  });

  afterAll(async () => {
    child?.kill("SIGKILL");
    for (const w of workers) await w.stop();
    await t?.close();
    await boss?.stop({ graceful: false, close: true, wait: true });
    await handle?.close();
  });

  const runStudyThroughApi = async (trials: number, seed: number) => {
    const s = await t.call("POST", `/api/revisions/${revisionId}/studies`, {
      cookie: eng,
      body: { study: { ...fixture("study-reference.json"), trials, seed } },
    });
    expect(s.status).toBe(202);
    return s.body.id as string;
  };
  const finished = async (id: string) => {
    await until(
      async () => (await handle.db.select({ status: studies.status }).from(studies).where(eq(studies.id, id)))[0].status,
      (status) => status === "finished" || status === "failed",
      180_000,
    );
    return t.call("GET", `/api/studies/${id}`, { cookie: eng });
  };

  it("two workers share a study's parts; the merged result equals the in-process engine's", async () => {
    for (let i = 0; i < 2; i++) {
      const w = new StudyJobWorker(handle.db, boss, log, { threads: 1, settings });
      await w.start();
      workers.push(w);
    }
    const id = await runStudyThroughApi(10 * 4096, 1234);
    const done = await finished(id);
    expect(done.body.status).toBe("finished");
    const parts = await handle.db.select().from(studyParts).where(eq(studyParts.studyId, id));
    expect(parts.length).toBe(5);
    expect(parts.every((p) => p.finishedAt && p.data === null)).toBe(true);
    const [stored] = await handle.db.select().from(studyResults).where(eq(studyResults.studyId, id));
    expect(stored.result).toEqual(await inProcessResult(handle, id));

    const health = await t.call("GET", "/api/health");
    expect(health.body.queue.depth).toBe(0);
    expect(health.body.queue.workers.map((w: { id: string }) => w.id).sort()).toEqual(workers.map((w) => w.id).sort());
    // the admin's status page shows the same queue and workers
    const status = await t.call("GET", "/api/status", { cookie: await t.signIn("admin@example.com") });
    expect(status.status).toBe(200);
    expect(status.body.queue.workers.map((w: { id: string }) => w.id).sort()).toEqual(workers.map((w) => w.id).sort());
    for (const w of workers.splice(0)) await w.stop();
  });

  it("cancel reaches the jobs: nothing more is run and no result is written", async () => {
    const id = await runStudyThroughApi(20 * 4096, 99);
    // no worker yet: the parts wait in the queue
    const queued = await until(
      () => t.call("GET", "/api/health"),
      (h) => h.body.queue.depth === 10,
    );
    expect(queued.body.queue.depth).toBe(10);
    expect((await t.call("POST", `/api/studies/${id}/cancel`, { cookie: eng, body: {} })).status).toBe(200);
    const w = new StudyJobWorker(handle.db, boss, log, { threads: 1, settings });
    await w.start();
    await until(
      () => t.call("GET", "/api/health"),
      (h) => h.body.queue.depth === 0 && h.body.queue.active === 0,
    );
    await w.stop();
    const parts = await handle.db.select().from(studyParts).where(eq(studyParts.studyId, id));
    expect(parts.filter((p) => p.finishedAt).length).toBe(0);
    expect(await handle.db.select().from(studyResults).where(eq(studyResults.studyId, id))).toEqual([]);
    expect((await t.call("GET", `/api/studies/${id}`, { cookie: eng })).body.status).toBe("cancelled");
  });

  it(
    "a worker process killed mid-job: its job expires, another worker runs it again, the result is unchanged",
    { timeout: 240_000 },
    async () => {
      const id = await runStudyThroughApi(12 * 4096, 4321);
      child = spawn(process.execPath, ["--import", "tsx", "backend/worker.ts"], {
        cwd: root,
        env: {
          ...process.env,
          DATABASE_URL: handle.url,
          WORKER_THREADS: "1",
          STUDY_JOB_EXPIRE_SECONDS: "20",
          QUEUE_MAINTENANCE_SECONDS: "1",
          NODE_ENV: "test",
        },
        stdio: "ignore",
      });
      // kill -9 while it holds a job, after it has finished at least one part
      await until(
        async () => {
          const parts = await handle.db.select({ f: studyParts.finishedAt }).from(studyParts).where(eq(studyParts.studyId, id));
          return { finished: parts.filter((p) => p.f).length, active: (await queueStatus(handle.db, boss)).active };
        },
        (x) => x.finished >= 1 && x.active >= 1,
        120_000,
      );
      child.kill("SIGKILL");
      const partsAtKill = await handle.db.select({ f: studyParts.finishedAt }).from(studyParts).where(eq(studyParts.studyId, id));
      expect(partsAtKill.filter((p) => p.f).length).toBeLessThan(6);

      const w = new StudyJobWorker(handle.db, boss, log, { threads: 2, settings });
      await w.start();
      workers.push(w);
      const done = await finished(id);
      expect(done.body.status).toBe("finished");
      const [stored] = await handle.db.select().from(studyResults).where(eq(studyResults.studyId, id));
      expect(stored.result).toEqual(await inProcessResult(handle, id));
      // progress is the sum over parts: the part run twice is not counted twice
      const [row] = await handle.db
        .select({ done: studies.trialsDone, total: studies.trialsTotal })
        .from(studies)
        .where(eq(studies.id, id));
      expect(row).toEqual({ done: 12 * 4096, total: 12 * 4096 });
    },
  );
});
